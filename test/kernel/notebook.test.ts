// nbclient (Debian's python3-nbclient) executes a widget notebook on the fringekit kernel; the
// stored widget state is validated against @jupyter-widgets/schema v2 with Python's jsonschema.
import { mkdtempSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeRun, installTempKernel, missingPrerequisite, parseChecks, repoRoot, runPython, type Check, type KernelPrefix } from "./helpers.js";

const require = createRequire(import.meta.url);
function schemaPath(name: string): string | undefined {
  try {
    return require.resolve(`@jupyter-widgets/schema/v2/${name}`);
  } catch {
    return undefined;
  }
}
const stateSchema = schemaPath("state.schema.json");
const viewSchema = schemaPath("view.schema.json");
const missing = missingPrerequisite() ?? (stateSchema && viewSchema ? undefined : "npm package @jupyter-widgets/schema is not installed");
if (missing) console.warn(`kernel notebook tests skipped: ${missing}`);

describe.skipIf(missing !== undefined)("nbclient executing a widget notebook on the fringekit kernel", () => {
  let kernel: KernelPrefix;
  let checks: Check[] = [];
  let log = "";
  let workdir = "";

  beforeAll(async () => {
    kernel = installTempKernel();
    // The notebook runs inside the repository so `fringekit/kernel` resolves to this package.
    workdir = mkdtempSync(path.join(repoRoot, "test", "kernel", ".nb-"));
    const run = await runPython("notebook.py", kernel, { args: [stateSchema!, viewSchema!, workdir] });
    checks = parseChecks(run);
    log = describeRun(run);
  });
  afterAll(() => {
    kernel?.dispose();
    if (workdir) rmSync(workdir, { recursive: true, force: true });
  });

  const required = [
    "every code cell has an execution count",
    "cell after the failing cell runs (allow_errors)",
    "widget state validates against state.schema.json v2",
    "widget view data validates against view.schema.json v2",
    "stored state has the model's latest values",
    "binary array stored as a base64 buffer at path x.buffer",
  ];
  it.each(required)("%s", (name) => {
    const check = checks.find((c) => c.name === name);
    expect(check, log).toBeDefined();
    expect(check!.ok, `${check!.detail}\n${log}`).toBe(true);
  });

  it("every check of py/notebook.py passes", () => {
    expect(checks.length, log).toBeGreaterThanOrEqual(11);
    expect(checks.filter((c) => !c.ok), log).toEqual([]);
  });
});
