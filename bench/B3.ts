// B3 of ../shared/bench/PROBLEMS.md: B1-like profiles (4096 pixels, seeds 1…N) written as CSV
// files and fitted by the built command `fringekit batch`, on 1 core and on N cores (N = the CPUs
// this process may use). What the two runs are:
//   "1 core":  `--jobs 1` (the fits run in the main thread, no worker thread), the whole process —
//              main thread and V8's garbage-collector and compiler threads — pinned to one CPU
//              with taskset, so it cannot borrow an idle second CPU for its background work.
//   "N cores": `--jobs N` (N worker threads read, parse and fit their inputs; the main thread
//              hands out paths and appends the rows), the whole process pinned to N CPUs.
// Without taskset (not Linux) both run unpinned and the line says so; the 1-core figure then
// includes V8's background threads on the other CPUs (about 10 % more CPU than wall time).
// The two runs alternate (1, N, 1, N, …) so that a change of the machine's load hits both; the
// figure is the ratio of the medians. Also printed: the CPU time of each run (user + system of
// the child, from /proc) — the CPU ratio shows the overhead of the parallel run even when the
// wall-clock speed-up cannot — and the start time of each worker thread.
// B3_PROFILES=600 B3_PAIRS=3 make a quicker run (defaults 2000 profiles, 3 pairs).
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { availableParallelism, tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { getModel, pixelPositions, simulateProfile } from "../src/physics/index.js";

const BIN = fileURLToPath(new URL("../bin/fringekit.js", import.meta.url));
const BUILT = new URL("../dist/cli/main.js", import.meta.url);
// B1 truth (SI); pixel averaging over the 5.5 µm pitch as in B1.
const TRUTH = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1, pixelWidth: 5.5e-6 };

/** Writes `count` B1-like profiles as CSV files into `dir`; returns their paths. */
export function writeProfiles(dir: string, count: number): string[] {
  const model = getModel("two-slit");
  const x = pixelPositions(4096, 5.5e-6);
  const files: string[] = [];
  for (let seed = 1; seed <= count; seed++) {
    const data = simulateProfile(model, TRUTH, x, { noise: "poisson", seed });
    const lines = ["position [mm],intensity (counts)"];
    for (let i = 0; i < x.length; i++) lines.push(`${(x[i]! * 1e3).toFixed(7)},${data.y[i]}`);
    const path = join(dir, `b3-${String(seed).padStart(4, "0")}.csv`);
    writeFileSync(path, `${lines.join("\n")}\n`);
    files.push(path);
  }
  return files;
}

/** CPU seconds (user + system) of this process's waited-for children, from /proc/self/stat. */
export function childrenCpuSeconds(): number {
  const fields = readFileSync("/proc/self/stat", "utf8").replace(/^.*\) /, "").split(" ");
  // Fields after the command: state is index 0, so cutime (16th field of the file) is index 13, cstime 14; clock ticks of 1/100 s (common practice on Linux).
  return (Number(fields[13]) + Number(fields[14])) / 100;
}

/**
 * The CPUs this process may run on (Linux: Cpus_allowed_list of /proc/self/status, e.g. "0-3,6"),
 * or undefined where that cannot be read.
 */
export function allowedCpus(): number[] | undefined {
  try {
    const list = /^Cpus_allowed_list:\s*(\S+)/m.exec(readFileSync("/proc/self/status", "utf8"))?.[1];
    if (list === undefined) return undefined;
    return list.split(",").flatMap((range) => {
      const [from, to] = range.split("-").map(Number) as [number, number | undefined];
      return Array.from({ length: (to ?? from) - from + 1 }, (_, i) => from + i);
    });
  } catch {
    return undefined;
  }
}

/** The command prefix that pins a child process to `cpus` (empty without taskset). */
function pinning(cpus: readonly number[] | undefined): string[] {
  if (cpus === undefined || spawnSync("taskset", ["-c", String(cpus[0]), "true"]).status !== 0) return [];
  return ["taskset", "-c", cpus.join(",")];
}

interface Run { seconds: number; cpu: number; ok: number; workerStart: string; load: string }

