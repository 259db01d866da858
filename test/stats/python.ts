// Runs reference computations in Debian's Python (python3-scipy, python3-mpmath).
// Tests that need it skip visibly when it is missing (CI always has it).
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

const PYTHON = "/usr/bin/python3";

/** Why SciPy cannot be used here, or null when it can. */
export const scipyMissing: string | null = (() => {
  if (!existsSync(PYTHON)) return `${PYTHON} not found`;
  const probe = spawnSync(PYTHON, ["-c", "import scipy, mpmath"], { encoding: "utf8" });
  return probe.status === 0 ? null : "python3-scipy or python3-mpmath is not installed";
})();

if (scipyMissing) console.warn(`SKIPPING SciPy reference checks: ${scipyMissing}`);

/** Runs `script` with the JSON `input` on stdin (as `data`), returns the JSON it prints. */
export function python<T>(script: string, input: unknown): T {
  const prelude = "import json, sys\ndata = json.load(sys.stdin)\n";
  const run = spawnSync(PYTHON, ["-c", prelude + script], { input: JSON.stringify(input), encoding: "utf8", maxBuffer: 1 << 26 });
  if (run.status !== 0) throw new Error(`python failed: ${run.stderr}`);
  return JSON.parse(run.stdout) as T;
}

/** Relative closeness with an absolute floor; the message shows input, got, expected, tolerance. */
export function expectClose(got: number, expected: number, rel: number, what: string, abs = 0): void {
  const tol = Math.max(rel * Math.abs(expected), abs);
  if (!(Math.abs(got - expected) <= tol)) {
    throw new Error(`${what}: got ${got}, expected ${expected}, tolerance ${tol}`);
  }
}
