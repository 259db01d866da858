// goodnessOfFit verdicts at the documented thresholds (p < 0.001 and χ²/ν > 1.5 for "poor"),
// with the tail probabilities checked against SciPy's scipy.stats.chi2 (Debian python3-scipy).
import { describe, expect, it } from "vitest";
import { goodnessOfFit } from "../../src/fit/goodness.js";
import { python, scipyMissing } from "../stats/python.js";

const maybe = scipyMissing ? it.skip : it;

describe("goodnessOfFit(chi2, dof, knownScale)", () => {
  maybe("goodnessOfFit gives poor / good / marginal / low at the documented thresholds, p-values as SciPy's", () => {
    const cases: [number, number, string][] = [
      [200, 100, "poor"], // χ²/ν = 2, p ≈ 1e-8
      [140, 100, "good"], // p ≈ 0.005 > 0.001
      [11000, 10000, "marginal"], // p tiny but χ²/ν = 1.1 ≤ 1.5
      [50, 100, "low"], // lower tail ≈ 1.7e-5
    ];
    const reference = python<{ sf: number; cdf: number }[]>(
      "from scipy.stats import chi2\nprint(json.dumps([{'sf': float(chi2.sf(c, k)), 'cdf': float(chi2.cdf(c, k))} for c, k in data]))",
      cases.map(([c, k]) => [c, k]),
    );
    cases.forEach(([chi2, dof, verdict], i) => {
      const g = goodnessOfFit(chi2, dof, true);
      expect(g.verdict, `χ² = ${chi2}, ν = ${dof}`).toBe(verdict);
      expect(Math.abs(g.pValue - reference[i]!.sf)).toBeLessThanOrEqual(1e-9 * Math.max(reference[i]!.sf, 1e-300) + 1e-15);
      // the verdicts agree with SciPy's tails at the 0.001 level
      if (verdict === "poor" || verdict === "marginal") expect(reference[i]!.sf).toBeLessThan(1e-3);
      if (verdict === "low") expect(reference[i]!.cdf).toBeLessThan(1e-3);
    });
    expect(goodnessOfFit(200, 100, true).summary).toMatch(/^the model does not describe these data \(χ²\/ν = 2 for ν = 100, p = [\d.]+e-\d+; expected 1 ± 0\.141\)$/);
  });

  it("goodnessOfFit(chi2, dof, false, why) is not-tested and says why", () => {
    const g = goodnessOfFit(8013, 10, false, "σ was declared relative (sigmaAbsolute: false)");
    expect(g.verdict).toBe("not-tested");
    expect(Number.isNaN(g.pValue)).toBe(true);
    expect(g.summary).toBe("goodness of fit not tested: σ was declared relative (sigmaAbsolute: false)");
  });
});
