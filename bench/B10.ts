// B10 of ../shared/bench/PROBLEMS.md: B1-like profiles (4096 pixels, as B3) fitted as a Slurm
// array job with K tasks (one CPU each) on a Slurm cluster — locally the one-node cluster of
// scripts/slurm-local.sh, started here when no cluster answers and stopped at the end — then
// merged and compared with the one-machine batch (all cores) of the same list in the same run.
// Printed: wall times, the rate, the per-task times from the task logs, and from them the
// per-task overhead and the per-profile cost used in the README to size a job.
// B10_PROFILES (default 2000) and B10_TASKS (default 4) change the run.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { availableParallelism, tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { childrenCpuSeconds, writeProfiles } from "./B3.js";

const BIN = fileURLToPath(new URL("../bin/fringekit.js", import.meta.url));
const SLURM_LOCAL = fileURLToPath(new URL("../scripts/slurm-local.sh", import.meta.url));

function load(): string {
  return readFileSync("/proc/loadavg", "utf8").split(" ").slice(0, 3).join(" ");
}

function sh(command: string, args: string[], cwd?: string): { code: number; stdout: string; stderr: string } {
  const run = spawnSync(command, args, { encoding: "utf8", cwd, env: process.env });
  return { code: run.status ?? -1, stdout: run.stdout ?? "", stderr: run.stderr ?? String(run.error ?? "") };
}

function clusterUp(): boolean {
  const probe = sh("sinfo", ["-h", "-o", "%T"]);
  return probe.code === 0 && /idle|mixed|allocated/.test(probe.stdout);
}

/** Runs B10 and prints the figures; the last line is the summary. */
export async function main(): Promise<void> {
  const count = Number(process.env["B10_PROFILES"] ?? 2000);
  const tasks = Number(process.env["B10_TASKS"] ?? 4);
  let started = false;
  if (!clusterUp()) {
    const up = sh(SLURM_LOCAL, ["start"]);
    if (up.code !== 0) throw new Error(`B10 needs a Slurm cluster: scripts/slurm-local.sh start failed: ${up.stderr.trim()}`);
    process.env["SLURM_CONF"] = up.stdout.trim().replace(/^export SLURM_CONF=/, "");
    started = true;
  }
  const dir = mkdtempSync(join(tmpdir(), "fringekit-b10-"));
  try {
    writeFileSync(join(dir, "inputs.txt"), `${writeProfiles(dir, count).join("\n")}\n`);
    const cores = availableParallelism();
    const loadLocal = load();
    const cpu0 = childrenCpuSeconds();
    const t0 = performance.now();
    const local = sh(process.execPath, [BIN, "batch", "--list", "inputs.txt", "--fix", "pixelWidth=5.5um", "--quiet", "--out", "local.csv"], dir);
    const localSeconds = (performance.now() - t0) / 1000;
    const localCpu = childrenCpuSeconds() - cpu0;
    if (local.code > 1) throw new Error(`local batch failed: ${local.stderr}`);
    console.log(`B10 one machine (${cores} worker threads): ${localSeconds.toFixed(1)} s wall, ${localCpu.toFixed(1)} s CPU, ${(count / localSeconds).toFixed(1)} profiles/s   (loadavg ${loadLocal})`);

    const script = sh(process.execPath, [BIN, "batch", "--list", "inputs.txt", "--fix", "pixelWidth=5.5um", "--jobs", "1", "--slurm-script", "job.sh", "--tasks", String(tasks), "--out", "parts/results.csv"], dir);
    if (script.code !== 0) throw new Error(`job script: ${script.stderr}`);
    const loadSlurm = load();
    const t1 = performance.now();
    const submitted = sh("sbatch", ["--parsable", "job.sh"], dir);
    const job = submitted.stdout.trim().split(";")[0];
    if (submitted.code !== 0 || !job) throw new Error(`sbatch failed: ${submitted.stderr}`);
    const deadline = Date.now() + 3 * 3600_000;
    while (sh("squeue", ["-h", "-j", job]).stdout.trim() !== "") {
      if (Date.now() > deadline) { sh("scancel", [job]); throw new Error(`job ${job} did not finish in 3 h`); }
      await new Promise((r) => setTimeout(r, 1000));
    }
    const slurmSeconds = (performance.now() - t1) / 1000;
    const merge = sh(process.execPath, [BIN, "merge", "parts", "--out", "merged.csv"], dir);
    const same = merge.code <= 1 && readFileSync(join(dir, "merged.csv"), "utf8") === readFileSync(join(dir, "local.csv"), "utf8");
    const logs = readdirSync(join(dir, "parts", "logs")).filter((n) => n.startsWith(`fringekit-${job}_`));
    const taskSeconds = logs.map((n) => Number(/took (?:(\d+) min )?(\d+) s/.exec(readFileSync(join(dir, "parts", "logs", n), "utf8"))?.slice(1).reduce((a, v, i) => a + (i === 0 ? 60 * Number(v ?? 0) : Number(v)), 0) ?? NaN));
    console.log(`B10 Slurm array ${tasks} tasks × 1 CPU on ${cores} CPUs: ${slurmSeconds.toFixed(1)} s from sbatch to done, ${(count / slurmSeconds).toFixed(1)} profiles/s; fitting time per task (from its log) ${taskSeconds.map((s) => `${s} s`).join(", ")}   (loadavg ${loadSlurm})`);
    // Sizing model: a task's wall time ≈ overhead + (profiles per task) × cost per profile on one CPU.
    // Both terms from this run: the fitting part from the task logs (first to last row), the
    // overhead as what is left of each wave of `cores` concurrent tasks (scheduling, Node and
    // library start in the main thread and the worker thread, merge of nothing).
    const meanTask = taskSeconds.reduce((a, b) => a + b, 0) / taskSeconds.length;
    const waves = Math.ceil(tasks / cores);
    const overhead = slurmSeconds / waves - meanTask;
    const perProfile = meanTask / (count / tasks);
    console.log(`B10 sizing (load averages above): fitting ≈ ${(perProfile * 1000).toFixed(0)} ms per profile per CPU (task logs), ${((localCpu / count) * 1000).toFixed(0)} ms CPU per profile in the one-machine run (start-up included); per-task overhead ≈ ${overhead.toFixed(1)} s (wall per wave of ${cores} tasks minus its fitting)`);
    if (!same) console.log(`B10 merge: ${merge.stderr.trim()}`);
    console.log(`B10 slurm array ${tasks} tasks: ${(count / slurmSeconds).toFixed(1)} profiles/s, merged ${same ? "==" : "!="} local (one machine ${(count / localSeconds).toFixed(1)} profiles/s, ${count} profiles)`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
    if (started) sh(SLURM_LOCAL, ["stop"]);
  }
}
