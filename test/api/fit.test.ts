// The one-line helpers: fitProfile(profile, id | model, options) → Fit, and what a Fit does next.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { compare, fitProfile, formulaModel, getModel, parseResults, readProfile, replayResults, type Profile } from "../../src/index.js";
import { fitProfileResult, optionsFromResult } from "../../src/advanced.js";
import { profileInterval } from "../../src/fit/profileInterval.js";
import { binResiduals } from "../../src/report/figures/binnedResiduals.js";

const DEMO = new URL("../../notebooks-demo/data/", import.meta.url);
const truths = JSON.parse(readFileSync(new URL("truths.json", DEMO), "utf8"));
const lineA = readProfile(readFileSync(new URL("line-pair-A.csv", DEMO)), { source: "line-pair-A.csv" }).profile;
const bench = { wavelength: 680e-9, distance: 0.75, pixelWidth: 5.5e-6 };

/** A straight line y = 2 + 3x with fixed, deterministic ±0.1 scatter and σ = 0.1 on 21 points. */
function lineProfile(): Profile {
  const x = Float64Array.from({ length: 21 }, (_, i) => i / 10);
  const y = x.map((v, i) => 2 + 3 * v + 0.1 * Math.sin(7 * i));
  return { x, y, sigma: new Float64Array(21).fill(0.1), yUnit: "a.u.", counts: false };
}

/** Weighted least squares of a straight line, closed form (normal equations; common practice). */
function straightLine(p: Profile): { a: number; b: number; cov: [number, number, number] } {
  let s = 0, sx = 0, sxx = 0, sy = 0, sxy = 0;
  for (let i = 0; i < p.x.length; i++) {
    const w = 1 / p.sigma![i] ** 2;
    s += w; sx += w * p.x[i]; sxx += w * p.x[i] ** 2; sy += w * p.y[i]; sxy += w * p.x[i] * p.y[i];
  }
  const det = s * sxx - sx * sx;
  return { a: (sxx * sy - sx * sxy) / det, b: (s * sxy - sx * sy) / det, cov: [sxx / det, -sx / det, s / det] };
}

describe("fitProfile(profile, id | model, options) → Fit", () => {
  const byId = fitProfile(lineA, "two-slit-broadband", { fix: bench });

  it("fitProfile(profile, \"two-slit-broadband\", { fix }) equals the fit of getModel(id) and reads parameters by name", () => {
    const byModel = fitProfileResult(lineA, getModel("two-slit-broadband"), { fix: bench });
    expect(byId.converged).toBe(true);
    expect(byId.params.separation.value).toBe(byModel.parameters.find((p) => p.name === "separation")!.value);
    expect(byId.params.separation.unit).toBe("m");
    expect(byId.params.wavelength).toMatchObject({ value: 680e-9, uncertainty: 0, fixed: true });
    // Demo truth (notebooks-demo/data/truths.json, invented for the demos): within 4 standard uncertainties.
    for (const name of ["separation", "bandwidth", "visibility"]) {
      expect(Math.abs(byId.params[name].value - truths.lineA[name]), name).toBeLessThan(4 * byId.params[name].uncertainty);
    }
  });

  it("fit.source records the model id and options, the fit options and the data fingerprint", () => {
    const small = fitProfile(lineA, "two-slit", { fix: bench, modelOptions: { smallAngle: true }, onProgress: () => undefined });
    expect(small.source.model).toEqual({ id: "two-slit", options: { smallAngle: true } });
    expect(small.source.options).toEqual({ fix: bench });
    expect(small.source.file).toEqual({ source: "line-pair-A.csv", sha256: lineA.provenance!.sha256 });
    expect(small.source.fingerprint).toMatch(/^[0-9a-f]{16}$/);
    expect(small.source.points).toBe(lineA.x.length);
  });

  it("fitProfile(profile, \"no-such-model\") and modelOptions with a model object are refused before any work", () => {
    expect(() => fitProfile(lineA, "no-such-model")).toThrow(/model id/);
    expect(() => fitProfile(lineA, getModel("two-slit"), { modelOptions: { smallAngle: true } })).toThrow(/only with a model id/);
  });

  it("a Fit copies like plain data (structuredClone, as a worker posts it) without its profile or model", () => {
    const copy = structuredClone(byId) as unknown as Record<string, unknown>;
    expect(copy.parameters).toEqual(byId.parameters);
    expect(copy.source).toEqual(byId.source);
    expect("profile" in copy || "fittedModel" in copy).toBe(false);
  });

  it("fit.report() names the data file and fit.figure() is the fit figure of its profile", () => {
    expect(byId.report().toString()).toMatch(/line-pair-A\.csv/);
    const figure = byId.figure();
    expect(figure.layout.meta.kind).toBe("fit");
    expect((figure.data[0] as { x: unknown[] }).x).toHaveLength(lineA.x.length);
  });

  it("fit.toJSON() is the results document: parseResults(JSON.stringify(fit)) reads the same numbers back", () => {
    const doc = parseResults(JSON.stringify(byId), "fit.json");
    expect(doc.fits[0].modelId).toBe("two-slit-broadband");
    expect(doc.fits[0].fitOptions).toEqual({ fix: bench });
    expect(doc.fits[0].result.parameters).toEqual(byId.parameters);
    expect(replayResults(doc, lineA).reproduced).toBe(true);
    expect(byId.replay().reproduced).toBe(true);
  });
});

