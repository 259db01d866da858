// Runs the built command (`node bin/fringekit.js`, after `npm run build`) as a child process.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";

export const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const BIN = fileURLToPath(new URL("../../bin/fringekit.js", import.meta.url));

/** Exit code, stdout and stderr of `fringekit ...args`. */
export function runCli(args: string[], options: { cwd?: string; timeout?: number } = {}): { code: number; stdout: string; stderr: string } {
  if (!existsSync(new URL("../../dist/cli/main.js", import.meta.url))) throw new Error("dist/cli/main.js is missing: run `npm run build` before the command-line tests");
  const result = spawnSync(process.execPath, [BIN, ...args], { cwd: options.cwd ?? ROOT, encoding: "utf8", timeout: options.timeout ?? 120_000 });
  if (result.error) throw result.error;
  return { code: result.status ?? -1, stdout: result.stdout, stderr: result.stderr };
}

/** True when the built library has the fitter (src/fit's fitProfile). */
export async function hasFitter(): Promise<boolean> {
  const lib = (await import(new URL("../../dist/src/advanced.js", import.meta.url).href)) as Record<string, unknown>;
  return typeof lib["fitProfile"] === "function";
}

/** Runs the command line in this process (cli/run.ts), capturing its output. Faster than a child process. */
export async function runInProcess(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const { run } = await import("../../cli/run.js");
  let stdout = "";
  let stderr = "";
  const code = await run(args, { stdout: (t) => { stdout += t; }, stderr: (t) => { stderr += t; } });
  return { code, stdout, stderr };
}
