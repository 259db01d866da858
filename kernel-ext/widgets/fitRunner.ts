/**
 * Runs a fit for a widget without blocking the kernel: in a worker thread when the model can be
 * rebuilt there from its source — registry id with its options, or formula text — (so comm
 * messages — progress, cancel — keep flowing), else in this thread after the current message.
 */
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { fitProfile } from "../../src/fit/fitProfile.js";
import type { FitOptions, FitProgress, FitResult } from "../../src/fit/types.js";
import type { Model } from "../../src/physics/model.js";
import { modelSource, type ModelSource } from "../../src/physics/modelSource.js";
import type { Profile } from "../../src/profile.js";

/** What the worker receives (structured-cloned). */
export interface FitJobData {
  profile: Profile;
  /** How to rebuild exactly the model shown (id and options, or formula). */
  model: ModelSource;
  options: Omit<FitOptions, "onProgress" | "signal">;
  cancelFlag: SharedArrayBuffer;
}

/** A fit in progress. */
export interface RunningFit {
  /** Resolves with the result (reason "cancelled" after cancel()); rejects on bad input. */
  result: Promise<FitResult>;
  /** Ask the solver to stop at its next iteration. */
  cancel(): void;
  /** "worker" or "inline": where the fit runs. */
  where: "worker" | "inline";
}

function workerFile(): string | null {
  const here = fileURLToPath(import.meta.url);
  const file = here.replace(/fitRunner\.(ts|js)$/, "fitWorker.js");
  // Only compiled JavaScript runs in a plain worker thread (tests on TypeScript sources run inline).
  return file.endsWith(".js") && existsSync(file) ? file : null;
}

/**
 * Start fitting `model` to `profile`.
 * @param onProgress called with solver progress (iteration, evaluations, objective), at most every 50 ms
 */
export function startFit(profile: Profile, model: Model, options: FitJobData["options"], onProgress: (p: FitProgress) => void): RunningFit {
  const cancelFlag = new SharedArrayBuffer(4);
  const flag = new Int32Array(cancelFlag);
  const cancel = () => Atomics.store(flag, 0, 1);
  const file = workerFile();
  const { rebuildable, ...source } = modelSource(model);
  if (file !== null && rebuildable) {
    const worker = new Worker(file, { workerData: { profile, model: source, options, cancelFlag } satisfies FitJobData });
    const result = new Promise<FitResult>((resolve, reject) => {
      worker.on("message", (message: { type: string; result?: FitResult; message?: string } & Partial<FitProgress>) => {
        if (message.type === "progress") onProgress(message as FitProgress);
        else if (message.type === "done") resolve(message.result!);
        else reject(new Error(message.message));
      });
      worker.on("error", reject);
      worker.on("exit", (code) => reject(new Error(`fit worker stopped (exit code ${code}) before sending a result`)));
    }).finally(() => void worker.terminate());
    return { result, cancel, where: "worker" };
  }
  const result = new Promise<FitResult>((resolve, reject) => {
    setImmediate(() => {
      try {
        resolve(fitProfile(profile, model, { ...options, onProgress, signal: { get aborted() { return Atomics.load(flag, 0) === 1; } } }));
      } catch (error) {
        reject(error);
      }
    });
  });
  return { result, cancel, where: "inline" };
}
