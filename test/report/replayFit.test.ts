// End to end: a CSV file's bytes → io's readTable → fitProfile → results JSON → replay with the
// real fitter. The SHA-256 comes from the bytes, as the command line computes it.
import { describe, expect, it } from "vitest";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { compareFits } from "../../src/stats/compareFits.js";
import { comparisonReport } from "../../src/report/tableReport.js";
import { readTable } from "../../src/io/parseTable.js";
import { getModel } from "../../src/physics/registry.js";
import { pixelPositions, simulateProfile } from "../../src/physics/simulate.js";
import { profileCurve } from "../../src/fit/profileCurve.js";
import { profileLikelihoodFigure } from "../../src/report/figures/profileLikelihoodFigure.js";
import { replayResults } from "../../src/api/replay.js";
import { fitDocument, parseResults, stringifyResults } from "../../src/report/results/resultsDocument.js";
import { TWO_SLIT_TRUTH } from "./figureExamples.js";

/** A B1-like scan (512 pixels of 22 µm, Poisson counts, seed 11) as the bytes of a CSV file. */
function csvBytes(seed: number): Uint8Array {
  const x = pixelPositions(512, 22e-6);
  const sim = simulateProfile(getModel("two-slit"), TWO_SLIT_TRUTH, x, { noise: "poisson", seed });
  const lines = ["position [mm],intensity (counts)"];
  for (let i = 0; i < x.length; i++) lines.push(`${(x[i] * 1e3).toFixed(6)},${sim.y[i]}`);
  return new TextEncoder().encode(`${lines.join("\n")}\n`);
}

const START = { amplitude: 18000, background: 100, center: 0.3e-3, separation: 0.497e-3, width: 0.11e-3, visibility: 0.7, phase: 0 };

describe("replayResults(doc, profile) with fitProfile", () => {
  const bytes = csvBytes(11);
  const readOptions = { source: "scan-11.csv" };
  const { profile } = readTable(bytes, readOptions);
  const model = getModel("two-slit");
  const result = fitProfile(profile, model, { start: START, noise: "poisson" });
  const text = stringifyResults(fitDocument(profile, { result, fitOptions: { start: START, noise: "poisson" } }));

  it("the recorded fit converged (precondition)", () => {
    expect(result.converged).toBe(true);
  });

  it("replayResults(parseResults(json), readTable(same bytes)) reproduces the fit", () => {
    const doc = parseResults(text, "fit.json");
    expect(doc.input.sha256).toMatch(/^[0-9a-f]{64}$/);
    const again = readTable(bytes, { ...(doc.input.readOptions as object), source: "scan-11.csv" }).profile;
    const report = replayResults(doc, again);
    expect(report.differences).toEqual([]);
    expect(report.reproduced).toBe(true);
    expect(report.dataCheck).toBe("sha256");
  });

  it("replayResults refuses a file with one changed count (different SHA-256)", () => {
    const changed = Uint8Array.from(bytes);
    const at = changed.lastIndexOf(0x2c) + 1; // first digit of the last count
    changed[at] = changed[at] === 0x39 ? 0x38 : changed[at] + 1;
    const other = readTable(changed, { source: "scan-11.csv" }).profile;
    expect(() => replayResults(parseResults(text), other)).toThrow(/SHA-256 .* does not match .*; this is not the data the result was made from/);
  });

  it("replayResults says what differs when the recorded options no longer give the same fit", () => {
    const doc = parseResults(text);
    doc.fits[0].fitOptions = { ...doc.fits[0].fitOptions, fix: { visibility: 0.8 } };
    const report = replayResults(doc, readTable(bytes, readOptions).profile);
    expect(report.reproduced).toBe(false);
    expect(report.differences.map((d) => d.quantity)).toContain("visibility fixed");
    expect(report.summary).toMatch(/^NOT reproduced/);
  });
});

describe("profileCurve(result, profile, model, name) with fitProfile", () => {
  const { profile } = readTable(csvBytes(11), { source: "scan-11.csv" });
  const model = getModel("two-slit");
  const result = fitProfile(profile, model, { start: START, noise: "poisson" });
  it("is 0 at the best fit and ≈ 1 one standard error away (Wilks 1938: Δχ² ~ χ²₁; quadratic near the optimum)", () => {
    const curve = profileCurve(result, profile, model, "separation", { points: 7, span: 3 });
    const d = Array.from(curve.deltaObjective);
    expect(d[3]).toBeLessThan(1e-3);
    // grid at −3, −2, −1, 0, 1, 2, 3 standard errors
    expect(d[2]).toBeGreaterThan(0.85);
    expect(d[2]).toBeLessThan(1.15);
    expect(d[4]).toBeGreaterThan(0.85);
    expect(d[4]).toBeLessThan(1.15);
    expect(d[0]).toBeGreaterThan(7);
    const fig = profileLikelihoodFigure([curve]);
    expect(fig.data.map((t) => t.name)).toEqual(["profile", "quadratic (covariance)"]);
  });
  it("refuses a fixed parameter by name", () => {
    expect(() => profileCurve(result, profile, model, "wavelength")).toThrow(/invalid parameter: "wavelength" \(a free parameter of the fit: /);
  });
});

describe("comparisonReport(fits, {verdict, tests}) with compareFits", () => {
  const { profile } = readTable(csvBytes(11), { source: "scan-11.csv" });
  const model = getModel("two-slit");
  const free = fitProfile(profile, model, { start: START, noise: "poisson" });
  const fixedV = fitProfile(profile, model, { start: START, noise: "poisson", fix: { visibility: 0.8 } });
  it("prints the likelihood-ratio and F tests of nested fits and the verdict as notes", () => {
    const fits = [{ label: "V free", result: free }, { label: "V = 0.8", result: fixedV }];
    const comparison = compareFits(fits.map((f) => ({ fit: f.result, label: f.label, profile })));
    expect(comparison.tests.length).toBe(1);
    const text = comparisonReport(comparison, { verdict: comparison.verdict, tests: comparison.tests, fits }).toString();
    expect(text).toMatch(/V = 0\.8 within V free \(1 extra parameter\): likelihood ratio [\d.]+, p < 1e-12; F\(1, 505\) = [\d.]+, p < 1e-12\./);
    expect(text).toContain(comparison.verdict);
    expect(text.split("\n")[3]).toMatch(/^V free /); // best AIC first
  });
});
