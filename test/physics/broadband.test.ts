import { describe, expect, it } from "vitest";
import { getModel } from "../../src/physics/registry.js";
import { pixelPositions } from "../../src/physics/simulate.js";
import { evaluate } from "./evaluateModel.js";

const LAMBDA = 632.8e-9;

/** A Gaussian spectrum in wavenumber k (σk from the FWHM Δλ as the model defines it), tabulated in wavelength. */
function gaussianTable(centre: number, fwhm: number, rows: number): { wavelengths: number[]; weights: number[] } {
  const k0 = (2 * Math.PI) / centre;
  const sigmaK = (2 * Math.PI * fwhm) / (centre * centre) / (2 * Math.sqrt(2 * Math.LN2));
  const wavelengths: number[] = [];
  const weights: number[] = [];
  for (let j = 0; j < rows; j++) {
    const k = k0 + sigmaK * (8 - (16 * j) / (rows - 1)); // k from high to low → λ increasing
    const lambda = (2 * Math.PI) / k;
    wavelengths.push(lambda);
    // density per unit wavelength: S_λ = S_k · |dk/dλ| = S_k · 2π/λ²
    weights.push(Math.exp(-0.5 * ((k - k0) / sigmaK) ** 2) * ((2 * Math.PI) / (lambda * lambda)));
  }
  return { wavelengths, weights };
}

describe('getModel("two-slit-broadband")', () => {
  it("equals the tabulated-spectrum model summed over a fine Gaussian table (fringe term exact; envelope-at-λ0 error second order in Δλ/λ)", () => {
    const x = pixelPositions(801, 20e-6, 0.1e-3);
    const common = { amplitude: 1, center: 0.1e-3, separation: 0.5e-3, visibility: 0.9, phase: 0.4, distance: 1 };
    for (const [width, bandwidth, tolerance] of [[1e-9, 6.328e-9, 1e-9], [0.1e-3, 6.328e-9, 3e-4], [0.1e-3, 0.6328e-9, 3e-6]] as const) {
      const analytic = evaluate("two-slit-broadband", { ...common, width, wavelength: LAMBDA, bandwidth }, x);
      const numeric = evaluate("two-slit-spectrum", { ...common, width }, x, { spectrum: gaussianTable(LAMBDA, bandwidth, 4001) });
      let worst = 0;
      x.forEach((_, i) => { worst = Math.max(worst, Math.abs(analytic[i]! - numeric[i]!)); });
      expect(worst, `slit width ${width} m, bandwidth ${bandwidth} m: worst difference ${worst} (peak 1.9)`).toBeLessThan(tolerance);
    }
  });

  it("loses fringe contrast to 1/e at path difference D = (2√(ln 2)/π) λ²/Δλ", () => {
    // analytic consequence of the Gaussian spectrum convention stated in broadband.ts
    const bandwidth = 20e-9, d = 0.5e-3, L = 1;
    const D = ((2 * Math.sqrt(Math.LN2)) / Math.PI) * LAMBDA ** 2 / bandwidth;
    const s = D / d;
    const xPeak = (L * s) / Math.sqrt(1 - s * s);
    // at that path difference choose φ so that cos(k0 D + φ) = 1: I = (A/2)(1 + V e^{−1}) for a flat envelope (A = 2 here)
    const phase = -(((2 * Math.PI) / LAMBDA) * D) % (2 * Math.PI);
    const out = evaluate("two-slit-broadband", { amplitude: 2, separation: d, width: 1e-12, visibility: 1, phase, wavelength: LAMBDA, bandwidth, distance: L }, new Float64Array([xPeak]), { pixelNodes: 1 });
    expect(Math.abs(out[0]! - (1 + Math.exp(-1)))).toBeLessThan(1e-9);
  });

  it('getModel("two-slit-spectrum") with one row equals getModel("two-slit") at that wavelength', () => {
    const x = pixelPositions(101, 50e-6, 0);
    const values = { amplitude: 3, separation: 0.4e-3, width: 0.09e-3, visibility: 0.7, phase: 1, distance: 0.9 };
    const one = evaluate("two-slit-spectrum", values, x, { spectrum: { wavelengths: [532e-9], weights: [5] } });
    const two = evaluate("two-slit", { ...values, wavelength: 532e-9 }, x);
    x.forEach((_, i) => expect(Math.abs(one[i]! - two[i]!)).toBeLessThan(1e-13));
  });

  it('getModel("two-slit-spectrum") rejects a missing or malformed spectrum with the argument named', () => {
    expect(() => getModel("two-slit-spectrum")).toThrow(/invalid spectrum option/);
    expect(() => getModel("two-slit-spectrum", { spectrum: { wavelengths: [600e-9, 500e-9], weights: [1, 1] } })).toThrow(/spectrum\.wavelengths\[1\].*increasing/);
    expect(() => getModel("two-slit-spectrum", { spectrum: { wavelengths: [600e-9], weights: [-1] } })).toThrow(/spectrum\.weights\[0\]/);
  });
});
