// A notebook executed by Debian's nbclient on the fringekit kernel: the widget state nbclient
// stores validates against @jupyter-widgets/schema v2, and the offline export of that notebook
// renders the widgets and fits in the page.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { Ajv } from "ajv";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { exportNotebookHtml } from "../../kernel-ext/widgets/exportHtml.js";
import { buildWidgetBundles } from "../../widgets/build.js";
import { installTempKernel, python, repoRoot, type KernelPrefix } from "../kernel/helpers.js";
import { hasChromium, launchBrowser } from "./browser.js";

const here = path.dirname(fileURLToPath(import.meta.url));
const require = createRequire(import.meta.url);
const why = !hasChromium() ? "no /usr/bin/chromium"
  : !existsSync(path.join(repoRoot, "dist/kernel-ext/widgets/index.js")) ? "dist/ is not built (npm run build)"
  : spawnSync(python, ["-c", "import nbclient, nbformat"]).status !== 0 ? "Debian's python3-nbclient is missing" : undefined;
if (why) console.warn(`test/widgets/executedNotebook: skipped, ${why}`);
const run = why ? describe.skip : describe;

const cells = [
  'import { getModel, paramVector, pixelPositions, simulateProfile, fitProfile } from "fringekit";\n' +
  'import { explorer, comparison } from "./dist/kernel-ext/widgets/index.js";\n' +
  "// B1-like line (invented scenario): 1024 pixels of 22 µm, Poisson counts\n" +
  'const model = getModel("two-slit");\n' +
  "const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };\n" +
  'const profile = simulateProfile(model, paramVector(model, truth), pixelPositions(1024, 22e-6), { noise: "poisson", seed: 8 });',
  "const ex = explorer(profile, { start: { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 } });\nex.display();",
  "const fitted = await ex.fit();\nconsole.log(fitted.converged, fitted.parameters.find((p) => p.name === \"separation\").value);",
  'const coherent = fitProfile(profile, model, { start: truth, fix: { visibility: 1 } });\ncomparison(profile, [{ label: "V free", result: fitted }, { label: "V = 1", result: coherent }]).display();',
];

run("nbclient-executed notebook with fringekit widgets", () => {
  let kernel: KernelPrefix | null = null;
  let dir = "";
  let executed: Record<string, any>;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(os.tmpdir(), "fringekit-nb-"));
    kernel = installTempKernel();
    await buildWidgetBundles();
    const notebook = {
      nbformat: 4, nbformat_minor: 5,
      metadata: { kernelspec: { name: "fringekit", display_name: "TypeScript (fringekit)", language: "typescript" } },
      cells: cells.map((source) => ({ cell_type: "code", metadata: {}, source, outputs: [], execution_count: null })),
    };
    writeFileSync(path.join(dir, "in.ipynb"), JSON.stringify(notebook));
    const result = spawnSync(python, [path.join(here, "py/executeNotebook.py"), path.join(dir, "in.ipynb"), path.join(dir, "out.ipynb"), repoRoot], {
      encoding: "utf8", timeout: 300_000, env: { ...process.env, JUPYTER_PATH: kernel.jupyterPath },
    });
    if (result.status !== 0) throw new Error(`nbclient failed:\n${result.stdout}\n${result.stderr}`);
    executed = JSON.parse(readFileSync(path.join(dir, "out.ipynb"), "utf8"));
  }, 600_000);

  afterAll(() => {
    kernel?.dispose();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it("the stored widget state validates against @jupyter-widgets/schema v2 and holds the fit", () => {
    const state = executed.metadata.widgets["application/vnd.jupyter.widget-state+json"];
    const schema = JSON.parse(readFileSync(require.resolve("@jupyter-widgets/schema/v2/state.schema.json"), "utf8"));
    const validate = new Ajv({ strict: false }).compile(schema);
    expect(validate(state), JSON.stringify(validate.errors)).toBe(true);
    const models = Object.values(state.state) as { model_name: string; state: Record<string, any> }[];
    const explorerModel = models.find((m) => m.model_name === "ExplorerModel")!;
    expect(explorerModel.state.fit_state).toBe("done");
    expect(explorerModel.state.result.converged).toBe(true);
    expect(models.some((m) => m.model_name === "ComparisonModel")).toBe(true);
  });

  it("exportNotebookHtml renders both widgets offline and the explorer fits in the page", async () => {
    await exportNotebookHtml(path.join(dir, "out.ipynb"), path.join(dir, "out.html"));
    const browser = await launchBrowser();
    try {
      const external: string[] = [];
      await browser.context.route("**/*", (route) => {
        const url = route.request().url();
        if (/^(file|blob|data):/.test(url)) return route.continue();
        external.push(url);
        return route.abort();
      });
      await browser.page.goto(pathToFileURL(path.join(dir, "out.html")).href);
      await browser.page.waitForSelector("body[data-widgets-rendered='2']", { state: "attached", timeout: 90_000 });
      // The saved state already says "done" (the kernel fitted): record the page's own run.
      await browser.page.evaluate(`(() => { const root = document.querySelector(".fk-root[data-fit-state]"); window.__states = [];
        new MutationObserver(() => window.__states.push(root.dataset.fitState)).observe(root, { attributes: true, attributeFilter: ["data-fit-state"] }); })()`);
      await browser.page.click("button[data-action=fit]");
      // A function, not a string: the page's Content-Security-Policy refuses eval of strings.
      await browser.page.waitForFunction(() => { const states = (globalThis as unknown as { __states: string[] }).__states; return states.includes("running") && states.at(-1) === "done"; }, undefined, { timeout: 90_000 });
      expect(await browser.page.textContent("[data-region=result]")).toContain("converged");
      expect(external).toEqual([]);
    } finally {
      await browser.close();
    }
  });
});
