// B2 of ../shared/bench/PROBLEMS.md: automatic starting values. 200 seeded B1-like datasets with
// separation in 0.15–1.5 mm, width in 0.03–0.2 mm, visibility in 0.2–0.98 (plus centre in
// ±0.5 mm and phase in (−π, π]); each is fitted with no start given, and also from the truth.
// Success: the automatic fit converged to the same optimum as the fit started at the truth
// (Poisson deviance equal within 1e-6 relative + 1e-3, or lower).
import { fitProfile } from "../src/fit/fitProfile.js";
import { createRandom } from "../src/random.js";
import { getModel, pixelPositions, simulateProfile } from "../src/physics/index.js";
import { B1_FIX } from "./B1.js";

export interface B2Case { seed: number; truth: Record<string, number> }

/** The 200 datasets' parameters, drawn from one seeded stream. */
export function b2Cases(count = 200, seed = 2024): B2Case[] {
  const rng = createRandom(seed);
  const uniform = (lo: number, hi: number): number => lo + (hi - lo) * rng.uniform();
  return Array.from({ length: count }, (_, k) => ({
    seed: 1000 + k,
    truth: {
      amplitude: 20000, background: 150, center: uniform(-0.5e-3, 0.5e-3),
      separation: uniform(0.15e-3, 1.5e-3), width: uniform(0.03e-3, 0.2e-3),
      visibility: uniform(0.2, 0.98), phase: uniform(-Math.PI, Math.PI), ...B1_FIX,
    },
  }));
}

/** Runs one case; returns whether the automatic start reached the truth-started optimum and its time (ms). */
export function runB2Case(c: B2Case): { success: boolean; ms: number; detail: string } {
  const model = getModel("two-slit");
  const profile = simulateProfile(model, c.truth, pixelPositions(4096, 5.5e-6), { noise: "poisson", seed: c.seed });
  const t0 = performance.now();
  const auto = fitProfile(profile, model, { fix: B1_FIX });
  const ms = performance.now() - t0;
  const { wavelength: _w, distance: _d, pixelWidth: _p, ...start } = c.truth;
  const reference = fitProfile(profile, model, { fix: B1_FIX, start });
  const a = auto.statistics.objective, r = reference.statistics.objective;
  const success = auto.converged && a <= r * (1 + 1e-6) + 1e-3;
  const detail = `seed ${c.seed}: d ${(c.truth.separation * 1e3).toFixed(3)} mm, a ${(c.truth.width * 1e3).toFixed(3)} mm, V ${c.truth.visibility.toFixed(2)}: deviance ${a.toFixed(1)} vs ${r.toFixed(1)} from truth (${auto.reason})`;
  return { success, ms, detail };
}

export async function main(): Promise<void> {
  const cases = b2Cases();
  let successes = 0;
  const times: number[] = [];
  for (const c of cases) {
    const outcome = runB2Case(c);
    times.push(outcome.ms);
    if (outcome.success) successes++;
    else process.stdout.write(`miss: ${outcome.detail}\n`);
  }
  times.sort((p, q) => p - q);
  const medianMs = times[Math.floor(times.length / 2)];
  process.stdout.write(`B2 auto-start success ${((100 * successes) / cases.length).toFixed(1)}% (${successes}/${cases.length}), ${medianMs.toFixed(0)} ms per fit\n`);
}
