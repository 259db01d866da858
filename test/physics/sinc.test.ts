import { describe, expect, it } from "vitest";
import { sinc, sincWithSlope } from "../../src/physics/sinc.js";

describe("sinc(β) / sincWithSlope(β, out)", () => {
  it("sinc(β) = sin β/β on both sides of the series switch at |β| = 1e-3, sinc(0) = 1, sinc(π) = 0 (common practice)", () => {
    expect(sinc(0)).toBe(1);
    expect(Math.abs(sinc(Math.PI))).toBeLessThan(1e-16);
    for (const beta of [1e-3 * (1 - 1e-12), 1e-3 * (1 + 1e-12), -7e-4, 3e-5]) {
      expect(Math.abs(sinc(beta) - Math.sin(beta) / beta)).toBeLessThan(2e-16);
    }
  });
  it("sincWithSlope(β).slope = (β cos β − sin β)/β², → −β/3 near 0", () => {
    const out = { value: 0, slope: 0 };
    for (const beta of [0.5, -2.2, 9e-4, -1.1e-3]) {
      sincWithSlope(beta, out);
      const expected = (beta * Math.cos(beta) - Math.sin(beta)) / (beta * beta);
      expect(Math.abs(out.slope - expected)).toBeLessThan(1e-9 * Math.abs(expected) + 1e-15);
      expect(out.value).toBe(sinc(beta));
    }
    sincWithSlope(1e-6, out);
    expect(Math.abs(out.slope / (-1e-6 / 3) - 1)).toBeLessThan(1e-11); // series −β/3 + β³/30
  });
});
