/**
 * Small dense linear algebra for the solver and the covariance: no allocation in the
 * functions the solver calls per iteration. Matrices are row-major Float64Arrays.
 */

/**
 * Cholesky factorisation in place of a symmetric positive-definite p × p matrix
 * (lower triangle L with A = L Lᵀ; the upper triangle is left untouched).
 * Method: the standard column-by-column algorithm (Golub & Van Loan, Matrix Computations, §4.2).
 * @returns false when the matrix is not numerically positive definite.
 */
export function choleskyInPlace(a: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let d = a[j * p + j];
    for (let k = 0; k < j; k++) d -= a[j * p + k] * a[j * p + k];
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const ljj = Math.sqrt(d);
    a[j * p + j] = ljj;
    for (let i = j + 1; i < p; i++) {
      let s = a[i * p + j];
      for (let k = 0; k < j; k++) s -= a[i * p + k] * a[j * p + k];
      a[i * p + j] = s / ljj;
    }
  }
  return true;
}

/** Solves L Lᵀ x = b in place (b becomes x), with L from {@link choleskyInPlace}. */
export function choleskySolveInPlace(l: Float64Array, p: number, b: Float64Array): void {
  for (let i = 0; i < p; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * p + k] * b[k];
    b[i] = s / l[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < p; k++) s -= l[k * p + i] * b[k];
    b[i] = s / l[i * p + i];
  }
}

/** Result of {@link svdJacobi}: A = U diag(s) Vᵀ with U (m × p, overwritten into A), V (p × p). */
export interface ThinSvd {
  singularValues: Float64Array;
  /** Right singular vectors, row-major p × p, column j belongs to singularValues[j]. */
  v: Float64Array;
}

/**
 * Thin singular value decomposition of an m × p matrix (m ≥ p) by one-sided Jacobi rotations.
 * Method: Hestenes one-sided Jacobi (Demmel & Veselić 1992, SIAM J. Matrix Anal. Appl. 13:1204),
 * chosen because it computes small singular values to high relative accuracy.
 * `a` is overwritten by U·diag(s). Allocates (called once per fit, not in the solver loop).
 */
export function svdJacobi(a: Float64Array, m: number, p: number): ThinSvd {
  const v = new Float64Array(p * p);
  for (let i = 0; i < p; i++) v[i * p + i] = 1;
  const eps = 2.220446049250313e-16;
  for (let sweep = 0; sweep < 80; sweep++) {
    let rotated = false;
    for (let j = 0; j < p - 1; j++) {
      for (let k = j + 1; k < p; k++) {
        let alpha = 0, beta = 0, gamma = 0;
        for (let i = 0; i < m; i++) {
          const x = a[i * p + j], y = a[i * p + k];
          alpha += x * x; beta += y * y; gamma += x * y;
        }
        if (gamma === 0 || Math.abs(gamma) <= eps * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = Math.sign(zeta || 1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t), s = c * t;
        for (let i = 0; i < m; i++) {
          const x = a[i * p + j], y = a[i * p + k];
          a[i * p + j] = c * x - s * y;
          a[i * p + k] = s * x + c * y;
        }
        for (let i = 0; i < p; i++) {
          const x = v[i * p + j], y = v[i * p + k];
          v[i * p + j] = c * x - s * y;
          v[i * p + k] = s * x + c * y;
        }
      }
    }
    if (!rotated) break;
  }
  const singularValues = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += a[i * p + j] * a[i * p + j];
    singularValues[j] = Math.sqrt(s);
  }
  return { singularValues, v };
}

/**
 * (JᵀJ)⁺ from the SVD of an n × p Jacobian: V diag(1/s²) Vᵀ, dropping singular values below
 * threshold·s_max (pseudo-inverse with a threshold, as in SciPy's curve_fit).
 * @returns the p × p matrix and the number of singular values dropped.
 */
export function normalPseudoInverse(jac: Float64Array, n: number, p: number, relativeThreshold?: number):
  { inverse: Float64Array; dropped: number; condition: number } {
  const work = Float64Array.from(jac);
  const rows = Math.max(n, p);
  const padded = rows === n ? work : (() => { const w = new Float64Array(rows * p); w.set(work); return w; })();
  const { singularValues, v } = svdJacobi(padded, rows, p);
  let smax = 0, smin = Infinity;
  for (const s of singularValues) { smax = Math.max(smax, s); smin = Math.min(smin, s); }
  const threshold = (relativeThreshold ?? 2.220446049250313e-16 * Math.max(n, p)) * smax;
  const inverse = new Float64Array(p * p);
  let dropped = 0;
  for (let k = 0; k < p; k++) {
    const s = singularValues[k];
    if (!(s > threshold)) { dropped++; continue; }
    const w = 1 / (s * s);
    for (let i = 0; i < p; i++) {
      const vi = v[i * p + k] * w;
      for (let j = 0; j < p; j++) inverse[i * p + j] += vi * v[j * p + k];
    }
  }
  return { inverse, dropped, condition: smin > 0 ? smax / smin : Infinity };
}

