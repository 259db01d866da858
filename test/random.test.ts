import { describe, expect, it } from "vitest";
import { createRandom } from "../src/random.js";

// Moment checks use tolerances of 5 standard errors of the sample statistic, so a correct
// generator fails with probability < 1e-6 while a biased one (wrong mean or variance by a
// few per cent) fails for sure. Seeds are fixed, so the outcome is reproducible.
function moments(draw: () => number, n: number): { mean: number; variance: number; third: number } {
  let s1 = 0, s2 = 0;
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) { const v = draw(); values[i] = v; s1 += v; }
  const mean = s1 / n;
  let s3 = 0;
  for (const v of values) { s2 += (v - mean) ** 2; s3 += (v - mean) ** 3; }
  return { mean, variance: s2 / (n - 1), third: s3 / n };
}

describe("createRandom", () => {
  it("createRandom(seed) is reproducible and seeds give different streams", () => {
    const a = createRandom(2026), b = createRandom(2026), c = createRandom(2027);
    const sa = Array.from({ length: 8 }, () => a.nextUint32());
    const sb = Array.from({ length: 8 }, () => b.nextUint32());
    const sc = Array.from({ length: 8 }, () => c.nextUint32());
    expect(sa).toEqual(sb);
    expect(sa).not.toEqual(sc);
    expect(() => createRandom(Number.NaN)).toThrow(/invalid seed/);
  });

  it("uniform() lies in [0, 1) with mean 1/2 and variance 1/12 (uniform distribution, common practice)", () => {
    const rng = createRandom(11);
    const n = 200000;
    const m = moments(() => rng.uniform(), n);
    expect(Math.abs(m.mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(m.variance - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / n));
    for (let i = 0; i < 1000; i++) { const u = rng.uniform(); expect(u >= 0 && u < 1).toBe(true); }
  });

  it("normal() has mean 0, variance 1, skewness 0 (standard normal, common practice)", () => {
    const rng = createRandom(5);
    const n = 200000;
    const m = moments(() => rng.normal(), n);
    expect(Math.abs(m.mean)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(m.variance - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    expect(Math.abs(m.third)).toBeLessThan(5 * Math.sqrt(15 / n));
  });

  it("poisson(mean) has mean = variance = third central moment = mean, for small (inversion) and large (PTRS) means", () => {
    // Poisson cumulants all equal the mean (common practice)
    for (const [mean, seed] of [[0.3, 1], [4.5, 2], [9.99, 3], [10, 4], [150, 5], [20000, 6]] as const) {
      const rng = createRandom(seed);
      const n = 100000;
      const m = moments(() => rng.poisson(mean), n);
      expect(Math.abs(m.mean - mean), `mean ${mean}`).toBeLessThan(5 * Math.sqrt(mean / n));
      expect(Math.abs(m.variance - mean), `variance ${mean}`).toBeLessThan(5 * Math.sqrt((mean + 2 * mean * mean) / n));
      expect(Math.abs(m.third - mean), `third moment ${mean}`).toBeLessThan(5 * Math.sqrt((mean + 18 * mean ** 2 + 6 * mean ** 3) / n));
    }
  });

  it("poisson(mean) matches the Poisson probabilities P(k) for mean 3.7 and 25 (chi-squared goodness of fit)", () => {
    for (const mean of [3.7, 25]) {
      const rng = createRandom(99);
      const n = 100000;
      const counts = new Map<number, number>();
      for (let i = 0; i < n; i++) { const k = rng.poisson(mean); counts.set(k, (counts.get(k) ?? 0) + 1); }
      let chi2 = 0, bins = 0;
      for (let k = 0; k < 4 * mean + 20; k++) {
        let logFactorial = 0;
        for (let j = 2; j <= k; j++) logFactorial += Math.log(j);
        const expected = n * Math.exp(-mean + k * Math.log(mean) - logFactorial);
        if (expected < 20) continue;
        chi2 += ((counts.get(k) ?? 0) - expected) ** 2 / expected;
        bins += 1;
      }
      // χ² with ≤ 40 degrees of freedom: 99.99th percentile < 80 (chi-squared table, A&S 26.2)
      expect(chi2, `mean ${mean}: χ² = ${chi2} over ${bins} bins`).toBeLessThan(80);
    }
  });

  it("poisson(mean) rejects negative and non-finite means", () => {
    const rng = createRandom(1);
    expect(rng.poisson(0)).toBe(0);
    expect(() => rng.poisson(-1)).toThrow(/invalid poisson mean: -1/);
    expect(() => rng.poisson(Number.POSITIVE_INFINITY)).toThrow(/poisson mean/);
  });

});
