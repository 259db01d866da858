// Shared helper (not a test file): reference values from Debian's python3-scipy / python3-mpmath.
import { spawnSync } from "node:child_process";

const PYTHON = "/usr/bin/python3";

/** True when /usr/bin/python3 can import scipy and mpmath; otherwise tests skip with a message. */
export const hasScipy: boolean = (() => {
  const probe = spawnSync(PYTHON, ["-c", "import scipy, mpmath"], { encoding: "utf8" });
  if (probe.status !== 0) {
    console.warn("SKIPPED reference checks: /usr/bin/python3 with python3-scipy and python3-mpmath is missing (apt-get install python3-scipy python3-mpmath)");
    return false;
  }
  return true;
})();

/** Runs `script` (which reads JSON input from stdin and prints JSON) and returns the parsed output. */
export function python<T>(script: string, input: unknown): T {
  const result = spawnSync(PYTHON, ["-c", script], { input: JSON.stringify(input), encoding: "utf8", maxBuffer: 64 << 20 });
  if (result.status !== 0) throw new Error(`python3 reference script failed: ${result.stderr}`);
  return JSON.parse(result.stdout) as T;
}
