import { describe, expect, it } from "vitest";
import { coherenceFromVisibility, intensityRatioFromVisibility, visibilityFromBeams } from "../../src/physics/coherence.js";
import { hasScipy, python } from "./python.js";
import { evaluate } from "./evaluateModel.js";

describe('getModel("coherence-disc")', () => {
  const values = { visibility: 1, diameter: 1e-3, sourceDistance: 2, wavelength: 550e-9 };
  it("vanishes first at d = 1.2197 λR/D (first zero of J1 / π, common practice)", () => {
    const d = (3.8317059702075123 / Math.PI) * (550e-9 * 2) / 1e-3; // A&S Table 9.5 zero j_{1,1}
    const out = evaluate("coherence-disc", values, new Float64Array([d, 0]));
    expect(out[0]!).toBeLessThan(1e-15);
    expect(out[1]!).toBe(1);
  });
  it.skipIf(!hasScipy)("equals V0 |2 J1(v)/v| from scipy.special.j1 over three lobes", () => {
    const x = Array.from({ length: 200 }, (_, i) => 1e-6 + i * 20e-6);
    const reference = python<number[]>(
      "import json,sys,math\nfrom scipy.special import j1\nd=json.load(sys.stdin)\nv=[math.pi*1e-3*x/(550e-9*2) for x in d['x']]\nprint(json.dumps([0.8*abs(2*j1(t)/t) for t in v]))",
      { x },
    );
    const out = evaluate("coherence-disc", { ...values, visibility: 0.8 }, Float64Array.from(x));
    x.forEach((_, i) => expect(Math.abs(out[i]! - reference[i]!)).toBeLessThan(1e-14));
  });
});

describe('getModel("coherence-gaussian")', () => {
  it("falls to V0·e^{−1/2} at d = λR/(2πσ) (Fourier transform of a Gaussian, common practice)", () => {
    const sigma = 0.3e-3, R = 1.5, lambda = 589e-9;
    const d = (lambda * R) / (2 * Math.PI * sigma);
    const out = evaluate("coherence-gaussian", { visibility: 0.9, rmsSize: sigma, sourceDistance: R, wavelength: lambda }, new Float64Array([d]));
    expect(out[0]!).toBeCloseTo(0.9 * Math.exp(-0.5), 14);
  });
});

describe("visibility relations V = 2√(I1 I2)/(I1 + I2) · |γ12|", () => {
  it("visibilityFromBeams(1, 1/4, 1) = 0.8 and (1, 1, 0.5) = 0.5 (Born & Wolf §10.4.1 worked by hand)", () => {
    expect(visibilityFromBeams(1, 0.25, 1)).toBeCloseTo(0.8, 15);
    expect(visibilityFromBeams(1, 1, 0.5)).toBeCloseTo(0.5, 15);
  });
  it("coherenceFromVisibility and intensityRatioFromVisibility invert visibilityFromBeams", () => {
    for (const [r, g] of [[0.25, 1], [0.6, 0.7], [1, 0.3], [0.01, 0.99]] as const) {
      const V = visibilityFromBeams(1, r, g);
      expect(coherenceFromVisibility(V, 1, r)).toBeCloseTo(g, 12);
      expect(intensityRatioFromVisibility(V, g)).toBeCloseTo(r, 12);
    }
  });
  it("coherenceFromVisibility rejects a visibility the intensity ratio cannot give", () => {
    expect(() => coherenceFromVisibility(0.95, 1, 0.25)).toThrow(/invalid visibility: 0.95 \(at most 0.8/);
    expect(() => visibilityFromBeams(-1, 1, 1)).toThrow(/invalid intensity1/);
  });
});
