import { describe, expect, it } from "vitest";
import { sinCosInto } from "../../src/physics/sincos.js";
import { hasScipy, python } from "./python.js";

describe("sinCosInto(angles, count, sines, cosines)", () => {
  it.skipIf(!hasScipy)("agrees with mpmath sin/cos (50 digits) within 2.5e-16 over |x| < 200 rad, near multiples of π/2 and past the 2^19 switch", () => {
    const angles: number[] = [0, -0, 1e-300, 5e-324, Math.PI / 4, Math.PI / 2, Math.PI, 3 * Math.PI / 2, 2 * Math.PI, 1e5, -3e5, 524287.9, 524288, 1e7, 1e22];
    for (let k = -120; k <= 120; k++) angles.push(k * Math.PI / 2 + 1e-9 * ((k % 7) - 3), k * Math.PI / 2);
    let seed = 12345;
    const next = (): number => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
    for (let i = 0; i < 3000; i++) angles.push((next() - 0.5) * 400);
    const x = Float64Array.from(angles);
    const sines = new Float64Array(x.length), cosines = new Float64Array(x.length);
    sinCosInto(x, x.length, sines, cosines);
    // reference: mpmath at 50 significant digits from the exact binary value of each double
    const ref = python<[string[], string[]]>(`
import json, sys, mpmath
mpmath.mp.dps = 50
xs = json.load(sys.stdin)
print(json.dumps([[repr(float(mpmath.sin(mpmath.mpf(v)))) for v in xs], [repr(float(mpmath.cos(mpmath.mpf(v)))) for v in xs]]))
`, angles);
    for (let i = 0; i < x.length; i++) {
      expect(Math.abs(sines[i]! - Number(ref[0][i]))).toBeLessThanOrEqual(2.5e-16);
      expect(Math.abs(cosines[i]! - Number(ref[1][i]))).toBeLessThanOrEqual(2.5e-16);
    }
  });

  it("gives NaN for NaN and ±Infinity, like Math.sin/cos (ECMA-262 §21.3.2)", () => {
    const x = new Float64Array([NaN, Infinity, -Infinity]);
    const s = new Float64Array(3), c = new Float64Array(3);
    sinCosInto(x, 3, s, c);
    for (let i = 0; i < 3; i++) { expect(Number.isNaN(s[i])).toBe(true); expect(Number.isNaN(c[i])).toBe(true); }
  });
});
