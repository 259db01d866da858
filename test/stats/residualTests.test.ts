import { describe, expect, it } from "vitest";
import { autocorrelation, durbinWatson, lombScarglePower, periodicityAt, residualDiagnostics, runsTest } from "../../src/stats/index.js";
import { fakeFit, seeded } from "./fakeFit.js";
import { expectClose, python, scipyMissing } from "./python.js";

describe("residual tests", () => {
  it("runsTest(r) on sequences computed by hand (Wald & Wolfowitz 1940 moments)", () => {
    // + + − − + −: n1 = n2 = 3, R = 4, μ = 2·9/6 + 1 = 4, so z = 0.
    const a = runsTest([1, 2, -1, -3, 0.5, -0.2]);
    expect([a.runs, a.expected, a.z]).toEqual([4, 4, 0]);
    // + + + + − − − −: R = 2, μ = 5, σ² = 32·24/(64·7) = 12/7, z = −3/√(12/7).
    const b = runsTest([1, 1, 1, 1, -1, -1, -1, -1]);
    expect(b.runs).toBe(2);
    expectClose(b.z, -3 / Math.sqrt(12 / 7), 1e-14, "z");
    expect(b.pTooFew).toBeLessThan(0.02);
    expect(runsTest([1, NaN, 0, -1, 1]).runs).toBe(3); // NaN skipped, 0 counted with the negatives: + − − + → 3 runs (hand count)
  });
  it("durbinWatson(r) and autocorrelation(r, 1) on sequences computed by hand", () => {
    // Alternating ±1: Σ(Δr)² = 3·4 = 12, Σ r² = 4, d = 3 (Durbin & Watson 1950 definition).
    expect(durbinWatson([1, -1, 1, -1])).toBe(3);
    // 1..5: deviations −2..2, c0 = 10, c1 = 2 + 0 + 0 + 2 = 4, ρ1 = 0.4.
    expectClose(autocorrelation([1, 2, 3, 4, 5]).value, 0.4, 1e-15, "rho1");
  });
  it("periodicityAt(x, r, f) finds a buried sinusoid and passes white noise", () => {
    const n = 2000;
    const x = Float64Array.from({ length: n }, (_, i) => i * 5e-6);
    const rng = seeded(7);
    const noise = Float64Array.from({ length: n }, () => rng.normal());
    const f = 1 / 0.6e-3; // fringe period 0.6 mm
    const white = periodicityAt(x, noise, f);
    expect(white.pValue).toBeGreaterThan(0.01);
    // white noise: the variance-normalised periodogram averages 1 (Scargle 1982); ±30 % allows for the estimate's scatter (common practice)
    expect(white.noiseFloor).toBeGreaterThan(0.7);
    expect(white.noiseFloor).toBeLessThan(1.3);
    const wavy = noise.map((v, i) => v + 0.3 * Math.cos(2 * Math.PI * f * x[i] + 1));
    const found = periodicityAt(x, wavy, f);
    // amplitude 0.3 over 2000 points: power ≈ n·A²/(4·var) = 2000·0.09/(4·1.045) ≈ 43 (Scargle 1982 normalisation; hand estimate), so > 20 and p < 1e-6
    expect(found.pValue).toBeLessThan(1e-6);
    expect(found.ratio).toBeGreaterThan(20);
  });
  it("lombScarglePower(x, r, f) is Exp(1)-distributed for white noise: mean ≈ 1 over 400 seeds", () => {
    // Scargle (1982): the variance-normalised power at one frequency is exponential with mean 1.
    let sum = 0;
    const x = Float64Array.from({ length: 300 }, (_, i) => i * 1e-5);
    for (let s = 0; s < 400; s++) {
      const rng = seeded(1000 + s);
      sum += lombScarglePower(x, Float64Array.from({ length: 300 }, () => rng.normal()), 1234.5);
    }
    // the mean of 400 Exp(1) draws has σ = 1/√400 = 0.05: ±0.15 is three σ (common practice)
    expect(sum / 400).toBeGreaterThan(0.85);
    expect(sum / 400).toBeLessThan(1.15);
  });
  it.skipIf(scipyMissing !== null)("lombScarglePower(x, r, f) equals scipy.signal.lombscargle divided by the variance", () => {
    const rng = seeded(3);
    const x = Array.from({ length: 257 }, (_, i) => i * 2e-6 + (i > 100 && i < 120 ? 1e-7 : 0)).filter((_, i) => i % 17 !== 5);
    const r = x.map(() => rng.normal());
    const freqs = [500, 3210.7, 44_000];
    const ref = python<number[]>(
      "import numpy as np\nfrom scipy.signal import lombscargle\nx = np.array(data['x']); r = np.array(data['r'])\n" +
        "p = lombscargle(x, r, 2*np.pi*np.array(data['f']), precenter=True)\nprint(json.dumps(list(p / np.var(r, ddof=1))))",
      { x, r, f: freqs });
    freqs.forEach((f, i) => expectClose(lombScarglePower(x, r, f), ref[i], 1e-9, `LS power at ${f}`));
  });
});

describe("residualDiagnostics", () => {
  it("residualDiagnostics(fit, { x }) flags about 1 % of white-noise residual sets at alpha = 0.01", () => {
    const n = 300;
    const x = Float64Array.from({ length: n }, (_, i) => i * 5e-6);
    let flagged = 0;
    const sets = 200;
    for (let s = 0; s < sets; s++) {
      const rng = seeded(5000 + s);
      const fit = fakeFit({ modelId: "two-slit", free: ["amplitude"], values: { amplitude: 1, separation: 0.5e-3, wavelength: 632.8e-9, distance: 1 },
        logLikelihood: 0, chi2: n, n, residuals: Float64Array.from({ length: n }, () => rng.normal()) });
      if (residualDiagnostics(fit, { x }).structured) flagged++;
    }
    // Expected 2 of 200 at the nominal level (Bonferroni is conservative); 8 or more has a
    // binomial tail probability near 1e-3 (common practice for a calibration check).
    expect(flagged).toBeLessThan(8);
  });
  it("residualDiagnostics(fit) flags a slow drift through the runs test and the lag-1 autocorrelation", () => {
    const n = 500;
    const rng = seeded(9);
    const residuals = Float64Array.from({ length: n }, (_, i) => rng.normal() + 1.5 * Math.sin(i / 40));
    const fit = fakeFit({ modelId: "single-slit", free: ["amplitude"], values: { amplitude: 1 }, logLikelihood: 0, chi2: n, n, residuals });
    const d = residualDiagnostics(fit);
    expect(d.structured).toBe(true);
    expect(d.periodicity).toBeUndefined();
    expect(d.reasons.join(" ")).toMatch(/too few sign runs/);
    expect(d.reasons.join(" ")).toMatch(/lag-1 autocorrelation/);
    expect(d.durbinWatson).toBeLessThan(1.5); // DW ≈ 2(1 − ρ1): well below 2 for positively correlated residuals (Durbin & Watson 1950)
  });
});
