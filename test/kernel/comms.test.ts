// Comm protocol checks against the Jupyter messaging specification 5.3, driven by Debian's
// jupyter_client (py/comms.py), which also verifies every message's HMAC on receipt.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeRun, installTempKernel, missingPrerequisite, parseChecks, runPython, type Check, type KernelPrefix } from "./helpers.js";

const missing = missingPrerequisite();
if (missing) console.warn(`kernel comm tests skipped: ${missing}`);

describe.skipIf(missing !== undefined)("comm_open / comm_msg / comm_close / comm_info_request with jupyter_client", () => {
  let kernel: KernelPrefix;
  let checks: Check[] = [];
  let log = "";

  beforeAll(async () => {
    kernel = installTempKernel();
    const run = await runPython("comms.py", kernel);
    checks = parseChecks(run);
    log = describeRun(run);
  });
  afterAll(() => kernel?.dispose());

  const required = [
    "comm_info_request gets a comm_info_reply",
    "comm_info_request with target_name filters",
    "binary buffers come back byte for byte (HMAC accepted by jupyter_client)",
    "kernel comm_open buffer is the Float64Array bytes",
    "comm_open to unknown target is answered with comm_close",
    "comm_msg handler output is routed to the comm_msg",
    "comm_msg is answered while a cell awaits",
    "history_request gets an empty, valid history_reply",
  ];
  it.each(required)("%s", (name) => {
    const check = checks.find((c) => c.name === name);
    expect(check, log).toBeDefined();
    expect(check!.ok, `${check!.detail}\n${log}`).toBe(true);
  });

  it("every check of py/comms.py passes", () => {
    expect(checks.length, log).toBeGreaterThanOrEqual(27);
    expect(checks.filter((c) => !c.ok), log).toEqual([]);
  });
});
