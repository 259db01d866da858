import { spawn } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batchCsv, spreadsheetSafe, type BatchRow } from "../../cli/batchRow.js";
import { parseShard, shardFromSlurm, shardPositions } from "../../cli/batchShard.js";
import { getModel, pixelPositions, simulateProfile } from "../../src/index.js";
import { writeTiff } from "../io/writeTiff.js";
import { runCli, runInProcess } from "./runCli.js";

// B1-like camera lines (../shared/bench/PROBLEMS.md) on 512 pixels so that each fit is quick;
// the values compared are those of the one-machine batch in the same test (the reference a
// sharded run must reproduce, issue 15), counts are hand counts of the inputs made here.
const TRUTH = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1 };
const work = mkdtempSync(join(tmpdir(), "fringekit-shards-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function line(seed: number, pixels = 512): Float64Array {
  return simulateProfile(getModel("two-slit"), TRUTH, pixelPositions(pixels, 5.5e-6), { noise: "poisson", seed }).y as Float64Array;
}

function writeLines(folder: string, count: number): string[] {
  mkdirSync(folder, { recursive: true });
  const x = pixelPositions(512, 5.5e-6);
  return Array.from({ length: count }, (_, i) => {
    const y = line(100 + i);
    const path = join(folder, `line-${String(i + 1).padStart(3, "0")}.csv`);
    writeFileSync(path, `position [mm],intensity (counts)\n${Array.from(x, (xi, j) => `${(xi * 1e3).toFixed(6)},${y[j]}`).join("\n")}\n`);
    return path;
  });
}

let data: string;
let files: string[];
let local: string;
beforeAll(async () => {
  data = join(work, "data");
  files = writeLines(data, 5);
  local = join(work, "local.csv");
  const run = await runInProcess(["batch", data, "--jobs", "1", "--quiet", "--out", local]);
  expect(run.code).toBe(0);
}, 120_000);

describe("parseShard(text), shardFromSlurm(env), shardPositions(total, shard)", () => {
  it("parseShard('3/16') and refusals of 0/4, 5/4, 3 and a/b", () => {
    expect(parseShard("3/16")).toMatchObject({ index: 3, count: 16 });
    for (const bad of ["0/4", "5/4", "3", "a/b", "1/0"]) expect(() => parseShard(bad)).toThrow(/invalid --shard: .*I\/N with 1 ≤ I ≤ N/);
  });

  it("shardFromSlurm: task 7 of an array 5-12 is shard 3 of 8; 0-30:10 step arrays; a resubmitted single task is refused", () => {
    // Variable meanings: Slurm sbatch documentation, "OUTPUT ENVIRONMENT VARIABLES" (SLURM_ARRAY_TASK_ID/MIN/COUNT/STEP).
    expect(shardFromSlurm({})).toBeUndefined();
    expect(shardFromSlurm({ SLURM_ARRAY_TASK_ID: "7", SLURM_ARRAY_TASK_MIN: "5", SLURM_ARRAY_TASK_COUNT: "8" })).toMatchObject({ index: 3, count: 8 });
    expect(shardFromSlurm({ SLURM_ARRAY_TASK_ID: "20", SLURM_ARRAY_TASK_MIN: "0", SLURM_ARRAY_TASK_COUNT: "4", SLURM_ARRAY_TASK_STEP: "10" })).toMatchObject({ index: 3, count: 4 });
    expect(() => shardFromSlurm({ SLURM_ARRAY_TASK_ID: "9", SLURM_ARRAY_TASK_MIN: "1", SLURM_ARRAY_TASK_COUNT: "3" })).toThrow(/give --shard I\/N explicitly/);
    expect(() => shardFromSlurm({ SLURM_ARRAY_TASK_ID: "2" })).toThrow(/SLURM_ARRAY_TASK_MIN=unset/);
  });

  it("shardPositions over 103 inputs in 10 shards: disjoint, covering, sizes 10 or 11", () => {
    const all = Array.from({ length: 10 }, (_, i) => shardPositions(103, { index: i + 1, count: 10 }));
    expect(all.flat().sort((a, b) => a - b)).toEqual(Array.from({ length: 103 }, (_, k) => k));
    expect(new Set(all.map((p) => p.length))).toEqual(new Set([10, 11]));
    expect(shardPositions(3, { index: 5, count: 8 })).toEqual([]);
  });
});

describe("spreadsheetSafe(text), batchCsv(rows)", () => {
  // Formula injection: a cell starting with =, +, -, @ (or tab, CR) is run by spreadsheets; a leading
  // apostrophe makes it text (OWASP "CSV Injection" guidance). Plain numbers are read as numbers.
  it("spreadsheetSafe neutralises =, +, -, @, tab and CR starts but leaves plain numbers such as -0.5 alone", () => {
    for (const text of ["=1+2", "+cmd|' /C calc'!A0", "-2+3", "@SUM(A1)", "\tx", "\rx", "-Infinity"]) expect(spreadsheetSafe(text)).toBe(`'${text}`);
    for (const text of ["-0.5", "+3", "-1.2e-3", "12", "a=b", "data/x.csv", ""]) expect(spreadsheetSafe(text)).toBe(text);
  });

  it("batchCsv: a file named =HYPERLINK(...) and a message starting with - are quoted text; negative numbers stay numbers", () => {
    const csv = batchCsv([
      { file: '=HYPERLINK("http://x","y")', status: "error", message: "-bad", fit: null },
      // A row as part files wrote it before the one JSON shape of a fit (model, stats): still read.
      { file: "ok.csv", status: "ok", message: "done", fit: { model: "m", converged: true, reason: "r", params: { phase: { value: -0.5, uncertainty: 0.1, unit: "rad", fixed: false } }, stats: { n: 3, dof: 2, chi2: 1, reducedChi2: 0.5, logLikelihood: -1, aic: -2.5, aicc: 1, bic: 1 }, warnings: [], goodness: null, provenance: null } as unknown as BatchRow["fit"] },
    ]);
    const rows = csv.trim().split("\n");
    expect(rows[1]).toBe(`"'=HYPERLINK(""http://x"",""y"")",error,'-bad,,,,,,`);
    expect(rows[2]).toBe("ok.csv,ok,done,3,0.5,-2.5,1,-0.5,0.1");
  });
});

describe("fringekit batch --shard I/N, fringekit merge PARTS --out", () => {
  it("fringekit batch 5 files --shard I/8 (more shards than inputs): shards 6-8 write empty parts; merge == one-machine batch", async () => {
    const parts = join(work, "eight");
    mkdirSync(parts);
    for (let i = 1; i <= 8; i++) {
      const run = await runInProcess(["batch", data, "--jobs", "1", "--quiet", "--shard", `${i}/8`, "--out", join(parts, "r.csv")]);
      expect(run.code).toBe(0);
      expect(run.stderr).toMatch(new RegExp(`${i <= 5 ? 1 : 0} files?: .*shard ${i}/8: ${i <= 5 ? 1 : 0} of 5 inputs`));
    }
    expect(existsSync(join(parts, "r.part-8-of-8.jsonl"))).toBe(true);
    const merged = join(work, "merged8.csv");
    const run = await runInProcess(["merge", parts, "--out", merged]);
    expect(run.code).toBe(0);
    expect(run.stderr).toMatch(/5 files: 5 fitted, .*8 parts of batch [0-9a-f]{16} merged/);
    expect(readFileSync(merged, "utf8")).toBe(readFileSync(local, "utf8"));
    const json = join(work, "merged8.json");
    expect((await runInProcess(["merge", parts, "--out", json])).code).toBe(0);
    expect(JSON.parse(readFileSync(json, "utf8")).map((r: { file: string }) => r.file)).toEqual(files);
  }, 120_000);

  it("fringekit merge with shard 2 missing and shard 3 unfinished names both and writes nothing; parts of another batch are refused", async () => {
    const parts = join(work, "three");
    mkdirSync(parts);
    for (const i of [1, 3]) expect((await runInProcess(["batch", data, "--jobs", "1", "--quiet", "--shard", `${i}/3`, "--out", join(parts, "r.csv")])).code).toBe(0);
    // Shard 3 as a killed task leaves it: the rows so far, no closing line, still named .partial.
    const finished = readFileSync(join(parts, "r.part-3-of-3.jsonl"), "utf8").trim().split("\n");
    rmSync(join(parts, "r.part-3-of-3.jsonl"));
    writeFileSync(join(parts, "r.part-3-of-3.jsonl.partial"), `${finished.slice(0, 1).join("\n")}\n{"row": 2, "fi`);
    const out = join(work, "never.csv");
    const run = await runInProcess(["merge", join(parts, "r.part-1-of-3.jsonl"), join(parts, "r.part-3-of-3.jsonl.partial"), "--out", out]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/not written: shard 2 of 3 missing \(no part file given\); shard 3 \(0 of 1 rows\) unfinished .*sbatch --array=2-3 job\.sh/);
    expect(existsSync(out)).toBe(false);
    const other = join(work, "other");
    mkdirSync(other);
    expect((await runInProcess(["batch", data, "--jobs", "1", "--quiet", "--noise", "gaussian", "--shard", "2/3", "--out", join(other, "r.csv")])).code).toBe(0);
    const mixed = await runInProcess(["merge", join(parts, "r.part-1-of-3.jsonl"), join(other, "r.part-2-of-3.jsonl"), "--out", out]);
    expect(mixed.code).toBe(2);
    expect(mixed.stderr).toMatch(/belongs to a different batch .*options \(none vs --noise gaussian\)/);
  }, 120_000);

  it("fringekit batch --list FILE and the Slurm array variables choose the inputs and the shard", async () => {
    const list = join(work, "inputs.txt");
    writeFileSync(list, `# inputs\n${files.join("\n")}\n\n`);
    const saved = { ...process.env };
    Object.assign(process.env, { SLURM_ARRAY_TASK_ID: "11", SLURM_ARRAY_TASK_MIN: "10", SLURM_ARRAY_TASK_COUNT: "2" });
    try {
      const run = await runInProcess(["batch", "--list", list, "--jobs", "1", "--quiet", "--out", join(work, "slurm.csv")]);
      expect(run.stderr).toMatch(/2 files: .*shard 2\/2 \(from the Slurm array task\): 2 of 5 inputs/);
    } finally {
      for (const name of ["SLURM_ARRAY_TASK_ID", "SLURM_ARRAY_TASK_MIN", "SLURM_ARRAY_TASK_COUNT"]) if (saved[name] === undefined) delete process.env[name];
    }
    const part = readFileSync(join(work, "slurm.part-2-of-2.jsonl"), "utf8").trim().split("\n").map((l) => JSON.parse(l));
    expect(part.slice(1, -1).map((r: { row: number; file: string }) => [r.row, r.file])).toEqual([[1, files[1]], [3, files[3]]]);
  }, 120_000);

  it("fringekit batch --slurm-script job.sh --tasks 4 writes an array script and the input list", async () => {
    const script = join(work, "job.sh");
    const run = await runInProcess(["batch", data, "--jobs", "2", "--fix", "pixelWidth=5.5um", "--slurm-script", script, "--tasks", "4", "--out", join(work, "job", "r.csv")]);
    expect(run.code).toBe(0);
    const text = readFileSync(script, "utf8");
    expect(text).toMatch(/^#!\/bin\/bash\n/);
    for (const line of ["#SBATCH --array=1-4", "#SBATCH --cpus-per-task=2", "#SBATCH --time=", "#SBATCH --mem=", `--shard "\${SLURM_ARRAY_TASK_ID}/4"`, "--fix=pixelWidth=5.5um", "--resume", "# Merge:    fringekit merge"]) expect(text).toContain(line);
    expect(readFileSync(join(work, "job.inputs.txt"), "utf8").trim().split("\n")).toEqual(files);
    expect(statSync(script).mode & 0o100).toBe(0o100);
    expect(existsSync(join(work, "job", "logs"))).toBe(true);
  });
});

describe("fringekit batch --resume", () => {
  it("fringekit batch killed mid-run, then --resume: the finished rows are kept and the results equal an uninterrupted run", async () => {
    const folder = join(work, "crash");
    const inputs = writeLines(folder, 12);
    const out = join(work, "crash.csv");
    const partial = join(work, "crash.part-1-of-1.jsonl.partial");
    const bin = fileURLToPath(new URL("../../bin/fringekit.js", import.meta.url));
    const child = spawn(process.execPath, [bin, "batch", folder, "--jobs", "1", "--quiet", "--out", out], { stdio: "ignore" });
    try {
      const deadline = Date.now() + 90_000;
      // Kill it (SIGKILL: no chance to clean up) once at least 3 rows are on disk.
      while (Date.now() < deadline) {
        if (existsSync(partial) && readFileSync(partial, "utf8").split("\n").length >= 5) break;
        await new Promise((r) => setTimeout(r, 50));
      }
    } finally {
      child.kill("SIGKILL");
    }
    await new Promise((r) => child.on("close", r));
    expect(existsSync(out)).toBe(false);
    const kept = readFileSync(partial, "utf8").split("\n").filter((l) => l.startsWith('{"row"')).length;
    expect(kept).toBeGreaterThanOrEqual(3);
    expect(kept).toBeLessThan(12);
    const refused = runCli(["batch", folder, "--jobs", "1", "--quiet", "--out", out], { timeout: 600_000 });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/an unfinished part of an earlier run is there; add --resume to continue it/);
    const resumed = runCli(["batch", folder, "--jobs", "2", "--quiet", "--resume", "--out", out], { timeout: 600_000 });
    expect(resumed.code).toBe(0);
    expect(resumed.stderr).toMatch(new RegExp(`resumed: ${kept} rows of the earlier run kept, ${12 - kept} fitted now`));
    expect(existsSync(partial)).toBe(false);
    const clean = join(work, "clean.csv");
    expect(runCli(["batch", ...inputs, "--jobs", "2", "--quiet", "--out", clean], { timeout: 600_000 }).code).toBe(0);
    expect(readFileSync(out, "utf8")).toBe(readFileSync(clean, "utf8"));
  }, 1_200_000);
});

describe("fringekit batch STACK.tif --page each", () => {
  it("fringekit batch of a 3-page TIFF stack --page each: one row per page, each equal to fringekit fit --page K", async () => {
    const width = 512, height = 4;
    const pages = [1, 2, 3].map((k) => {
      const y = line(200 + k);
      const page = new Uint16Array(width * height);
      for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) page[r * width + c] = Math.min(65535, Math.round(y[c]! / height));
      return page;
    });
    const stack = join(work, "stack.tif");
    writeFileSync(stack, writeTiff(width, height, pages));
    const out = join(work, "stack.json");
    const run = await runInProcess(["batch", stack, "--page", "each", "--pixel-pitch", "5.5", "um", "--jobs", "1", "--quiet", "--out", out]);
    expect(run.stderr).toMatch(/^3 frames: /);
    const rows = JSON.parse(readFileSync(out, "utf8")) as { file: string; page: number; fit: { params: Record<string, { value: number }> } }[];
    expect(rows.map((r) => r.page)).toEqual([1, 2, 3]);
    for (const row of rows) {
      const single = await runInProcess(["fit", stack, "--page", String(row.page), "--pixel-pitch", "5.5", "um", "--json"]);
      expect(row.fit.params["separation"]!.value).toBe(JSON.parse(single.stdout).params.separation.value);
    }
    expect(rows[0]!.fit.params["separation"]!.value).not.toBe(rows[1]!.fit.params["separation"]!.value);
    const csv = join(work, "stack.csv");
    await runInProcess(["batch", stack, "--page", "each", "--pixel-pitch", "5.5", "um", "--jobs", "1", "--quiet", "--out", csv]);
    expect(readFileSync(csv, "utf8").split("\n")[0]).toMatch(/^file,page,status,/);
  }, 120_000);
});
