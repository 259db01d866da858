// The kernel's start-up snapshot (kernel-ext/startSnapshot.ts, launch.ts): built after a start
// that had none, used by later starts with the same answers as without it, set aside when
// corrupt — through jupyter_client (py/startSnapshot.py) in an empty temporary cache folder.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeRun, installTempKernel, launcher, missingPrerequisite, parseChecks, repoRoot, runPython, type Check, type KernelPrefix } from "./helpers.js";

const missing = missingPrerequisite(["jupyter_client"]);
if (missing) console.warn(`start-up snapshot: skipped: ${missing}`);

describe.skipIf(missing !== undefined)("kernel start-up snapshot", () => {
  let kernel: KernelPrefix;
  let cache = "";
  let checks: Check[] = [];
  let log = "";
  beforeAll(async () => {
    kernel = installTempKernel();
    cache = mkdtempSync(path.join(tmpdir(), "fringekit-snapshot-"));
    const run = await runPython("startSnapshot.py", kernel, { args: [process.execPath, launcher, repoRoot], env: { FRINGEKIT_CACHE_DIR: cache }, timeoutMs: 400_000 });
    checks = parseChecks(run);
    log = describeRun(run);
  }, 420_000);
  afterAll(() => {
    kernel?.dispose();
    if (cache) rmSync(cache, { recursive: true, force: true });
  });

  it.each([
    "a start without a snapshot builds one",
    "a later start runs from the snapshot",
    "from the snapshot, cell 1 answers as without it",
    "from the snapshot, cell 4 answers as without it",
    "from the snapshot, completions are those without it",
    "a corrupt snapshot: the kernel starts without it and answers",
    "a corrupt snapshot is removed",
  ])("%s", (name) => {
    const check = checks.find((c) => c.name === name);
    expect(check, log).toBeDefined();
    expect(check!.ok, `${check!.detail}\n${log}`).toBe(true);
  });

  it("every check of py/startSnapshot.py passes", () => {
    expect(checks.length, log).toBeGreaterThanOrEqual(14);
    expect(checks.filter((c) => !c.ok), log).toEqual([]);
  });
});
