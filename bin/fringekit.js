#!/usr/bin/env node
// The fringekit command: the compiled command line lives in dist/ (built by `npm run build`,
// which `npm ci` runs through the "prepare" script).
import("../dist/cli/main.js").catch((error) => {
  if (error && error.code === "ERR_MODULE_NOT_FOUND") {
    process.stderr.write("fringekit: the command is not built yet; run `npm run build` in the fringekit folder\n");
    process.exit(2);
  }
  throw error;
});
