#!/usr/bin/env node
// The main job on the bundled demo data: installs what is missing, executes the demo
// notebooks headlessly with the fringekit kernel, and writes everything to out/.
// Plain JavaScript on purpose: it must run before `npm ci` has installed TypeScript tools.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { dirname, join, relative } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const out = join(root, "out");
const jupyterData = join(root, ".jupyter-local");
const python = "/usr/bin/python3";
// The figures are drawn without a browser, in Liberation Sans (embedded in the PDFs).
const font = "/usr/share/fonts/truetype/liberation/LiberationSans-Regular.ttf";
// Debian packages: nbclient runs the notebooks, fonts-liberation gives the figures their font.
// nbconvert is optional: only the fallback HTML copies need it.
const debianPackages = ["python3-nbclient", "python3-nbformat", "python3-jupyter-client", "fonts-liberation"];
const outputFolders = ["notebooks", "html", "figures", "results"];
const steps = 6;
let step = 0;
const started = Date.now();

function say(text) {
  process.stdout.write(`${text}\n`);
}
function seconds() {
  return `${((Date.now() - started) / 1000).toFixed(0)} s`;
}
function stage(text) {
  step += 1;
  say(`[${step}/${steps}] ${text} (${seconds()})`);
}
function fail(text) {
  process.stderr.write(`demo: ${text}\n`);
  process.exit(2);
}
function run(command, args, options = {}) {
  const result = spawnSync(command, args, { cwd: root, stdio: "inherit", ...options });
  if (result.error) fail(`could not run ${command}: ${result.error.message}`);
  return result.status ?? 1;
}
/** Newest modification time (ms) of the files under `folder` (0 when it does not exist). */
function newestIn(folder) {
  if (!existsSync(folder)) return 0;
  let newest = 0;
  for (const entry of readdirSync(folder, { withFileTypes: true })) {
    const path = join(folder, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestIn(path) : statSync(path).mtimeMs);
  }
  return newest;
}

const major = Number(process.versions.node.split(".")[0]);
if (major < 20) fail(`Node ${process.versions.node} is too old; fringekit needs Node 20 or newer`);

stage("npm packages");
const installedLock = join(root, "node_modules", ".package-lock.json");
if (!existsSync(installedLock) || statSync(installedLock).mtimeMs < statSync(join(root, "package-lock.json")).mtimeMs) {
  say("  node_modules is missing or older than package-lock.json: npm ci");
  if (run("npm", ["ci", "--no-audit", "--no-fund"]) !== 0) fail("npm ci failed (see above)");
} else {
  say("  node_modules is up to date");
}

