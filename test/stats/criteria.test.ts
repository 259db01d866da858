import { describe, expect, it } from "vitest";
import { akaikeWeights, compareFits, informationCriteria, isNestedByParameters, knownNesting, nestedTest, profileFingerprint } from "../../src/stats/index.js";
import type { Profile } from "../../src/profile.js";
import { expectClose } from "./python.js";
import { fakeFit } from "./fakeFit.js";

describe("information criteria", () => {
  it("informationCriteria(lnL, k, n) on a case computed by hand", () => {
    // By hand from the definitions: AIC = −2 lnL + 2k (Akaike 1974) = 20 + 4 = 24;
    // AICc = AIC + 2k(k+1)/(n−k−1) (Hurvich & Tsai 1989) = 24 + 12/17 = 24.705882...;
    // BIC = −2 lnL + k ln n (Schwarz 1978) = 20 + 2 ln 20 = 25.991464...
    const c = informationCriteria(-10, 2, 20);
    expect(c.aic).toBe(24);
    expectClose(c.aicc, 24 + 12 / 17, 1e-15, "AICc");
    expectClose(c.bic, 25.99146454710798, 1e-14, "BIC");
  });
  it("informationCriteria(lnL, k, n) gives AICc = Infinity when n ≤ k + 1", () => {
    expect(informationCriteria(-1, 3, 4).aicc).toBe(Infinity);
    expect(() => informationCriteria(-1, 1.5, 4)).toThrow(/invalid k: 1.5/);
  });
  it("akaikeWeights(values) on a case computed by hand", () => {
    // Δ = (0, 2, 10): weights ∝ (1, e^−1, e^−5) (Burnham & Anderson 2002, §2.9), by hand.
    const { delta, weight } = akaikeWeights([100, 102, 110]);
    expect(delta).toEqual([0, 2, 10]);
    const total = 1 + Math.exp(-1) + Math.exp(-5);
    expectClose(weight[0], 1 / total, 1e-15, "w0");
    expectClose(weight[1], Math.exp(-1) / total, 1e-15, "w1");
    expectClose(weight[2], Math.exp(-5) / total, 1e-14, "w2");
    expect(akaikeWeights([5, Infinity]).weight).toEqual([1, 0]);
  });
});

describe("nested tests", () => {
  const simple = fakeFit({ modelId: "two-slit", free: ["amplitude", "background"], values: { amplitude: 1, background: 0, visibility: 1 },
    logLikelihood: -100, chi2: 130, n: 52 });
  const larger = fakeFit({ modelId: "two-slit", free: ["amplitude", "background", "visibility", "phase"], values: { amplitude: 1, background: 0, visibility: 0.9, phase: 0 },
    logLikelihood: -96, chi2: 100, n: 54 });
  it("nestedTest(simpler, larger) likelihood ratio on a case computed by hand", () => {
    // LR = 2(−96 + 100) = 8 with Δk = 2; the χ²(2) survival is exactly e^{−x/2} (A&S 26.4.21), so p = e^{−4}.
    const t = nestedTest(simple, larger);
    expect(t.likelihoodRatio).toBe(8);
    expectClose(t.likelihoodRatioPValue, Math.exp(-4), 1e-13, "LR p");
  });
  it("nestedTest(simpler, larger) F-test on a case computed by hand", () => {
    // F = ((130 − 100)/2) / (100/50) = 7.5 with (2, 50) dof; F(2, ν) survival is (1 + 2F/ν)^{−ν/2}
    // (A&S 26.6.4 with ν1 = 2), so p = 1.3^{−25}.
    const t = nestedTest(simple, larger);
    expect(t.f).toBe(7.5);
    expect(t.fDof).toEqual([2, 50]);
    expectClose(t.fPValue, 1.3 ** -25, 1e-12, "F p");
  });
  it("isNestedByParameters(simpler, larger) needs the same model and a strict subset of free parameters", () => {
    expect(isNestedByParameters(simple, larger)).toBe(true);
    expect(isNestedByParameters(larger, simple)).toBe(false);
    const other = { ...larger, modelId: "two-slit-fresnel" };
    expect(isNestedByParameters(simple, other)).toBe(false);
    expect(() => nestedTest(larger, simple)).toThrow(/more free parameters/);
  });
});

describe("known nesting by model id", () => {
  const values = { amplitude: 1, center: 0, separation: 5e-4, wavelength: 6e-7, distance: 1 };
  const mono = fakeFit({ modelId: "two-slit", free: ["amplitude", "center", "separation"], values, logLikelihood: -200, chi2: 100, n: 100 });
  const broad = fakeFit({ modelId: "two-slit-broadband", free: ["amplitude", "center", "separation", "bandwidth"], values: { ...values, bandwidth: 1e-9 },
    logLikelihood: -197, chi2: 94, n: 100 });
  it("knownNesting(two-slit, two-slit-broadband) finds the bandwidth = 0 boundary", () => {
    expect(knownNesting(mono, broad)).toEqual(["bandwidth"]);
    expect(knownNesting(broad, mono)).toBeUndefined();
  });
  it("compareFits([two-slit, two-slit-broadband]) halves the likelihood-ratio p-value on the boundary", () => {
    // LR = 2(−197 + 200) = 6 on one boundary parameter: p = ½ P(χ²₁ > 6) = ½ erfc(√3)
    // (Self & Liang 1987 mixture) = 0.0071529392177148 (mpmath, 20 digits).
    const result = compareFits([mono, broad]);
    expect(result.tests).toHaveLength(1);
    expect(result.tests[0].nesting).toBe("model");
    expect(result.tests[0].boundaryCorrected).toBe(true);
    expectClose(result.tests[0].likelihoodRatioPValue, 0.0071529392177148, 1e-12, "boundary p");
    expect(result.verdict).toMatch(/halved: the simpler model sits on the extra parameter's bound/);
  });
});

describe("profileFingerprint", () => {
  const base: Profile = { x: new Float64Array([0, 1, 2]), y: new Float64Array([5, 6, 7]), yUnit: "counts", counts: true };
  it("profileFingerprint(profile) is stable, treats a missing mask as all ones, and changes with any value", () => {
    const print = profileFingerprint(base);
    expect(print).toMatch(/^[0-9a-f]{16}$/);
    expect(profileFingerprint({ ...base, mask: new Uint8Array([1, 1, 1]) })).toBe(print);
    expect(profileFingerprint({ ...base, mask: new Uint8Array([1, 0, 1]) })).not.toBe(print);
    expect(profileFingerprint({ ...base, y: new Float64Array([5, 6, 7.000000001]) })).not.toBe(print);
    expect(profileFingerprint({ ...base, sigma: new Float64Array([1, 1, 1]) })).not.toBe(print);
  });
  it("profileFingerprint(empty profile) is the FNV-1a of the length and flag bytes", () => {
    // FNV-1a 32-bit of the bytes [0, 0, 0, 0] with the standard offset basis 2166136261 and prime
    // 16777619 (Fowler–Noll–Vo reference parameters), computed by hand in the test.
    let h = 2166136261;
    for (const b of [0, 0, 0, 0]) h = Math.imul(h ^ b, 16777619) >>> 0;
    const empty: Profile = { x: new Float64Array(0), y: new Float64Array(0), yUnit: "a.u.", counts: false };
    expect(profileFingerprint(empty).slice(0, 8)).toBe(h.toString(16).padStart(8, "0"));
  });
});