function batch(listFile: string, jobs: number, out: string, pin: readonly string[]): Run {
  const load = readFileSync("/proc/loadavg", "utf8").split(" ").slice(0, 3).join(" ");
  const cpu0 = childrenCpuSeconds();
  const t0 = performance.now();
  const argv = [...pin, process.execPath, BIN, "batch", "--list", listFile, "--fix", "pixelWidth=5.5um", "--jobs", String(jobs), "--quiet", "--out", out];
  const run = spawnSync(argv[0]!, argv.slice(1), { encoding: "utf8" });
  const seconds = (performance.now() - t0) / 1000;
  const cpu = childrenCpuSeconds() - cpu0;
  if (run.status !== 0 && run.status !== 1) throw new Error(`fringekit batch failed (exit ${run.status}): ${run.stderr}`);
  const rows = readFileSync(out, "utf8").trim().split("\n").slice(1);
  const workerStart = /worker threads started in ([\d.]+ s–[\d.]+ s)/.exec(run.stderr)?.[1] ?? "-";
  return { seconds, cpu, ok: rows.filter((r) => r.split(",")[1] === "ok").length, workerStart, load };
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
}

/** Runs B3 and prints the figures; the last line is the summary. */
export async function main(): Promise<void> {
  if (!existsSync(BUILT)) throw new Error("B3 runs the built command: run `npm run build` first");
  const count = Number(process.env["B3_PROFILES"] ?? 2000);
  const pairs = Number(process.env["B3_PAIRS"] ?? 3);
  const cpus = allowedCpus();
  const cores = cpus?.length ?? availableParallelism();
  const pinOne = pinning(cpus?.slice(0, 1));
  const pinAll = pinning(cpus);
  console.log(pinOne.length > 0
    ? `B3 "1 core" = --jobs 1 (fits in the main thread), whole process pinned to CPU ${cpus![0]} (taskset); "${cores} cores" = --jobs ${cores} (worker threads), whole process pinned to CPUs ${cpus!.join(",")}`
    : `B3 "1 core" = --jobs 1 (fits in the main thread), "${cores} cores" = --jobs ${cores} (worker threads); not pinned (no taskset): the 1-core run may use other CPUs for V8's background threads`);
  const dir = mkdtempSync(join(tmpdir(), "fringekit-b3-"));
  try {
    const list = join(dir, "inputs.txt");
    writeFileSync(list, `${writeProfiles(dir, count).join("\n")}\n`);
    const one: Run[] = [], all: Run[] = [];
    for (let pair = 1; pair <= pairs; pair++) {
      const a = batch(list, 1, join(dir, "one.csv"), pinOne);
      one.push(a);
      console.log(`B3 pair ${pair}: 1 core  ${a.seconds.toFixed(1)} s wall, ${a.cpu.toFixed(1)} s CPU, ${a.ok}/${count} converged   (loadavg ${a.load})`);
      const b = batch(list, cores, join(dir, "all.csv"), pinAll);
      all.push(b);
      console.log(`B3 pair ${pair}: ${cores} cores ${b.seconds.toFixed(1)} s wall, ${b.cpu.toFixed(1)} s CPU, ${b.ok}/${count} converged, worker start ${b.workerStart}   (loadavg ${b.load})`);
    }
    const t1 = median(one.map((r) => r.seconds)), tN = median(all.map((r) => r.seconds));
    const c1 = median(one.map((r) => r.cpu)), cN = median(all.map((r) => r.cpu));
    console.log(`B3 CPU time ${cores} cores / 1 core: ${(cN / c1).toFixed(2)} (1.00 = the parallel run does no extra work; the rest is worker start-up and hand-over); times include process start and file reading; load averages above`);
    console.log(`B3 batch ${(count / t1).toFixed(1)} profiles/s on 1 core, ${(count / tN).toFixed(1)} on ${cores} cores (speed-up ${(t1 / tN).toFixed(2)}, median of ${pairs} interleaved pairs, ${count} profiles${pinOne.length > 0 ? ", pinned with taskset" : ", not pinned"})`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
