/**
 * Renders widgets from state embedded in a page, the way notebook HTML exports carry it:
 * `<script type="application/vnd.jupyter.widget-state+json">` (schema v2) holds every model,
 * each `<script type="application/vnd.jupyter.widget-view+json">` marks where a view goes.
 */
import type { ManagerBase } from "@jupyter-widgets/base-manager";
import { checkBufferPaths } from "../shared/bufferPaths.js";
import { MODULE_NAME } from "./version.js";

/**
 * Only fringekit's own models: a page may carry other libraries' models (HTML, Output, Image
 * widgets) whose stock views would insert HTML or fetch from the network.
 */
function ownState<T extends { state?: Record<string, { model_module?: string; buffers?: { path?: unknown }[] }> }>(document: T): T {
  const own = Object.entries(document.state ?? {}).filter(([id, model]) => {
    if (model?.model_module !== MODULE_NAME) return false;
    // The widget manager's put_buffers walks these paths without checks: refuse prototype keys.
    try {
      checkBufferPaths((model.buffers ?? []).map((b) => b?.path));
      return true;
    } catch (error) {
      console.warn(`widget ${id} not rendered: ${(error as Error).message}`);
      return false;
    }
  });
  return { ...document, state: Object.fromEntries(own) };
}

/** Render every embedded view under `root`; returns the number of views drawn. */
export async function renderEmbedded(makeManager: () => ManagerBase & { display_view(view: any, el: HTMLElement): Promise<void> }, root: ParentNode = document): Promise<number> {
  let drawn = 0;
  for (const stateTag of Array.from(root.querySelectorAll('script[type="application/vnd.jupyter.widget-state+json"]'))) {
    const manager = makeManager();
    const models = await manager.set_state(ownState(JSON.parse(stateTag.textContent ?? "{}")));
    for (const viewTag of Array.from(root.querySelectorAll('script[type="application/vnd.jupyter.widget-view+json"]'))) {
      const { model_id: id } = JSON.parse(viewTag.textContent ?? "{}") as { model_id?: string };
      const model = models.find((m) => m.model_id === id);
      if (!model || model.get("_model_module") !== MODULE_NAME || !viewTag.parentElement) continue;
      const host = document.createElement("div");
      host.className = "widget-subarea";
      viewTag.parentElement.insertBefore(host, viewTag);
      // The text fallback beside the tag is for readers without JavaScript.
      viewTag.parentElement.querySelector(".fk-static-fallback")?.remove();
      await manager.display_view(await manager.create_view(model), host);
      drawn++;
    }
  }
  return drawn;
}
