import { describe, expect, it } from "vitest";
import { coherenceScanFigure } from "../../src/report/figures/coherenceScanFigure.js";
import { comparisonFigure } from "../../src/report/figures/comparisonFigure.js";
import { confidenceBand } from "../../src/report/figures/confidenceBand.js";
import { correlationFigure } from "../../src/report/figures/correlationFigure.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { resolveSize } from "../../src/report/figures/journal.js";
import { profileLikelihoodFigure } from "../../src/report/figures/profileLikelihoodFigure.js";
import { coherenceExample, comparisonExample, fitExample, profileCurvesExample } from "./figureExamples.js";
import { HOSTILE } from "./fixtures.js";

describe("resolveSize(size, defaultHeightMm)", () => {
  it("resolveSize({width: 'single'}) is 85 mm = 321 CSS px; 8 pt = 10.67 px (96 px/in, 72 pt/in)", () => {
    const s = resolveSize({ width: "single" }, 70);
    expect(s).toMatchObject({ widthMm: 85, widthPx: 321, heightPx: 265, fontPt: 8 });
    expect(s.fontPx).toBeCloseTo(10.6667, 4);
    expect(resolveSize({ width: "double" }, 80).widthPx).toBe(680); // 180 mm
  });
  it("resolveSize refuses fonts outside 7–9 pt and widths outside 40–250 mm", () => {
    expect(() => resolveSize({ fontPt: 12 }, 70)).toThrow(/invalid fontPt: 12 \(a font size from 7 to 9 pt\)/);
    expect(() => resolveSize({ width: 500 }, 70)).toThrow(/invalid width: 500/);
    expect(() => resolveSize({ width: "poster" as "single" }, 70)).toThrow(/invalid width: "poster"/);
  });
});

describe("fitFigure(profile, result, options)", () => {
  const { profile, result } = fitExample();
  it("has data, excluded points, model and residuals, with units on both axes", () => {
    const fig = fitFigure(profile, result);
    expect(fig.data.map((t) => t.name)).toEqual(["data", "excluded", "two-slit fit", "residuals"]);
    expect((fig.data[1].x as unknown[]).length).toBe(24); // the 24 pixels figureExamples masks (600–623)
    expect(JSON.stringify(fig.layout.xaxis2)).toContain("Position <i>x</i> (mm)");
    expect(JSON.stringify(fig.layout.yaxis)).toContain("Intensity <i>I</i> (10<sup>3</sup> counts)");
    expect(fig.layout.meta).toMatchObject({ kind: "fit", widthMm: 85, heightMm: 70, fontPt: 8 });
  });
  it("scales intensities by 10³ and positions to mm consistently for data and model", () => {
    const fig = fitFigure(profile, result);
    const i = 100;
    expect((fig.data[2].x as number[])[i]).toBeCloseTo(profile.x[i] * 1e3, 12);
    expect((fig.data[2].y as number[])[i]).toBeCloseTo(result.model[i] / 1e3, 12);
  });
  it("escapes user-supplied legend names", () => {
    const fig = fitFigure(profile, result, { modelLabel: HOSTILE[0], dataLabel: HOSTILE[1] });
    expect(JSON.stringify(fig.data.map((t) => t.name))).not.toMatch(/<script|<img/);
  });
  it("refuses a result of another profile", () => {
    const { scan } = coherenceExample();
    expect(() => fitFigure(scan, result)).toThrow(/the FitResult of this profile \(9 points\)/);
  });
});

describe("comparisonFigure / coherenceScanFigure / correlationFigure / profileLikelihoodFigure", () => {
  it("comparisonFigure gives each model its own colour and dash, residuals broken over masked points", () => {
    const { profile, fits } = comparisonExample();
    const fig = comparisonFigure(profile, fits);
    const lines = fig.data.filter((t) => t.mode === "lines");
    const styles = lines.map((t) => JSON.stringify(t.line));
    expect(new Set(styles.slice(0, 1).concat(styles.slice(2, 3))).size).toBe(2);
    expect((lines[1].y as (number | null)[])[610]).toBeNull(); // pixel 610 is inside the masked run 600–623 of figureExamples
    expect(() => comparisonFigure(profile, [...fits, ...fits, ...fits])).toThrow(/1 to 4 labelled fits/);
  });
  it("confidenceBand(model, result, x) is symmetric, z = 1.959964 at 95 % (normal quantile, A&S 26.2)", () => {
    const { result, model } = coherenceExample();
    const x = Float64Array.from([0.5e-3, 1e-3]);
    const b95 = confidenceBand(model, result, x, 0.95);
    const b68 = confidenceBand(model, result, x, 0.6826894921);
    for (let i = 0; i < 2; i++) {
      expect(b95.upper[i] - b95.center[i]).toBeCloseTo(b95.center[i] - b95.lower[i], 12);
      // half-widths scale with z: 1.959964 / 1.0 (A&S Table 26.1 quantiles)
      expect((b95.upper[i] - b95.center[i]) / (b68.upper[i] - b68.center[i])).toBeCloseTo(1.959964, 4);
    }
  });
  it("coherenceScanFigure draws band, fitted curve and measured points with error bars", () => {
    const { scan, result, model } = coherenceExample();
    const fig = coherenceScanFigure(scan, result, model);
    expect(fig.data.map((t) => t.name)).toEqual(["band lower", "95 % confidence band", "coherence-disc fit", "measured"]);
    expect(fig.data[3].error_y).toBeTruthy();
    expect(JSON.stringify(fig.layout.xaxis)).toContain("Slit separation <i>d</i> (mm)");
  });
  it("correlationFigure prints every coefficient and refuses a one-parameter fit", () => {
    const { result } = fitExample();
    const fig = correlationFigure(result);
    expect((fig.layout.annotations as unknown[]).length).toBe(49); // 7 free parameters → 7 × 7 coefficients (hand count)
    const one = { ...result, freeNames: ["amplitude"], correlation: new Float64Array([1]) };
    expect(() => correlationFigure(one)).toThrow(/at least two free parameters/);
  });
  it("profileLikelihoodFigure marks Δχ² = 1 and 3.841 (χ²₁ 68.27 % and 95 %, A&S Table 26.8)", () => {
    const fig = profileLikelihoodFigure(profileCurvesExample());
    const levels = (fig.layout.meta.thresholds as number[]).map((t) => t.toFixed(3));
    expect(levels).toEqual(["1.000", "3.841"]);
    expect(fig.layout.meta.best).toEqual(["(500.00 ± 0.40) µm", "0.8500 ± 0.0040"]); // the example's optima and σ, GUM 7.2.6 rounding by hand
  });
});
