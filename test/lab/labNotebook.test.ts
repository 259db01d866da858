// A real JupyterLab notebook in headless Chromium: JupyterLab's notebook component and widget
// manager (built from npm by test/lab/buildPage.ts, no Python JupyterLab needed) with fringekit's
// prebuilt lab extension loaded as JupyterLab loads it, on Debian's jupyter-server running the
// fringekit kernel. A notebook on the demo data is opened, run with "Run All", and its four
// widgets are checked; a keyboard slider move redraws; Fit updates the view and `ex.result` in
// the kernel; the saved notebook, opened again, restores the widgets from its saved state. Then
// the demo notebook 01-first-fit.ipynb runs the same way.
import { spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildLabExtension, labExtensionDir } from "../../widgets/build.js";
import { MODULE_NAME } from "../../widgets/src/version.js";
import { python, repoRoot } from "../kernel/helpers.js";
import { hasChromium, launchBrowser, type Browser } from "../widgets/browser.js";
import { startJupyterServer, stopTestServers, type TestJupyter } from "../widgets/jupyterServer.js";
import { buildLabPage } from "./buildPage.js";

const outputDir = path.join(repoRoot, "test/lab/__output__");
const why = !hasChromium() ? "/usr/bin/chromium is not installed"
  : !existsSync(path.join(repoRoot, "dist/kernel-ext/widgets/index.js")) ? "dist/ is not built (npm run build)"
  : spawnSync(python, ["-c", "import jupyter_server"]).status !== 0 ? "Debian's python3-jupyter-server is not installed" : undefined;
if (why) console.warn(`test/lab/labNotebook: skipped, ${why}`);

// The notebook: the demo data, the four widgets (simulated data; notebooks-demo/data/README.md).
const cells = [
  '// Laser safety: this notebook only reads recorded (here simulated) data.\nimport { readFileSync, readdirSync } from "node:fs";\n' +
  'import { readProfile, getModel, fitProfile, coherenceScanProfile } from "fringekit";\n' +
  'const bench = { wavelength: 680e-9, distance: 0.750, pixelWidth: 5.5e-6 };\n' +
  'const { profile } = readProfile(readFileSync("data/line-pair-A.csv"), { source: "line-pair-A.csv" });',
  'import { explorer } from "fringekit/widgets";\nconst ex = explorer(profile, { model: "two-slit", start: { ...bench, separation: 0.60e-3, width: 0.06e-3 }, fixed: ["wavelength", "distance", "pixelWidth"] });\nex.display();',
  'import { comparison } from "fringekit/widgets";\nconst mono = fitProfile(profile, getModel("two-slit"), { fix: bench });\nconst broad = fitProfile(profile, getModel("two-slit-broadband"), { fix: bench });\n' +
  'comparison(profile, [{ label: "monochromatic", result: mono }, { label: "Gaussian spectrum", result: broad }]).display();',
  'import { uncertainty } from "fringekit/widgets";\nuncertainty(mono, profile, getModel("two-slit"), { names: ["visibility"], points: 7 }).display();',
  'import { coherenceScan } from "fringekit/widgets";\n' +
  'const lines = readdirSync("data/scan").filter((n) => n.endsWith(".csv")).sort().map((n) => fitProfile(readProfile(readFileSync(`data/scan/${n}`), { source: n }).profile, getModel("two-slit"), { fix: bench }));\n' +
  'const get = (f, name) => f.parameters.find((p) => p.name === name);\n' +
  'const scan = coherenceScanProfile(lines.map((f) => get(f, "separation").value), lines.map((f) => get(f, "visibility").value), lines.map((f) => get(f, "visibility").uncertainty));\n' +
  'const discModel = getModel("coherence-disc");\nconst disc = fitProfile(scan, discModel, { fix: { wavelength: 680e-9, sourceDistance: 0.40 }, start: { visibility: 0.9, diameter: 0.1e-3 } });\n' +
  'coherenceScan(scan, disc, discModel, { sourceLabel: "uniform disc" }).display();',
];

