// A kernel whose connection file names a port another process already holds must stop at once
// with a message saying so (tslab alone logs the failed bind and keeps running, deaf on that
// socket, so the frontend waits for it until its start-up timeout).
import { spawn } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { createServer, type Server } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { launcher } from "./helpers.js";

/** A free port on 127.0.0.1, found by listening on port 0 (common practice). */
function listen(): Promise<Server> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => resolve(server));
  });
}
const portOf = (server: Server) => (server.address() as { port: number }).port;

describe.skipIf(!existsSync(launcher))("kernel with a port already in use", () => {
  const work = mkdtempSync(path.join(tmpdir(), "fringekit-busy-port-"));
  const servers: Server[] = [];
  afterAll(() => {
    for (const s of servers) s.close();
    rmSync(work, { recursive: true, force: true });
  });

  it("launch.js CONNECTION_FILE exits with status 1 and names the port when the shell port is taken", async () => {
    const busy = await listen();
    servers.push(busy);
    // Four more free ports: listened on and closed before the kernel starts.
    const others: number[] = [];
    for (let i = 0; i < 4; i++) {
      const s = await listen();
      others.push(portOf(s));
      await new Promise((r) => s.close(r));
    }
    const connection = path.join(work, "kernel.json");
    writeFileSync(connection, JSON.stringify({
      transport: "tcp", ip: "127.0.0.1", shell_port: portOf(busy), iopub_port: others[0], control_port: others[1],
      stdin_port: others[2], hb_port: others[3], key: "test-key", signature_scheme: "hmac-sha256", kernel_name: "fringekit",
    }));
    const child = spawn(process.execPath, [launcher, connection], { stdio: ["ignore", "ignore", "pipe"], env: { ...process.env, FRINGEKIT_KERNEL_SNAPSHOT: "0" } });
    let stderr = "";
    child.stderr.on("data", (chunk) => (stderr += chunk));
    const timer = setTimeout(() => child.kill("SIGKILL"), 30_000);
    const code = await new Promise<number | null>((resolve) => child.on("close", resolve));
    clearTimeout(timer);
    expect(code).toBe(1);
    expect(stderr).toContain(`cannot listen on port ${portOf(busy)} of the connection file: the address is already in use`);
  }, 40_000);
});
