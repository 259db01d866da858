// Offline HTML export: every widget renders from embedded state with no kernel and no network;
// sliders recompute in the page and Fit runs the fitter in a Web Worker. Also on a page that has
// an AMD loader, and when the renderer script is added after DOMContentLoaded.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { exportNotebookHtml } from "../../kernel-ext/widgets/exportHtml.js";
import { buildWidgetBundles } from "../../widgets/build.js";
import { hasChromium, launchBrowser, type Browser } from "./browser.js";
import { demoWidgets } from "./demoWidgets.js";

const run = hasChromium() ? describe : describe.skip;

/** An executed-notebook document as nbclient saves it: one widget view per cell, state in metadata. */
function notebookWith(state: ReturnType<typeof demoWidgets>): Record<string, unknown> {
  return {
    nbformat: 4, nbformat_minor: 5,
    metadata: { widgets: { "application/vnd.jupyter.widget-state+json": state.state } },
    cells: Object.entries(state.ids).map(([kind, id]) => ({
      cell_type: "code", execution_count: 1, metadata: {}, source: `// ${kind}`,
      outputs: [{ output_type: "display_data", metadata: {}, data: {
        "application/vnd.jupyter.widget-view+json": { version_major: 2, version_minor: 0, model_id: id },
        "text/plain": `${kind} widget`,
      } }],
    })),
  };
}

run("exportNotebookHtml(ipynbPath, outPath)", () => {
  let dir = "";
  let browser: Browser;
  let html = "";
  const external: string[] = [];
  const errors: string[] = [];
  const widgets = demoWidgets(1024);

  beforeAll(async () => {
    await buildWidgetBundles();
    dir = mkdtempSync(path.join(os.tmpdir(), "fringekit-offline-"));
    const ipynb = path.join(dir, "scan.ipynb");
    writeFileSync(ipynb, JSON.stringify(notebookWith(widgets)));
    await exportNotebookHtml(ipynb, path.join(dir, "scan.html"));
    html = readFileSync(path.join(dir, "scan.html"), "utf8");
    browser = await launchBrowser(1280, 800);
    // No network: anything but the page's own file is refused and recorded.
    await browser.context.route("**/*", (route) => {
      const url = route.request().url();
      if (url.startsWith("file:") || url.startsWith("blob:") || url.startsWith("data:")) return route.continue();
      external.push(url);
      return route.abort();
    });
    browser.page.on("pageerror", (e) => errors.push(e.message));
  });
  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it("renders all four widgets from embedded state with no request leaving the page", async () => {
    await browser.page.goto(pathToFileURL(path.join(dir, "scan.html")).href);
    await browser.page.waitForSelector("body[data-widgets-rendered='4']", { state: "attached", timeout: 60_000 });
    expect(await browser.page.$$eval(".fk-root", (els) => els.length)).toBe(4);
    expect(external).toEqual([]);
    expect(errors).toEqual([]);
  });

  it("sliders recompute the model and Fit runs in a Web Worker in the page", async () => {
    const page = browser.page;
    const canvas = "document.querySelector('canvas.fk-overlay').toDataURL()";
    const before = await page.evaluate(canvas);
    const slider = page.locator("input[type=range][data-param=separation]").first();
    await slider.focus();
    for (let k = 0; k < 3; k++) await slider.press("ArrowRight");
    await page.waitForTimeout(150);
    expect(await page.evaluate(canvas)).not.toBe(before);
    await page.click("button[data-action=fit]");
    await page.waitForSelector(".fk-root[data-fit-state=done]", { state: "attached", timeout: 90_000 });
    const separation = (await page.textContent("[data-region=result] tr[data-param=separation]"))!;
    // Simulated truth 500 µm (B1); the in-page fit finds it within 3 standard uncertainties.
    const [, value, err] = separation.match(/([\d.]+) ± ([\d.]+)/)!.map(Number);
    expect(Math.abs(value! - 500)).toBeLessThan(3 * err!);
    expect(external).toEqual([]);
  });

  it("still renders on a page with an AMD define (require.js) and when the renderer is added after load", async () => {
    // These pages add inline scripts of their own, which the export's Content-Security-Policy
    // refuses by design (hostileExport.test.ts); the renderer's robustness is tested without it.
    html = html.replace(/<meta http-equiv="Content-Security-Policy"[^>]*>/, "");
    const amd = html.replace("<body>", "<body><script>window.define = function () { throw new Error('AMD path taken'); }; window.define.amd = {};</script>");
    writeFileSync(path.join(dir, "amd.html"), amd);
    await browser.page.goto(pathToFileURL(path.join(dir, "amd.html")).href);
    await browser.page.waitForSelector("body[data-widgets-rendered='4']", { state: "attached", timeout: 60_000 });
    const open = '<script id="fringekit-widget-renderer">';
    const renderer = html.indexOf(open);
    const late = `${html.slice(0, renderer)}<script>addEventListener("load", () => setTimeout(() => {
      const s = document.createElement("script"); s.textContent = document.getElementById("later").textContent; document.body.appendChild(s); }, 200));</script>
      <script type="text/plain" id="later">${html.slice(renderer + open.length, html.lastIndexOf("</script>"))}</script></body></html>`;
    writeFileSync(path.join(dir, "late.html"), late);
    await browser.page.goto(pathToFileURL(path.join(dir, "late.html")).href);
    await browser.page.waitForSelector("body[data-widgets-rendered='4']", { state: "attached", timeout: 60_000 });
    expect(errors).toEqual([]);
  });

  it("exportNotebookHtml(not a notebook) says what to pass and writes nothing", async () => {
    const bad = path.join(dir, "bad.ipynb");
    writeFileSync(bad, "{ not json");
    await expect(exportNotebookHtml(bad, path.join(dir, "bad.html"))).rejects.toThrow(/bad\.ipynb: cannot read the notebook .*; pass an executed \.ipynb/);
    await expect(exportNotebookHtml(path.join(dir, "x.txt"), path.join(dir, "x.html"))).rejects.toThrow(/invalid ipynbPath/);
    expect(readFileSync(bad, "utf8")).toBe("{ not json");
  });
});