type Manifest = { jupyterlab: { _build?: { load: string } } };
function readManifest(dir: string): Manifest | null {
  try {
    return JSON.parse(readFileSync(path.join(dir, "package.json"), "utf8")) as Manifest;
  } catch {
    return null;
  }
}
/** A finished build: the manifest names its remote entry (written last) and that file exists. */
function complete(dir: string): boolean {
  const load = readManifest(dir)?.jupyterlab._build?.load;
  return load !== undefined && existsSync(path.join(dir, load));
}

/**
 * A private copy of the prebuilt extension (widgets/dist/labextension). test/widgets/labExtension
 * rebuilds that folder in its own beforeAll (deleting it first), possibly while this test runs, so
 * this test serves a copy. `npm test` builds it beforehand (`npm run build:lab`); under npm test
 * a missing or half-written folder means the other test is rebuilding it: wait for it. Run alone,
 * this test builds it when it is missing.
 */
async function snapshotLabExtension(dest: string): Promise<string> {
  if (!complete(labExtensionDir) && process.env.npm_lifecycle_event !== "test") await buildLabExtension();
  const deadline = Date.now() + 15 * 60_000;
  for (;;) {
    if (complete(labExtensionDir)) {
      rmSync(dest, { recursive: true, force: true });
      try {
        cpSync(labExtensionDir, dest, { recursive: true });
      } catch {
        // deleted while copying: a rebuild started; wait for it
      }
      if (complete(dest)) return dest;
    }
    if (Date.now() > deadline) throw new Error(`no finished JupyterLab extension in ${labExtensionDir} after 15 minutes; build it with npm run build:lab`);
    await new Promise((r) => setTimeout(r, 2000));
  }
}

