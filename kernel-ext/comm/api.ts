/**
 * Comm functions for cell code and widgets. They need the fringekit kernel; outside it they
 * throw NotInKernelError.
 */
import { requireRuntime } from "../runtime.js";
import type { BufferLike, Comm, CommTargetHandler, JsonObject } from "./types.js";

/**
 * Registers `handler` for comms a frontend opens to target `name`.
 * Example: `registerCommTarget("my.echo", (comm) => comm.onMessage((d) => comm.send(d)))`.
 * @returns a function that unregisters the target
 */
export function registerCommTarget(name: string, handler: CommTargetHandler): () => void {
  return requireRuntime("registerCommTarget").comms.registerTarget(name, handler);
}

/**
 * Opens a comm from the kernel to frontend target `target` (comm_open with `data`,
 * `metadata` and binary `buffers`, one wire frame each).
 * @returns the kernel end of the comm
 */
export function openComm(target: string, data: JsonObject = {}, metadata: JsonObject = {}, buffers: readonly BufferLike[] = []): Comm {
  return requireRuntime("openComm").comms.open(target, data, metadata, buffers);
}