describe("Fit of a straight line against the closed-form weighted least squares (common practice)", () => {
  const profile = lineProfile();
  const ref = straightLine(profile);
  const fit = fitProfile(profile, formulaModel("a + b*x"), { sigmaAbsolute: true, noise: "gaussian" });

  it("fit.params.a/b and their uncertainties equal the normal-equation solution", () => {
    expect(fit.params.a.value).toBeCloseTo(ref.a, 8);
    expect(fit.params.b.value).toBeCloseTo(ref.b, 8);
    expect(fit.params.a.uncertainty).toBeCloseTo(Math.sqrt(ref.cov[0]), 8);
    expect(fit.params.b.uncertainty).toBeCloseTo(Math.sqrt(ref.cov[2]), 8);
    expect(fit.format("b")).toMatch(/±/);
  });

  it("fit.band(x, 0.95) is a + b·x ± 1.96·sqrt(var) with var = C_aa + 2x·C_ab + x²·C_bb", () => {
    const x = Float64Array.from([0, 1, 3.5]);
    const band = fit.band(x, 0.95);
    x.forEach((v, i) => {
      const half = 1.959963984540054 * Math.sqrt(ref.cov[0] + 2 * v * ref.cov[1] + v * v * ref.cov[2]); // z(0.975), from memory
      expect(band.upper[i] - band.center[i]).toBeCloseTo(half, 6);
      expect(band.center[i]).toBeCloseTo(ref.a + ref.b * v, 8);
    });
  });

  it("fit.interval(\"b\", 0.95) is b ± 1.96 σ_b (exact for a linear model with absolute σ)", () => {
    const iv = fit.interval("b", 0.95);
    expect(iv.lower).toBeCloseTo(ref.b - 1.959963984540054 * Math.sqrt(ref.cov[2]), 5);
    expect(iv.upper).toBeCloseTo(ref.b + 1.959963984540054 * Math.sqrt(ref.cov[2]), 5);
  });

  it("a formula fit records its expression and replays from its results file alone", () => {
    expect(fit.source.model.formula?.expression).toBe("a + b*x");
    const doc = parseResults(fit.toResultsText(), "line.json");
    expect(doc.fits[0].formula?.expression).toBe("a + b*x");
    const replay = replayResults(doc, null);
    expect(replay.summary).toMatch(/^Reproduced/);
    expect(replay.replayed[0].parameters[1].value).toBeCloseTo(ref.b, 8);
  });
});

