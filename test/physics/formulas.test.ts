import { describe, expect, it } from "vitest";
import {
  coherenceLengthFromBandwidth, coherenceTimeFromBandwidth, fringeSpacing, maximumAngle, maximumPosition,
  minimumPosition, missingOrders,
} from "../../src/physics/formulas.js";
import { getModel } from "../../src/physics/registry.js";
import { paramVector } from "../../src/physics/simulate.js";

describe("closed-form helpers", () => {
  it("fringeSpacing(632.8 nm, 1.00 m, 0.25 mm) = 2.53 mm (worked example, common practice)", () => {
    expect(fringeSpacing(632.8e-9, 1.0, 0.25e-3)).toBeCloseTo(2.5312e-3, 7);
  });
  it("maximumPosition(m) small-angle is mλL/d; exact is L tan(asin(mλ/d)) and lies further out", () => {
    expect(maximumPosition(3, 632.8e-9, 1, 0.25e-3)).toBeCloseTo(3 * 2.5312e-3, 9);
    const exact = maximumPosition(3, 632.8e-9, 1, 0.25e-3, true);
    const s = (3 * 632.8e-9) / 0.25e-3;
    expect(exact).toBeCloseTo(s / Math.sqrt(1 - s * s), 12); // tan(asin s) = s/√(1 − s²)
    expect(exact).toBeGreaterThan(3 * 2.5312e-3);
    expect(minimumPosition(0, 632.8e-9, 1, 0.25e-3)).toBeCloseTo(2.5312e-3 / 2, 9);
  });
  it("maximumPosition(exact) sits on a maximum of the exact two-slit model (narrow slits, V = 1)", () => {
    const model = getModel("two-slit", { pixelNodes: 1 });
    const p = paramVector(model, { amplitude: 2, separation: 20e-6, width: 1e-12, visibility: 1, phase: 0, distance: 1 }); // coherent peak 2
    const x = maximumPosition(10, 632.8e-9, 1, 20e-6, true); // sin θ = 0.3164: small-angle would be off by 16 mm
    const out = new Float64Array(3);
    model.evaluate(new Float64Array([x - 1e-6, x, x + 1e-6]), p, out);
    expect(out[1]!).toBeCloseTo(2, 10);
    expect(out[1]!).toBeGreaterThan(out[0]!);
    expect(out[1]!).toBeGreaterThan(out[2]!);
  });
  it("maximumAngle throws for an order that does not propagate", () => {
    expect(maximumAngle(1, 500e-9, 1e-6)).toBeCloseTo(Math.PI / 6, 14); // sin θ = 1/2
    expect(() => maximumAngle(3, 500e-9, 1e-6)).toThrow(/invalid order: 3 .*does not propagate/);
  });
  it("missingOrders(d = 3a) = [3, 6, 9]; d/a = 2.5 gives [5, 10]; irrational ratio gives none (common practice)", () => {
    expect(missingOrders(0.3e-3, 0.1e-3, 10)).toEqual([3, 6, 9]);
    expect(missingOrders(0.25e-3, 0.1e-3, 10)).toEqual([5, 10]);
    expect(missingOrders(Math.SQRT2 * 1e-4, 1e-4, 20)).toEqual([]);
    expect(() => missingOrders(1e-4, 2e-4, 5)).toThrow(/invalid width/);
  });
  it("coherenceLengthFromBandwidth(632.8 nm, 1 nm) = λ²/Δλ = 0.400 mm; coherence time = l/c", () => {
    // l_c = λ²/Δλ (common practice); (632.8e-9)²/1e-9 = 4.0043584e-4 m by hand; c = 299 792 458 m/s exactly (SI definition)
    expect(coherenceLengthFromBandwidth(632.8e-9, 1e-9)).toBeCloseTo(4.0043584e-4, 10);
    expect(coherenceTimeFromBandwidth(632.8e-9, 1e-9)).toBeCloseTo(4.0043584e-4 / 299792458, 20);
    expect(() => coherenceLengthFromBandwidth(632.8e-9, 0)).toThrow(/invalid bandwidth: 0/);
  });
});
