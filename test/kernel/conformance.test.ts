// Conformance of the fringekit kernel with Debian's jupyter_kernel_test 0.4.5
// (python3-jupyter-kernel-test), which validates replies against its Jupyter message schemas.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeRun, installTempKernel, missingPrerequisite, runPython, type KernelPrefix } from "./helpers.js";

const missing = missingPrerequisite();
if (missing) console.warn(`kernel conformance tests skipped: ${missing}`);

describe.skipIf(missing !== undefined)("jupyter_kernel_test against the installed fringekit kernelspec", () => {
  let kernel: KernelPrefix;
  let outcome: Record<string, string>;
  let log = "";

  beforeAll(async () => {
    kernel = installTempKernel();
    const run = await runPython("conformance.py", kernel);
    log = describeRun(run);
    const line = run.stdout.split("\n").find((l) => l.startsWith("FRINGEKIT-CONFORMANCE "));
    outcome = line ? JSON.parse(line.slice("FRINGEKIT-CONFORMANCE ".length)) : {};
  });
  afterAll(() => kernel?.dispose());

  // Every test that applies to a TypeScript kernel; test_pager (IPython's `?` pager) and the
  // history subtests (the kernel keeps no history and says so with an empty reply) do not.
  const applicable = [
    "test_kernel_info",
    "test_execute_stdout",
    "test_execute_stderr",
    "test_execute_result",
    "test_error",
    "test_completion",
    "test_inspect",
    "test_is_complete",
    "test_display_data",
    "test_clear_output",
  ];
  it.each(applicable)("%s passes", (name) => {
    expect(outcome[name], log).toBe("ok");
  });

  it("reports no failed test at all", () => {
    const failed = Object.entries(outcome).filter(([, v]) => v.startsWith("failed"));
    expect(Object.keys(outcome).length, log).toBeGreaterThan(10);
    expect(failed, log).toEqual([]);
  });
});
