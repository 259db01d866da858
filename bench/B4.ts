/**
 * B4 (../shared/bench/PROBLEMS.md): in the profile explorer, one slider moved continuously over
 * an 8192-point B1-like profile in headless Chromium; time from each input event to the redrawn
 * model curve. Reported against the 16.7 ms frame budget (60 frames per second) and against
 * plotly redrawing the same traces with precomputed curves, measured in the same run.
 *
 * Also the explorer's time to draw: in the test page (display call to drawn figure, median of
 * several displays) and on an offline HTML export holding that explorer (page load to drawn and
 * settled figure, and the page's size). With FRINGEKIT_B4_BASELINE=FILE (an earlier build's
 * widgets/dist/fringekit-embed.js) the same page is also exported with that renderer, and the
 * two pages are loaded in turns (A, B, A, B ...) in the same run.
 */
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { explorer } from "../kernel-ext/widgets/explorer.js";
import { notebookHtml, rendererBundlePath } from "../kernel-ext/widgets/exportHtml.js";
import { widgetStateFromMessages } from "../kernel-ext/widgets/widgetState.js";
import { buildWidgetBundles, distDir } from "../widgets/build.js";
import { hasChromium, launchBrowser, type Browser } from "../test/widgets/browser.js";
import { b1Profile, b1Start } from "../test/widgets/demoWidgets.js";
import { installFakeKernel } from "../test/widgets/fakeKernel.js";

const POINTS = 8192;
const WARMUP = 20;
const STEPS = 200;
const REFERENCE_STEPS = 10;
const FRAME_BUDGET_MS = 1000 / 60;
/** Further displays of the explorer in the test page (after the first), and loads of each offline page. */
const DISPLAYS = 5;
const PAGE_LOADS = 7;
/** The figure counts as drawn when its plot has not changed for this long (ms). */
const SETTLED_MS = 1000;

function quantile(sorted: number[], q: number): number {
  const i = (sorted.length - 1) * q;
  const lo = Math.floor(i);
  return sorted[lo]! + (sorted[Math.ceil(i)]! - sorted[lo]!) * (i - lo);
}

/** An executed-notebook document with one explorer of an `n`-point B1-like profile, as nbclient saves it. */
function explorerNotebook(n: number): Record<string, unknown> {
  const kernel = installFakeKernel();
  try {
    const ex = explorer(b1Profile(n), { start: b1Start, title: "Two-slit line (simulated)" });
    return {
      nbformat: 4, nbformat_minor: 5,
      metadata: { widgets: { "application/vnd.jupyter.widget-state+json": widgetStateFromMessages(kernel.messages) } },
      cells: [{ cell_type: "code", execution_count: 1, metadata: {}, source: "explorer(profile).display();", outputs: [{
        output_type: "display_data", metadata: {},
        data: { "application/vnd.jupyter.widget-view+json": { version_major: 2, version_minor: 0, model_id: ex.widget.id }, "text/plain": "explorer" },
      }] }],
    };
  } finally {
    kernel.uninstall();
  }
}

/**
 * Load `file` in a new tab and return the time (ms after navigation start) of the last change to
 * the explorer's plot once it has been still for SETTLED_MS: the figure as the reader sees it,
 * including any redraw after the first (e.g. on the view's first resize).
 */
async function pageDrawnMs(browser: Browser, file: string): Promise<number> {
  const page = await browser.context.newPage();
  try {
    await page.addInitScript(`(() => {
      const state = window.__fkDrawn = { last: 0 };
      new MutationObserver((records) => {
        if (records.some((r) => r.target instanceof Element && r.target.closest(".fk-widget .js-plotly-plot"))) state.last = performance.now();
      }).observe(document, { subtree: true, childList: true, attributes: true });
    })();`);
    page.on("pageerror", (error) => process.stderr.write(`B4 page error: ${error.message}\n`));
    await page.goto(pathToFileURL(file).href);
    await page.waitForSelector(".fk-widget .js-plotly-plot .scatterlayer .trace", { state: "attached", timeout: 120_000 });
    for (;;) {
      const { last, now } = await page.evaluate("({ last: window.__fkDrawn.last, now: performance.now() })") as { last: number; now: number };
      if (now - last >= SETTLED_MS) return last;
      await page.waitForTimeout(SETTLED_MS - (now - last) + 20);
    }
  } finally {
    await page.close();
  }
}

const medianOf = (values: number[]) => quantile([...values].sort((a, b) => a - b), 0.5);
const megabytes = (bytes: number) => `${(bytes / 1e6).toFixed(2)} MB`;

