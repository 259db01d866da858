import { describe, expect, it } from "vitest";
import { besselJ0, besselJ012, besselJ1 } from "../../src/physics/bessel.js";
import { hasScipy, python } from "./python.js";

describe("besselJ012(v, out)", () => {
  it.skipIf(!hasScipy)("besselJ012(v) matches scipy.special.jv(0|1|2, v) at 500 points in −120…120", () => {
    const vs: number[] = [];
    for (let i = 0; i < 500; i++) vs.push(-120 + (240 * i) / 499 + 0.013);
    vs.push(1e-7, 1e-5, 0.5, 24.999, 25, 25.001, 300.7);
    const reference = python<number[][]>(
      "import json,sys\nfrom scipy.special import jv\nvs=json.load(sys.stdin)\nprint(json.dumps([[float(jv(n,v)) for n in (0,1,2)] for v in vs]))",
      vs,
    );
    const triple = { j0: 0, j1: 0, j2: 0 };
    vs.forEach((v, i) => {
      besselJ012(v, triple);
      const [j0, j1, j2] = reference[i]!;
      const message = `v = ${v}: got ${triple.j0}, ${triple.j1}, ${triple.j2}; SciPy ${j0}, ${j1}, ${j2}`;
      expect(Math.abs(triple.j0 - j0!), message).toBeLessThan(1e-14 + 1e-13 * Math.abs(j0!));
      expect(Math.abs(triple.j1 - j1!), message).toBeLessThan(1e-14 + 1e-13 * Math.abs(j1!));
      expect(Math.abs(triple.j2 - j2!), message).toBeLessThan(1e-14 + 1e-13 * Math.abs(j2!));
    });
  });

  it("besselJ1 vanishes at its first zeros 3.8317059702…, 7.0155866698…, 10.1734681351… and J0 at 2.4048255577… (A&S Table 9.5)", () => {
    for (const zero of [3.8317059702075123, 7.0155866698156188, 10.173468135062722]) {
      expect(Math.abs(besselJ1(zero)), `J1(${zero})`).toBeLessThan(1e-15);
      expect(besselJ1(zero - 1e-9) * besselJ1(zero + 1e-9)).toBeLessThan(0); // a sign change, not a touch
    }
    expect(Math.abs(besselJ0(2.404825557695773))).toBeLessThan(1e-15);
  });

  it("besselJ1(1) = 0.4400505857, besselJ0(1) = 0.7651976866 (A&S Table 9.1, from memory, confirmed with SciPy)", () => {
    expect(besselJ1(1)).toBeCloseTo(0.4400505857449335, 12);
    expect(besselJ0(1)).toBeCloseTo(0.7651976865579666, 12);
    expect(besselJ1(-1)).toBeCloseTo(-0.4400505857449335, 12); // J1 odd
  });
});
