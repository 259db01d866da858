// The package as a user gets it: `npm pack` of this folder, installed into a fresh folder
// outside the repository (its dependencies come from the npm registry, as for any user), then
// `fringekit kernel install` from there, a short notebook run by nbclient on that kernel, the
// command line, and the offline HTML export — all from the installed copy, none from the clone.
import { spawnSync, type SpawnSyncOptions } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { python, repoRoot } from "../kernel/helpers.js";

const here = path.dirname(fileURLToPath(import.meta.url));
const demoData = path.join(repoRoot, "notebooks-demo", "data");
// Truths the demo line was simulated with (notebooks-demo/data/truths.json, made by scripts/make-demo-data.ts).
const truths = JSON.parse(readFileSync(path.join(demoData, "truths.json"), "utf8")) as { lineA: { separation: number } };

interface PackEntry { path: string }
function packList(): string[] {
  const run = spawnSync("npm", ["pack", "--dry-run", "--json", "--ignore-scripts"], { cwd: repoRoot, encoding: "utf8" });
  if (run.status !== 0) throw new Error(`npm pack --dry-run failed:\n${run.stderr}`);
  return (JSON.parse(run.stdout)[0].files as PackEntry[]).map((f) => f.path);
}

describe("npm pack --dry-run (package.json \"files\")", () => {
  const why = !existsSync(path.join(repoRoot, "widgets/dist/fringekit-embed.js")) || !existsSync(path.join(repoRoot, "dist/cli/main.js"))
    ? "dist/ or widgets/dist/ is not built (npm run build)" : undefined;
  if (why) console.warn(`test/install: pack list skipped, ${why}`);

  it.skipIf(why)("lists the built code, the command, the widget bundles and the type declarations", () => {
    const files = packList();
    for (const needed of ["package.json", "README.md", "bin/fringekit.js", "dist/cli/main.js", "dist/cli/batchWorker.js",
      "dist/kernel-ext/launch.js", "dist/kernel-ext/install-cli.js", "dist/kernel-ext/widgets/fitWorker.js",
      "dist/src/index.js", "dist/src/index.d.ts", "dist/kernel-ext/widgets/index.d.ts",
      "widgets/dist/fringekit-embed.js", "widgets/dist/fringekit-widgets.js"]) {
      expect(files, needed).toContain(needed);
    }
    if (existsSync(path.join(repoRoot, "widgets/dist/labextension/package.json"))) {
      expect(files).toContain("widgets/dist/labextension/package.json");
    }
  });

  it.skipIf(why)("lists no tests, benchmarks, sources, scripts, demo data, CI files or local folders", () => {
    const files = packList();
    const stray = files.filter((f) => /^(test|bench|scripts|notebooks-demo|docs|out|\.ci|\.jupyter-local|node_modules|src|kernel-ext|cli|widgets\/src|widgets\/jupyterlab|widgets\/dist\/labextension-(src|core))\//.test(f)
      || /\.(map|tsbuildinfo)$/.test(f) || /^tsconfig|^vitest|^DEVELOPERS/.test(f));
    expect(stray).toEqual([]);
  });
});

const why = !existsSync(path.join(repoRoot, "dist/cli/main.js")) ? "dist/ is not built (npm run build)"
  : !existsSync(path.join(repoRoot, "widgets/dist/fringekit-embed.js")) ? "widgets/dist/ is not built (npm run build)"
  : spawnSync(python, ["-c", "import nbclient, nbformat, jupyter_client"]).status !== 0 ? "Debian's python3-nbclient is missing" : undefined;
if (why) console.warn(`test/install: tarball install skipped, ${why}`);

