import { spawnSync } from "node:child_process";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { b1Profile, fitB1, runScipy, scipyAvailable } from "../../bench/B1.js";
import { NIST_DIR, parseNistFile } from "../../bench/nist.js";
import { InvalidArgumentError } from "../../src/errors.js";
import { autoStartCandidates } from "../../src/fit/autoStart.js";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { formulaModel } from "../../src/fit/formulaModel.js";
import { getModel, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import type { Profile } from "../../src/profile.js";
import { createRandom } from "../../src/random.js";

const hasScipy = scipyAvailable();
if (!hasScipy) process.stdout.write("SKIPPED: SciPy cross-check needs /usr/bin/python3 with python3-scipy\n");

function nistProfile(name: string): { profile: Profile; data: ReturnType<typeof parseNistFile> } {
  const data = parseNistFile(join(NIST_DIR, `${name}.dat`));
  return { data, profile: { x: data.columns[0], y: data.y, yUnit: "1", counts: false } };
}

describe("fitProfile(profile, formulaModel(...)) on NIST StRD", () => {
  // Certified values and standard deviations: NIST/ITL StRD, Misra1a and Thurber (files as published).
  for (const name of ["Misra1a", "Thurber"]) {
    it(`reproduces the certified ${name} values (>= 6 digits) and standard deviations (>= 4 digits)`, () => {
      const { data, profile } = nistProfile(name);
      const model = formulaModel(data.formula, { parameters: data.parameters });
      const start = Object.fromEntries(data.parameters.map((b, j) => [b, data.starts[1][j]]));
      const result = fitProfile(profile, model, { start, noise: "gaussian", tolerance: 1e-15 });
      expect(result.converged).toBe(true);
      result.parameters.forEach((p, j) => {
        expect(Math.abs(p.value - data.certified[j]) / Math.abs(data.certified[j])).toBeLessThan(1e-6);
        expect(Math.abs(p.uncertainty - data.certifiedSd[j]) / data.certifiedSd[j]).toBeLessThan(1e-4);
      });
      expect(result.statistics.chi2).toBeCloseTo(data.certifiedRss, 4);
    });
  }
});

describe("fitProfile(b1Profile, two-slit) against SciPy least_squares", () => {
  it.skipIf(!hasScipy)("finds the same optimum and standard errors within 1 % (SciPy reference run in this test)", () => {
    const profile = b1Profile(3);
    const ours = fitB1(profile);
    const scipy = runScipy(profile, 1);
    expect(ours.converged).toBe(true);
    expect(Math.abs(ours.statistics.chi2 - scipy.chi2) / scipy.chi2).toBeLessThan(1e-8);
    for (const p of ours.parameters.filter((q) => !q.fixed)) {
      const ref = scipy.values[p.name], refErr = scipy.stderr[p.name];
      // same optimum: agreement far inside one standard error
      expect(Math.abs(p.value - ref)).toBeLessThan(1e-3 * refErr);
      expect(Math.abs(p.uncertainty - refErr) / refErr).toBeLessThan(0.01);
    }
  });
});

describe("fitProfile(profile, model, options)", () => {
  const model = getModel("two-slit");
  const x = pixelPositions(1024, 11e-6);
  const truth = { amplitude: 5000, background: 80, center: 0.1e-3, separation: 0.4e-3, width: 0.08e-3, visibility: 0.8, phase: 0.5, pixelWidth: 11e-6 };
  const profile = simulateProfile(model, truth, x, { noise: "poisson", seed: 11 });

  it("finds its own start (autoStart) and reaches chi2/dof near 1 with Poisson noise", () => {
    const result = fitProfile(profile, model, { fix: { pixelWidth: 11e-6 } });
    expect(result.noise).toBe("poisson");
    expect(result.converged).toBe(true);
    expect(result.statistics.reducedChi2).toBeGreaterThan(0.85);
    expect(result.statistics.reducedChi2).toBeLessThan(1.15);
    for (const p of result.parameters.filter((q) => !q.fixed)) {
      expect(Math.abs(p.value - truth[p.name as keyof typeof truth]) / p.uncertainty).toBeLessThan(4);
    }
  });

  it("holds fixed parameters, evaluates ties and reports at-bound parameters", () => {
    const result = fitProfile(profile, model, {
      fix: { pixelWidth: 11e-6, phase: 0.5 }, tie: { width: "separation / 5" }, bounds: { visibility: [0, 0.7] },
    });
    const byName = Object.fromEntries(result.parameters.map((p) => [p.name, p]));
    expect(byName.phase.value).toBe(0.5);
    expect(byName.phase.fixed).toBe(true);
    expect(byName.width.tied).toBe("separation / 5");
    expect(byName.width.value).toBeCloseTo(byName.separation.value / 5, 15);
    expect(byName.width.uncertainty).toBeCloseTo(byName.separation.uncertainty / 5, 15);
    expect(byName.visibility.atBound).toBe("upper");
    expect(result.warnings.some((w) => w.code === "at-bound" && w.parameter === "visibility")).toBe(true);
    expect(result.freeNames).not.toContain("width");
  });

  it("stops with reason cancelled when signal.aborted is set, and reports progress", () => {
    const signal = { aborted: false };
    const seen: number[] = [];
    const result = fitProfile(profile, model, {
      fix: { pixelWidth: 11e-6 }, autoStart: false, signal,
      onProgress: (p) => { seen.push(p.iteration); if (p.iteration >= 2) signal.aborted = true; },
    });
    expect(result.reason).toBe("cancelled");
    expect(result.converged).toBe(false);
    expect(seen.length).toBeGreaterThanOrEqual(2);
  });

  it("robust noise flags a hot pixel and is not pulled by it", () => {
    const hot = { ...profile, y: Float64Array.from(profile.y), counts: true };
    hot.y[300] += 4000;
    const robust = fitProfile(hot, model, { fix: { pixelWidth: 11e-6 }, noise: "robust" });
    expect(robust.flagged).toContain(300);
    expect(robust.warnings.some((w) => w.code === "outliers-flagged")).toBe(true);
    const clean = fitProfile(profile, model, { fix: { pixelWidth: 11e-6 }, noise: "gaussian" });
    const sep = (r: typeof robust): number => r.parameters.find((p) => p.name === "separation")!.value;
    expect(Math.abs(sep(robust) - sep(clean))).toBeLessThan(clean.parameters.find((p) => p.name === "separation")!.uncertainty);
  });

  it("throws InvalidArgumentError before work for unknown names, bad bounds and non-finite data", () => {
    expect(() => fitProfile(profile, model, { fix: ["nonsense"] })).toThrow(InvalidArgumentError);
    expect(() => fitProfile(profile, model, { bounds: { width: [2, 1] } })).toThrow(/bounds.width/);
    expect(() => fitProfile(profile, model, { tie: { width: "separation * import" } })).toThrow(InvalidArgumentError);
    const bad = { ...profile, y: Float64Array.from(profile.y) };
    bad.y[5] = NaN;
    expect(() => fitProfile(bad, model)).toThrow(/profile point 5/);
    const masked = { ...bad, mask: new Uint8Array(bad.x.length).fill(1) };
    masked.mask[5] = 0;
    expect(fitProfile(masked, model, { fix: { pixelWidth: 11e-6 } }).statistics.n).toBe(bad.x.length - 1);
  });

  it("gives a consistent log-likelihood: AIC = -2 lnL + 2k, Poisson lnL = sum[y ln f - f - ln y!] (definition)", () => {
    const result = fitProfile(profile, model, { fix: { pixelWidth: 11e-6 } });
    let ll = 0;
    for (let i = 0; i < profile.y.length; i++) {
      const y = profile.y[i], f = result.model[i];
      let lnFactorial = 0;
      for (let k = 2; k <= y; k++) lnFactorial += Math.log(k);
      ll += (y > 0 ? y * Math.log(f) : 0) - f - lnFactorial;
    }
    expect(result.statistics.logLikelihood).toBeCloseTo(ll, 6);
    expect(result.statistics.aic).toBeCloseTo(-2 * ll + 2 * result.statistics.nFree, 6);
  });

  it("returns a result, not an exception, when the fit stops early or cannot start", () => {
    const early = fitProfile(profile, model, { fix: { pixelWidth: 11e-6 }, autoStart: false, maxEvaluations: 3 });
    expect(early.converged).toBe(false);
    expect(early.reason).toBe("max-evaluations");
    expect(early.warnings.some((w) => w.code === "not-converged")).toBe(true);
    const line: Profile = { x: Float64Array.from([1, 2, 3, 4]), y: Float64Array.from([1, 2, 3, 4]), yUnit: "1", counts: false };
    const bad = fitProfile(line, formulaModel("sqrt(a - 5) * x"), { start: { a: 1 } });
    expect(bad.converged).toBe(false);
    expect(bad.reason).toBe("invalid-start");
  });

  it("reports an infinite uncertainty and a warning for parameters the data cannot separate", () => {
    const line: Profile = { x: Float64Array.from([1, 2, 3, 4, 5]), y: Float64Array.from([2.1, 3.9, 6.2, 7.8, 10.1]), yUnit: "1", counts: false };
    const result = fitProfile(line, formulaModel("a*b*x"), { start: { a: 1, b: 1 } });
    expect(result.parameters.every((p) => p.uncertainty === Infinity)).toBe(true);
    expect(result.warnings.some((w) => w.code === "singular-covariance")).toBe(true);
  });
});

describe("autoStartCandidates(x, y, wavelength, distance)", () => {
  it("recovers separation within 1 %, width within 25 % and the centre within a tenth of a fringe on simulated data", () => {
    const model = getModel("two-slit");
    const x = pixelPositions(2048, 5.5e-6);
    for (const [seed, truth] of [
      [1, { separation: 0.3e-3, width: 0.06e-3, center: -0.2e-3, visibility: 0.5, phase: 2 }],
      [2, { separation: 1.2e-3, width: 0.15e-3, center: 0.4e-3, visibility: 0.9, phase: -1 }],
    ] as const) {
      const profile = simulateProfile(model, { amplitude: 3000, background: 40, ...truth }, x, { noise: "poisson", seed });
      const [best] = autoStartCandidates(profile.x, profile.y, 632.8e-9, 1);
      expect(Math.abs(best.separation / truth.separation - 1)).toBeLessThan(0.01);
      // Width is only a start: in the first case the envelope fills most of the window.
      expect(Math.abs(best.width / truth.width - 1)).toBeLessThan(0.25);
      const fringe = 632.8e-9 / truth.separation;
      expect(Math.abs(best.center - truth.center)).toBeLessThan(0.1 * fringe);
    }
  });
});

describe("fitProfile(profile, getModel(id)) with automatic starts across model families", () => {
  for (const [id, truth] of [
    ["n-slit", { amplitude: 2000, background: 30, center: -0.15e-3, separation: 0.3e-3, width: 0.06e-3 }],
    ["two-beam", { amplitude: 2000, background: 30, center: 0.2e-3, separation: 0.8e-3, visibility: 0.6, phase: -1 }],
    ["single-slit", { amplitude: 1500, background: 20, center: 0.3e-3, width: 0.25e-3 }],
  ] as const) {
    it(`${id}: converges to within 4 standard errors of the simulated truth`, () => {
      const model = getModel(id);
      const profile = simulateProfile(model, truth, pixelPositions(2048, 5.5e-6), { noise: "poisson", seed: 17 });
      const result = fitProfile(profile, model);
      expect(result.converged).toBe(true);
      for (const [name, value] of Object.entries(truth)) {
        const p = result.parameters.find((q) => q.name === name)!;
        expect(Math.abs(p.value - value) / p.uncertainty).toBeLessThan(4);
      }
    });
  }
});

describe("fitProfile(counts, formulaModel, { noise: \"poisson\" }) against SciPy", () => {
  it.skipIf(!hasScipy)("matches scipy.optimize.minimize on the Poisson deviance and the inverse-Fisher standard errors", () => {
    // Counts from a*exp(−b·x) + c with a = 40, b = 0.3, c = 2 (seeded Poisson draws).
    const rng = createRandom(8);
    const x = Float64Array.from({ length: 60 }, (_, i) => i * 0.25);
    const y = Float64Array.from(x, (v) => rng.poisson(40 * Math.exp(-0.3 * v) + 2));
    const profile: Profile = { x, y, yUnit: "counts", counts: true };
    const model = formulaModel("a*exp(-b*x) + c");
    const ours = fitProfile(profile, model, { start: { a: 30, b: 0.2, c: 1 }, tolerance: 1e-14 });
    expect(ours.noise).toBe("poisson");
    const script = join(dirname(fileURLToPath(import.meta.url)), "..", "..", "bench", "reference", "poisson_scipy.py");
    const run = spawnSync("/usr/bin/python3", [script], { input: JSON.stringify({ x: Array.from(x), y: Array.from(y), start: [30, 0.2, 1] }), encoding: "utf8" });
    expect(run.status).toBe(0);
    const reference = JSON.parse(run.stdout) as { values: number[]; stderr: number[]; deviance: number };
    expect(ours.statistics.objective).toBeCloseTo(reference.deviance, 6);
    ours.parameters.forEach((p, j) => {
      expect(Math.abs(p.value - reference.values[j])).toBeLessThan(1e-4 * reference.stderr[j]);
      expect(Math.abs(p.uncertainty / reference.stderr[j] - 1)).toBeLessThan(1e-4);
    });
  });
});

