/**
 * The process-wide link between cell code and the running kernel. The launcher installs one
 * runtime on `globalThis` under a registered symbol, so every copy of fringekit a cell may load
 * (the repo's dist/, a project's node_modules) talks to the same kernel.
 */
import type { CommRegistry } from "./comm/registry.js";

/** Binary data accepted wherever buffers are sent: ArrayBuffer, typed arrays, DataView, Buffer. */
export type BufferLike = ArrayBuffer | ArrayBufferView;

/** Options of an iopub message. */
export interface PublishOptions {
  metadata?: Record<string, unknown>;
  buffers?: readonly BufferLike[];
}

/** What the kernel offers cell code; installed by the launcher. */
export interface KernelRuntime {
  /** Version of this interface, raised on incompatible change. */
  readonly apiVersion: 1;
  /**
   * Publishes a message on iopub. Its parent header is the request whose handling is running
   * (the cell, or the comm message being handled), so frontends put output where it belongs.
   */
  publish(msgType: string, content: Record<string, unknown>, options?: PublishOptions): void;
  /** Comm targets and open comms of this kernel. */
  readonly comms: CommRegistry;
  /** Signal of the running cell: aborted when the user interrupts the kernel. */
  interruptSignal(): AbortSignal;
}

const RUNTIME_KEY = Symbol.for("fringekit.kernel.runtime");

/** The runtime of the fringekit kernel this code runs in, or undefined outside it. */
export function getRuntime(): KernelRuntime | undefined {
  return (globalThis as Record<symbol, unknown>)[RUNTIME_KEY] as KernelRuntime | undefined;
}

/** Thrown when kernel-only functions are called outside the fringekit kernel. */
export class NotInKernelError extends Error {
  readonly code = "not-in-kernel";
  constructor(what: string) {
    super(
      `${what} needs the fringekit Jupyter kernel, but this code is not running in it; ` +
        "install it with `fringekit kernel install` and pick \"TypeScript (fringekit)\" as the notebook's kernel",
    );
    this.name = "NotInKernelError";
  }
}

/** The runtime, or a NotInKernelError naming `what` needed it. */
export function requireRuntime(what: string): KernelRuntime {
  const runtime = getRuntime();
  if (!runtime) throw new NotInKernelError(what);
  return runtime;
}

/** Installs the runtime (the launcher does this once) and returns the previous one. */
export function installRuntime(runtime: KernelRuntime | undefined): KernelRuntime | undefined {
  const previous = getRuntime();
  (globalThis as Record<symbol, unknown>)[RUNTIME_KEY] = runtime;
  return previous;
}

/** A Node Buffer viewing the same bytes as `data` (no copy). */
export function toBuffer(data: BufferLike): Buffer {
  if (Buffer.isBuffer(data)) return data;
  if (data instanceof ArrayBuffer) return Buffer.from(data);
  if (ArrayBuffer.isView(data)) return Buffer.from(data.buffer, data.byteOffset, data.byteLength);
  throw new TypeError(`buffer: expected an ArrayBuffer, typed array or DataView, got ${Object.prototype.toString.call(data)}`);
}
