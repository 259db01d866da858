// Bundles test/lab/page/labNotebook.ts (JupyterLab's notebook component and widget manager from
// npm) into one script and one stylesheet with esbuild. JupyterLab's stylesheets import other
// packages' CSS webpack-style (`~@scope/pkg/...`); a small resolver maps those to node_modules.
import { createRequire } from "node:module";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { build, type Plugin } from "esbuild";

const here = path.dirname(fileURLToPath(import.meta.url));
const require = createRequire(import.meta.url);

const tildeImports: Plugin = {
  name: "webpack-tilde-css",
  setup(b) {
    b.onResolve({ filter: /^~/ }, (args) => ({ path: require.resolve(args.path.slice(1)) }));
  },
};

/** Writes labNotebook.js and labNotebook.css into `outDir`; returns their paths. */
export async function buildLabPage(outDir: string): Promise<{ script: string; css: string }> {
  await build({
    entryPoints: [path.join(here, "page/labNotebook.ts")], bundle: true, format: "iife", outdir: outDir, platform: "browser", target: "es2022",
    loader: { ".svg": "dataurl", ".woff": "dataurl", ".woff2": "dataurl", ".ttf": "dataurl", ".png": "dataurl", ".gif": "dataurl", ".eot": "dataurl" },
    define: { "process.env.NODE_ENV": '"production"', global: "globalThis" }, logLevel: "error", plugins: [tildeImports],
  });
  return { script: path.join(outDir, "labNotebook.js"), css: path.join(outDir, "labNotebook.css") };
}
