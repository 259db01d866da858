/**
 * B4 (../shared/bench/PROBLEMS.md): in the profile explorer, one slider moved continuously over
 * an 8192-point B1-like profile in headless Chromium; time from each input event to the redrawn
 * model curve. Reported against the 16.7 ms frame budget (60 frames per second) and against
 * plotly redrawing the same traces with precomputed curves, measured in the same run.
 */
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { buildWidgetBundles, distDir } from "../widgets/build.js";
import { hasChromium, launchBrowser } from "../test/widgets/browser.js";

const POINTS = 8192;
const WARMUP = 20;
const STEPS = 200;
const REFERENCE_STEPS = 10;
const FRAME_BUDGET_MS = 1000 / 60;

function quantile(sorted: number[], q: number): number {
  const i = (sorted.length - 1) * q;
  const lo = Math.floor(i);
  return sorted[lo]! + (sorted[Math.ceil(i)]! - sorted[lo]!) * (i - lo);
}

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
    const t0 = Date.now();
    const id = await browser.page.evaluate(`fk.show("ExplorerModel", fk.b1State(${POINTS}))`) as string;
    await browser.page.waitForSelector(".js-plotly-plot .scatterlayer .trace", { state: "attached" });
    const displayMs = Date.now() - t0;
    await browser.page.evaluate(`fk.measureSlider(${JSON.stringify(id)}, "separation", ${WARMUP})`);
    const times = (await browser.page.evaluate(`fk.measureSlider(${JSON.stringify(id)}, "separation", ${STEPS})`) as number[]).sort((a, b) => a - b);
    const reference = (await browser.page.evaluate(`fk.measurePlotlyAlone(${JSON.stringify(id)}, ${REFERENCE_STEPS})`) as number[]).sort((a, b) => a - b);
    const median = quantile(times, 0.5);
    const p95 = quantile(times, 0.95);
    const refMedian = quantile(reference, 0.5);
    process.stdout.write(`B4 display-to-drawn explorer ${displayMs} ms (8192 points, includes view creation)\n`);
    process.stdout.write(`B4 plotly alone (precomputed curves): median ${refMedian.toFixed(2)} ms\n`);
    process.stdout.write(`B4 ratio median / frame budget ${(median / FRAME_BUDGET_MS).toPrecision(2)}, ` +
      `median / plotly alone ${(median / refMedian).toPrecision(2)}\n`);
    process.stdout.write(`B4 slider-to-redraw median ${median.toFixed(2)} ms, p95 ${p95.toFixed(2)} ms (${POINTS} points)\n`);
  } finally {
    await browser.close();
    await rm(dir, { recursive: true, force: true });
  }
}
