/**
 * README screenshots of the four widgets (real fits of simulated data, rendered from an offline
 * export) at 1280 × 800 and in a 600 px notebook column. Run: `npx tsx test/widgets/takeScreenshots.ts`.
 * Writes docs/img/widget-<name>.png and docs/img/widget-<name>-narrow.png.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { exportNotebookHtml } from "../../kernel-ext/widgets/exportHtml.js";
import { buildWidgetBundles } from "../../widgets/build.js";
import { launchBrowser } from "./browser.js";
import { demoWidgets } from "./demoWidgets.js";

const out = fileURLToPath(new URL("../../docs/img/", import.meta.url));
const names = ["explorer", "comparison", "uncertainty", "coherence-scan"];

await buildWidgetBundles();
mkdirSync(out, { recursive: true });
const dir = mkdtempSync(path.join(os.tmpdir(), "fringekit-shots-"));
try {
  const widgets = demoWidgets(2048);
  const notebook = {
    nbformat: 4, nbformat_minor: 5,
    metadata: { widgets: { "application/vnd.jupyter.widget-state+json": widgets.state } },
    cells: Object.values(widgets.ids).map((id) => ({ cell_type: "code", execution_count: 1, metadata: {}, source: "",
      outputs: [{ output_type: "display_data", metadata: {}, data: { "application/vnd.jupyter.widget-view+json": { version_major: 2, version_minor: 0, model_id: id } } }] })),
  };
  writeFileSync(path.join(dir, "demo.ipynb"), JSON.stringify(notebook));
  await exportNotebookHtml(path.join(dir, "demo.ipynb"), path.join(dir, "demo.html"));
  for (const [width, suffix] of [[1280, ""], [600, "-narrow"]] as const) {
    const browser = await launchBrowser(width, 800);
    try {
      await browser.page.goto(pathToFileURL(path.join(dir, "demo.html")).href);
      await browser.page.waitForSelector("body[data-widgets-rendered='4']", { state: "attached", timeout: 90_000 });
      await browser.page.addStyleTag({ content: "pre.fk-code { display: none } body { margin: 8px auto; padding: 0 8px }" });
      // The explorer after pressing Fit (in-page fitter), as a user would see it.
      await browser.page.click("button[data-action=fit]");
      await browser.page.waitForSelector(".fk-root[data-fit-state=done]", { state: "attached", timeout: 90_000 });
      await browser.page.waitForTimeout(1500);
      const roots = await browser.page.$$(".fk-root");
      for (const [i, root] of roots.entries()) {
        await root.screenshot({ path: path.join(out, `widget-${names[i]}${suffix}.png`) });
      }
    } finally {
      await browser.close();
    }
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
