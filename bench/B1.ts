// B1 of ../shared/bench/PROBLEMS.md: one camera line, finite-width two-slit, Poisson counts.
// fringekit and SciPy least_squares(method="lm") fit the same data, model and start in the same
// run; both minimise χ² with σ = √max(y, 1) so the timings compare like with like. SciPy runs
// twice: as PROBLEMS.md writes the call (least_squares(fun, p0, method="lm"), finite-difference
// Jacobian; this is the ratio of the last line) and with an analytic numpy Jacobian (printed too).
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { fitProfile } from "../src/fit/fitProfile.js";
import type { FitResult } from "../src/fit/types.js";
import { getModel, pixelPositions, simulateProfile, type SimulatedProfile } from "../src/physics/index.js";

export const PYTHON = "/usr/bin/python3";
const SCRIPT = join(dirname(fileURLToPath(import.meta.url)), "reference", "two_slit_scipy.py");

// PROBLEMS.md writes B1 as background + A·sinc²·(1 + V cos) (A the mean level); fringekit's
// amplitude is the coherent peak 2A, so the values here are doubled and halved for SciPy.
/** B1 truth (SI; amplitude = coherent peak, twice the problem's A). */
export const B1_TRUTH = {
  amplitude: 40000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3,
  visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1, pixelWidth: 5.5e-6,
} as const;
/** B1 start (SI). */
export const B1_START = { amplitude: 36000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 };
export const B1_FIX = { wavelength: 632.8e-9, distance: 1, pixelWidth: 5.5e-6 };

/** The B1 profile: 4096 pixels of 5.5 µm, Poisson counts from a seeded stream. */
export function b1Profile(seed = 1, pixels = 4096): SimulatedProfile {
  return simulateProfile(getModel("two-slit"), B1_TRUTH, pixelPositions(pixels, 5.5e-6), { noise: "poisson", seed });
}

/** fringekit's B1 fit (gaussian χ² with σ from counts, the objective the SciPy reference uses). */
export function fitB1(profile: SimulatedProfile, noise: "gaussian" | "poisson" = "gaussian"): FitResult {
  return fitProfile(profile, getModel("two-slit"), { noise, fix: B1_FIX, start: B1_START });
}

export interface ScipyOutcome {
  values: Record<string, number>;
  stderr: Record<string, number>;
  chi2: number;
  nfev: number;
  status: number;
  median_ms: number;
}

/** True when /usr/bin/python3 with SciPy is available. */
export function scipyAvailable(): boolean {
  if (!existsSync(PYTHON)) return false;
  return spawnSync(PYTHON, ["-c", "import scipy.optimize, numpy"], { stdio: "ignore" }).status === 0;
}

