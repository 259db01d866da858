import { describe, expect, it } from "vitest";
import { getModel } from "../../src/physics/registry.js";
import { checkParameters, paramVector, pixelPositions, simulateProfile } from "../../src/physics/simulate.js";

// B1 of the shared benchmark problems (an invented scenario)
const B1 = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, pixelWidth: 5.5e-6 };

describe("pixelPositions(count, pitch, offset)", () => {
  it("pixelPositions(4096, 5.5 µm) is centred on the axis with the given pitch", () => {
    const x = pixelPositions(4096, 5.5e-6);
    expect(x[0]! + x[4095]!).toBeCloseTo(0, 18);
    expect(x[1]! - x[0]!).toBeCloseTo(5.5e-6, 18);
    expect(pixelPositions(3, 1e-3, 2e-3)).toEqual(new Float64Array([1e-3, 2e-3, 3e-3]));
    expect(() => pixelPositions(0, 1e-6)).toThrow(/invalid count: 0/);
    expect(() => pixelPositions(10, -1)).toThrow(/invalid pitch: -1/);
  });
});

describe("paramVector(model, values) / checkParameters(model, params)", () => {
  it("fills defaults by name and rejects unknown names, wrong lengths and out-of-bound values", () => {
    const model = getModel("two-slit");
    const p = paramVector(model, { separation: 0.3e-3 });
    expect(p[model.parameters.findIndex((s) => s.name === "separation")]).toBe(0.3e-3);
    expect(p[model.parameters.findIndex((s) => s.name === "wavelength")]).toBe(632.8e-9);
    expect(() => paramVector(model, { seperation: 1 })).toThrow(/invalid parameter name: "seperation"/);
    expect(() => paramVector(model, [1, 2, 3])).toThrow(/invalid params: "3 values"/);
    expect(() => paramVector(model, { visibility: 1.5 })).toThrow(/invalid visibility: 1.5 \(between 0 and 1 1\)/);
    expect(() => checkParameters(getModel("n-slit"), paramVector(getModel("n-slit"), { slits: 2.5 }))).toThrow(/invalid slits: 2.5 \(an integer\)/);
  });
});

describe("simulateProfile(model, params, x, options)", () => {
  it("simulateProfile(B1, poisson, seed) is reproducible, integer, and scatters like √mean", () => {
    const model = getModel("two-slit");
    const x = pixelPositions(4096, 5.5e-6);
    const a = simulateProfile(model, B1, x, { noise: "poisson", seed: 7 });
    const b = simulateProfile(model, B1, x, { noise: "poisson", seed: 7 });
    const c = simulateProfile(model, B1, x, { noise: "poisson", seed: 8 });
    expect(a.y).toEqual(b.y);
    expect(a.y).not.toEqual(c.y);
    expect(a.counts).toBe(true);
    expect(a.yUnit).toBe("counts");
    let chi2 = 0;
    a.y.forEach((y, i) => {
      expect(Number.isInteger(y)).toBe(true);
      chi2 += (y - a.mean[i]!) ** 2 / a.mean[i]!;
    });
    // Pearson χ²/n for Poisson data is 1 ± √(2/n) (common practice): 5σ band
    expect(Math.abs(chi2 / 4096 - 1)).toBeLessThan(5 * Math.sqrt(2 / 4096));
  });
  it("simulateProfile(gaussian) adds N(0, σ²) and records σ; none returns the mean", () => {
    const model = getModel("two-slit");
    const x = pixelPositions(2000, 10e-6);
    const g = simulateProfile(model, B1, x, { noise: "gaussian", sigma: 3, seed: 1 });
    let sum2 = 0;
    g.y.forEach((y, i) => { sum2 += (y - g.mean[i]!) ** 2; });
    expect(Math.abs(Math.sqrt(sum2 / 2000) - 3)).toBeLessThan(5 * 3 / Math.sqrt(4000));
    expect(g.sigma![0]).toBe(3);
    const n = simulateProfile(model, B1, x, { noise: "none" });
    expect(n.y).toEqual(n.mean);
    expect(() => simulateProfile(model, B1, x, { noise: "gaussian" })).toThrow(/invalid sigma/);
    expect(() => simulateProfile(model, { ...B1, background: -1e6 }, x, { noise: "poisson" })).toThrow(/invalid model mean.*raise the background/);
  });
});
