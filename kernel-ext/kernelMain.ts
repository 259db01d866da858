/**
 * The fringekit kernel itself, started by launch.ts (in this process, or in a child started
 * from the start-up snapshot). Loads tslab 1.0.22's own server module, checks it is the pinned
 * version, installs fringekit's message handling into it and starts tslab's startKernel.
 */
import { readFileSync } from "node:fs";
import { FringekitKernel, type TslabServer } from "./server/kernel.js";
import { loadTslab, type ExecutorConsole } from "./tslabPin.js";
import { cacheDir } from "./codeCache.js";
import { snapshotSourceFiles, scheduleSnapshotBuild, type KernelSnapshot } from "./startSnapshot.js";
import { installRuntime } from "./runtime.js";
import { registerWidgetControl } from "./widget/registry.js";
import type { SendingSocket } from "./server/wire.js";

/** Messages iopub may queue per subscriber before dropping (bursts of output stay whole). */
const IOPUB_HIGH_WATER_MARK = 100_000;

/**
 * Delay before writing TypeScript's code cache and building the start-up snapshot (only when a
 * start had none), ms: after start and a first cell, at low priority, not during them.
 */
const CACHE_DELAY_MS = 3000;
/** Delay of the second look at the snapshot's declaration files, after the first, ms. */
const SNAPSHOT_RECHECK_MS = 60_000;

const realStderr = process.stderr.write.bind(process.stderr);
const log = (line: string) => void realStderr(`[fringekit kernel] ${line}\n`);

function packageVersion(): string {
  try {
    return JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8")).version ?? "unknown";
  } catch {
    return "unknown";
  }
}

function routeStdio(kernel: FringekitKernel): void {
  for (const name of ["stdout", "stderr"] as const) {
    const stream = process[name];
    const original = stream.write.bind(stream);
    stream.write = ((chunk: unknown, encoding?: unknown, callback?: unknown) => {
      if (!kernel.ready) return original(chunk as string, encoding as BufferEncoding, callback as () => void);
      const text = typeof chunk === "string" ? chunk : Buffer.from(chunk as Uint8Array).toString(typeof encoding === "string" ? (encoding as BufferEncoding) : "utf8");
      kernel.writeStream(name, text);
      const done = typeof encoding === "function" ? encoding : callback;
      if (typeof done === "function") queueMicrotask(() => (done as () => void)());
      return true;
    }) as typeof stream.write;
  }
}

/** How the kernel was started (see launch.ts). */
export interface KernelStartOptions {
  /** The state deserialized from the start-up snapshot, when this process started from one. */
  snapshot?: KernelSnapshot;
  /** Whether to build a start-up snapshot after this start if none fits (launch.ts decides). */
  buildSnapshot: boolean;
}

/**
 * Starts the kernel for the Jupyter connection file `configPath`.
 * @param configPath the connection file Jupyter wrote
 * @param start snapshot state and whether to build one (see KernelStartOptions)
 */
export function startFringekitKernel(configPath: string, start: KernelStartOptions): void {
  const dir = cacheDir();
  const sourceFiles = snapshotSourceFiles(start.snapshot);
  const tslab = loadTslab(import.meta.url, {
    resolvePackageExports: true,
    globalTypes: process.env.FRINGEKIT_KERNEL_TYPES,
    codeCacheDir: dir,
    snapshot: start.snapshot,
    sourceFiles,
  });
  const kernel = new FringekitKernel(tslab, log, { implementation: "fringekit", implementationVersion: packageVersion() });

  const createExecutor = tslab.executor.createExecutor;
  tslab.executor.createExecutor = (rootDir: string, convs: unknown, _console: ExecutorConsole) =>
    createExecutor(rootDir, convs, kernel.executorConsole);
  // A PUB socket silently drops messages beyond its high-water mark (zeromq's default: 1000
  // queued per subscriber), so a burst of outputs or widget updates would lose messages.
  const bindSocket = tslab.jupyter.ZmqServer.prototype.bindSocket as (this: TslabServer, socket: unknown, port: number) => Promise<void>;
  tslab.jupyter.ZmqServer.prototype.bindSocket = function (this: TslabServer, socket: { sendHighWaterMark?: number }, port: number) {
    if (socket === this.iopub) socket.sendHighWaterMark = IOPUB_HIGH_WATER_MARK;
    // tslab only logs a failed bind and keeps running, deaf on that socket: the frontend then
    // waits for a kernel that never answers. Exit instead, so it sees the kernel die at once.
    return bindSocket.call(this, socket, port).catch((error: { code?: string; message?: string }) => {
      const why = error?.code === "EADDRINUSE" ? "the address is already in use (another process took the port)" : error?.message ?? String(error);
      log(`cannot listen on port ${port} of the connection file: ${why}; the kernel stops. Start it again: the frontend writes new ports.`);
      process.exit(1);
    });
  };
  tslab.jupyter.ZmqServer.prototype.handleShellMessage = function (this: TslabServer, socket: SendingSocket, ...frames: Buffer[]) {
    return kernel.handleFrames(this, socket, frames);
  };
  // tslab's own `display` (import { display } from "tslab") publishes through this hook.
  tslab.jupyter.lastWriteDisplayData = (data: Record<string, unknown>, update: boolean) =>
    kernel.publish(update ? "update_display_data" : "display_data", data);

  installRuntime(kernel.runtime);
  registerWidgetControl();
  routeStdio(kernel);
  // tslab's own SIGINT handler interrupts an awaiting cell; this one aborts interruptSignal().
  process.on("SIGINT", () => kernel.interrupt());
  tslab.main.startKernel({ configPath, enableFindLocal: false, jsKernel: false, globalVersion: tslab.version });
  setTimeout(() => {
    // Once, when there was no usable cache: after start and a first cell have compiled the
    // type-checker's hot functions, so the next start finds them compiled (~3 MB file).
    tslab.saveCodeCache();
    // When no snapshot fits this start's declaration files (see startSnapshot.ts); once more a
    // minute later if the cells imported packages the snapshot lacks, so that the next start
    // has their declarations parsed too (a first cell usually comes later than the first check).
    if (start.buildSnapshot && sourceFiles.needsBuild()) scheduleSnapshotBuild(dir, sourceFiles.buildJob(), log);
    setTimeout(() => {
      if (start.buildSnapshot && sourceFiles.needsBuild()) scheduleSnapshotBuild(dir, sourceFiles.buildJob(), log);
    }, SNAPSHOT_RECHECK_MS).unref();
  }, CACHE_DELAY_MS).unref();
}
