// A kernel runtime that records published messages instead of sending them: lets comm,
// widget and display code run without a kernel (like a dummy widget manager).
import { CommRegistry } from "../../kernel-ext/comm/registry.js";
import { installRuntime, type KernelRuntime, type PublishOptions } from "../../kernel-ext/runtime.js";

export interface Published {
  msgType: string;
  content: Record<string, unknown>;
  metadata: Record<string, unknown>;
  buffers: ArrayBufferView[];
}

export function useFakeRuntime(): { sent: Published[]; problems: string[]; runtime: KernelRuntime; restore(): void; controller: AbortController } {
  const sent: Published[] = [];
  const problems: string[] = [];
  const publish = (msgType: string, content: Record<string, unknown>, options: PublishOptions = {}) => {
    sent.push({ msgType, content, metadata: options.metadata ?? {}, buffers: (options.buffers ?? []) as ArrayBufferView[] });
  };
  const controller = new AbortController();
  const runtime: KernelRuntime = {
    apiVersion: 1,
    publish,
    comms: new CommRegistry(publish, (line) => problems.push(line)),
    interruptSignal: () => controller.signal,
  };
  const previous = installRuntime(runtime);
  return { sent, problems, runtime, controller, restore: () => void installRuntime(previous) };
}
