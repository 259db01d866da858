#!/usr/bin/env node
// The fringekit command: the compiled command line lives in dist/ (built by `npm run build`,
// which `npm ci` runs through the "prepare" script). The build also bundles it into
// dist/cli/bundle/ (scripts/bundle-command.ts): a few files instead of ~200 modules, for a faster
// start. The bundle is used when it is at least as new as dist/cli/main.js (a later `tsc` alone
// leaves it stale) and loads; otherwise, and for the batch and kernel commands (which find files
// next to their own modules), the command runs from dist/cli/main.js.
import { statSync } from "node:fs";

const MAIN = new URL("../dist/cli/main.js", import.meta.url);
const BUNDLE = new URL("../dist/cli/bundle/run.js", import.meta.url);
const UNBUNDLED_COMMANDS = ["batch", "kernel"];

function bundleUsable() {
  if (UNBUNDLED_COMMANDS.includes(process.argv[2])) return false;
  try {
    return statSync(BUNDLE).mtimeMs >= statSync(MAIN).mtimeMs;
  } catch {
    return false; // no bundle (or no build at all: reported below)
  }
}

/** The bundle's run(), or undefined when it cannot be loaded (missing chunk, damaged file). */
async function bundledRun() {
  if (!bundleUsable()) return undefined;
  try {
    return (await import(BUNDLE.href)).run;
  } catch {
    return undefined; // loading runs no command code, so dist/ can take over
  }
}

const run = await bundledRun();
if (run) {
  process.exitCode = await run(process.argv.slice(2));
} else {
  await import(MAIN.href).catch((error) => {
    if (error && error.code === "ERR_MODULE_NOT_FOUND") {
      process.stderr.write("fringekit: the command is not built yet; run `npm run build` in the fringekit folder\n");
      process.exit(2);
    }
    throw error;
  });
}
