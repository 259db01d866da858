/** Worker thread of `fringekit batch`: fits the files it is sent, one message per file. */
import { parentPort, workerData } from "node:worker_threads";
import { batchRow } from "./batchRow.js";
import type { ParsedArgs } from "./parseArgs.js";

const { modelId, args } = workerData as { modelId: string; args: ParsedArgs };
parentPort?.on("message", (message: { index: number; path: string } | null) => {
  if (message === null) {
    parentPort?.close();
    return;
  }
  parentPort?.postMessage({ index: message.index, row: batchRow(message.path, modelId, args) });
});
