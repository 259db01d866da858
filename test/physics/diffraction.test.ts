import { describe, expect, it } from "vitest";
import { pixelPositions } from "../../src/physics/simulate.js";
import { visibilityFromBeams } from "../../src/physics/coherence.js";
import { fraunhoferIntensity, fresnelIntensity, type Slit } from "./apertureIntegrals.js";
import { evaluate } from "./evaluateModel.js";

const LAMBDA = 632.8e-9; // He–Ne line (common practice)

function maxAbs(values: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < values.length; i++) m = Math.max(m, Math.abs(values[i]!));
  return m;
}

describe("far-field models against a direct numerical Fraunhofer integral of the aperture", () => {
  it('getModel("two-slit") equals |∫ t(ξ) e^{−iksξ} dξ|² for slits of amplitude 1 and τ e^{−iφ}', () => {
    const a = 0.1e-3, d = 0.5e-3, L = 1, tau = 0.6, phi = 0.7, center = 0.2e-3;
    // unequal beams: V = 2√(I1 I2)/(I1 + I2) with I2/I1 = τ²; mean level a²(1 + τ²), amplitude (coherent peak) twice that
    const V = visibilityFromBeams(1, tau * tau, 1);
    const x = pixelPositions(500, 40e-6, center);
    const got = evaluate("two-slit", { amplitude: 2 * a * a * (1 + tau * tau), center, separation: d, width: a, visibility: V, phase: phi, wavelength: LAMBDA, distance: L }, x);
    const slits: Slit[] = [
      { center: -d / 2, width: a, re: 1, im: 0 },
      { center: d / 2, width: a, re: tau * Math.cos(-phi), im: tau * Math.sin(-phi) },
    ];
    const peak = maxAbs(got);
    x.forEach((xi, i) => {
      const u = xi - center;
      const expected = fraunhoferIntensity(slits, LAMBDA, u / Math.hypot(u, L));
      expect(Math.abs(got[i]! - expected), `x = ${xi}`).toBeLessThan(1e-10 * peak);
    });
  });

  it('getModel("n-slit") with N = 1, 2, 5, 12 equals the Fraunhofer integral of N equal slits, scaled by (Na)²', () => {
    const a = 40e-6, d = 120e-6, L = 0.8;
    const x = pixelPositions(700, 30e-6, 0);
    for (const N of [1, 2, 5, 12]) {
      const got = evaluate("n-slit", { amplitude: 1, center: 0, separation: d, width: a, slits: N, wavelength: LAMBDA, distance: L }, x);
      const slits: Slit[] = Array.from({ length: N }, (_, j) => ({ center: (j - (N - 1) / 2) * d, width: a, re: 1, im: 0 }));
      x.forEach((xi, i) => {
        const expected = fraunhoferIntensity(slits, LAMBDA, xi / Math.hypot(xi, L)) / (N * a) ** 2;
        expect(Math.abs(got[i]! - expected), `N = ${N}, x = ${xi}`).toBeLessThan(1e-10);
      });
    }
  });

  it('getModel("single-slit") equals getModel("n-slit") with N = 1 and has zeros at sin θ = mλ/a (common practice)', () => {
    const a = 0.15e-3, L = 1;
    const x = pixelPositions(300, 50e-6, 0);
    const single = evaluate("single-slit", { amplitude: 7, width: a, distance: L }, x);
    const nslit = evaluate("n-slit", { amplitude: 7, width: a, slits: 1, distance: L }, x);
    x.forEach((_, i) => expect(Math.abs(single[i]! - nslit[i]!)).toBeLessThan(1e-12));
    const s1 = LAMBDA / a; // first zero
    const zero = evaluate("single-slit", { amplitude: 7, width: a, distance: L }, new Float64Array([L * Math.tan(Math.asin(s1))]));
    expect(zero[0]!).toBeLessThan(1e-20);
  });

  it('getModel("n-slit") loses the orders m with m·a/d integer (missing orders, d = 3a: m = 3, 6)', () => {
    const a = 0.1e-3, d = 0.3e-3, L = 1;
    const model = { amplitude: 1, separation: d, width: a, slits: 4, distance: L };
    const orders = [1, 2, 3, 4, 5, 6].map((m) => L * Math.tan(Math.asin((m * LAMBDA) / d)));
    const at = evaluate("n-slit", model, new Float64Array(orders));
    // principal maxima follow the envelope sinc²(πm a/d) (common practice)
    [1, 2, 3, 4, 5, 6].forEach((m, i) => {
      const beta = (Math.PI * m * a) / d;
      expect(Math.abs(at[i]! - (Math.sin(beta) / beta) ** 2), `order ${m}`).toBeLessThan(1e-12);
    });
    expect(at[2]!).toBeLessThan(1e-25);
    expect(at[5]!).toBeLessThan(1e-25);
  });

  it("two-slit intensity integrated over sin θ equals the transmitted power (Parseval): ∫ I ds = I_peak λ/(N a)", () => {
    // Parseval for E(f) = ∫ t(ξ) e^{−2πifξ} dξ: ∫ |E|² df = ∫ |t|² dξ = N a; with I = I_peak |E|²/(Na)²
    // and f = s/λ this is ∫ I ds = I_peak λ/(N a). Here N = 2, V = 1: I_peak = 2A, so ∫ I ds = A λ/a.
    // Small-angle form with L = 1, so x = s over the whole line.
    const a = 0.1e-3, d = 0.5e-3, A = 1;
    const lobes = 400; // integrate |s| ≤ lobes·λ/a
    const S = (lobes * LAMBDA) / a;
    const n = 2_000_001;
    const h = (2 * S) / (n - 1);
    const x = new Float64Array(n).map((_, i) => -S + i * h);
    // amplitude = coherent peak 2A: mean level A
    const I = evaluate("two-slit", { amplitude: 2 * A, separation: d, width: a, visibility: 1, phase: 0, distance: 1 }, x, { smallAngle: true, pixelNodes: 1 });
    let sum = 0;
    for (let i = 0; i < n; i++) sum += (i === 0 || i === n - 1 ? 0.5 : 1) * I[i]!;
    sum *= h;
    // tails beyond ±S: sinc² ≈ sin²β (λ/(π a s))², sin²β averaging 1/2 and (1 + cos) averaging 1,
    // so both tails together hold 2 · A (λ/(πa))² (1/2) ∫_S^∞ ds/s² = A (λ/(πa))²/S
    const tail = (A * (LAMBDA / (Math.PI * a)) ** 2) / S;
    const expected = (A * LAMBDA) / a;
    expect(Math.abs(sum + tail - expected) / expected, `∫ I ds = ${sum} + tail ${tail}, expected ${expected}`).toBeLessThan(2e-6);
  });
});
