// The global stage's bookkeeping: what "the same optimum" means, when the best basin counts as
// confirmed, and the "starts-disagree" warning. Runs are built by hand (values by hand).
import { describe, expect, it } from "vitest";
import { prepareFit } from "../../src/fit/fitProfile.js";
import { formulaModel } from "../../src/fit/index.js";
import { objectiveTolerance, sameOptimum, summarizeStarts, type StartRun } from "../../src/fit/starts/index.js";
import type { SolverOutcome } from "../../src/fit/leastSquares.js";

const x = Float64Array.from({ length: 50 }, (_, i) => i / 10);
const profile = { x, y: x.map((v) => 2 + Math.cos(3 * v)), sigma: new Float64Array(50).fill(0.1), yUnit: "1", counts: false };
const model = formulaModel("a + cos(k*x + phase)", { parameters: ["a", "k", "phase"] });
const known = prepareFit(profile, model, { sigmaAbsolute: true });
const relative = prepareFit(profile, model);
const run = (a: number, k: number, phase: number, cost: number, converged = true): StartRun => ({ start: new Float64Array(3), theta: Float64Array.from([a, k, phase]), cost, converged });
const outcome = (r: StartRun): SolverOutcome => ({ x: r.theta, residuals: new Float64Array(0), jacobian: new Float64Array(0), cost: r.cost, reason: "converged-gradient", iterations: 1, evaluations: 1, jacobianEvaluations: 1, nonFiniteJacobian: false, nonFiniteTrials: 0 });

describe("sameOptimum(prep, run, best, uncertainty)", () => {
  const best = run(2, 3, 0.5, 47);
  it("sameOptimum: within 1e-3 in χ² (known σ) and 0.1 σ per parameter is the same optimum", () => {
    expect(objectiveTolerance(known, 47)).toBeCloseTo(1e-3 + 47e-6, 12);
    expect(sameOptimum(known, run(2.0005, 3, 0.5, 47.0009), best, [0.01, 0.01, 0.01])).toBe(true);
    expect(sameOptimum(known, run(2, 3, 0.5, 47.002), best, [0.01, 0.01, 0.01])).toBe(false); // objective 2e-3 higher
    expect(sameOptimum(known, run(2.002, 3, 0.5, 47), best, [0.01, 0.01, 0.01])).toBe(false); // 0.2 σ away
    expect(sameOptimum(known, run(2, 3, 0.5, 47, false), best, [0.01, 0.01, 0.01])).toBe(false); // not converged
  });
  it("sameOptimum: a phase 2π away is the same optimum", () => {
    expect(sameOptimum(known, run(2, 3, 0.5 + 2 * Math.PI, 47), best, [0.01, 0.01, 0.01])).toBe(true);
  });
  it("objectiveTolerance: with σ relative the unit is the best objective per degree of freedom", () => {
    // ν = 50 − 3 = 47: unit = 94/47 = 2
    expect(objectiveTolerance(relative, 94)).toBeCloseTo(2e-3 + 94e-6, 12);
  });
});

describe("summarizeStarts(prep, search, uncertainty, method)", () => {
  it("summarizeStarts: two starts at the best optimum confirm it; no warning", () => {
    const best = run(2, 3, 0.5, 47);
    const { starts, warning } = summarizeStarts(known, { best: outcome(best), runs: [best, run(2, 3, 0.5 + 1e-5, 47.0001), run(1, 1, 0, 400)] }, [0.01, 0.01, 0.01], "test");
    expect(starts).toEqual({ tried: 3, converged: 3, agreeing: 2, method: "test" });
    expect(warning).toBeNull();
  });
  it("summarizeStarts: the best reached from one start only gives starts-disagree with the other objectives", () => {
    const best = run(2, 3, 0.5, 47);
    const { starts, warning } = summarizeStarts(known, { best: outcome(best), runs: [best, run(1, 1, 0, 400), run(1, 2, 0, 90, false)] }, [0.01, 0.01, 0.01], "test");
    expect(starts).toEqual({ tried: 3, converged: 2, agreeing: 1, method: "test" });
    expect(warning?.code).toBe("starts-disagree");
    expect(warning?.message).toMatch(/only 1 of 3 starts \(2 converged; the other converged starts ended 353 higher/);
  });
  it("summarizeStarts: a single given start is reported, not warned about", () => {
    const best = run(2, 3, 0.5, 47);
    const { starts, warning } = summarizeStarts(known, { best: outcome(best), runs: [best] }, [0.01, 0.01, 0.01], "given start");
    expect(starts.agreeing).toBe(1);
    expect(warning).toBeNull();
  });
});
