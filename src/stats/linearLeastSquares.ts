/**
 * Weighted linear least squares by the normal equations with Gauss–Jordan inversion: enough
 * for the small, well-conditioned local fits (≤ 4 columns of scaled bases) of the derived
 * quantities. Covariance (AᵀWA)⁻¹, scaled by χ²/ν when σ is unknown or the scatter exceeds it
 * (common practice; e.g. Bevington & Robinson, 3rd ed., §7.2).
 */

/**
 * Solves min Σ w_i (y_i − Σ_j A_ij β_j)² (any consistent units: β in units of y per unit of A).
 * @param rows        design matrix rows A_i (length p each)
 * @param y           observations
 * @param weights     w_i = 1/σ_i²
 * @param sigmaUnknown scale the covariance by χ²/ν always (true) or only when χ²/ν > 1 (false)
 * @returns coefficients, covariance (p × p row-major), χ², or undefined when singular
 */
export function solveNormalEquations(rows: readonly number[][], y: readonly number[], weights: readonly number[], sigmaUnknown: boolean):
  { coefficients: number[]; covariance: Float64Array; chi2: number } | undefined {
  const p = rows[0]?.length ?? 0;
  const n = rows.length;
  if (p === 0 || n <= p) return undefined;
  const normal = new Float64Array(p * p);
  const rhs = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    const w = weights[i];
    for (let a = 0; a < p; a++) {
      rhs[a] += w * r[a] * y[i];
      for (let b = 0; b < p; b++) normal[a * p + b] += w * r[a] * r[b];
    }
  }
  const inverse = invertMatrix(normal, p);
  if (!inverse) return undefined;
  const coefficients = Array.from({ length: p }, (_, a) => {
    let sum = 0;
    for (let b = 0; b < p; b++) sum += inverse[a * p + b] * rhs[b];
    return sum;
  });
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    let f = 0;
    for (let a = 0; a < p; a++) f += rows[i][a] * coefficients[a];
    chi2 += weights[i] * (y[i] - f) ** 2;
  }
  const ratio = chi2 / (n - p);
  const factor = sigmaUnknown ? ratio : Math.max(1, ratio);
  for (let k = 0; k < p * p; k++) inverse[k] *= factor;
  return { coefficients, covariance: inverse, chi2 };
}

/** Inverse of a small square matrix (row-major p × p, entries in any units; the inverse has the reciprocal units) by Gauss–Jordan elimination with partial pivoting. */
export function invertMatrix(matrix: Float64Array, p: number): Float64Array | undefined {
  const a = Float64Array.from(matrix);
  const inv = new Float64Array(p * p);
  for (let i = 0; i < p; i++) inv[i * p + i] = 1;
  for (let col = 0; col < p; col++) {
    let pivot = col;
    for (let r = col + 1; r < p; r++) if (Math.abs(a[r * p + col]) > Math.abs(a[pivot * p + col])) pivot = r;
    const value = a[pivot * p + col];
    if (!(Math.abs(value) > 0)) return undefined;
    for (let k = 0; k < p; k++) {
      [a[col * p + k], a[pivot * p + k]] = [a[pivot * p + k], a[col * p + k]];
      [inv[col * p + k], inv[pivot * p + k]] = [inv[pivot * p + k], inv[col * p + k]];
    }
    for (let k = 0; k < p; k++) {
      a[col * p + k] /= value;
      inv[col * p + k] /= value;
    }
    for (let r = 0; r < p; r++) {
      if (r === col) continue;
      const f = a[r * p + col];
      if (f === 0) continue;
      for (let k = 0; k < p; k++) {
        a[r * p + k] -= f * a[col * p + k];
        inv[r * p + k] -= f * inv[col * p + k];
      }
    }
  }
  return inv;
}
