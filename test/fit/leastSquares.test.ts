import { describe, expect, it } from "vitest";
import { leastSquares, type LeastSquaresProblem } from "../../src/fit/leastSquares.js";

// Rosenbrock as residuals: r = (10(x₂ − x₁²), 1 − x₁); minimum 0 at (1, 1), standard start (−1.2, 1)
// (Moré, Garbow & Hillstrom 1981, ACM TOMS 7:17, problem 1).
const rosenbrock = (withJacobian: boolean): LeastSquaresProblem => ({
  n: 2, p: 2,
  residuals(x, out) { out[0] = 10 * (x[1] - x[0] * x[0]); out[1] = 1 - x[0]; },
  ...(withJacobian ? { jacobian(x: Float64Array, jac: Float64Array) { jac[0] = -20 * x[0]; jac[1] = 10; jac[2] = -1; jac[3] = 0; } } : {}),
});

// Freudenstein–Roth: r = (−13 + x₁ + ((5 − x₂)x₂ − 2)x₂, −29 + x₁ + ((x₂ + 1)x₂ − 14)x₂); from (0.5, −2)
// a local minimum with Σr² = 48.9842... at (11.41..., −0.8968...) traps Gauss–Newton methods; the global
// minimum is 0 at (5, 4) (Moré, Garbow & Hillstrom 1981, problem 2).
const freudensteinRoth: LeastSquaresProblem = {
  n: 2, p: 2,
  residuals(x, out) {
    out[0] = -13 + x[0] + ((5 - x[1]) * x[1] - 2) * x[1];
    out[1] = -29 + x[0] + ((x[1] + 1) * x[1] - 14) * x[1];
  },
};

describe("leastSquares(problem, start, options)", () => {
  it("solves Rosenbrock from (−1.2, 1) with the analytic and with the numerical Jacobian (MGH 1981 #1)", () => {
    for (const analytic of [true, false]) {
      const outcome = leastSquares(rosenbrock(analytic), Float64Array.from([-1.2, 1]));
      expect(outcome.reason.startsWith("converged")).toBe(true);
      expect(outcome.x[0]).toBeCloseTo(1, 10);
      expect(outcome.x[1]).toBeCloseTo(1, 10);
      expect(outcome.cost).toBeLessThan(1e-20);
    }
  });

  it("keeps the bound x₁ ≤ 0.5 and finds the constrained optimum (0.5, 0.25), Σr² = 0.25 (by hand: r₁ = 0 on x₂ = x₁²)", () => {
    const outcome = leastSquares(rosenbrock(true), Float64Array.from([-1.2, 1]), {
      lower: Float64Array.from([-Infinity, -Infinity]), upper: Float64Array.from([0.5, Infinity]),
    });
    expect(outcome.reason.startsWith("converged")).toBe(true);
    expect(outcome.x[0]).toBe(0.5);
    // ftol is relative to Σr², which the bound keeps at 0.25: x₂ is resolved to ~√(ftol·0.25)/10.
    expect(outcome.x[1]).toBeCloseTo(0.25, 8);
    expect(outcome.cost).toBeCloseTo(0.25, 12);
  });

  it("ends at the known local minimum of Freudenstein–Roth from (0.5, −2) as a converged result (MGH 1981 #2)", () => {
    const outcome = leastSquares(freudensteinRoth, Float64Array.from([0.5, -2]));
    expect(outcome.reason.startsWith("converged")).toBe(true);
    expect(outcome.cost).toBeCloseTo(48.98425367924, 6);
  });

  it("stops with max-evaluations and with cancelled, returning the best point so far", () => {
    const limited = leastSquares(rosenbrock(true), Float64Array.from([-1.2, 1]), { maxEvaluations: 4 });
    expect(limited.reason).toBe("max-evaluations");
    expect(limited.evaluations).toBeLessThanOrEqual(5);
    const signal = { aborted: true };
    const cancelled = leastSquares(rosenbrock(true), Float64Array.from([-1.2, 1]), { signal });
    expect(cancelled.reason).toBe("cancelled");
    expect(Array.from(cancelled.x)).toEqual([-1.2, 1]);
  });

  it("reports invalid-start when the residuals are not finite at the start", () => {
    const problem: LeastSquaresProblem = { n: 1, p: 1, residuals(x, out) { out[0] = Math.log(x[0]); } };
    expect(leastSquares(problem, Float64Array.from([-1])).reason).toBe("invalid-start");
  });
});
