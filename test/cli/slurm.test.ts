// A real Slurm array job (the one-node cluster of scripts/slurm-local.sh, which .ci/run starts):
// `fringekit batch --slurm-script` → sbatch → squeue until done → `fringekit merge`, checked
// against the one-machine batch of the same inputs in the same test (issue 15's reference).
// Skipped with a message when no cluster answers, except in CI (FRINGEKIT_SLURM_REQUIRED=1).
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { getModel, pixelPositions, simulateProfile } from "../../src/index.js";
import { runCli } from "./runCli.js";

const required = process.env["FRINGEKIT_SLURM_REQUIRED"] === "1";
const defaultConf = join(process.env["TMPDIR"] ?? "/tmp", `fringekit-slurm-${process.getuid?.() ?? 0}`, "slurm.conf");
const env = { ...process.env, ...(process.env["SLURM_CONF"] === undefined && existsSync(defaultConf) ? { SLURM_CONF: defaultConf } : {}) };

function slurm(command: string, args: string[]): { code: number; stdout: string; stderr: string } {
  const run = spawnSync(command, args, { env, encoding: "utf8", timeout: 30_000 });
  return { code: run.status ?? -1, stdout: run.stdout ?? "", stderr: run.stderr ?? String(run.error ?? "") };
}

const probe = slurm("sinfo", ["-h", "-o", "%T"]);
const reachable = probe.code === 0 && /idle|mixed|allocated/.test(probe.stdout);
if (!reachable && !required) console.warn(`slurm.test.ts skipped: no Slurm cluster answers sinfo (${probe.stderr.trim() || probe.stdout.trim() || "not installed"}); start one with scripts/slurm-local.sh start (as root) or run under .ci/run`);

// B1-like camera lines (../shared/bench/PROBLEMS.md) on 512 pixels: quick fits, real solver work.
const TRUTH = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1 };
const COUNT = 240;
const work = mkdtempSync(join(tmpdir(), "fringekit-slurm-test-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** Submits the script (optionally some array tasks only) and waits until none of its tasks is queued or running. */
async function submitAndWait(script: string, extra: string[], timeoutMs: number): Promise<string> {
  const submitted = slurm("sbatch", ["--parsable", ...extra, script]);
  expect(submitted.stderr).toBe("");
  const job = submitted.stdout.trim().split(";")[0]!;
  expect(job).toMatch(/^\d+$/);
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const queue = slurm("squeue", ["-h", "-j", job, "-o", "%i %T"]);
    if (queue.code === 0 && queue.stdout.trim() === "") return job;
    await new Promise((r) => setTimeout(r, 1000));
  }
  slurm("scancel", [job]);
  throw new Error(`Slurm job ${job} did not finish within ${timeoutMs / 1000} s (cancelled)`);
}

// The cluster of scripts/slurm-local.sh (its slurm.conf says so) must not be reachable from the network.
const confPath = env["SLURM_CONF"];
const localCluster = confPath !== undefined && existsSync(confPath) && readFileSync(confPath, "utf8").includes("written by scripts/slurm-local.sh");
const hasSs = spawnSync("ss", ["-V"], { encoding: "utf8" }).status === 0;

describe.runIf(reachable && localCluster && hasSs)("scripts/slurm-local.sh", () => {
  it("slurmctld and slurmd listen on 127.0.0.1 only (ss -ltnp, their pid files)", () => {
    const folder = confPath!.replace(/\/slurm\.conf$/, "");
    const pids = ["slurmctld.pid", "slurmd.pid"].map((name) => readFileSync(join(folder, name), "utf8").trim());
    const sockets = spawnSync("ss", ["-Hltnp"], { encoding: "utf8" }).stdout.split("\n").filter((line) => pids.some((pid) => line.includes(`pid=${pid},`)));
    // Both daemons listen (so the check cannot pass vacuously), and every local address is loopback.
    expect(pids.every((pid) => sockets.some((line) => line.includes(`pid=${pid},`))), sockets.join("\n")).toBe(true);
    for (const line of sockets) expect(line.trim().split(/\s+/)[3], line).toMatch(/^127\.0\.0\.1:\d+$/);
  });
});

describe.runIf(reachable || required)("fringekit batch --slurm-script on a Slurm cluster, fringekit merge", () => {
  it(`sbatch of a 4-task array over ${COUNT} profiles, merged == one-machine batch; a lost shard is named by merge and re-run alone`, async () => {
    expect(reachable, `CI needs the Slurm cluster of scripts/slurm-local.sh (sinfo said: ${probe.stderr.trim() || probe.stdout.trim()})`).toBe(true);
    const data = join(work, "data");
    mkdirSync(data);
    const x = pixelPositions(512, 5.5e-6);
    for (let seed = 1; seed <= COUNT; seed++) {
      const y = simulateProfile(getModel("two-slit"), TRUTH, x, { noise: "poisson", seed }).y;
      writeFileSync(join(data, `p${String(seed).padStart(4, "0")}.csv`), `position [mm],intensity (counts)\n${Array.from(x, (xi, i) => `${(xi * 1e3).toFixed(6)},${y[i]}`).join("\n")}\n`);
    }
    const local = join(work, "local.csv");
    const one = runCli(["batch", data, "--quiet", "--out", local], { cwd: work, timeout: 600_000 });
    expect(one.code).toBe(0);

    const script = join(work, "job.sh");
    const written = runCli(["batch", "data", "--jobs", "1", "--slurm-script", script, "--tasks", "4", "--out", "parts/results.csv"], { cwd: work });
    expect(written.code, written.stderr).toBe(0);
    const job = await submitAndWait(script, [], 600_000);
    const logs = readdirSync(join(work, "parts", "logs")).filter((n) => n.startsWith(`fringekit-${job}_`)).sort();
    expect(logs).toEqual([1, 2, 3, 4].map((i) => `fringekit-${job}_${i}.log`));
    for (let i = 1; i <= 4; i++) expect(readFileSync(join(work, "parts", "logs", logs[i - 1]!), "utf8")).toMatch(new RegExp(`shard ${i}/4: ${COUNT / 4} of ${COUNT} inputs`));

    // Lose shard 3 (as a node failure would), let merge name it, then re-run that task alone.
    rmSync(join(work, "parts", "results.part-3-of-4.jsonl"));
    const refused = runCli(["merge", "parts", "--out", "merged.csv"], { cwd: work });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/shard 3 of 4 missing .*sbatch --array=3 job\.sh/);
    await submitAndWait(script, ["--array=3"], 600_000);

    const merged = runCli(["merge", "parts", "--out", "merged.csv"], { cwd: work });
    expect(merged.code, merged.stderr).toBe(0);
    // Equal to the last printed digit: every cell as text (the rows hold no timing columns); files
    // are named as given, relative here, absolute in the local run — compare the names only.
    const table = (path: string): string[][] => readFileSync(path, "utf8").trim().split("\n").map((r) => r.split(","));
    const a = table(local), b = table(join(work, "merged.csv"));
    expect(b).toHaveLength(COUNT + 1);
    expect(b[0]).toEqual(a[0]);
    for (let r = 1; r <= COUNT; r++) {
      expect(b[r]![0]!.split("/").pop()).toBe(a[r]![0]!.split("/").pop());
      expect(b[r]!.slice(1)).toEqual(a[r]!.slice(1));
    }
  }, 1_500_000);
});
