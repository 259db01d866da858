// Web Worker of static pages: runs fitProfile (the kernel's fitter) on a request from the
// explorer and posts progress and the result back.
import { fitProfile } from "../../../src/fit/fitProfile.js";
import { getModel } from "../../../src/physics/index.js";
import { fitOptionsFromParams } from "../../shared/fitRequest.js";
import { fitJson } from "../../../src/report/results/fitJson.js";
import type { LocalFitRequest } from "../explorerView.js";

addEventListener("message", (event: MessageEvent<LocalFitRequest>) => {
  const request = event.data;
  try {
    const model = getModel(request.modelId, request.modelOptions ?? {});
    let last = 0;
    const result = fitProfile(
      { x: request.x, y: request.y, sigma: request.sigma ?? undefined, mask: request.mask, counts: request.counts, yUnit: "" },
      model,
      {
        ...fitOptionsFromParams(model, request.params, request.noise),
        onProgress: (p) => {
          const now = Date.now();
          if (now - last < 50) return;
          last = now;
          postMessage({ type: "progress", iteration: p.iteration, objective: p.objective });
        },
      },
    );
    const params = structuredClone(request.params);
    for (const p of result.parameters) if (params[p.name]) params[p.name]!.value = p.value;
    postMessage({ type: "done", summary: fitJson(result), curve: result.model, params });
  } catch (error) {
    postMessage({ type: "error", message: error instanceof Error ? error.message : String(error) });
  }
});
