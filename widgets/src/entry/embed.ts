// Offline renderer: one classic script (no AMD `define` seen) with a kernel-less widget manager
// (pageManager.ts), the widgets, plotly and the in-page fitter. Works when added before or after
// DOMContentLoaded.
import workerSource from "fringekit:fit-worker-source";
import { ExplorerView } from "../explorerView.js";
import * as widgets from "../index.js";
import { workerFitter } from "../pageFitter.js";
import { PageWidgetManager } from "../pageManager.js";
import { registerPhysicsModels } from "../registerPhysics.js";
import { renderEmbedded } from "../renderEmbedded.js";

registerPhysicsModels();
ExplorerView.localFitter = workerFitter(workerSource);

const loader = async (name: string) => {
  if (name === widgets.MODULE_NAME) return widgets;
  throw new Error(`this page has no widget module ${name} (only ${widgets.MODULE_NAME})`);
};

function start(): void {
  renderEmbedded(() => new PageWidgetManager(loader))
    .then((count) => document.body.setAttribute("data-widgets-rendered", String(count)))
    .catch((error: unknown) => {
      document.body.setAttribute("data-widgets-error", String(error));
      console.error(error);
    });
}

(globalThis as Record<string, unknown>).fringekitWidgets = widgets;
if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", start, { once: true });
else start();