describe.skipIf(why)("npm install <tarball from npm pack> in a fresh folder, then fringekit kernel install", () => {
  let work = "";
  let project = "";
  let jupyterPrefix = "";
  const bin = () => path.join(project, "node_modules", ".bin", "fringekit");
  const run = (command: string, args: string[], options: SpawnSyncOptions = {}) => {
    const result = spawnSync(command, args, { cwd: project, encoding: "utf8", timeout: 300_000, ...options });
    return { status: result.status, stdout: String(result.stdout ?? ""), stderr: String(result.stderr ?? "") };
  };

  beforeAll(() => {
    work = realpathSync(mkdtempSync(path.join(os.tmpdir(), "fringekit-install-")));
    project = path.join(work, "my-notebooks");
    jupyterPrefix = path.join(work, "jupyter-prefix");
    mkdirSync(project);
    const pack = spawnSync("npm", ["pack", "--json", "--ignore-scripts", "--pack-destination", work], { cwd: repoRoot, encoding: "utf8" });
    if (pack.status !== 0) throw new Error(`npm pack failed:\n${pack.stderr}`);
    const tarball = path.join(work, JSON.parse(pack.stdout)[0].filename as string);
    writeFileSync(path.join(project, "package.json"), JSON.stringify({ name: "my-notebooks", private: true, type: "module" }, null, 2));
    const install = spawnSync("npm", ["install", "--no-audit", "--no-fund", "--prefer-offline", tarball], { cwd: project, encoding: "utf8", timeout: 480_000 });
    if (install.status !== 0) throw new Error(`npm install of the tarball failed:\n${install.stdout}\n${install.stderr}`);
    copyFileSync(path.join(demoData, "line-pair-A.csv"), path.join(project, "line-pair-A.csv"));
  }, 600_000);

  afterAll(() => {
    if (work) {
      rmSync(work, { recursive: true, force: true });
    }
  });

  it("fringekit kernel install --prefix DIR writes a kernelspec that runs the installed copy", () => {
    const result = run(bin(), ["kernel", "install", "--prefix", jupyterPrefix]);
    expect(result.status, result.stderr).toBe(0);
    const spec = JSON.parse(readFileSync(path.join(jupyterPrefix, "share/jupyter/kernels/fringekit/kernel.json"), "utf8")) as { argv: string[] };
    expect(spec.argv[1]).toBe(path.join(project, "node_modules/fringekit/dist/kernel-ext/launch.js"));
    expect(existsSync(spec.argv[1]!)).toBe(true);
  });

  it("fringekit fit line.csv --set wavelength=680nm --set distance=0.75m --json (installed command)", () => {
    const result = run(bin(), ["fit", "line-pair-A.csv", "--set", "wavelength=680nm", "--set", "distance=0.75m", "--json"]);
    expect(result.status, result.stderr).toBe(0);
    const fit = JSON.parse(result.stdout) as { converged: boolean; params: Record<string, { value: number }> };
    expect(fit.converged).toBe(true);
    // truth: notebooks-demo/data/truths.json (the demo line was simulated with d = 0.6 mm)
    expect(Math.abs(fit.params.separation!.value / truths.lineA.separation - 1)).toBeLessThan(0.01);
  });

  it("a notebook on the installed kernel imports fringekit and fringekit/widgets, fits and stores widget state; exportNotebookHtml works from the installed copy", () => {
    const cells = [
      'import { readFileSync } from "node:fs";\nimport { readProfile, getModel, fitProfile } from "fringekit";\n' +
      'const { profile } = readProfile(readFileSync("line-pair-A.csv"), { source: "line-pair-A.csv" });\n' +
      'const fit = fitProfile(profile, getModel("two-slit"), { fix: { wavelength: 680e-9, distance: 0.75 } });\n' +
      'console.log("separation", fit.parameters.find((p) => p.name === "separation").value);',
      'import { explorer } from "fringekit/widgets";\nconst ex = explorer(profile, { model: "two-slit", start: { wavelength: 680e-9, distance: 0.75 } });\nex.display();',
    ];
    const notebook = {
      nbformat: 4, nbformat_minor: 5,
      metadata: { kernelspec: { name: "fringekit", display_name: "TypeScript (fringekit)", language: "typescript" } },
      cells: cells.map((source) => ({ cell_type: "code", metadata: {}, source, outputs: [], execution_count: null })),
    };
    writeFileSync(path.join(project, "check.ipynb"), JSON.stringify(notebook));
    const executed = run(python, [path.join(here, "py/runNotebook.py"), "check.ipynb", "check.out.ipynb", project], {
      env: { ...process.env, JUPYTER_PATH: path.join(jupyterPrefix, "share/jupyter") },
    });
    expect(executed.status, `${executed.stdout}\n${executed.stderr}`).toBe(0);
    const out = JSON.parse(readFileSync(path.join(project, "check.out.ipynb"), "utf8"));
    const outputs = (out.cells as { outputs: Record<string, any>[] }[]).flatMap((c) => c.outputs);
    expect(outputs.filter((o) => o.output_type === "error")).toEqual([]);
    const printed = outputs.filter((o) => o.output_type === "stream").map((o) => [].concat(o.text).join("")).join("");
    const separation = Number(/separation (\S+)/.exec(printed)?.[1]);
    expect(Math.abs(separation / truths.lineA.separation - 1)).toBeLessThan(0.01); // truths.json, as above
    const state = out.metadata.widgets["application/vnd.jupyter.widget-state+json"].state as Record<string, { model_name: string }>;
    expect(Object.values(state).some((m) => m.model_name === "ExplorerModel")).toBe(true);

    writeFileSync(path.join(project, "export.mjs"), 'import { exportNotebookHtml } from "fringekit/widgets";\nawait exportNotebookHtml("check.out.ipynb", "check.html");\n');
    const exported = run(process.execPath, ["export.mjs"]);
    expect(exported.status, exported.stderr).toBe(0);
    const html = readFileSync(path.join(project, "check.html"), "utf8");
    expect(html).toContain('id="fringekit-widget-renderer"');
    expect(html).toContain("application/vnd.jupyter.widget-view+json");
  }, 400_000);
});
