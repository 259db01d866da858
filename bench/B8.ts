// B8 of ../shared/bench/PROBLEMS.md: notebook latency through jupyter_client. Kernel start until
// kernel_info answers, a first cell importing the main entry point, a trivial cell (median of 5
// per start): the fringekit kernel against ipykernel (Debian python3-ipykernel) with
// `import numpy, scipy.optimize` as its first cell, and plain tslab 1.0.22 (the floor the
// fringekit kernel is built on), interleaved round by round in one driver
// (bench/reference/kernel_latency.py). Medians over rounds. The timed rounds measure a kernel
// that has its caches (TypeScript's code cache, the start-up snapshot): when they are missing,
// one warm-up start (not timed against anything) writes them first, and its start is printed.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { loadavg, tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { PYTHON } from "./B1.js";

const HERE = dirname(fileURLToPath(import.meta.url));
const ROOT = dirname(HERE);
const ROUNDS = 3;
const TRIVIAL = 5;

/** Longest wait for the warm-up start's snapshot build, ms. */
const SNAPSHOT_WAIT_MS = 120_000;

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]!;
const sleep = (ms: number) => new Promise((done) => setTimeout(done, ms));

/** The start-up snapshot the built kernel would use, or undefined (see launch.ts). */
function snapshotStatus(): string | undefined {
  const run = spawnSync(process.execPath, [join(ROOT, "dist/kernel-ext/launch.js"), "--snapshot-status"], { encoding: "utf8" });
  const answer = run.stdout.trim();
  return run.status === 0 && answer !== "none" ? answer : undefined;
}
const load = () => loadavg().map((v) => v.toFixed(2)).join(" ");

export async function main(): Promise<void> {
  if (!existsSync(join(ROOT, "dist/kernel-ext/launch.js"))) throw new Error("B8 needs the built kernel: run `npm run build` first");
  if (spawnSync(PYTHON, ["-c", "import jupyter_client, ipykernel, numpy, scipy"], { stdio: "ignore" }).status !== 0) {
    throw new Error("B8 needs Debian's python3-jupyter-client, python3-ipykernel and python3-scipy");
  }
  const prefix = mkdtempSync(join(tmpdir(), "fringekit-b8-"));
  try {
    const install = spawnSync(process.execPath, [join(ROOT, "dist/kernel-ext/install-cli.js"), "--prefix", prefix], { encoding: "utf8" });
    if (install.status !== 0) throw new Error(`kernelspec install failed: ${install.stderr}`);
    // Plain tslab, as its own kernelspec does it (`tslab kernel --config-path FILE`).
    const tslabBin = join(dirname(createRequire(import.meta.url).resolve("tslab/package.json")), "bin", "tslab");
    const plain = join(prefix, "share", "jupyter", "kernels", "tslab-plain");
    mkdirSync(plain, { recursive: true });
    writeFileSync(join(plain, "kernel.json"), JSON.stringify({ argv: [process.execPath, tslabBin, "kernel", "--config-path", "{connection_file}"], display_name: "tslab (plain)", language: "typescript" }));
    // The same kernel with its start-up snapshot turned off, interleaved: the snapshot's effect.
    const spec = JSON.parse(readFileSync(join(prefix, "share", "jupyter", "kernels", "fringekit", "kernel.json"), "utf8"));
    const noSnapshot = join(prefix, "share", "jupyter", "kernels", "fringekit-no-snapshot");
    mkdirSync(noSnapshot, { recursive: true });
    writeFileSync(join(noSnapshot, "kernel.json"), JSON.stringify({ ...spec, env: { ...spec.env, FRINGEKIT_KERNEL_SNAPSHOT: "0" } }));
    const fringekitFirst = 'import * as fk from "fringekit";\nfk.getModel("two-slit").id';
    const job = {
      rounds: ROUNDS,
      trivial: TRIVIAL,
      kernels: [
        { name: "fringekit", first: fringekitFirst, trivial: "1 + 1", cwd: ROOT },
        { name: "fringekit-no-snapshot", first: fringekitFirst, trivial: "1 + 1", cwd: ROOT },
        { name: "python3", first: "import numpy, scipy.optimize", trivial: "1 + 1", cwd: ROOT },
        { name: "tslab-plain", first: 'import * as path from "path";\npath.sep', trivial: "1 + 1", cwd: ROOT },
      ],
    };
    const env = { ...process.env, JUPYTER_PATH: join(prefix, "share", "jupyter") };
    const drive = (driverJob: object) => {
      const run = spawnSync(PYTHON, [join(HERE, "reference", "kernel_latency.py"), JSON.stringify(driverJob)], { encoding: "utf8", cwd: ROOT, env, timeout: 1_800_000 });
      if (run.status !== 0) throw new Error(`kernel driver failed (exit ${run.status}): ${run.stderr}`);
      return JSON.parse(run.stdout) as Record<string, { start: number[]; first: number[]; trivial: number[] }>;
    };
    let caches = "present";
    if (!snapshotStatus()) {
      // A kernel writes its caches a few seconds after a start that had none (in the background).
      const warm = drive({ rounds: 1, trivial: 1, hold: 5, kernels: [job.kernels[0]] });
      const until = Date.now() + SNAPSHOT_WAIT_MS;
      while (!snapshotStatus() && Date.now() < until) await sleep(1000);
      caches = `${snapshotStatus() ? "written" : "NOT written"} by a warm-up start (${warm.fringekit!.start[0]!.toFixed(2)} s without them)`;
    }
    process.stdout.write(`B8 running ${ROUNDS} interleaved rounds (loadavg ${load()}; kernel caches ${caches})\n`);
    const t = drive(job);
    const m = (name: string, key: "start" | "first" | "trivial") => median(t[name]![key]);
    for (const name of Object.keys(t)) {
      process.stdout.write(`B8 ${name}: start ${m(name, "start").toFixed(2)} s, first cell ${m(name, "first").toFixed(2)} s, trivial cell ${(m(name, "trivial") * 1000).toFixed(0)} ms\n`);
    }
    process.stdout.write(`B8 load average ${load()}; fringekit start over plain tslab ${(m("fringekit", "start") / m("tslab-plain", "start")).toFixed(2)}, trivial cell over plain tslab ${(m("fringekit", "trivial") / m("tslab-plain", "trivial")).toFixed(2)}\n`);
    const r = (key: "start" | "first" | "trivial") => (m("fringekit", key) / m("python3", key)).toFixed(2);
    process.stdout.write(`B8 kernel start ratio ${r("start")}, first cell ratio ${r("first")}, trivial cell ratio ${r("trivial")} (${(m("fringekit", "trivial") * 1000).toFixed(0)} ms)\n`);
  } finally {
    rmSync(prefix, { recursive: true, force: true });
  }
}
