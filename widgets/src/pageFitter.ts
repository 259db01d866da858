/**
 * The explorer's fitter in pages without a kernel (static HTML exports): fitProfile in a Web
 * Worker started from the worker bundle's source (a blob URL works from file:// pages too).
 * Cancel terminates the worker.
 */
import type { LocalFitter } from "./explorerView.js";

/** A LocalFitter running `workerSource` (the bundled fit worker) for each fit. */
export function workerFitter(workerSource: string): LocalFitter {
  const url = URL.createObjectURL(new Blob([workerSource], { type: "text/javascript" }));
  return {
    fit: (request, onProgress, signal) => new Promise((resolve, reject) => {
      const worker = new Worker(url);
      const stop = () => {
        worker.terminate();
        reject(new Error("fit cancelled"));
      };
      signal.addEventListener("abort", stop, { once: true });
      worker.onmessage = (event: MessageEvent) => {
        const message = event.data as { type: string; [key: string]: any };
        if (message.type === "progress") {
          onProgress(Math.min(0.95, Math.log1p(message.iteration) / Math.log1p(60)), `iteration ${message.iteration}, objective ${Number(message.objective).toPrecision(7)}`);
          return;
        }
        signal.removeEventListener("abort", stop);
        worker.terminate();
        if (message.type === "done") resolve({ summary: message.summary, curve: message.curve, params: message.params });
        else reject(new Error(message.message));
      };
      worker.onerror = (event) => {
        signal.removeEventListener("abort", stop);
        worker.terminate();
        reject(new Error(event.message || "the fit worker failed"));
      };
      worker.postMessage(request);
    }),
  };
}
