/**
 * Worker thread that runs one fit, so the kernel keeps handling comm messages (progress,
 * cancel) while it works. Input: workerData {profile, model (its source), options, cancelFlag}.
 * Output messages: {type: "progress", ...FitProgress} and {type: "done", result} or {type: "error", message}.
 */
import { parentPort, workerData } from "node:worker_threads";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { rebuildModel } from "../../src/fit/fitSource.js";
import type { FitJobData } from "./fitRunner.js";

const job = workerData as FitJobData;
const flag = new Int32Array(job.cancelFlag);
let lastProgress = 0;
try {
  const result = fitProfile(job.profile, rebuildModel(job.model), {
    ...job.options,
    signal: { get aborted() { return Atomics.load(flag, 0) === 1; } },
    onProgress: (progress) => {
      const now = Date.now();
      if (now - lastProgress < 50) return;
      lastProgress = now;
      parentPort?.postMessage({ type: "progress", ...progress });
    },
  });
  parentPort?.postMessage({ type: "done", result });
} catch (error) {
  parentPort?.postMessage({ type: "error", message: error instanceof Error ? error.message : String(error) });
}
