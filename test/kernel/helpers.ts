// Helpers for kernel tests: a kernelspec in a temporary prefix, Python clients run with
// Debian's jupyter_client, and a guarantee that every kernel they start is stopped.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const repoRoot = fileURLToPath(new URL("../../", import.meta.url));
export const pyDir = fileURLToPath(new URL("./py/", import.meta.url));
export const python = "/usr/bin/python3";
export const launcher = path.join(repoRoot, "dist", "kernel-ext", "launch.js");

/** Why the Jupyter kernel tests cannot run here, or undefined when they can. */
export function missingPrerequisite(modules: string[] = ["jupyter_client", "jupyter_kernel_test", "nbclient", "nbformat", "jsonschema", "zmq"]): string | undefined {
  if (!existsSync(launcher)) return "dist/kernel-ext/launch.js is missing; run `npm run build` first";
  if (!existsSync(python)) return `${python} is missing (install Debian's python3)`;
  const probe = spawnSync(python, ["-c", `import ${modules.join(", ")}`], { encoding: "utf8" });
  if (probe.status !== 0) return `Python modules missing (${modules.join(", ")}): install Debian's python3-jupyter-client, python3-jupyter-kernel-test, python3-nbclient`;
  return undefined;
}

/** A temporary Jupyter prefix with the fringekit kernelspec installed by the install script. */
export interface KernelPrefix {
  prefix: string;
  jupyterPath: string;
  pidFile: string;
  dispose(): void;
}

/** Installs the kernelspec into a fresh temporary prefix (`--prefix DIR`). */
export function installTempKernel(): KernelPrefix {
  const prefix = mkdtempSync(path.join(tmpdir(), "fringekit-kernel-"));
  const result = spawnSync(process.execPath, [path.join(repoRoot, "dist", "kernel-ext", "install-cli.js"), "--prefix", prefix], { encoding: "utf8" });
  if (result.status !== 0) throw new Error(`kernelspec install failed: ${result.stderr}`);
  const pidFile = path.join(prefix, "kernel-pids.txt");
  return {
    prefix,
    jupyterPath: path.join(prefix, "share", "jupyter"),
    pidFile,
    dispose: () => {
      stopRecordedKernels(pidFile);
      rmSync(prefix, { recursive: true, force: true });
    },
  };
}

/** Kills kernels a Python client recorded and did not stop (after a crash or timeout). */
export function stopRecordedKernels(pidFile: string): number {
  if (!existsSync(pidFile)) return 0;
  let stopped = 0;
  for (const line of readFileSync(pidFile, "utf8").split("\n")) {
    const pid = Number(line.trim());
    if (!Number.isInteger(pid) || pid <= 0) continue;
    try {
      process.kill(pid, 0);
    } catch {
      continue; // already gone
    }
    try {
      process.kill(pid, "SIGKILL");
      stopped++;
    } catch {
      // exited meanwhile
    }
  }
  return stopped;
}

/** Output of one Python client run. */
export interface PythonRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

/**
 * Runs `py/<script>` with the kernelspec prefix on JUPYTER_PATH. On timeout the client gets
 * SIGTERM (its `finally` stops the kernel), then SIGKILL; recorded kernels are killed after.
 */
export function runPython(script: string, kernel: KernelPrefix, options: { cwd?: string; timeoutMs?: number; args?: string[]; env?: Record<string, string> } = {}): Promise<PythonRun> {
  const timeoutMs = options.timeoutMs ?? 240_000;
  return new Promise((resolve) => {
    const child = spawn(python, [path.join(pyDir, script), ...(options.args ?? [])], {
      cwd: options.cwd ?? pyDir,
      env: {
        ...process.env,
        ...options.env,
        JUPYTER_PATH: kernel.jupyterPath,
        FRINGEKIT_TEST_PIDFILE: kernel.pidFile,
        PYTHONPATH: pyDir,
        PYDEVD_DISABLE_FILE_VALIDATION: "1",
        PYTHONUNBUFFERED: "1",
        PYTHONDONTWRITEBYTECODE: "1",
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d) => (stdout += d));
    child.stderr.on("data", (d) => (stderr += d));
    const term = setTimeout(() => child.kill("SIGTERM"), timeoutMs);
    const kill = setTimeout(() => child.kill("SIGKILL"), timeoutMs + 15_000);
    child.on("close", (code) => {
      clearTimeout(term);
      clearTimeout(kill);
      stopRecordedKernels(kernel.pidFile);
      resolve({ code, stdout, stderr });
    });
  });
}

/** One named check reported by a Python client. */
export interface Check {
  name: string;
  ok: boolean;
  detail: string;
}

/** The checks a client printed on its FRINGEKIT-CHECKS line (empty when it printed none). */
export function parseChecks(run: PythonRun): Check[] {
  const line = run.stdout.split("\n").find((l) => l.startsWith("FRINGEKIT-CHECKS "));
  return line ? (JSON.parse(line.slice("FRINGEKIT-CHECKS ".length)) as Check[]) : [];
}

/** A readable summary of a run for assertion messages. */
export function describeRun(run: PythonRun): string {
  return `exit ${run.code}\n--- stdout ---\n${run.stdout.slice(-4000)}\n--- stderr ---\n${run.stderr.slice(-4000)}`;
}

/**
 * Registers a vitest suite that runs one Python client against a freshly installed kernelspec
 * and requires each of `required` checks and every other reported check to pass.
 */
export async function checksSuite(
  vitest: typeof import("vitest"),
  options: { title: string; script: string; required: string[]; minimumChecks: number; args?: () => string[]; cwd?: () => string },
): Promise<void> {
  const { describe, beforeAll, afterAll, it, expect } = vitest;
  const missing = missingPrerequisite();
  if (missing) console.warn(`${options.title}: skipped: ${missing}`);
  describe.skipIf(missing !== undefined)(options.title, () => {
    let kernel: KernelPrefix;
    let checks: Check[] = [];
    let log = "";
    beforeAll(async () => {
      kernel = installTempKernel();
      const run = await runPython(options.script, kernel, { args: options.args?.(), cwd: options.cwd?.() });
      checks = parseChecks(run);
      log = describeRun(run);
    });
    afterAll(() => kernel?.dispose());
    it.each(options.required)("%s", (name) => {
      const check = checks.find((c) => c.name === name);
      expect(check, log).toBeDefined();
      expect(check!.ok, `${check!.detail}\n${log}`).toBe(true);
    });
    it(`every check of py/${options.script} passes`, () => {
      expect(checks.length, log).toBeGreaterThanOrEqual(options.minimumChecks);
      expect(checks.filter((c) => !c.ok), log).toEqual([]);
    });
  });
}
