import { describe, expect, it } from "vitest";
import { compareFits, comparisonJson } from "../../src/stats/index.js";
import type { Profile } from "../../src/profile.js";
import { fakeFit, seeded } from "./fakeFit.js";

const n = 400;
const x = Float64Array.from({ length: n }, (_, i) => (i - n / 2) * 5.5e-6);
const profile: Profile = { x, y: new Float64Array(n).fill(100), yUnit: "counts", counts: true };
const geometry = { wavelength: 632.8e-9, distance: 1, separation: 0.5e-3 };
const fringe = geometry.separation / (geometry.wavelength * geometry.distance);
const white = (seed: number) => {
  const rng = seeded(seed);
  return Float64Array.from({ length: n }, () => rng.normal());
};

describe("compareFits", () => {
  const far = fakeFit({ modelId: "two-slit", free: ["amplitude", "background", "center", "separation"], values: { ...geometry, amplitude: 1, background: 0, center: 0 },
    logLikelihood: -1500, chi2: 800, n, residuals: white(1).map((v, i) => v + 0.8 * Math.cos(2 * Math.PI * fringe * x[i])) });
  const near = fakeFit({ modelId: "two-slit-fresnel", free: ["amplitude", "background", "center", "separation", "width"], values: { ...geometry, amplitude: 1, background: 0, center: 0, width: 1e-4 },
    logLikelihood: -1300, chi2: 402, n, residuals: white(2) });

  it("compareFits(fits, { profile }) ranks by AIC, gives Δ, weights and a verdict with numbers", () => {
    const result = compareFits([far, near], { profile });
    expect(result.preferred).toBe("two-slit-fresnel");
    expect(result.rows.map((r) => r.label)).toEqual(["two-slit-fresnel", "two-slit"]);
    // By hand: AIC_near = 2600 + 10 = 2610, AIC_far = 3000 + 8 = 3008, Δ = 398 (Akaike 1974).
    expect(result.rows[1].deltaAic).toBe(398);
    expect(result.rows[0].weight).toBeCloseTo(1, 12);
    expect(result.verdict).toMatch(/two-slit-fresnel is preferred over two-slit: ΔAIC = 398\.0 \(decisive preference/);
    expect(result.rows[1].diagnostics.structured).toBe(true);
    expect(result.rows[1].diagnostics.periodicity?.pValue).toBeLessThan(1e-6);
    expect(result.tests).toEqual([]);
  });
  it("compareFits(fits) warns 'consider the near-field model' when a far-field winner has structured residuals", () => {
    const result = compareFits([far], { profile });
    expect(result.preferred).toBe("two-slit");
    expect(result.verdict).toMatch(/residuals of two-slit still structured .*leftover power at the fringe frequency.*consider the near-field model/);
    // χ² = 800 with ν = 396: far in the upper tail of χ²(396), so the scatter warning appears.
    expect(result.warnings.some((w) => /reduced χ² of two-slit is 2\.02 \(p < 1e-12\): the scatter is larger/.test(w))).toBe(true);
  });
  it("compareFits(fits, { nested }) runs the likelihood-ratio and F tests on asserted pairs", () => {
    const result = compareFits([far, near], { profile, nested: [["two-slit", "two-slit-fresnel"]] });
    expect(result.tests).toHaveLength(1);
    expect(result.tests[0].likelihoodRatio).toBe(400); // 2 (ln L_near − ln L_far) = 2 (−1300 + 1500), by hand (Wilks 1938)
    expect(result.tests[0].nesting).toBe("asserted");
    expect(result.verdict).toMatch(/likelihood ratio 400\.0, p < 1e-12/);
    expect(() => compareFits([far, near], { nested: [["two-slit", "nope"]] })).toThrow(/labels of the compared fits: two-slit, two-slit-fresnel/);
  });
  it("compareFits(fits) refuses different noise models, point counts, masks and data", () => {
    const poisson = { ...near, noise: "poisson" as const };
    expect(() => compareFits([far, poisson])).toThrow(/noise gaussian vs poisson.*same noise option/);
    const fewer = { ...near, statistics: { ...near.statistics, n: n - 1 } };
    expect(() => compareFits([far, fewer])).toThrow(/400 vs 399 points used/);
    const masked = { ...near, residuals: near.residuals.map((v, i) => (i === 7 ? NaN : v)) };
    expect(() => compareFits([far, masked])).toThrow(/masks differ at point 7/);
    const other: Profile = { ...profile, y: profile.y.map((v, i) => (i === 3 ? v + 1 : v)) };
    expect(() => compareFits([{ fit: far, profile }, { fit: near, profile: other }])).toThrow(/data fingerprints [0-9a-f]{16} vs [0-9a-f]{16}/);
    expect(() => compareFits([])).toThrow(/non-empty array/);
  });
  it("compareFits(fits) leaves non-converged fits out of the ranking, says so, and states no preference", () => {
    const failed = { ...near, converged: false, message: "stopped at the evaluation limit before converging" };
    const result = compareFits([failed, far], { profile });
    expect(result.preferred).toBeNull();
    expect(result.unreliable).toEqual([{ label: "two-slit-fresnel", reasons: ["did not converge (stopped at the evaluation limit before converging)"] }]);
    expect(result.rows[1].weight).toBe(0);
    expect(result.verdict).toMatch(/two-slit-fresnel did not converge/);
    expect(result.verdict).toMatch(/^No model is preferred: the fit of two-slit-fresnel \(did not converge/);
    expect(result.verdict).not.toMatch(/is preferred over/);
  });
  it("compareFits(fits) states no preference when a fit warns no-fringes or fringe-aliased, or the best-ranked fit warns poor-fit, and names it", () => {
    // A fit that found no fringe (or an alias) failed to find its optimum: no preference.
    for (const code of ["no-fringes", "fringe-aliased"]) {
      const bad = { ...far, warnings: [{ code, message: `the model does not describe these data (${code} test)` }] };
      const result = compareFits([bad, near], { profile });
      expect(result.preferred, code).toBeNull();
      expect(result.unreliable.map((u) => u.label)).toEqual(["two-slit"]);
      expect(result.unreliable[0].reasons[0]).toBe(`${code}: the model does not describe these data (${code} test)`);
      expect(result.verdict).toMatch(new RegExp(`^No model is preferred: the fit of two-slit \\(${code}: `));
      expect(result.verdict).not.toMatch(/is preferred over|decisive/);
      expect(comparisonJson(result).preferred).toBeNull();
    }
    // A poor fit of the model that ranks lower is what a comparison shows: the preference stands.
    const poorFar = { ...far, warnings: [{ code: "poor-fit", message: "the model does not describe these data (χ²/ν = 4270)" }] };
    expect(compareFits([poorFar, near], { profile }).preferred).toBe("two-slit-fresnel");
    // A poor fit of the best-ranked model: no candidate describes the data, so no preference.
    const poorNear = { ...near, warnings: [{ code: "poor-fit", message: "the model does not describe these data (χ²/ν = 3.1)" }] };
    const none = compareFits([far, poorNear], { profile });
    expect(none.preferred).toBeNull();
    expect(none.unreliable.map((u) => u.label)).toEqual(["two-slit-fresnel"]);
    // Another warning (a parameter at its bound) is no failure: the preference stands.
    const atBound = { ...far, warnings: [{ code: "at-bound", message: "visibility is at its upper bound 1" }] };
    expect(compareFits([atBound, near], { profile }).preferred).toBe("two-slit-fresnel");
  });
  it("comparisonJson(result) has the compare --json shape", () => {
    const json = comparisonJson(compareFits([far, near], { profile }));
    expect(Object.keys(json)).toEqual(expect.arrayContaining(["ranking", "preferred", "verdict"]));
    expect(json.ranking[0]).toMatchObject({ modelId: "two-slit-fresnel", aic: 2610, deltaAic: 0 });
    expect(json.ranking[1]).toMatchObject({ modelId: "two-slit", aic: 3008, deltaAic: 398, residualsStructured: true });
    expect(JSON.parse(JSON.stringify(json)).preferred).toBe("two-slit-fresnel");
  });
});
