import { describe, expect, it } from "vitest";
import { farFieldValidity } from "../../src/api/farField.js";
import { coherenceScanProfile, sourceSize } from "../../src/stats/index.js";
import { fakeFit } from "./fakeFit.js";
import { expectClose } from "./python.js";

describe("farFieldValidity", () => {
  const geometry = { amplitude: 1, center: 0, separation: 0.5e-3, width: 0.1e-3, wavelength: 632.8e-9, distance: 1 };
  it("farFieldValidity(fit) computes a²/(λL) with its uncertainty and passes a far-field bench", () => {
    const fit = fakeFit({ modelId: "two-slit", free: ["amplitude", "width"], values: geometry, uncertainty: { width: 1e-6 }, logLikelihood: 0, chi2: 1, n: 10 });
    const check = farFieldValidity(fit, { distance: { value: 1, uncertainty: 1e-3 } });
    // By hand: (1e-4)²/(632.8e-9 · 1) = 0.015803; relative u = 2 u_a/a ⊕ u_L/L = 0.02 ⊕ 0.001.
    expectClose(check.fresnelNumber.value, 1e-8 / 632.8e-9, 1e-12, "N_F");
    expectClose(check.fresnelNumber.uncertainty / check.fresnelNumber.value, Math.hypot(0.02, 1e-3), 1e-6, "u(N_F)");
    expect(check.valid).toBe(true);
    expect(check.warning).toBeUndefined();
  });
  it("farFieldValidity(fit) warns when a far-field model is used at Fresnel number ≈ 3", () => {
    const near = { ...geometry, width: 0.44e-3, separation: 1e-3, distance: 0.1 };
    const fit = fakeFit({ modelId: "two-slit", free: ["amplitude"], values: near, logLikelihood: 0, chi2: 1, n: 10 });
    const check = farFieldValidity(fit);
    expect(check.fresnelNumber.value).toBeGreaterThan(2.9);
    expect(check.valid).toBe(false);
    expect(check.warning).toMatch(/two-slit is a far-field model used outside its range .*fit "two-slit-fresnel" instead/);
    // Distance where both numbers reach 0.1, by hand: max(a², d·a)/(0.1 λ) = 4.4e-7/6.328e-8 = 6.95 m.
    expect(check.warning).toMatch(/or move the detector to at least 7\.0 m$/);
    const nearModel = farFieldValidity({ ...fit, modelId: "two-slit-fresnel" });
    expect(nearModel.warning).toBeUndefined();
    // the source-size models are two-slit far-field patterns too
    for (const modelId of ["two-slit-disc-source", "two-slit-gaussian-source"]) {
      expect(farFieldValidity({ ...fit, modelId }).warning).toMatch(new RegExp(`^${modelId} is a far-field model used outside its range`));
    }
  });
});

describe("farFieldValidity(broadband fit in the near field)", () => {
  it("farFieldValidity(fit) never sends a fit with bandwidth or partial coherence to the monochromatic near-field model", () => {
    const near = { amplitude: 1, center: 0, separation: 1e-3, width: 0.44e-3, wavelength: 590e-9, distance: 0.1, visibility: 0.7, bandwidth: 15e-9 };
    const fit = fakeFit({ modelId: "two-slit-broadband", free: ["amplitude", "visibility", "bandwidth"], values: near, uncertainty: { visibility: 0.01, bandwidth: 1e-9 }, logLikelihood: 0, chi2: 1, n: 10 });
    const check = farFieldValidity(fit);
    expect(check.warning).not.toMatch(/fit "two-slit-fresnel" instead/);
    expect(check.warning).toMatch(/"two-slit-fresnel" has no visibility below 1 \(partial coherence\) or spectral bandwidth, which this fit needs, so no built-in model covers these data: move the detector/);
    // A bandwidth fitted as 0 ± 1 nm and visibility 1 need nothing the near-field model lacks.
    const neutral = fakeFit({ modelId: "two-slit-broadband", free: ["amplitude", "visibility", "bandwidth"], values: { ...near, visibility: 1, bandwidth: 0.5e-9 }, uncertainty: { visibility: 0.01, bandwidth: 1e-9 }, logLikelihood: 0, chi2: 1, n: 10 });
    expect(farFieldValidity(neutral).warning).toMatch(/fit "two-slit-fresnel" instead/);
  });
});

describe("sourceSize", () => {
  const values = { visibility: 0.95, diameter: 1e-3, sourceDistance: 2, wavelength: 550e-9 };
  const fit = fakeFit({ modelId: "coherence-disc", free: ["visibility", "diameter"], values, uncertainty: { visibility: 0.01, diameter: 2e-5 }, logLikelihood: 0, chi2: 8, n: 10 });
  it("sourceSize(fit, calibration) scales D with the calibrated λR and adds their uncertainties", () => {
    const r = sourceSize(fit, { sourceDistance: { value: 2.02, uncertainty: 0.01 }, wavelength: { value: 550e-9, uncertainty: 0 } });
    // By hand: D = 1 mm × 2.02/2; relative u = 0.02 ⊕ 0.01/2.02.
    expectClose(r.size.value, 1.01e-3, 1e-12, "D");
    expectClose(r.size.uncertainty / r.size.value, Math.hypot(0.02, 0.01 / 2.02), 1e-6, "u(D)");
    expect(r.size.unit).toBe("m");
    // 95 % interval with t_{0.975}(8) = 2.306 (A&S Table 26.10).
    expectClose((r.interval[1] - r.interval[0]) / (2 * r.size.uncertainty), 2.306004, 1e-6, "t factor");
    expectClose(r.angularSize.value, 1.01e-3 / 2.02, 1e-12, "angular");
  });
  it("sourceSize(fit) refuses other models and a fixed size", () => {
    expect(() => sourceSize({ ...fit, modelId: "two-slit" })).toThrow(/coherence-disc/);
    expect(() => sourceSize({ ...fit, freeNames: ["visibility"] })).toThrow(/diameter fixed/);
  });
  it("coherenceScanProfile(d, V, u) sorts by separation and validates", () => {
    const p = coherenceScanProfile([3e-4, 1e-4, 2e-4], [0.5, 0.9, 0.7], [0.02, 0.01, 0.03]);
    expect(Array.from(p.x)).toEqual([1e-4, 2e-4, 3e-4]);
    expect(Array.from(p.y)).toEqual([0.9, 0.7, 0.5]);
    expect(Array.from(p.sigma!)).toEqual([0.01, 0.03, 0.02]);
    expect(() => coherenceScanProfile([1e-4, 1e-4, 2e-4], [0.5, 0.5, 0.4], [0.1, 0.1, 0.1])).toThrow(/distinct separations/);
    expect(() => coherenceScanProfile([1e-4, 2e-4, 3e-4], [0.5, 0.5, 0.4], [0.1, 0, 0.1])).toThrow(/uncertainties\[1\]/);
  });
});