/** Run B4 and print its summary line. */
export async function main(): Promise<void> {
  if (!hasChromium()) throw new Error("B4 needs Debian's chromium at /usr/bin/chromium (apt-get install chromium)");
  const harness = path.join(path.dirname(new URL(import.meta.url).pathname), "../test/widgets/harness/harness.ts");
  await buildWidgetBundles([{ entry: harness, out: "test-harness.js" }]);
  const dir = await mkdtemp(path.join(os.tmpdir(), "fringekit-b4-"));
  const browser = await launchBrowser(1280, 800);
  try {
    browser.page.on("pageerror", (error) => process.stderr.write(`B4 page error: ${error.message}\n`));
    const page = path.join(dir, "b4.html");
    const script = pathToFileURL(path.join(distDir, "test-harness.js")).href;
    await writeFile(page, `<!doctype html><meta charset="utf-8"><body style="margin:16px"><script src="${script}"></script></body>`);
    await browser.page.goto(pathToFileURL(page).href);
    await browser.page.waitForSelector("body[data-ready]", { state: "attached" });
    // Display to drawn figure: the first display (first use of plotly and the model), then
    // the median of further displays of fresh views of the same state.
    const displayOnce = async () => {
      const t0 = Date.now();
      const shown = await browser.page.evaluate(`fk.show("ExplorerModel", fk.b1State(${POINTS}))`) as string;
      await browser.page.waitForSelector(`#host-${shown} .js-plotly-plot .scatterlayer .trace`, { state: "attached" });
      return { shown, ms: Date.now() - t0 };
    };
    const first = await displayOnce();
    const id = first.shown;
    const displayMs = first.ms;
    const again: number[] = [];
    for (let k = 0; k < DISPLAYS; k++) {
      const { shown, ms } = await displayOnce();
      again.push(ms);
      await browser.page.evaluate(`(() => { const v = fk.views.get(${JSON.stringify(shown)}); v.remove(); document.getElementById("host-${shown}").remove(); })()`);
    }
    await browser.page.evaluate(`fk.measureSlider(${JSON.stringify(id)}, "separation", ${WARMUP})`);
    const times = (await browser.page.evaluate(`fk.measureSlider(${JSON.stringify(id)}, "separation", ${STEPS})`) as number[]).sort((a, b) => a - b);
    const reference = (await browser.page.evaluate(`fk.measurePlotlyAlone(${JSON.stringify(id)}, ${REFERENCE_STEPS})`) as number[]).sort((a, b) => a - b);
    const median = quantile(times, 0.5);
    const p95 = quantile(times, 0.95);
    const refMedian = quantile(reference, 0.5);
    process.stdout.write(`B4 display-to-drawn explorer ${displayMs} ms first, median ${medianOf(again).toFixed(0)} ms of ${DISPLAYS} more (test page, ${POINTS} points, includes view creation)\n`);
    process.stdout.write(`B4 plotly alone (precomputed curves): median ${refMedian.toFixed(2)} ms\n`);
    process.stdout.write(`B4 ratio median / frame budget ${(median / FRAME_BUDGET_MS).toPrecision(2)}, ` +
      `median / plotly alone ${(median / refMedian).toPrecision(2)}\n`);
    process.stdout.write(`B4 slider-to-redraw median ${median.toFixed(2)} ms, p95 ${p95.toFixed(2)} ms (${POINTS} points)\n`);
    await offlinePage(browser, dir);
  } finally {
    await browser.close();
    await rm(dir, { recursive: true, force: true });
  }
}

/** The offline-export lines: page size and load-to-drawn explorer, against a baseline renderer when given. */
async function offlinePage(browser: Browser, dir: string): Promise<void> {
  const notebook = explorerNotebook(POINTS);
  const pages: { label: string; file: string; bytes: number; times: number[] }[] = [];
  const baseline = process.env.FRINGEKIT_B4_BASELINE;
  const renderers: [string, string][] = [["this build", rendererBundlePath()], ...(baseline ? [["baseline", path.resolve(baseline)] as [string, string]] : [])];
  for (const [label, bundle] of renderers) {
    const html = notebookHtml(notebook, await readFile(bundle, "utf8"), "B4 explorer");
    const file = path.join(dir, `offline-${pages.length}.html`);
    await writeFile(file, html);
    pages.push({ label, file, bytes: Buffer.byteLength(html), times: [] });
  }
  for (let k = 0; k < PAGE_LOADS; k++) {
    for (const page of pages) page.times.push(await pageDrawnMs(browser, page.file));
  }
  for (const page of pages) {
    const sorted = [...page.times].sort((a, b) => a - b);
    process.stdout.write(`B4 offline HTML explorer drawn after page load (${page.label}): median ${medianOf(page.times).toFixed(0)} ms ` +
      `(${sorted[0]!.toFixed(0)}-${sorted.at(-1)!.toFixed(0)} over ${PAGE_LOADS} loads), page ${megabytes(page.bytes)} (${POINTS} points)\n`);
  }
  if (pages.length === 2) {
    process.stdout.write(`B4 offline draw ratio this build / baseline ${(medianOf(pages[0]!.times) / medianOf(pages[1]!.times)).toPrecision(2)}, ` +
      `page size ratio ${(pages[0]!.bytes / pages[1]!.bytes).toPrecision(2)}\n`);
  }
}