describe("fit.interval(name) re-fits with the fit's own solver settings", () => {
  // A line with two gross outliers and σ given: the robust scale changes the objective's shape.
  const profile = lineProfile();
  profile.y[5] += 3; profile.y[15] -= 2;
  const fit = fitProfile(profile, formulaModel("a + b*x"), { noise: "robust", robustScale: 0.5, tolerance: 1e-12, maxEvaluations: 900 });

  it("fit.interval(\"b\") equals profileInterval(..., { robustScale: 0.5 }) and differs from the default scale", () => {
    const own = fit.interval("b", 0.95);
    const given = profileInterval(fit, profile, fit.fittedModel, "b", 0.95, { robustScale: 0.5 });
    const defaultScale = profileInterval(fit, profile, fit.fittedModel, "b", 0.95, { robustScale: 2 });
    expect(own.lower).toBeCloseTo(given.lower, 10);
    expect(own.upper).toBeCloseTo(given.upper, 10);
    expect(Math.abs(defaultScale.upper - own.upper)).toBeGreaterThan(1e-4); // the setting matters here
  });

  it("optionsFromResult(fit, model) carries robustScale, tolerance and maxEvaluations", () => {
    expect(optionsFromResult(fit, fit.fittedModel)).toMatchObject({ robustScale: 0.5, tolerance: 1e-12, maxEvaluations: 900 });
  });
});

describe("compare({ label: fit, … }) → Comparison", () => {
  const ideal = fitProfile(lineA, "two-slit", { fix: bench });
  const broadband = fitProfile(lineA, "two-slit-broadband", { fix: bench });
  const comparison = compare({ ideal, broadband });

  it(".best is the bandwidth fit itself (the demo line was simulated with a 30 nm bandwidth, truths.json)", () => {
    expect(comparison.best).toBe(broadband);
    expect(comparison.ranking[0].label).toBe("broadband");
    expect(comparison.verdict).toMatch(/broadband/);
    expect(comparison.report().toString()).toMatch(/ideal/);
  });

  it(".report() fills the goodness-of-fit column from the fits themselves (not \"–\")", () => {
    // The ideal model misses the broadband line: its goodness test is not "good".
    expect(ideal.goodness.verdict).not.toBe("good");
    const word = (v: string) => (v === "poor" ? "POOR" : v === "not-tested" ? "not tested" : v);
    const rows = comparison.report().table.rows.map((r) => ("cells" in r ? [r.cells[0], r.cells[1]] : []));
    expect(rows).toEqual([["broadband", word(broadband.goodness.verdict)], ["ideal", word(ideal.goodness.verdict)]]);
  });

  it("compare([fitA, fitB]) labels by model id; compare of fits to different data is refused", () => {
    expect(compare([ideal, broadband]).best).toBe(broadband);
    const other = fitProfile({ ...lineA, y: lineA.y.map((v, i) => v + (i % 2)) }, "two-slit", { fix: bench });
    expect(() => compare({ ideal, other })).toThrow(/fingerprint|different data/);
  });

  it(".figure() shows binned residuals: the ideal model misses by far more than the bandwidth model", () => {
    const figure = comparison.figure();
    expect(figure.layout.meta).toMatchObject({ kind: "comparison", residuals: "binned" });
    const worst = (f: typeof ideal) => Math.max(...binResiduals(lineA, f.residuals).z.map(Math.abs));
    expect(worst(ideal)).toBeGreaterThan(5);
    expect(worst(broadband)).toBeLessThan(4.5);
  });

  it("comparison.toResultsText() records each fit's model and options; it replays", () => {
    const doc = parseResults(comparison.toResultsText(), "cmp.json");
    expect(doc.kind).toBe("comparison");
    expect(doc.fits.map((f) => f.label)).toEqual(["ideal", "broadband"]);
    expect(doc.fits[1].fitOptions).toEqual({ fix: bench });
    expect(doc.verdict).toBe(comparison.verdict);
    expect(replayResults(doc, lineA).reproduced).toBe(true);
  });
});

describe("binResiduals(profile, residuals, bins)", () => {
  it("sums each bin's residuals over √m (sum of independent N(0,1) is N(0, m); common practice)", () => {
    const profile: Profile = { x: Float64Array.from([0, 1, 2, 3, 4, 5]), y: new Float64Array(6), yUnit: "a.u.", counts: false, mask: Uint8Array.from([1, 1, 0, 1, 1, 1]) };
    const r = Float64Array.from([1, 2, NaN, 3, -1, 4]);
    const b = binResiduals(profile, r, 2);
    expect(Array.from(b.counts)).toEqual([2, 3]);
    expect(b.z[0]).toBeCloseTo(3 / Math.SQRT2, 14);
    expect(b.z[1]).toBeCloseTo(6 / Math.sqrt(3), 14);
    expect(b.x[1]).toBeCloseTo(4, 14);
  });
});