/**
 * Householder QR in place of an m × p row-major matrix (m ≥ p), no pivoting
 * (Golub & Van Loan, Matrix Computations, §5.2). On return the upper triangle above the
 * diagonal holds R, `rdiag` holds R's diagonal, and the columns below the diagonal hold the
 * Householder vectors with factors `tau` (H_k = I − tau_k v vᵀ). Allocates nothing.
 */
export function householderQr(a: Float64Array, m: number, p: number, rdiag: Float64Array, tau: Float64Array): void {
  for (let k = 0; k < p; k++) {
    let norm = 0;
    for (let i = k; i < m; i++) norm += a[i * p + k] * a[i * p + k];
    norm = Math.sqrt(norm);
    if (norm === 0) { rdiag[k] = 0; tau[k] = 0; continue; }
    const akk = a[k * p + k];
    const alpha = akk > 0 ? -norm : norm;
    a[k * p + k] = akk - alpha;
    const vnorm2 = norm * norm - 2 * alpha * akk + alpha * alpha;
    const t = vnorm2 > 0 ? 2 / vnorm2 : 0;
    tau[k] = t;
    for (let j = k + 1; j < p; j++) {
      let s = 0;
      for (let i = k; i < m; i++) s += a[i * p + k] * a[i * p + j];
      s *= t;
      for (let i = k; i < m; i++) a[i * p + j] -= s * a[i * p + k];
    }
    rdiag[k] = alpha;
  }
}

/** Applies Qᵀ from {@link householderQr} to a vector b (length m) in place. */
export function applyQt(a: Float64Array, m: number, p: number, tau: Float64Array, b: Float64Array): void {
  for (let k = 0; k < p; k++) {
    const t = tau[k];
    if (t === 0) continue;
    let s = 0;
    for (let i = k; i < m; i++) s += a[i * p + k] * b[i];
    s *= t;
    for (let i = k; i < m; i++) b[i] -= s * a[i * p + k];
  }
}

/**
 * Solves R x = c (first p entries of c) by back substitution with R from {@link householderQr}.
 * @returns false when a diagonal entry is zero (rank-deficient).
 */
export function backSubstitute(a: Float64Array, p: number, rdiag: Float64Array, c: Float64Array, x: Float64Array): boolean {
  for (let i = p - 1; i >= 0; i--) {
    let s = c[i];
    for (let j = i + 1; j < p; j++) s -= a[i * p + j] * x[j];
    if (rdiag[i] === 0) return false;
    x[i] = s / rdiag[i];
  }
  return true;
}

/**
 * Householder QR like {@link householderQr}, for a matrix stored column by column
 * (column j is a[j·m … j·m + m − 1]), so every inner loop runs over contiguous memory; this is
 * the layout the solver uses for its tall n × p Jacobian. On return R's strict upper part is at
 * a[j·m + i] (i < j), `rdiag` holds its diagonal and the Householder vectors lie below it.
 */
export function householderQrColumns(a: Float64Array, m: number, p: number, rdiag: Float64Array, tau: Float64Array): void {
  for (let k = 0; k < p; k++) {
    const ck = k * m;
    const norm = Math.sqrt(dotColumns(a, ck, ck, k, m));
    if (norm === 0) { rdiag[k] = 0; tau[k] = 0; continue; }
    const akk = a[ck + k];
    const alpha = akk > 0 ? -norm : norm;
    a[ck + k] = akk - alpha;
    const vnorm2 = norm * norm - 2 * alpha * akk + alpha * alpha;
    const t = vnorm2 > 0 ? 2 / vnorm2 : 0;
    tau[k] = t;
    for (let j = k + 1; j < p; j++) {
      const cj = j * m;
      const s = t * dotColumns(a, ck, cj, k, m);
      for (let i = k; i < m; i++) a[cj + i] -= s * a[ck + i];
    }
    rdiag[k] = alpha;
  }
}

/** Σ_{i = from}^{m−1} a[x + i]·a[y + i] with four partial sums (shorter dependency chains). */
function dotColumns(a: Float64Array, x: number, y: number, from: number, m: number): number {
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  let i = from;
  for (; i + 3 < m; i += 4) {
    s0 += a[x + i] * a[y + i];
    s1 += a[x + i + 1] * a[y + i + 1];
    s2 += a[x + i + 2] * a[y + i + 2];
    s3 += a[x + i + 3] * a[y + i + 3];
  }
  for (; i < m; i++) s0 += a[x + i] * a[y + i];
  return (s0 + s1) + (s2 + s3);
}

/** Applies Qᵀ from {@link householderQrColumns} to a vector b (length m) in place. */
export function applyQtColumns(a: Float64Array, m: number, p: number, tau: Float64Array, b: Float64Array): void {
  for (let k = 0; k < p; k++) {
    const t = tau[k];
    if (t === 0) continue;
    const ck = k * m;
    let s = 0;
    for (let i = k; i < m; i++) s += a[ck + i] * b[i];
    s *= t;
    for (let i = k; i < m; i++) b[i] -= s * a[ck + i];
  }
}
