/**
 * The fringekit kernel process: `node launch.js CONNECTION_FILE` (written into the kernelspec
 * by installKernelspec). When a verified start-up snapshot fits this Node and TypeScript (see
 * startSnapshot.ts), the kernel runs in a child `node --snapshot-blob BLOB launch.js` (the
 * snapshot cannot be chosen after Node has started), which this process watches: it forwards
 * interrupt and termination signals, exits with the child's status, and the child exits when
 * this process is gone. Should the child die before reporting that it started from the
 * snapshot, the blob is set aside and the kernel starts here as it would without one. Otherwise
 * the kernel (kernelMain.ts) starts in this process.
 *
 * `launch.js --check-snapshot KEY` (run by buildSnapshot.ts under `--snapshot-blob`) prints
 * `ok KEY FILES` when the snapshot's state is there and intact; `launch.js --snapshot-status`
 * prints the blob a kernel would start from, or `none`.
 */
import { spawn } from "node:child_process";
import { rmSync } from "node:fs";
import { createRequire } from "node:module";
import { constants } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { cacheDir } from "./codeCache.js";
import { currentSnapshot, snapshotBuildFailed, snapshotsDisabled, usableSnapshot, type KernelSnapshot } from "./startSnapshot.js";

/** Variable marking the child started from the snapshot (its value: the blob's path). */
const CHILD_MARK = "FRINGEKIT_KERNEL_SNAPSHOT_CHILD";
/** Message the child sends once it runs from the snapshot, before it opens any socket. */
const STARTED = "fringekit-kernel-snapshot-started";
/** Signals passed on to the child (interrupt, and the ways a frontend ends a kernel). */
const FORWARDED_SIGNALS = ["SIGINT", "SIGTERM", "SIGHUP"] as const;

const log = (line: string) => void process.stderr.write(`[fringekit kernel] ${line}\n`);

/** TypeScript for tslab as tslab resolves it, or undefined when it cannot be found. */
function typescriptPath(): string | undefined {
  try {
    const require = createRequire(import.meta.url);
    const tslabRoot = path.dirname(require.resolve("tslab/package.json"));
    return require.resolve("@tslab/typescript-for-tslab", { paths: [tslabRoot] });
  } catch {
    return undefined; // loadTslab reports it properly
  }
}

async function startHere(configPath: string, snapshot: KernelSnapshot | undefined, buildSnapshot: boolean): Promise<void> {
  const { startFringekitKernel } = await import("./kernelMain.js");
  startFringekitKernel(configPath, { snapshot, buildSnapshot });
}

/** Runs the kernel in a child started from `blob`; falls back to `fallback` if it cannot start. */
function startFromSnapshot(blob: string, configPath: string, fallback: () => void): void {
  const child = spawn(process.execPath, ["--snapshot-blob", blob, fileURLToPath(import.meta.url), configPath], {
    // Its own process group: a signal to this kernel's group reaches it once, through here.
    detached: true,
    stdio: ["ignore", "inherit", "inherit", "ipc"],
    env: { ...process.env, [CHILD_MARK]: blob },
  });
  let started = false;
  child.on("message", (message) => {
    if (message === STARTED) started = true;
  });
  const forward = (signal: NodeJS.Signals) => () => void child.kill(signal);
  for (const signal of FORWARDED_SIGNALS) process.on(signal, forward(signal));
  let settled = false;
  const settle = (code: number | null, signal: NodeJS.Signals | null) => {
    if (settled) return;
    settled = true;
    // Exit as the kernel did (a signal's status as a shell reports it).
    if (started) process.exit(code ?? 128 + (signal ? constants.signals[signal] : 1));
    for (const name of FORWARDED_SIGNALS) process.removeAllListeners(name);
    log(`the start-up snapshot did not start (${code ?? signal}); it is set aside and the kernel starts without it`);
    rmSync(blob, { force: true });
    fallback();
  };
  child.on("error", () => settle(null, null));
  child.on("close", settle); // after its messages, unlike "exit"
}

function main(argv: string[]): void {
  const snapshot = currentSnapshot();
  if (argv[0] === "--check-snapshot") {
    // TypeScript memoizes the working directory at its first use: it must not have been used
    // while the snapshot was built (buildSnapshot.ts runs this check in another folder).
    const ts = snapshot?.typescript as { createSourceFile?: unknown; sys?: { getCurrentDirectory(): string } } | undefined;
    const ok = !!snapshot && snapshot.key === argv[1] && typeof ts?.createSourceFile === "function" && ts.sys?.getCurrentDirectory() === process.cwd();
    process.stdout.write(ok ? `ok ${snapshot!.key} ${snapshot!.files.size}\n` : "no snapshot\n");
    process.exit(ok ? 0 : 1);
  }
  if (argv[0] === "--snapshot-status") {
    const ts = typescriptPath();
    process.stdout.write(`${(ts && !snapshotsDisabled() && usableSnapshot(cacheDir(), ts)) || "none"}\n`);
    return;
  }
  const configPath = argv[0];
  if (!configPath) {
    log("usage: node launch.js CONNECTION_FILE (Jupyter passes {connection_file})");
    process.exit(2);
  }
  const fail = (error: unknown) => {
    log((error as Error)?.message ?? String(error));
    process.exit(1);
  };
  if (process.env[CHILD_MARK]) {
    // The child: tell the parent it runs from the snapshot; end with it (it may be killed).
    delete process.env[CHILD_MARK];
    process.send?.(STARTED);
    process.on("disconnect", () => process.exit(0));
    process.channel?.unref();
    // Processes the kernel's cells start should not start from the snapshot too.
    const at = process.execArgv.indexOf("--snapshot-blob");
    if (at >= 0) process.execArgv.splice(at, 2);
    startHere(configPath, snapshot, true).catch(fail);
    return;
  }
  const dir = cacheDir();
  const ts = snapshotsDisabled() ? undefined : typescriptPath();
  const blob = ts ? usableSnapshot(dir, ts) : undefined;
  if (blob) startFromSnapshot(blob, configPath, () => void startHere(configPath, undefined, false).catch(fail));
  else startHere(configPath, undefined, !!ts && !snapshotBuildFailed(dir, ts)).catch(fail);
}

main(process.argv.slice(2));
