// A jupyter-server (Debian's python3-jupyter-server) for the browser tests: on 127.0.0.1 only,
// with a random token, its own config/data/runtime folders and a temporary fringekit kernel;
// stopped, with the page server and the temp folder, by stopTestServers.
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdirSync, rmSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { installTempKernel, python, type KernelPrefix } from "../kernel/helpers.js";

/** A running test server and what a page needs to reach it. */
export interface TestJupyter {
  process: ChildProcess;
  kernel: KernelPrefix;
  /** http://127.0.0.1:PORT/ */
  baseUrl: string;
  token: string;
  /** The server's output so far (for error messages). */
  log(): string;
}

/** A TCP port free on 127.0.0.1 right now. */
export async function freePort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise((resolve) => server.close(resolve));
  return port;
}

/**
 * Installs a temporary kernel and starts jupyter-server serving `root`, accepting requests from
 * the page at `allowOrigin`; resolves once /api/status answers (60 s at most).
 * @param tmp an empty temp folder the server's config, data and runtime folders go into
 */
export async function startJupyterServer(options: { root: string; tmp: string; allowOrigin: string }): Promise<TestJupyter> {
  const { root, tmp, allowOrigin } = options;
  const kernel = installTempKernel();
  const port = await freePort();
  const token = randomBytes(16).toString("hex");
  for (const d of ["config", "data", "runtime"]) mkdirSync(path.join(tmp, d));
  const child = spawn(python, ["-m", "jupyter_server", "--no-browser", "--ServerApp.ip=127.0.0.1", `--ServerApp.port=${port}`,
    "--ServerApp.port_retries=0", `--ServerApp.token=${token}`, `--ServerApp.allow_origin=${allowOrigin}`,
    `--ServerApp.root_dir=${root}`, ...(process.getuid?.() === 0 ? ["--allow-root"] : [])], {
    cwd: root,
    env: { ...process.env, JUPYTER_PATH: kernel.jupyterPath, JUPYTER_CONFIG_DIR: path.join(tmp, "config"),
      JUPYTER_DATA_DIR: path.join(tmp, "data"), JUPYTER_RUNTIME_DIR: path.join(tmp, "runtime") },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout!.on("data", (d) => (output += d));
  child.stderr!.on("data", (d) => (output += d));
  const server: TestJupyter = { process: child, kernel, baseUrl: `http://127.0.0.1:${port}/`, token, log: () => output.slice(-3000) };
  for (let i = 0; i < 240; i++) {
    if (child.exitCode !== null) {
      await stopTestServers({ jupyter: server });
      throw new Error(`jupyter-server exited with ${child.exitCode}:\n${server.log()}`);
    }
    const ok = await fetch(`${server.baseUrl}api/status`, { headers: { Authorization: `token ${token}` } }).then((r) => r.ok, () => false);
    if (ok) return server;
    await new Promise((r) => setTimeout(r, 250));
  }
  await stopTestServers({ jupyter: server });
  throw new Error(`jupyter-server did not answer within 60 s:\n${server.log()}`);
}

/** Stops what a browser test started: jupyter-server (SIGTERM, then SIGKILL after 1.5 s), its kernel prefix, the page server, the temp folder. */
export async function stopTestServers(parts: { jupyter?: TestJupyter | null; pageServer?: Server | null; tmp?: string }): Promise<void> {
  const child = parts.jupyter?.process;
  if (child && child.exitCode === null) {
    child.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 1500));
    if (child.exitCode === null) child.kill("SIGKILL");
  }
  await new Promise((r) => (parts.pageServer ? parts.pageServer.close(r) : r(undefined)));
  parts.jupyter?.kernel.dispose();
  if (parts.tmp) rmSync(parts.tmp, { recursive: true, force: true });
}
