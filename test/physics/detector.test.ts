import { describe, expect, it } from "vitest";
import { getModel } from "../../src/physics/registry.js";
import { paramVector } from "../../src/physics/simulate.js";

// A flat-envelope small-angle two-slit pattern is a pure cosine A(1 + V cos(q u + φ)), q = 2πd/(λL).
// Averaging cos over a pixel of width w multiplies its amplitude by sinc(q w/2); a Gaussian blur of
// standard deviation σ by exp(−q²σ²/2) (Fourier transforms of the box and of the Gaussian, common practice).
const LAMBDA = 632.8e-9, D = 0.5e-3, L = 1;
const q = (2 * Math.PI * D) / (LAMBDA * L);
const period = (2 * Math.PI) / q;

function cosineCase(pixelWidth: number, blur: number, options = {}): { got: Float64Array; x: Float64Array } {
  const model = getModel("two-slit", { smallAngle: true, ...options });
  // amplitude 2 = coherent peak, so the mean level is 1
  const p = paramVector(model, { amplitude: 2, center: 0, separation: D, width: 1e-15, visibility: 1, phase: 0.2, wavelength: LAMBDA, distance: L, pixelWidth, blur });
  const x = new Float64Array(50).map((_, i) => (i * period) / 37);
  const got = new Float64Array(x.length);
  model.evaluate(x, p, got);
  return { got, x };
}

describe("detectorModel pixel averaging and blur", () => {
  it("pixelWidth w multiplies the fringe term by sinc(q w/2) (5-point Gauss–Legendre: 1e-10 at w = period/4)", () => {
    for (const w of [5.5e-6, period / 4]) {
      const { got, x } = cosineCase(w, 0);
      const factor = Math.sin((q * w) / 2) / ((q * w) / 2);
      x.forEach((xi, i) => expect(Math.abs(got[i]! - (1 + factor * Math.cos(q * xi + 0.2))), `w = ${w}`).toBeLessThan(1e-10));
    }
  });
  it("blur σ multiplies the fringe term by exp(−q²σ²/2) (16-node Gauss–Hermite: 1e-9 up to σ = period/4)", () => {
    for (const [sigma, tolerance] of [[period / 20, 1e-13], [period / 4, 1e-9]] as const) {
      const { got, x } = cosineCase(0, sigma);
      const factor = Math.exp(-0.5 * (q * sigma) ** 2);
      x.forEach((xi, i) => expect(Math.abs(got[i]! - (1 + factor * Math.cos(q * xi + 0.2))), `σ = ${sigma}`).toBeLessThan(tolerance));
    }
  });
  it("pixel width and blur together multiply both factors", () => {
    const w = period / 6, sigma = period / 10;
    const { got, x } = cosineCase(w, sigma);
    const factor = (Math.sin((q * w) / 2) / ((q * w) / 2)) * Math.exp(-0.5 * (q * sigma) ** 2);
    x.forEach((xi, i) => expect(Math.abs(got[i]! - (1 + factor * Math.cos(q * xi + 0.2)))).toBeLessThan(1e-10));
  });
  it("getModel(id, options) rejects unknown options, wrong option types and bad node counts", () => {
    expect(() => getModel("two-slit", { smallangle: true })).toThrow(/invalid model option: "smallangle" \(one of smallAngle/);
    expect(() => getModel("two-slit", { smallAngle: "yes" as unknown as boolean })).toThrow(/invalid smallAngle: "yes"/);
    expect(() => getModel("two-slit", { pixelNodes: 0 })).toThrow(/invalid pixelNodes: 0/);
    expect(() => getModel("no-such-model")).toThrow(/invalid model id: "no-such-model" \(one of two-slit/);
  });
});
