// Shared helper (not a test file): compares a model's analytic Jacobian with central differences.
import { expect } from "vitest";
import type { Model } from "../../src/physics/model.js";

/**
 * For every non-integer parameter j, checks jac[:, j] against
 * (I(p + h e_j) − I(p − h e_j)) / 2h with h = step · |p_j| (step · typical_j when p_j = 0).
 * Tolerance is relative to the largest |column| entry (columns can cross zero), plus the
 * rounding noise of the difference quotient, 100 ε max|I| / h.
 */
export function checkJacobian(model: Model, params: Float64Array, x: Float64Array, options: { step?: number; tolerance?: number; typical?: Record<string, number> } = {}): void {
  const n = x.length;
  const p = params.length;
  const jac = new Float64Array(n * p);
  const out = new Float64Array(n);
  const plain = new Float64Array(n);
  model.jacobian!(x, params, jac, out);
  model.evaluate(x, params, plain);
  for (let i = 0; i < n; i++) expect(out[i]).toBeCloseTo(plain[i]!, 9);
  const plus = new Float64Array(n);
  const minus = new Float64Array(n);
  const step = options.step ?? 1e-6;
  const tolerance = options.tolerance ?? 1e-6;
  model.parameters.forEach((spec, j) => {
    if (spec.integer) return; // integer parameters are never fitted; their column is 0 by contract
    const typical = options.typical?.[spec.name] ?? (spec.unit === "m" ? 1e-4 : 1);
    const h = step * (params[j] !== 0 ? Math.abs(params[j]!) : typical);
    const shifted = Float64Array.from(params);
    shifted[j] = params[j]! + h;
    model.evaluate(x, shifted, plus);
    shifted[j] = params[j]! - h;
    model.evaluate(x, shifted, minus);
    let level = 0;
    for (let i = 0; i < n; i++) level = Math.max(level, Math.abs(plus[i]!), Math.abs(minus[i]!));
    const noise = (100 * Number.EPSILON * level) / h;
    let scale = 0;
    let worst = 0;
    let worstIndex = 0;
    for (let i = 0; i < n; i++) {
      const numeric = (plus[i]! - minus[i]!) / (2 * h);
      scale = Math.max(scale, Math.abs(numeric), Math.abs(jac[i * p + j]!));
      const difference = Math.abs(numeric - jac[i * p + j]!);
      if (difference > worst) {
        worst = difference;
        worstIndex = i;
      }
    }
    const message = `${model.id} ∂I/∂${spec.name}: worst |analytic − numeric| = ${worst} at x = ${x[worstIndex]} (column scale ${scale}, tolerance ${tolerance} relative + rounding ${noise})`;
    expect(worst <= tolerance * scale + noise, message).toBe(true);
  });
}
