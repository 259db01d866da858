/** A kernel runtime without a kernel: the real comm registry, with published messages recorded. */
import { CommRegistry } from "../../kernel-ext/comm/registry.js";
import { installRuntime, type KernelRuntime } from "../../kernel-ext/runtime.js";

export interface Published {
  msgType: string;
  content: Record<string, any>;
  buffers: readonly ArrayBufferView[];
}

/** Install a recording runtime; returns the messages list, the registry and an uninstall function. */
export function installFakeKernel(): { messages: Published[]; comms: CommRegistry; uninstall: () => void } {
  const messages: Published[] = [];
  const comms = new CommRegistry(
    (msgType, content, options) => messages.push({ msgType, content, buffers: (options?.buffers ?? []) as ArrayBufferView[] }),
    (problem) => { throw new Error(problem); },
  );
  const runtime: KernelRuntime = { apiVersion: 1, publish: comms.publish, comms, interruptSignal: () => new AbortController().signal };
  const previous = installRuntime(runtime);
  return { messages, comms, uninstall: () => void installRuntime(previous) };
}
