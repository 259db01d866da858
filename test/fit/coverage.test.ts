// Statistical checks of the uncertainties by simulation (seeded): coverage of the 1σ intervals
// and bias of the Poisson fit against √N-weighted χ² on photon-starved data. Profiles are
// 1024 pixels of 11 µm (B1's geometry at a quarter of the pixels) to keep the run short.
import { describe, expect, it } from "vitest";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { getModel, pixelPositions, simulateProfile } from "../../src/physics/index.js";

const model = getModel("two-slit");
const x = pixelPositions(1024, 11e-6);
const fix = { pixelWidth: 11e-6 };

describe("fitProfile coverage over 400 seeded B1-like simulations", () => {
  it("1σ intervals of separation and visibility cover the truth 68 % ± 4 % (normal theory: P(|Z| < 1) = 0.6827, A&S 26.2)", () => {
    const truth = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };
    const start = { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 };
    const covered = { separation: 0, visibility: 0 };
    let runs = 0;
    for (let seed = 1; seed <= 400; seed++) {
      const profile = simulateProfile(model, { ...truth, ...fix }, x, { noise: "poisson", seed });
      const result = fitProfile(profile, model, { fix, start });
      expect(result.converged).toBe(true);
      runs++;
      for (const name of ["separation", "visibility"] as const) {
        const p = result.parameters.find((q) => q.name === name)!;
        if (Math.abs(p.value - truth[name]) <= p.uncertainty) covered[name]++;
      }
    }
    const rate = { separation: covered.separation / runs, visibility: covered.visibility / runs };
    process.stdout.write(`coverage of 1σ intervals over ${runs} fits: separation ${(100 * rate.separation).toFixed(1)} %, visibility ${(100 * rate.visibility).toFixed(1)} %\n`);
    for (const name of ["separation", "visibility"] as const) {
      // 68 % ± 4 %, bounds included; the binomial standard error at n = 400 is 2.3 %.
      expect(rate[name]).toBeGreaterThanOrEqual(0.64);
      expect(rate[name]).toBeLessThanOrEqual(0.72);
    }
  });

  it("the Poisson fit is unbiased at a peak of about 5 counts where the √N-weighted χ² fit is not", () => {
    // Peak = background + amplitude·(1 + V) = 0.5 + 2.4·1.85 ≈ 4.9 counts.
    const truth = { amplitude: 2.4, background: 0.5, center: 0.1e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3 };
    const runs = 200;
    const estimates = { poisson: [] as number[], gaussian: [] as number[] };
    for (let seed = 1; seed <= runs; seed++) {
      const profile = simulateProfile(model, { ...truth, ...fix }, x, { noise: "poisson", seed: 5000 + seed });
      for (const noise of ["poisson", "gaussian"] as const) {
        const result = fitProfile(profile, model, { fix, start: truth, noise });
        expect(result.converged).toBe(true);
        estimates[noise].push(result.parameters.find((p) => p.name === "amplitude")!.value);
      }
    }
    const summary = (values: number[]) => {
      const mean = values.reduce((s, v) => s + v, 0) / values.length;
      const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
      return { mean, sem: sd / Math.sqrt(values.length) };
    };
    const poisson = summary(estimates.poisson), gaussian = summary(estimates.gaussian);
    process.stdout.write(`amplitude at a 5-count peak (truth ${truth.amplitude}) over ${runs} fits: ` +
      `Poisson deviance ${poisson.mean.toFixed(4)} ± ${poisson.sem.toFixed(4)}, √N-weighted χ² ${gaussian.mean.toFixed(4)} ± ${gaussian.sem.toFixed(4)}\n`);
    expect(Math.abs(poisson.mean - truth.amplitude)).toBeLessThan(3 * poisson.sem);
    expect(Math.abs(gaussian.mean - truth.amplitude)).toBeGreaterThan(5 * gaussian.sem);
  });
});
