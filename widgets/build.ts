/**
 * Builds the browser bundles into widgets/dist/ with esbuild:
 *   fringekit-widgets.js  the widget module as an ES module (for pages and loaders that import it)
 *   fringekit-embed.js    the offline renderer: a kernel-less widget manager + widgets + plotly in
 *                         one classic script that never sees an AMD `define` (safe on require.js pages)
 * plus any extra entries (test pages). Run: `npx tsx widgets/build.ts`.
 */
import { build, type BuildOptions, type Plugin } from "esbuild";
import { fileURLToPath } from "node:url";
import path from "node:path";

/** Folder of this file (widgets/). */
export const widgetsDir = path.dirname(fileURLToPath(import.meta.url));
/** Where bundles go. */
export const distDir = path.join(widgetsDir, "dist");

const common: BuildOptions = {
  bundle: true,
  minify: true,
  sourcemap: false,
  target: "es2022",
  logLevel: "error",
  legalComments: "none",
  loader: { ".css": "text", ".woff": "dataurl", ".woff2": "dataurl", ".ttf": "dataurl", ".eot": "dataurl", ".svg": "dataurl" },
  define: { "process.env.NODE_ENV": '"production"' },
  // Only the cartesian traces (scatter, heatmap and kin): the widgets draw nothing else, and the
  // partial bundle is about a third of the full one. Sources keep importing "plotly.js-dist-min".
  alias: { "plotly.js-dist-min": "plotly.js-cartesian-dist-min" },
};

/** One extra bundle: entry file (absolute) and output file name in widgets/dist/. */
export interface ExtraEntry {
  entry: string;
  out: string;
}

/**
 * Build the module bundle, the offline renderer and `extra` classic-script bundles.
 * @returns absolute paths of the written files
 */
export async function buildWidgetBundles(extra: ExtraEntry[] = []): Promise<string[]> {
  const written: string[] = [];
  // The in-page fitter's worker, bundled first and handed to the renderer as a string.
  const worker = await build({ ...common, entryPoints: [path.join(widgetsDir, "src/entry/fitWorker.ts")], format: "iife", write: false, outfile: "fit-worker.js" });
  const workerSource = worker.outputFiles![0]!.text;
  const workerPlugin: Plugin = {
    name: "fit-worker-source",
    setup(b) {
      b.onResolve({ filter: /^fringekit:fit-worker-source$/ }, (args) => ({ path: args.path, namespace: "fk-worker" }));
      b.onLoad({ filter: /.*/, namespace: "fk-worker" }, () => ({ contents: `export default ${JSON.stringify(workerSource)};`, loader: "js" }));
    },
  };
  // The page manager (pageManager.ts) escapes control descriptions itself, so the widget
  // manager's HTML sanitiser (sanitize-html with postcss and an HTML parser, ~250 KB) is left out
  // of the offline renderer; a call to it would fail loudly rather than pass HTML through.
  const noSanitizerPlugin: Plugin = {
    name: "no-sanitize-html",
    setup(b) {
      b.onResolve({ filter: /^sanitize-html$/ }, (args) => ({ path: args.path, namespace: "fk-no-sanitizer" }));
      b.onLoad({ filter: /.*/, namespace: "fk-no-sanitizer" }, () => ({
        contents: 'export default function sanitizeHtml() { throw new Error("no HTML sanitiser in the offline renderer: fringekit pages escape widget descriptions as text"); }',
        loader: "js",
      }));
    },
  };
  const moduleOut = path.join(distDir, "fringekit-widgets.js");
  await build({ ...common, entryPoints: [path.join(widgetsDir, "src/entry/module.ts")], format: "esm", outfile: moduleOut });
  written.push(moduleOut);
  const classic = [{ entry: path.join(widgetsDir, "src/entry/embed.ts"), out: "fringekit-embed.js" }, ...extra];
  for (const item of classic) {
    const outfile = path.join(distDir, item.out);
    // IIFE output with `define` renamed away: a require.js page would otherwise route UMD
    // dependencies inside the bundle down the AMD path and they would never load.
    const plugins = item.out === "fringekit-embed.js" ? [workerPlugin, noSanitizerPlugin] : [workerPlugin];
    await build({ ...common, entryPoints: [item.entry], format: "iife", outfile, define: { ...common.define, define: "undefined" }, plugins });
    written.push(outfile);
  }
  return written;
}

/** Where the JupyterLab 4 prebuilt extension is written. */
export const labExtensionDir = path.join(distDir, "labextension");

/**
 * Build the JupyterLab 4 prebuilt extension with @jupyterlab/builder: the plugin is bundled by
 * esbuild with @jupyter-widgets/base left as an import, then webpack module federation shares
 * it as a singleton (JupyterLab's widget manager provides it). Output: widgets/dist/labextension/.
 */
export async function buildLabExtension(): Promise<string> {
  const { spawnSync } = await import("node:child_process");
  const { mkdir, rm, writeFile, copyFile } = await import("node:fs/promises");
  const { createRequire } = await import("node:module");
  const source = path.join(distDir, "labextension-src");
  await rm(source, { recursive: true, force: true });
  await rm(labExtensionDir, { recursive: true, force: true });
  await mkdir(path.join(source, "lib"), { recursive: true });
  await build({ ...common, entryPoints: [path.join(widgetsDir, "src/entry/labPlugin.ts")], format: "esm", outfile: path.join(source, "lib/index.js"), external: ["@jupyter-widgets/base"] });
  const require = createRequire(import.meta.url);
  const baseVersion = (require("@jupyter-widgets/base/package.json") as { version: string }).version;
  const { MODULE_NAME, MODULE_VERSION } = await import("./src/version.js");
  await writeFile(path.join(source, "package.json"), JSON.stringify({
    name: MODULE_NAME,
    version: MODULE_VERSION,
    description: "fringekit widgets for JupyterLab 4",
    license: "MIT",
    main: "lib/index.js",
    keywords: ["jupyter", "jupyterlab", "jupyterlab-extension", "widgets"],
    dependencies: { "@jupyter-widgets/base": `^${baseVersion}` },
    jupyterlab: {
      extension: true,
      outputDir: "../labextension",
      sharedPackages: { "@jupyter-widgets/base": { bundled: false, singleton: true } },
    },
  }, null, 2));
  const core = path.join(distDir, "labextension-core");
  await mkdir(core, { recursive: true });
  await copyFile(path.join(widgetsDir, "jupyterlab/core-package.json"), path.join(core, "package.json"));
  const cli = require.resolve("@jupyterlab/builder/lib/build-labextension.js");
  const run = spawnSync(process.execPath, [cli, "--core-path", core, source], { encoding: "utf8", cwd: path.dirname(widgetsDir) });
  if (run.status !== 0) throw new Error(`build-labextension failed (exit ${run.status}):\n${run.stdout}\n${run.stderr}`);
  return labExtensionDir;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const files = await buildWidgetBundles();
  if (process.argv.includes("--lab")) files.push(await buildLabExtension());
  for (const file of files) process.stdout.write(`${path.relative(process.cwd(), file)}\n`);
}
