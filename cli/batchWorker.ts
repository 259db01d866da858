/**
 * Worker thread of `fringekit batch` (protocol in batchPool.ts): fits the inputs it is sent and
 * answers one message per input. It loads only the fitting code a row needs.
 */
import { parentPort, workerData } from "node:worker_threads";
import { batchRow, type BatchInput } from "./batchRow.js";
import type { ParsedArgs } from "./parseArgs.js";

const { modelId, args } = workerData as { modelId: string; args: ParsedArgs };
// A row awaits (the image decoders load on the first image), yet answers must go out in the
// order the inputs came (batchPool's protocol): messages are handled one after another.
let previous: Promise<void> = Promise.resolve();
parentPort?.on("message", (message: { tasks: { position: number; input: BatchInput }[] } | null) => {
  previous = previous.then(async () => {
    if (message === null) {
      parentPort?.close();
      return;
    }
    for (const task of message.tasks) parentPort?.postMessage({ position: task.position, result: await batchRow(task.input, modelId, args) });
  });
});
parentPort?.postMessage({ ready: true });