describe.skipIf(why)("JupyterLab notebook component + jupyterlab-manager + fringekit's prebuilt extension", () => {
  let pageServer: Server | null = null;
  let jupyter: TestJupyter | null = null;
  let browser: Browser | null = null;
  let tmp = "";
  let pageOrigin = "";
  let extensionDir = "";
  const pageErrors: string[] = [];

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "fringekit-lab-"));
    const root = path.join(tmp, "root");
    mkdirSync(root);
    cpSync(path.join(repoRoot, "notebooks-demo/data"), path.join(root, "data"), { recursive: true });
    cpSync(path.join(repoRoot, "notebooks-demo/01-first-fit.ipynb"), path.join(root, "01-first-fit.ipynb"));
    // fringekit as an installed dependency of the notebook folder.
    mkdirSync(path.join(root, "node_modules"));
    symlinkSync(repoRoot, path.join(root, "node_modules", "fringekit"), "dir");
    writeFileSync(path.join(root, "widgets.ipynb"), JSON.stringify({
      nbformat: 4, nbformat_minor: 5,
      metadata: { kernelspec: { name: "fringekit", display_name: "TypeScript (fringekit)", language: "typescript" } },
      cells: cells.map((source) => ({ cell_type: "code", metadata: {}, source, outputs: [], execution_count: null })),
    }));
    extensionDir = await snapshotLabExtension(path.join(tmp, "labextension"));
    const manifest = readManifest(extensionDir)!;
    const page = await buildLabPage(path.join(tmp, "page"));

    pageServer = createServer((req, res) => {
      const url = new URL(req.url ?? "/", "http://x");
      if (url.pathname === "/") {
        res.writeHead(200, { "content-type": "text/html; charset=utf-8" }).end(`<!doctype html><html><head><meta charset="utf-8"><title>fringekit in a JupyterLab notebook</title>` +
          `<link rel="stylesheet" href="/page.css"><style>body{margin:0;font-family:sans-serif} #notebook{position:absolute;inset:0;overflow:auto}</style></head>` +
          `<body><div id="notebook"></div><script src="/page.js"></script></body></html>`);
        return;
      }
      if (url.pathname === "/page.js" || url.pathname === "/page.css") {
        res.writeHead(200, { "content-type": url.pathname.endsWith(".js") ? "text/javascript" : "text/css" }).end(readFileSync(url.pathname.endsWith(".js") ? page.script : page.css));
        return;
      }
      const file = path.join(extensionDir, path.normalize(url.pathname.replace(/^\/ext\//, "/")).replace(/^([/\\])+/, ""));
      if (!url.pathname.startsWith("/ext/") || !file.startsWith(extensionDir) || !existsSync(file)) {
        res.writeHead(404).end();
        return;
      }
      res.writeHead(200, { "content-type": "text/javascript" }).end(readFileSync(file));
    });
    await new Promise<void>((resolve) => pageServer!.listen(0, "127.0.0.1", resolve));
    pageOrigin = `http://127.0.0.1:${(pageServer.address() as AddressInfo).port}`;

    jupyter = await startJupyterServer({ root, tmp, allowOrigin: pageOrigin });
    const { baseUrl, token } = jupyter;

    browser = await launchBrowser(1280, 1000);
    browser.page.on("pageerror", (e) => pageErrors.push(e.message));
    await browser.page.goto(`${pageOrigin}/?token=${token}&server=${encodeURIComponent(baseUrl)}&ext=${encodeURIComponent(`${pageOrigin}/ext/${manifest.jupyterlab._build!.load}`)}`);
    await browser.page.waitForSelector("body[data-ready]", { state: "attached" });
  }, 900_000);

  afterAll(async () => {
    try {
      await browser?.page.evaluate("labTest.close()").catch(() => undefined);
      await browser?.close();
    } finally {
      await stopTestServers({ jupyter, pageServer, tmp });
    }
  });

  it("Run All renders the explorer, comparison, uncertainty and coherence-scan widgets; slider, Fit, ex.result; reopening restores the state", async () => {
    const page = browser!.page;
    const ext = new URL(page.url()).searchParams.get("ext")!;
    await page.evaluate(`labTest.open("widgets.ipynb", ${JSON.stringify({ name: MODULE_NAME, remoteEntry: ext })})`);
    const ran = await page.evaluate("labTest.runAll()");
    mkdirSync(outputDir, { recursive: true });
    await page.screenshot({ path: path.join(outputDir, "lab-run-all.png"), fullPage: true });
    const report = await page.evaluate("labTest.cellReport()") as { count: number | null; errors: string[] }[];
    expect(report.flatMap((c, i) => c.errors.map((e) => `cell ${i + 1}: ${e}`)), `page errors: ${pageErrors.join("; ")}`).toEqual([]);
    expect(ran, `Run All reported a failing cell; page errors: ${pageErrors.join("; ")}`).toBe(true);
    // Each fringekit widget draws a plotly plot inside JupyterLab's widget output.
    await page.waitForFunction(() => document.querySelectorAll(".jp-OutputArea-output .fk-root .js-plotly-plot .main-svg").length >= 4, undefined, { timeout: 180_000 });
    const kinds = await page.evaluate(() => [...document.querySelectorAll(".jp-OutputArea-output .fk-root")].map((e) => (e as HTMLElement).dataset.widget ?? e.className));
    await page.screenshot({ path: path.join(outputDir, "lab-run-all.png"), fullPage: true });
    const roots = page.locator(".jp-OutputArea-output .fk-root");
    for (let i = 0; i < (await roots.count()); i++) await roots.nth(i).screenshot({ path: path.join(outputDir, `lab-widget-${i + 1}.png`) });
    expect(kinds.length).toBeGreaterThanOrEqual(4);

    // Keyboard slider move: the explorer's model curve is redrawn (overlay canvas changes).
    const host = ".jp-OutputArea-output .fk-root:has(input[type=range][data-param=separation])";
    const canvas = `document.querySelector(${JSON.stringify(`${host} canvas.fk-overlay`)}).toDataURL()`;
    const before = await page.evaluate(canvas);
    const slider = page.locator(`${host} input[type=range][data-param="separation"]`).first();
    await slider.focus();
    for (let k = 0; k < 5; k++) await slider.press("ArrowRight");
    await page.waitForTimeout(300);
    expect(await page.evaluate(canvas)).not.toBe(before);

    // Fit from the view: done in the view, and the same result in the kernel as ex.result.
    await page.click(`${host} button[data-action=fit]`);
    await page.waitForSelector(`${host}[data-fit-state=done]`, { timeout: 180_000 });
    expect(await page.textContent(`${host} [data-region=result]`)).toContain("converged");
    await page.screenshot({ path: path.join(outputDir, "lab-explorer-fitted.png"), fullPage: true });
    const printed = await page.evaluate('labTest.evaluate("console.log(JSON.stringify({ converged: ex.result.converged, separation: ex.result.parameters.find((p) => p.name === \\"separation\\").value }))")') as string;
    const kernelResult = JSON.parse(printed.trim().split("\n").at(-1)!) as { converged: boolean; separation: number };
    expect(kernelResult.converged).toBe(true);
    // notebooks-demo/data/truths.json: the line was simulated with d = 0.6 mm
    expect(Math.abs(kernelResult.separation / 0.6e-3 - 1)).toBeLessThan(0.01);

    // Save (the widget manager writes the widget state into the notebook), close, reopen.
    await page.evaluate("labTest.save()");
    const saved = JSON.parse(readFileSync(path.join(tmp, "root/widgets.ipynb"), "utf8"));
    const state = saved.metadata.widgets["application/vnd.jupyter.widget-state+json"].state as Record<string, { model_name: string }>;
    expect(Object.values(state).map((m) => m.model_name)).toEqual(expect.arrayContaining(["ExplorerModel", "ComparisonModel", "UncertaintyModel", "CoherenceScanModel"]));
    await page.evaluate("labTest.close()");
    await page.evaluate(`labTest.open("widgets.ipynb", ${JSON.stringify({ name: MODULE_NAME, remoteEntry: ext })})`);
    await page.waitForFunction(() => document.querySelectorAll(".jp-OutputArea-output .fk-root .js-plotly-plot .main-svg").length >= 4, undefined, { timeout: 120_000 });
    await page.waitForSelector(`${host}[data-fit-state=done]`, { timeout: 60_000 });
    await page.screenshot({ path: path.join(outputDir, "lab-reopened.png"), fullPage: true });
    expect(pageErrors).toEqual([]);
  }, 900_000);

  it("the demo notebook 01-first-fit.ipynb runs with Run All; its explorer and uncertainty widgets draw", async () => {
    const page = browser!.page;
    const ext = new URL(page.url()).searchParams.get("ext")!;
    await page.evaluate("labTest.close()");
    await page.evaluate(`labTest.open("01-first-fit.ipynb", ${JSON.stringify({ name: MODULE_NAME, remoteEntry: ext })})`);
    const ran = await page.evaluate("labTest.runAll()");
    const report = await page.evaluate("labTest.cellReport()") as { count: number | null; errors: string[] }[];
    expect(report.flatMap((c, i) => c.errors.map((e) => `code cell ${i + 1}: ${e}`))).toEqual([]);
    expect(ran).toBe(true);
    // The notebook's last cell asserts its results against the simulation's truths (it would raise above).
    await page.waitForFunction(() => document.querySelectorAll(".jp-OutputArea-output .fk-root .js-plotly-plot .main-svg").length >= 2, undefined, { timeout: 180_000 });
    const roots = page.locator(".jp-OutputArea-output .fk-root");
    for (let i = 0; i < (await roots.count()); i++) await roots.nth(i).screenshot({ path: path.join(outputDir, `lab-demo-widget-${i + 1}.png`) });
    expect(pageErrors).toEqual([]);
  }, 900_000);
});
