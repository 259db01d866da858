import { describe, expect, it } from "vitest";
import { pixelPositions } from "../../src/physics/simulate.js";
import { farFieldCheck, fresnelNumber } from "../../src/physics/formulas.js";
import { fresnelIntensity, type Slit } from "./apertureIntegrals.js";
import { evaluate } from "./evaluateModel.js";

const LAMBDA = 632.8e-9; // He–Ne line (common practice)

// amplitude = peak of the fully coherent far-field pattern: illuminating intensity 1 ↔ amplitude (N a)²/(λL)
const illuminatedBy1 = (N: number, a: number, L: number): number => (N * a) ** 2 / (LAMBDA * L);

describe('getModel("two-slit-fresnel")', () => {
  it("equals a direct numerical Fresnel integral |(1/√(iλL)) ∫ exp(iπ(v − ξ)²/(λL)) dξ|² for N = 1, 2, 3 at Fresnel number ≈ 1.3", () => {
    const a = 0.2e-3, d = 0.5e-3, L = 0.05, center = -0.07e-3;
    expect(fresnelNumber(a, LAMBDA, L)).toBeCloseTo(1.264, 3); // (0.2 mm)²/(632.8 nm · 5 cm) = 1.2642, by hand
    const x = pixelPositions(161, 15e-6, center);
    for (const N of [1, 2, 3]) {
      const got = evaluate("two-slit-fresnel", { amplitude: illuminatedBy1(N, a, L), center, separation: d, width: a, slits: N, wavelength: LAMBDA, distance: L }, x, { pixelNodes: 1 });
      const slits: Slit[] = Array.from({ length: N }, (_, j) => ({ center: (j - (N - 1) / 2) * d, width: a, re: 1, im: 0 }));
      x.forEach((xi, i) => {
        const expected = fresnelIntensity(slits, LAMBDA, L, xi - center);
        expect(Math.abs(got[i]! - expected), `N = ${N}, x = ${xi}: got ${got[i]}, integral ${expected}`).toBeLessThan(1e-10);
      });
    }
  });

  it("shows the geometric shadow deep in the near field (Fresnel number 400: intensity ≈ 1 inside the slits, ≈ 0 between)", () => {
    const a = 0.5e-3, L = 0.001; // a²/(λL) ≈ 395
    // slit centres at ±0.5 mm (d = 1 mm), and the opaque bar between them at 0
    const got = evaluate("two-slit-fresnel", { amplitude: illuminatedBy1(2, a, L), separation: 1.0e-3, width: a, wavelength: LAMBDA, distance: L }, new Float64Array([-0.5e-3, 0.5e-3, 0]), { pixelNodes: 1 });
    expect(Math.abs(got[0]! - 1)).toBeLessThan(0.1); // edge ripple amplitude ~ 1/(π u) at u ≈ 11
    expect(Math.abs(got[1]! - 1)).toBeLessThan(0.1);
    expect(got[2]!).toBeLessThan(0.01);
  });

  it("conserves power: ∫ I dx = illuminating intensity · N a (Fresnel propagation is unitary, Parseval)", () => {
    const a = 0.1e-3, d = 0.3e-3, L = 0.2, N = 3;
    const S = 0.4; // ±0.4 m on the screen: far tails 1/x² handled below
    const n = 200_001; // 4 µm steps: ~100 per fringe period
    const h = (2 * S) / (n - 1);
    const x = new Float64Array(n).map((_, i) => -S + i * h);
    const I = evaluate("two-slit-fresnel", { amplitude: illuminatedBy1(N, a, L), separation: d, width: a, slits: N, wavelength: LAMBDA, distance: L }, x, { pixelNodes: 1 });
    let sum = 0;
    for (let i = 0; i < n; i++) sum += (i === 0 || i === n - 1 ? 0.5 : 1) * I[i]!;
    sum *= h;
    // tails beyond |x| = S, far-field form I ≈ (N a)²/(λL) · sinc² · grating²: sinc² ≈ (λL/(π a x))² sin²
    // with sin² averaging 1/2 and grating² averaging 1/N, so both tails hold (N a)²/(λL) · (λL/(πa))² /(N S)
    const tail = ((N * a) ** 2 / (LAMBDA * L)) * (LAMBDA * L / (Math.PI * a)) ** 2 / (N * S);
    const expected = N * a;
    expect(Math.abs(sum + tail - expected) / expected, `∫ I dx = ${sum} + tail ${tail}, expected ${expected}`).toBeLessThan(1e-4);
  });

  it("tends to the small-angle far-field n-slit pattern as a²/(λL) → 0, the difference falling as (a²/(λL))²", () => {
    const a = 0.1e-3, d = 0.25e-3;
    const errors: number[] = [];
    for (const F of [1e-2, 1e-3]) {
      const L = (a * a) / (LAMBDA * F);
      const x = pixelPositions(1001, (6 * LAMBDA * L) / a / 1000, 0);
      const peak = (2 * a) ** 2 / (LAMBDA * L); // far-field peak of |U|²: (N a)²/(λL)
      const near = evaluate("two-slit-fresnel", { amplitude: peak, separation: d, width: a, slits: 2, wavelength: LAMBDA, distance: L }, x, { pixelNodes: 1 });
      const far = evaluate("n-slit", { amplitude: peak, separation: d, width: a, slits: 2, wavelength: LAMBDA, distance: L }, x, { smallAngle: true, pixelNodes: 1 });
      let worst = 0;
      x.forEach((_, i) => { worst = Math.max(worst, Math.abs(near[i]! - far[i]!) / peak); });
      errors.push(worst);
    }
    expect(errors[1]!, `relative difference at a²/(λL) = 1e-3: ${errors[1]}`).toBeLessThan(1e-5);
    const ratio = errors[0]! / errors[1]!;
    expect(ratio, `difference ratio between a²/(λL) = 1e-2 and 1e-3: ${ratio}`).toBeGreaterThan(50);
    expect(ratio).toBeLessThan(200);
  });
});

describe("fresnelNumber / farFieldCheck", () => {
  it("fresnelNumber(0.1 mm, 632.8 nm, 1 m) = 0.0158 (a²/(λL), common practice)", () => {
    expect(fresnelNumber(0.1e-3, LAMBDA, 1)).toBeCloseTo(0.015803, 6);
  });
  it("farFieldCheck accepts the B1 bench (d = 0.5 mm, a = 0.1 mm, L = 1 m) and rejects L = 5 cm", () => {
    const b1 = farFieldCheck({ width: 0.1e-3, separation: 0.5e-3, slits: 2, wavelength: LAMBDA, distance: 1 });
    expect(b1.valid).toBe(true);
    expect(b1.offsetNumber).toBeCloseTo(0.079, 3); // (N−1)·d·a/(λL) = 0.5 mm · 0.1 mm/(632.8 nm · 1 m) = 0.0790, by hand
    const close = farFieldCheck({ width: 0.1e-3, separation: 0.5e-3, slits: 2, wavelength: LAMBDA, distance: 0.05 });
    expect(close.valid).toBe(false);
    expect(close.message).toMatch(/two-slit-fresnel/);
    expect(() => farFieldCheck({ width: -1, wavelength: LAMBDA, distance: 1 })).toThrow(/invalid width: -1/);
  });
});