/** Runs the SciPy reference on a profile; `repeats` timed fits after one warm-up. */
export function runScipy(profile: SimulatedProfile, repeats = 10, variant: "analytic" | "default" = "analytic"): ScipyOutcome {
  const sigma = Array.from(profile.y, (v) => Math.sqrt(Math.max(v, 1)));
  const start = { ...B1_START, amplitude: B1_START.amplitude / 2 }; // the problem's A (mean level)
  const job = JSON.stringify({ x: Array.from(profile.x), y: Array.from(profile.y), sigma, start, fixed: B1_FIX, repeats, variant });
  const run = spawnSync(PYTHON, [SCRIPT], { input: job, encoding: "utf8", maxBuffer: 1 << 26 });
  if (run.status !== 0) throw new Error(`SciPy reference failed: ${run.stderr}`);
  const outcome = JSON.parse(run.stdout) as ScipyOutcome;
  // back to fringekit's amplitude (coherent peak = 2A)
  outcome.values["amplitude"] = 2 * outcome.values["amplitude"]!;
  outcome.stderr["amplitude"] = 2 * outcome.stderr["amplitude"]!;
  return outcome;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

export async function main(): Promise<void> {
  const profile = b1Profile(1);
  // B1_ROUNDS interleaved rounds (default 5) of 5 timed fits each side; more rounds steady the
  // medians on a loaded machine. The load average is printed with the result.
  const rounds = Math.max(1, Math.min(50, Number(process.env.B1_ROUNDS ?? 5) || 5)), perRound = 5;
  const loadBefore = loadavg()[0]!;
  // warm-up: enough fits for the JIT to finish optimising the hot loops (with 2, the first
  // timed round still ran partly unoptimised code)
  for (let i = 0; i < 10; i++) fitB1(profile);
  // Interleaved rounds (fringekit, SciPy as written, SciPy with analytic Jacobian) so a change of
  // machine load during the run affects both sides alike; medians over all rounds.
  const times: number[] = [];
  const scipyTimes: number[] = [], tunedTimes: number[] = [];
  const haveScipy = scipyAvailable();
  let result = fitB1(profile);
  let scipy: ScipyOutcome | null = null, tuned: ScipyOutcome | null = null;
  const roundRatios: number[] = [];
  // CPU time of this process per fit (includes GC helper threads): steadier than wall time on a
  // loaded machine, for comparing fringekit versions; the ratio below stays wall time on both sides.
  const cpuTimes: number[] = [];
  for (let round = 0; round < rounds; round++) {
    const roundTimes: number[] = [];
    for (let i = 0; i < perRound; i++) {
      const c0 = process.cpuUsage(), t0 = performance.now();
      result = fitB1(profile);
      roundTimes.push(performance.now() - t0);
      const c = process.cpuUsage(c0);
      cpuTimes.push((c.user + c.system) / 1000);
    }
    times.push(...roundTimes);
    if (!haveScipy) continue;
    scipy = runScipy(profile, perRound, "default");
    scipyTimes.push(scipy.median_ms);
    tuned = runScipy(profile, perRound, "analytic");
    tunedTimes.push(tuned.median_ms);
    roundRatios.push(median(roundTimes) / scipy.median_ms);
    process.stdout.write(`round ${round + 1}: fringekit median ${median(roundTimes).toFixed(1)} ms, scipy ${scipy.median_ms.toFixed(1)} ms (analytic ${tuned.median_ms.toFixed(1)} ms), ratio ${roundRatios[round]!.toFixed(3)}\n`);
  }
  const poissonTimes: number[] = [];
  let poisson = fitB1(profile, "poisson");
  for (let i = 0; i < perRound; i++) {
    const t0 = performance.now();
    poisson = fitB1(profile, "poisson");
    poissonTimes.push(performance.now() - t0);
  }
  const ours = median(times);
  const line = (r: FitResult): string => r.parameters.filter((p) => !p.fixed)
    .map((p) => `${p.name} ${((p.value - B1_TRUTH[p.name as keyof typeof B1_TRUTH]) / p.uncertainty).toFixed(2)}σ`).join(", ");
  process.stdout.write(`fringekit gaussian (σ = √counts): ${result.reason}, ${result.evaluations} evaluations + ${result.jacobianEvaluations} Jacobians, reduced χ² ${result.statistics.reducedChi2.toFixed(4)}, median ${ours.toFixed(1)} ms over ${times.length}\n`);
  process.stdout.write(`  deviation from truth: ${line(result)}\n`);
  process.stdout.write(`  fringekit CPU time per fit: median ${median(cpuTimes).toFixed(1)} ms over ${cpuTimes.length}\n`);
  process.stdout.write(`fringekit poisson: ${poisson.reason}, reduced χ² ${poisson.statistics.reducedChi2.toFixed(4)}, median ${median(poissonTimes).toFixed(1)} ms over ${perRound}\n`);
  process.stdout.write(`  deviation from truth: ${line(poisson)}\n`);
  if (!haveScipy || !scipy || !tuned) {
    process.stdout.write(`B1 fringekit/scipy time ratio unavailable: SciPy not installed for ${PYTHON} (fringekit ${ours.toFixed(1)} ms)\n`);
    return;
  }
  // Two SciPy references: the call as PROBLEMS.md writes it (finite-difference Jacobian, default
  // scaling; the ratio of the last line) and SciPy handed an analytic numpy Jacobian.
  const tunedMs = median(tunedTimes), scipyMs = median(scipyTimes);
  process.stdout.write(`per-round ratios ${roundRatios.map((r) => r.toFixed(3)).join(" ")} (median ${median(roundRatios).toFixed(3)}); 1-min load average ${loadBefore.toFixed(1)} → ${loadavg()[0]!.toFixed(1)} on ${cpus().length} cores\n`);
  process.stdout.write(`scipy least_squares(method="lm", jac=analytic numpy, x_scale="jac"): status ${tuned.status}, ${tuned.nfev} evaluations, χ² ${tuned.chi2.toFixed(2)}, median ${tunedMs.toFixed(1)} ms; fringekit/this ratio ${(ours / tunedMs).toFixed(3)}\n`);
  process.stdout.write(`scipy least_squares(fun, p0, method="lm"): status ${scipy.status}, ${scipy.nfev} evaluations, χ² ${scipy.chi2.toFixed(2)} (fringekit ${result.statistics.chi2.toFixed(2)}), median ${scipyMs.toFixed(1)} ms\n`);
  process.stdout.write(`B1 fringekit/scipy time ratio ${(ours / scipyMs).toFixed(3)} (fringekit ${ours.toFixed(1)} ms, scipy ${scipyMs.toFixed(1)} ms)\n`);
}
