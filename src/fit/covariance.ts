/**
 * Covariance of fitted parameters from the final Jacobian: C = s²·(JᵀJ)⁺ with the pseudo-inverse
 * taken by SVD of the column-equilibrated Jacobian and singular values below
 * ε·max(n, p)·s_max dropped (the threshold used by SciPy's curve_fit); s² = reduced χ² when σ
 * is relative, 1 when absolute (Press et al., Numerical Recipes 3rd ed., §15.4–15.5).
 * Parameters along a dropped direction get an infinite standard error and a warning.
 */
import { householderQr, svdJacobi } from "./linalg.js";
import type { FitWarning } from "./types.js";

/** Covariance (SI²), correlation and standard errors (SI) of the free parameters. */
export interface CovarianceResult {
  covariance: Float64Array;
  correlation: Float64Array;
  stderr: Float64Array;
  /** Condition number of the column-equilibrated Jacobian. */
  condition: number;
  warnings: FitWarning[];
}

/**
 * Covariance of q parameters from an n × q row-major Jacobian of normalised residuals.
 * @param scale multiplies (JᵀJ)⁺ (reduced χ², or 1 for absolute σ)
 * @param names parameter names for warnings
 */
export function covarianceFromJacobian(jac: Float64Array, n: number, q: number, scale: number, names: readonly string[]): CovarianceResult {
  const covariance = new Float64Array(q * q), correlation = new Float64Array(q * q), stderr = new Float64Array(q);
  const warnings: FitWarning[] = [];
  if (q === 0) return { covariance, correlation, stderr, condition: 1, warnings };
  const rows = Math.max(n, q);
  const work = new Float64Array(rows * q);
  const norms = new Float64Array(q);
  for (let i = 0; i < n; i++) for (let j = 0; j < q; j++) norms[j] += jac[i * q + j] ** 2;
  for (let j = 0; j < q; j++) norms[j] = Math.sqrt(norms[j]) || 1;
  for (let i = 0; i < n; i++) for (let j = 0; j < q; j++) work[i * q + j] = jac[i * q + j] / norms[j];
  // J = QR first, then the SVD of the small R: same singular values and V, O(nq²) work.
  const rdiag = new Float64Array(q), tau = new Float64Array(q);
  householderQr(work, rows, q, rdiag, tau);
  const r = new Float64Array(q * q);
  for (let a = 0; a < q; a++) {
    r[a * q + a] = rdiag[a];
    for (let b = a + 1; b < q; b++) r[a * q + b] = work[a * q + b];
  }
  const { singularValues, v } = svdJacobi(r, q, q);
  let smax = 0, smin = Infinity;
  for (const s of singularValues) { smax = Math.max(smax, s); smin = Math.min(smin, s); }
  const threshold = 2.220446049250313e-16 * Math.max(n, q) * smax;
  const infinite = new Uint8Array(q);
  for (let k = 0; k < q; k++) {
    const s = singularValues[k];
    if (!(s > threshold)) {
      for (let j = 0; j < q; j++) if (Math.abs(v[j * q + k]) > 1e-6) infinite[j] = 1;
      continue;
    }
    const w = scale / (s * s);
    for (let a = 0; a < q; a++) {
      const va = v[a * q + k] * w;
      for (let b = 0; b < q; b++) covariance[a * q + b] += va * v[b * q + k];
    }
  }
  for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) covariance[a * q + b] /= norms[a] * norms[b];
  for (let j = 0; j < q; j++) {
    if (infinite[j] || !Number.isFinite(covariance[j * q + j])) {
      stderr[j] = Infinity;
      warnings.push({ code: "singular-covariance", parameter: names[j],
        message: `${names[j]} is not determined by the data (the Jacobian is singular along it): its uncertainty is infinite; fix it or tie it` });
    } else stderr[j] = Math.sqrt(covariance[j * q + j]);
  }
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) {
      correlation[a * q + b] = Number.isFinite(stderr[a]) && Number.isFinite(stderr[b]) && stderr[a] > 0 && stderr[b] > 0
        ? covariance[a * q + b] / (stderr[a] * stderr[b]) : a === b ? 1 : NaN;
    }
  }
  const condition = smin > 0 ? smax / smin : Infinity;
  if (condition > 1e10 && warnings.length === 0) {
    warnings.push({ code: "ill-conditioned", message: `the Jacobian is ill-conditioned (condition number ${condition.toExponential(1)} after column scaling): strongly correlated parameters; uncertainties may be unreliable` });
  }
  return { covariance, correlation, stderr, condition, warnings };
}
