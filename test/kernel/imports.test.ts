// `import ... from "fringekit"` and "fringekit/kernel" in cells, with tslab's type-checker
// resolving the .d.ts: from a folder inside this repository (package self-reference) and from a
// user's project that has fringekit in node_modules (here a link, as `npm install DIR` makes).
import { existsSync, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import * as vitest from "vitest";
import { checksSuite, repoRoot } from "./helpers.js";

let project = "";
vitest.afterAll(() => {
  if (project) rmSync(project, { recursive: true, force: true });
});

await checksSuite(vitest, {
  title: "imports from a user's project with fringekit installed",
  script: "imports.py",
  minimumChecks: 3,
  args: () => {
    project = mkdtempSync(path.join(tmpdir(), "fringekit-project-"));
    writeFileSync(path.join(project, "package.json"), JSON.stringify({ name: "lab-notebooks", private: true, dependencies: { fringekit: `file:${repoRoot}` } }));
    mkdirSync(path.join(project, "node_modules"));
    symlinkSync(repoRoot, path.join(project, "node_modules", "fringekit"), "dir");
    return [project, "project"];
  },
  required: ["project: cells import fringekit and fringekit/kernel", "project: the type-checker reads fringekit's .d.ts"],
});

await checksSuite(vitest, {
  title: "imports from a notebook folder inside the fringekit repository",
  script: "imports.py",
  minimumChecks: 3,
  // notebooks-demo/ when it exists, else this test folder: both lie inside the package.
  args: () => [existsSync(path.join(repoRoot, "notebooks-demo")) ? path.join(repoRoot, "notebooks-demo") : path.join(repoRoot, "test", "kernel"), "repository"],
  required: ["repository: cells import fringekit and fringekit/kernel", "repository: the type-checker reads fringekit's .d.ts"],
});
