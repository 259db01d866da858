import { describe, expect, it } from "vitest";
import { InvalidArgumentError } from "../../src/errors.js";
import { bootstrap } from "../../src/fit/bootstrap.js";
import { fitJoint } from "../../src/fit/fitJoint.js";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { formulaModel } from "../../src/fit/formulaModel.js";
import { profileInterval } from "../../src/fit/profileInterval.js";
import { propagate } from "../../src/fit/propagate.js";
import { STOP_REASONS } from "../../src/fit/status.js";
import { getModel, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import { createRandom } from "../../src/random.js";
import type { Profile } from "../../src/profile.js";

// A straight line with known σ: y = 2 + 0.5 x + N(0, 0.3²), 40 points (seeded).
function lineProfile(): Profile {
  const rng = createRandom(5);
  const x = Float64Array.from({ length: 40 }, (_, i) => i * 0.25);
  const sigma = new Float64Array(40).fill(0.3);
  const y = Float64Array.from(x, (v) => 2 + 0.5 * v + 0.3 * rng.normal());
  return { x, y, sigma, yUnit: "1", counts: false };
}
const line = formulaModel("a + b*x");

describe("profileInterval(result, profile, model, name, level)", () => {
  it("equals value ± z·uncertainty for a linear model with absolute σ (exact for linear least squares, common practice)", () => {
    const profile = lineProfile();
    const result = fitProfile(profile, line, { start: { a: 1, b: 1 }, sigmaAbsolute: true, noise: "gaussian" });
    const b = result.parameters[1];
    const interval = profileInterval(result, profile, line, "b", 0.95);
    const z = 1.959963984540054; // Φ⁻¹(0.975), A&S Table 26.5
    expect(interval.lower).toBeCloseTo(b.value - z * b.uncertainty, 6);
    expect(interval.upper).toBeCloseTo(b.value + z * b.uncertainty, 6);
  });

  it("matches SciPy brentq on the Poisson deviance of a constant rate (asymmetric 95 % interval)", () => {
    // Reference: scipy.optimize.brentq on D(mu) - D(mu_hat) = chi2.ppf(0.95, 1) for these 20 counts
    // (computed with Debian python3-scipy): 3.9928070974865397 and 5.935185794441937.
    const y = Float64Array.from([3, 7, 4, 6, 2, 5, 8, 4, 3, 6, 5, 7, 2, 4, 6, 5, 3, 9, 4, 5]);
    const profile: Profile = { x: Float64Array.from(y, (_, i) => i), y, yUnit: "counts", counts: true };
    const constant = formulaModel("mu + 0*x", { parameters: [{ name: "mu", unit: "counts", default: 1, lower: 0, upper: Infinity, description: "rate" }] });
    const result = fitProfile(profile, constant, { start: { mu: 4 } });
    expect(result.noise).toBe("poisson");
    const interval = profileInterval(result, profile, constant, "mu", 0.95);
    expect(interval.lower).toBeCloseTo(3.9928070974865397, 5);
    expect(interval.upper).toBeCloseTo(5.935185794441937, 5);
  });
});

describe("profileInterval(..., { signal })", () => {
  it("returns NaN ends and a cancelled warning when signal.aborted is set", () => {
    const profile = lineProfile();
    const result = fitProfile(profile, line, { start: { a: 1, b: 1 }, sigmaAbsolute: true, noise: "gaussian" });
    const interval = profileInterval(result, profile, line, "a", 0.68, { signal: { aborted: true } });
    expect(Number.isNaN(interval.lower) && Number.isNaN(interval.upper)).toBe(true);
    expect(interval.warnings.map((w) => w.code)).toContain("cancelled");
  });
});

describe("profileInterval and bootstrap of a robust fit without σ", () => {
  it("refuse with InvalidArgumentError (σ was estimated from the residuals and a refit would not repeat it)", () => {
    const { x, y } = lineProfile();
    const profile: Profile = { x, y, yUnit: "1", counts: false };
    const result = fitProfile(profile, line, { start: { a: 1, b: 1 }, noise: "robust" });
    expect(result.converged).toBe(true);
    expect(() => profileInterval(result, profile, line, "b")).toThrow(InvalidArgumentError);
    expect(() => bootstrap(result, profile, line, { samples: 5 })).toThrow(InvalidArgumentError);
  });
});

describe("propagate(result, fn, options)", () => {
  const profile = lineProfile();
  const result = fitProfile(profile, line, { start: { a: 1, b: 1 }, sigmaAbsolute: true, noise: "gaussian" });
  const [a, b] = result.parameters;
  const cov = result.covariance;

  it("delta method for a/b equals the first-order formula with correlation (JCGM 100:2008 eq. 13)", () => {
    const out = propagate(result, (p) => p.a / p.b);
    const g = a.value / b.value;
    const expected = Math.abs(g) * Math.sqrt((a.uncertainty / a.value) ** 2 + (b.uncertainty / b.value) ** 2 - (2 * cov[1]) / (a.value * b.value));
    expect(out.value).toBeCloseTo(g, 14);
    expect(Math.abs(out.uncertainty - expected) / expected).toBeLessThan(1e-6);
  });

  it("Monte Carlo agrees with the exact variance of a linear function a + 2b (JCGM 101:2008)", () => {
    const out = propagate(result, (p) => p.a + 2 * p.b, { method: "monte-carlo", samples: 20000, seed: 3 });
    const exact = Math.sqrt(cov[0] + 4 * cov[3] + 4 * cov[1]);
    // 20000 draws: relative standard error of an SD ≈ 1/√(2·20000) = 0.5 %
    expect(Math.abs(out.uncertainty - exact) / exact).toBeLessThan(0.02);
    expect(out.interval[0]).toBeLessThan(out.value);
    expect(out.interval[1]).toBeGreaterThan(out.value);
  });
});

describe("bootstrap(result, profile, model, options)", () => {
  it("parametric and residual bootstrap standard errors agree with the covariance for a linear fit (Efron & Tibshirani 1993, ch. 6)", () => {
    const profile = lineProfile();
    const result = fitProfile(profile, line, { start: { a: 1, b: 1 }, sigmaAbsolute: true, noise: "gaussian" });
    for (const method of ["parametric", "residual"] as const) {
      const boot = bootstrap(result, profile, line, { method, samples: 300, seed: 9, derived: { ratio: (p) => p.a / p.b } });
      expect(boot.failed).toBe(0);
      expect(boot.draws.b.length).toBe(300);
      // 300 samples: relative SE of an SD ≈ 4 %; the residual bootstrap also carries the sample's own χ²/dof.
      expect(Math.abs(boot.uncertainty.b / result.parameters[1].uncertainty - 1)).toBeLessThan(method === "parametric" ? 0.15 : 0.3);
      expect(boot.interval.ratio[0]).toBeLessThan(boot.interval.ratio[1]);
    }
    const again = bootstrap(result, profile, line, { samples: 20, seed: 9 });
    const repeat = bootstrap(result, profile, line, { samples: 20, seed: 9 });
    expect(Array.from(again.draws.a)).toEqual(Array.from(repeat.draws.a));
  });
});

describe("fitJoint(datasets, shared, options)", () => {
  it("shares separation and width across two wavelengths and tightens them", () => {
    const model = getModel("two-slit");
    const x = pixelPositions(1024, 11e-6);
    const truth = { amplitude: 4000, background: 60, center: 0.05e-3, separation: 0.45e-3, width: 0.09e-3, visibility: 0.8, phase: 0.2, pixelWidth: 11e-6 };
    const red = simulateProfile(model, { ...truth, wavelength: 632.8e-9 }, x, { noise: "poisson", seed: 21 });
    const green = simulateProfile(model, { ...truth, wavelength: 532e-9, phase: -0.4 }, x, { noise: "poisson", seed: 22 });
    const joint = fitJoint([
      { profile: red, model, fix: { wavelength: 632.8e-9, pixelWidth: 11e-6 } },
      { profile: green, model, fix: { wavelength: 532e-9, pixelWidth: 11e-6 } },
    ], ["separation", "width"]);
    expect(joint.converged).toBe(true);
    const single = fitProfile(red, model, { fix: { wavelength: 632.8e-9, pixelWidth: 11e-6 } });
    const pick = (r: typeof single, name: string) => r.parameters.find((p) => p.name === name)!;
    for (const name of ["separation", "width"]) {
      expect(pick(joint.results[0], name).value).toBe(pick(joint.results[1], name).value);
      expect(pick(joint.results[0], name).uncertainty).toBeLessThan(pick(single, name).uncertainty);
      expect(Math.abs(pick(joint.results[0], name).value - truth[name as "separation" | "width"])).toBeLessThan(4 * pick(joint.results[0], name).uncertainty);
    }
    expect(joint.freeNames.slice(0, 2)).toEqual(["separation", "width"]);
    expect(joint.statistics.logLikelihood).toBeCloseTo(joint.results[0].statistics.logLikelihood + joint.results[1].statistics.logLikelihood, 8);
  });
});

describe("STOP_REASONS", () => {
  it("has a message for every stop reason and marks only the converged-* reasons as converged", () => {
    for (const [reason, info] of Object.entries(STOP_REASONS)) {
      expect(info.message.length).toBeGreaterThan(10);
      expect(info.converged).toBe(reason.startsWith("converged-"));
    }
  });
});
