// End to end: Debian's jupyter-server running the fringekit kernel, a page with
// @jupyterlab/services and the ipywidgets HTML manager in headless Chromium. Cells create the
// explorer; the test sees it render, moves a slider, presses Fit and reads the result from a cell.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildWidgetBundles, distDir } from "../../widgets/build.js";
import { python, repoRoot } from "../kernel/helpers.js";
import { hasChromium, launchBrowser, type Browser } from "./browser.js";
import { startJupyterServer, stopTestServers, type TestJupyter } from "./jupyterServer.js";

const here = path.dirname(fileURLToPath(import.meta.url));
const outputDir = path.join(here, "__output__");

function missing(): string | undefined {
  if (!hasChromium()) return "/usr/bin/chromium is not installed (apt-get install chromium)";
  if (!existsSync(path.join(repoRoot, "dist/kernel-ext/widgets/index.js"))) return "dist/ is not built (npm run build)";
  if (!existsSync(python) || spawnSync(python, ["-c", "import jupyter_server"]).status !== 0) return "Debian's python3-jupyter-server is not installed";
  return undefined;
}

const why = missing();
if (why) console.warn(`test/widgets/live: skipped, ${why}`);
const run = why ? describe.skip : describe;

run("live notebook: explorer in a real kernel and browser", () => {
  let pageServer: Server | null = null;
  let jupyter: TestJupyter | null = null;
  let browser: Browser | null = null;
  let tmp = "";
  const pageErrors: string[] = [];

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "fringekit-live-"));
    await buildWidgetBundles([{ entry: path.join(here, "harness/live.ts"), out: "test-live.js" }]);
    const script = readFileSync(path.join(distDir, "test-live.js"));
    pageServer = createServer((req, res) => {
      if (req.url === "/live.js") {
        res.writeHead(200, { "content-type": "text/javascript" }).end(script);
      } else {
        res.writeHead(200, { "content-type": "text/html; charset=utf-8" })
          .end(`<!doctype html><html><head><meta charset="utf-8"><title>fringekit live</title></head><body style="margin:16px;font-family:sans-serif"><script src="/live.js"></script></body></html>`);
      }
    });
    await new Promise<void>((resolve) => pageServer!.listen(0, "127.0.0.1", resolve));
    const pageOrigin = `http://127.0.0.1:${(pageServer.address() as AddressInfo).port}`;

    jupyter = await startJupyterServer({ root: repoRoot, tmp, allowOrigin: pageOrigin });
    const { baseUrl, token } = jupyter;

    browser = await launchBrowser(1280, 800);
    browser.page.on("pageerror", (e) => pageErrors.push(e.message));
    await browser.page.goto(pageOrigin);
    await browser.page.waitForSelector("body[data-ready]", { state: "attached" });
    await browser.page.evaluate(`live.connect(${JSON.stringify(baseUrl)}, ${JSON.stringify(token)}, "fringekit")`);
  });

  afterAll(async () => {
    try {
      await browser?.page.evaluate("live.shutdown()").catch(() => undefined);
      await browser?.close();
    } finally {
      await stopTestServers({ jupyter, pageServer, tmp });
    }
  });

  it("cells create the explorer; slider, Fit and explorer.result work across kernel and browser", async () => {
    const page = browser!.page;
    const cell = (code: string) => page.evaluate(`live.run(${JSON.stringify(code)})`) as Promise<{ status: string; text: string[]; error: string | null; widgets: string[] }>;
    const first = await cell([
      'import { getModel, paramVector, pixelPositions, simulateProfile } from "fringekit";',
      'import { explorer } from "./dist/kernel-ext/widgets/index.js";',
      "// B1-like line (../shared/bench/PROBLEMS.md), 2048 pixels of 11 µm",
      'const model = getModel("two-slit");',
      "const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };",
      "const profile = simulateProfile(model, paramVector(model, truth), pixelPositions(2048, 11e-6), { noise: \"poisson\", seed: 4 });",
      "const ex = explorer(profile, { start: { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 } });",
      "ex.display();",
    ].join("\n"));
    expect(first.error, first.text.join("")).toBeNull();
    expect(first.widgets).toHaveLength(1);
    const host = `#view-${first.widgets[0]}`;
    await page.waitForSelector(`${host} .js-plotly-plot .main-svg`, { state: "attached" });
    mkdirSync(outputDir, { recursive: true });
    await page.screenshot({ path: path.join(outputDir, "live-explorer.png"), fullPage: true });

    // Slider: keyboard moves recompute the curve in the browser (canvas changes, no kernel round trip).
    const canvas = `document.querySelector(${JSON.stringify(`${host} canvas.fk-overlay`)}).toDataURL()`;
    const before = await page.evaluate(canvas);
    const slider = page.locator(`${host} input[type=range][data-param="separation"]`);
    await slider.focus();
    for (let k = 0; k < 5; k++) await slider.press("ArrowRight");
    await page.waitForTimeout(200);
    expect(await page.evaluate(canvas)).not.toBe(before);
    const moved = await cell("ex.params.separation");
    // The kernel saw the settled slider value (5 key presses of 0.2 % each on 0.497 mm).
    expect(Number(moved.text.at(-1))).toBeCloseTo(0.497e-3 * 1.002 ** 5, 9);

    // Fit: the kernel fits and the result arrives in the page.
    await page.click(`${host} button[data-action=fit]`);
    await page.waitForSelector(`${host} .fk-root[data-fit-state=done]`, { timeout: 120_000 });
    const shown = await page.textContent(`${host} [data-region=result]`);
    expect(shown).toContain("converged");
    await page.screenshot({ path: path.join(outputDir, "live-explorer-fitted.png"), fullPage: true });

    // The same result is readable from cell code.
    const read = await cell('const s = ex.result.parameters.find((p) => p.name === "separation");\nconsole.log(JSON.stringify({ converged: ex.result.converged, separation: s.value, uncertainty: s.uncertainty }));');
    const kernelResult = JSON.parse(read.text.join("").trim().split("\n").at(-1)!) as { converged: boolean; separation: number; uncertainty: number };
    expect(kernelResult.converged).toBe(true);
    // Simulation truth within 3 standard errors (B1 acceptance).
    expect(Math.abs(kernelResult.separation - 0.5e-3)).toBeLessThan(3 * kernelResult.uncertainty);
    const browserSeparation = await page.evaluate(`live.views.find((v) => v.el.closest(${JSON.stringify(host)})).model.get("result").params.separation.value`);
    expect(browserSeparation).toBe(kernelResult.separation);
    expect(pageErrors).toEqual([]);
  });
});
