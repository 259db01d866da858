// B3 of ../shared/bench/PROBLEMS.md: 2000 B1-like profiles (seeds 1…2000) written as CSV files
// and fitted by the built command `fringekit batch`, first with one worker (--jobs 1, in the
// main thread), then with one worker thread per core. The reference is the one-core run in the
// same benchmark run; the figure is the speed-up. B3_PROFILES=200 makes a quicker run.
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

function writeProfiles(dir: string, count: number): string[] {
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

function batch(files: string[], jobs: number, out: string): { seconds: number; ok: number } {
  const t0 = performance.now();
  const run = spawnSync(process.execPath, [BIN, "batch", ...files, "--fix", "pixelWidth=5.5um", "--jobs", String(jobs), "--out", out], { encoding: "utf8" });
  const seconds = (performance.now() - t0) / 1000;
  if (run.status !== 0 && run.status !== 1) throw new Error(`fringekit batch failed (exit ${run.status}): ${run.stderr}`);
  const rows = readFileSync(out, "utf8").trim().split("\n").slice(1);
  return { seconds, ok: rows.filter((r) => r.split(",")[1] === "ok").length };
}

/** Runs B3 and prints the figures; the last line is the summary. */
export async function main(): Promise<void> {
  if (!existsSync(BUILT)) throw new Error("B3 runs the built command: run `npm run build` first");
  const count = Number(process.env["B3_PROFILES"] ?? 2000);
  const cores = availableParallelism();
  const dir = mkdtempSync(join(tmpdir(), "fringekit-b3-"));
  try {
    const files = writeProfiles(dir, count);
    const one = batch(files, 1, join(dir, "one.csv"));
    const all = batch(files, cores, join(dir, "all.csv"));
    const rate1 = count / one.seconds;
    const rateN = count / all.seconds;
    console.log(`B3 ${count} profiles of 4096 pixels: 1 core ${one.seconds.toFixed(1)} s (${one.ok} converged), ${cores} cores ${all.seconds.toFixed(1)} s (${all.ok} converged); times include process start and file reading`);
    console.log(`B3 batch ${rate1.toFixed(1)} profiles/s on 1 core, ${rateN.toFixed(1)} on ${cores} cores (speed-up ${(rateN / rate1).toFixed(2)})`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