stage("Jupyter (nbclient, nbformat, jupyter_client) and the figure font");
const probeJupyter = () => spawnSync(python, ["-c", "import nbclient, nbformat, jupyter_client"], { stdio: "ignore" }).status === 0;
const ready = () => existsSync(python) && probeJupyter() && (existsSync(font) || Boolean(process.env.FRINGEKIT_FONT_DIR));
if (!ready()) {
  const canInstall = process.getuid?.() === 0 && existsSync("/usr/bin/apt-get");
  if (!canInstall) {
    fail(`missing: ${[!existsSync(python) || !probeJupyter() ? `Python packages for ${python}` : "", !existsSync(font) ? font : ""].filter(Boolean).join(" and ")}.\n` +
      `Install them with\n  sudo apt-get install -y ${debianPackages.join(" ")}\n` +
      `(or, for ${python}, the pip packages nbclient nbformat jupyter_client) and run npm run demo again`);
  }
  say(`  installing ${debianPackages.join(" ")}`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  run("apt-get", ["update", "-qq"], { env });
  if (run("apt-get", ["install", "-y", "-qq", "--no-install-recommends", ...debianPackages], { env }) !== 0 || !ready()) {
    fail("installing the Jupyter packages or fonts-liberation failed (see above)");
  }
} else {
  say("  found");
}

stage("build");
const built = join(root, "dist", "kernel-ext", "launch.js");
const sourcesChanged = Math.max(...["src", "kernel-ext", "cli"].map((folder) => newestIn(join(root, folder))));
if (!existsSync(built) || statSync(join(root, "dist", "src", "index.js")).mtimeMs < sourcesChanged) {
  if (run("npm", ["run", "--silent", "build"]) !== 0) fail("the build failed (see above)");
  say("  dist/ built");
} else {
  say("  dist/ is up to date");
}
// The browser bundle that draws widgets in the offline HTML copies (widgets/dist/ is not in git).
const widgetBundle = join(root, "widgets", "dist", "fringekit-embed.js");
if (existsSync(join(root, "widgets", "build.ts")) && (!existsSync(widgetBundle) || statSync(widgetBundle).mtimeMs < Math.max(newestIn(join(root, "widgets", "src")), newestIn(join(root, "src"))))) {
  if (run(process.execPath, [join(root, "node_modules", "tsx", "dist", "cli.mjs"), join("widgets", "build.ts")]) !== 0) {
    say("  building the widget bundle failed (see above); the HTML copies will have no live widgets");
  } else {
    say("  widgets/dist/ built");
  }
}

stage("kernelspec into .jupyter-local/ (not your global Jupyter folder)");
const { installKernelspec } = await import(pathToFileURL(join(root, "dist", "kernel-ext", "install.js")).href);
const installed = await installKernelspec({ prefix: jupyterData });
say(`  ${relative(root, installed.directory)}/kernel.json`);
const jupyterEnv = { ...process.env, JUPYTER_PATH: join(jupyterData, "share", "jupyter") };

stage("executing the demo notebooks with the fringekit kernel");
// Everything under out/ is regenerated, so nothing stale from an earlier run is left behind.
for (const folder of outputFolders) rmSync(join(out, folder), { recursive: true, force: true });
mkdirSync(join(out, "notebooks"), { recursive: true });
const notebooks = readdirSync(join(root, "notebooks-demo"))
  .filter((name) => name.endsWith(".ipynb"))
  .sort()
  .map((name) => join("notebooks-demo", name));
if (notebooks.length === 0) fail("no notebooks in notebooks-demo/");
say("  (each kernel type-checks its imports in the first cell: allow half a minute per notebook)");
const executed = run(python, [join("scripts", "run-notebooks.py"), join(out, "notebooks"), ...notebooks], { env: jupyterEnv });

stage("offline HTML copies");
mkdirSync(join(out, "html"), { recursive: true });
const exporter = join(root, "dist", "kernel-ext", "widgets", "exportHtml.js");
let exported = false;
if (existsSync(exporter)) {
  try {
    const { exportNotebookHtml } = await import(pathToFileURL(exporter).href);
    for (const name of readdirSync(join(out, "notebooks")).filter((n) => n.endsWith(".ipynb")).sort()) {
      const html = name.replace(/\.ipynb$/, ".html");
      await exportNotebookHtml(join(out, "notebooks", name), join(out, "html", html));
      say(`  out/html/${html} (live widgets, no kernel or network needed)`);
    }
    exported = true;
  } catch (error) {
    say(`  the widget HTML exporter failed: ${error instanceof Error ? error.message : String(error)}`);
  }
}
if (!exported && spawnSync(python, ["-c", "import nbconvert"], { stdio: "ignore" }).status !== 0) {
  say("  no HTML copies: static HTML needs nbconvert (sudo apt-get install python3-nbconvert)");
} else if (!exported) {
  say("  writing static HTML with nbconvert instead (no live widgets or plots)");
  const executedNotebooks = readdirSync(join(out, "notebooks")).filter((name) => name.endsWith(".ipynb")).map((name) => join(out, "notebooks", name));
  const status = run(python, ["-m", "nbconvert", "--to", "html", "--log-level", "WARN", "--output-dir", join(out, "html"), ...executedNotebooks], { env: jupyterEnv });
  if (status !== 0) say("  nbconvert failed (see above); the executed notebooks are still in out/notebooks/");
}

say("");
say("Summary");
const summaryDir = join(out, "results");
if (existsSync(summaryDir)) {
  for (const name of readdirSync(summaryDir).filter((n) => n.startsWith("summary-") && n.endsWith(".txt")).sort()) {
    say(readFileSync(join(summaryDir, name), "utf8").trimEnd());
  }
}
say("");
for (const folder of outputFolders) {
  const path = join(out, folder);
  if (existsSync(path)) say(`  out/${folder}/: ${readdirSync(path).length} files`);
}
say("  Open out/html/*.html in a browser, or out/notebooks/*.ipynb in JupyterLab with the fringekit kernel.");
say("  Re-check a result: npx fringekit replay out/results/first-fit.json --data notebooks-demo/data/line-pair-A.csv");
say(`Done in ${seconds()}.`);
if (executed !== 0) {
  process.stderr.write("demo: a notebook failed; the executed copy in out/notebooks/ shows where\n");
  process.exit(1);
}
