#!/usr/bin/env node
// The main job on the bundled demo data: installs what is missing, executes the demo
// notebooks headlessly with the fringekit kernel, and writes everything to out/.
// Plain JavaScript on purpose: it must run before `npm ci` has installed TypeScript tools.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const out = join(root, "out");
const jupyterData = join(root, ".jupyter-local");
const python = "/usr/bin/python3";
const debianPackages = ["python3-nbclient", "python3-nbformat", "python3-jupyter-client", "jupyter-client"];
const steps = 6;
let step = 0;
const started = Date.now();

function say(text) {
  process.stdout.write(`${text}\n`);
}
function stage(text) {
  step += 1;
  say(`[${step}/${steps}] ${text} (${((Date.now() - started) / 1000).toFixed(0)} s)`);
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

const major = Number(process.versions.node.split(".")[0]);
if (major < 20) fail(`Node ${process.versions.node} is too old; fringekit needs Node 20 or newer`);

stage("npm packages");
const installedLock = join(root, "node_modules", ".package-lock.json");
if (!existsSync(installedLock) || statSync(installedLock).mtimeMs < statSync(join(root, "package-lock.json")).mtimeMs) {
  if (run("npm", ["ci", "--no-audit", "--no-fund"]) !== 0) fail("npm ci failed (see above)");
} else {
  say("  node_modules is up to date");
}

stage("Jupyter (nbclient, nbformat, jupyter_client from Debian)");
const probe = () => spawnSync(python, ["-c", "import nbclient, nbformat, jupyter_client"], { stdio: "ignore" }).status === 0;
if (!probe()) {
  const canInstall = process.getuid?.() === 0 && existsSync("/usr/bin/apt-get");
  if (!canInstall) {
    fail(`the Jupyter Python packages are missing; install them with\n  sudo apt-get install -y ${debianPackages.join(" ")}\n(or the pip packages nbclient nbformat jupyter_client for ${python}) and run npm run demo again`);
  }
  say(`  installing ${debianPackages.join(" ")}`);
  run("apt-get", ["update", "-qq"]);
  if (run("apt-get", ["install", "-y", "-qq", ...debianPackages], { env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } }) !== 0 || !probe()) {
    fail("installing the Jupyter packages failed (see above)");
  }
} else {
  say("  found");
}

stage("build");
if (run("npm", ["run", "--silent", "build"]) !== 0) fail("the build failed (see above)");

stage("kernelspec into .jupyter-local/ (not your global Jupyter folder)");
const { installKernelspec } = await import(pathToFileURL(join(root, "dist", "kernel-ext", "install.js")).href);
const spec = await installKernelspec({ prefix: jupyterData });
say(`  ${relative(root, typeof spec === "string" ? spec : spec?.path ?? jupyterData)}`);
const jupyterEnv = { ...process.env, JUPYTER_PATH: join(jupyterData, "share", "jupyter"), FRINGEKIT_OUT: out };

stage("executing the demo notebooks with the fringekit kernel");
mkdirSync(join(out, "notebooks"), { recursive: true });
const notebooks = readdirSync(join(root, "notebooks-demo"))
  .filter((name) => name.endsWith(".ipynb"))
  .sort()
  .map((name) => join("notebooks-demo", name));
if (notebooks.length === 0) fail("no notebooks in notebooks-demo/");
const executed = run(python, [join("scripts", "run-notebooks.py"), join(out, "notebooks"), ...notebooks], { env: jupyterEnv });

stage("offline HTML export with live widgets");
const exporter = join(root, "dist", "kernel-ext", "widgets", "exportHtml.js");
if (existsSync(exporter)) {
  const { exportNotebookHtml } = await import(pathToFileURL(exporter).href);
  mkdirSync(join(out, "html"), { recursive: true });
  for (const notebook of notebooks) {
    const name = notebook.split("/").pop().replace(/\.ipynb$/, "");
    await exportNotebookHtml(join(out, "notebooks", `${name}.ipynb`), join(out, "html", `${name}.html`));
    say(`  out/html/${name}.html`);
  }
} else {
  say("  skipped: the widget exporter is not built");
}

say("");
say("Summary");
const summaryDir = join(out, "results");
if (existsSync(summaryDir)) {
  for (const name of readdirSync(summaryDir).filter((n) => n.startsWith("summary-") && n.endsWith(".txt")).sort()) {
    say(readFileSync(join(summaryDir, name), "utf8").trimEnd());
  }
}
for (const folder of ["notebooks", "html", "figures", "results"]) {
  const path = join(out, folder);
  if (existsSync(path)) say(`  out/${folder}/: ${readdirSync(path).length} files`);
}
say(`Done in ${((Date.now() - started) / 1000).toFixed(0)} s.`);
if (executed !== 0) {
  process.stderr.write("demo: a notebook failed; the executed copy in out/notebooks/ shows where\n");
  process.exit(1);
}
