/**
 * Bundles the compiled `fringekit` command line (dist/cli/run.js, from `tsc`) into a few files in
 * dist/cli/bundle/ with esbuild, for a faster command start (benchmark B9): a table fit then loads
 * 15 files instead of ~200 modules. Each command stays its own chunk (loaded when run),
 * and code reached only through a dynamic import (the image decoders for an image input, figure
 * export) stays out of the chunks a table fit loads. bin/fringekit.js uses the bundle when it is
 * at least as new as dist/cli/main.js, else dist/cli/main.js.
 *
 * Kept outside the bundle, loaded as they are:
 *   - npm packages (node_modules), loaded from the package's dependencies as before;
 *   - the batch and kernel commands, which find files next to their own modules through
 *     import.meta.url (batch worker threads, the kernel launcher and package.json):
 *     bin/fringekit.js runs them from dist/cli/main.js, so bundled and unbundled copies of the
 *     library (and of its error classes) never meet in one process.
 * Run: `npx tsx scripts/bundle-command.ts` (part of `npm run build`, after tsc).
 */
import { build, type Plugin } from "esbuild";
import { existsSync, rmSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const ROOT = path.dirname(path.dirname(fileURLToPath(import.meta.url)));
const DIST = path.join(ROOT, "dist");
/** Where the bundle goes; bin/fringekit.js loads `run.js` from here and calls its run(). */
export const BUNDLE_DIR = path.join(DIST, "cli", "bundle");

/** Commands that always run from dist/cli/main.js (see the module comment and bin/fringekit.js). */
export const UNBUNDLED_COMMANDS = ["batch", "kernel"];

/** True for compiled files that stay out of the bundle (the unbundled commands' modules). */
export function staysOutside(file: string): boolean {
  const rel = path.relative(DIST, file).split(path.sep).join("/");
  return UNBUNDLED_COMMANDS.some((name) => rel === `cli/commands/${name}.js`);
}

const keepOutside: Plugin = {
  name: "keep-outside",
  setup(b) {
    b.onResolve({ filter: /^\.\.?\// }, (args) => {
      const file = path.resolve(args.resolveDir, args.path);
      if (!staysOutside(file)) return undefined;
      // The import is rewritten relative to the bundle folder (every chunk is written there).
      const rel = path.relative(BUNDLE_DIR, file).split(path.sep).join("/");
      return { path: rel.startsWith(".") ? rel : `./${rel}`, external: true };
    });
  },
};

/** Writes dist/cli/bundle/ from dist/cli/run.js; returns the files written. */
export async function bundleCommand(): Promise<string[]> {
  const entry = path.join(DIST, "cli", "run.js");
  if (!existsSync(entry)) throw new Error("dist/cli/run.js is missing: run tsc (npm run build) first");
  rmSync(BUNDLE_DIR, { recursive: true, force: true });
  const result = await build({
    entryPoints: [entry],
    outdir: BUNDLE_DIR,
    bundle: true,
    splitting: true,
    format: "esm",
    platform: "node",
    target: "node20",
    packages: "external",
    plugins: [keepOutside],
    logLevel: "error",
    legalComments: "none",
    metafile: true,
  });
  return Object.keys(result.metafile.outputs);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await bundleCommand();
}
