/**
 * Bessel functions of the first kind J0, J1, J2 of real argument.
 *
 * Method: for |v| ≤ 25, Miller's backward recurrence J_{k−1} = (2k/v) J_k − J_{k+1}
 * (A&S 9.1.27) from an order well above |v|, normalised by 1 = J0 + 2 Σ J_{2k} (A&S 9.1.46);
 * for |v| > 25, Hankel's asymptotic expansion (A&S 9.2.5, 9.2.9–9.2.10) summed to its
 * smallest term (< 1e-20 there). Accuracy about 1e-15 absolute, checked against SciPy.
 */

/** Result slot of `besselJ012`. */
export interface BesselTriple {
  j0: number;
  j1: number;
  j2: number;
}

/**
 * Writes J0(v), J1(v), J2(v) (dimensionless) into `out`.
 * @example const b = { j0: 0, j1: 0, j2: 0 }; besselJ012(1, b); // b.j1 ≈ 0.44005058574
 */
export function besselJ012(v: number, out: BesselTriple): void {
  const av = Math.abs(v);
  const sign = v < 0 ? -1 : 1; // J0, J2 even; J1 odd
  if (av < 1e-6) {
    const q = 0.25 * av * av;
    out.j0 = 1 - q;
    out.j1 = sign * 0.5 * av * (1 - q / 2);
    out.j2 = (av * av) / 8;
    return;
  }
  if (av <= 25) millerJ012(av, out);
  else hankelJ012(av, out);
  out.j1 *= sign;
}

/** J1(v), dimensionless. */
export function besselJ1(v: number): number {
  const triple = { j0: 0, j1: 0, j2: 0 };
  besselJ012(v, triple);
  return triple.j1;
}

/** J0(v), dimensionless. */
export function besselJ0(v: number): number {
  const triple = { j0: 0, j1: 0, j2: 0 };
  besselJ012(v, triple);
  return triple.j0;
}

function millerJ012(v: number, out: BesselTriple): void {
  // start order: even, comfortably above v (error decays like (ev/2M)^M)
  let start = Math.ceil(v + 18 + 6 * Math.cbrt(v));
  if (start % 2 === 1) start += 1;
  let above = 0; // J_{k+1}
  let current = 1e-300; // J_k, arbitrary scale
  let norm = 0;
  let j0 = 0, j1 = 0, j2 = 0;
  const twoOverV = 2 / v;
  for (let k = start; k >= 1; k--) {
    const below = k * twoOverV * current - above; // J_{k−1}
    above = current;
    current = below;
    if (Math.abs(current) > 1e250) {
      // rescale everything gathered so far to avoid overflow
      current *= 1e-250; above *= 1e-250; norm *= 1e-250; j1 *= 1e-250; j2 *= 1e-250;
    }
    const order = k - 1;
    if (order === 2) j2 = current;
    if (order === 1) j1 = current;
    if (order > 0 && order % 2 === 0) norm += 2 * current;
  }
  j0 = current;
  norm += j0;
  out.j0 = j0 / norm;
  out.j1 = j1 / norm;
  out.j2 = j2 / norm;
}

function hankelJ012(v: number, out: BesselTriple): void {
  const amplitude = Math.sqrt(2 / (Math.PI * v));
  out.j0 = amplitude * hankelCombination(0, v);
  out.j1 = amplitude * hankelCombination(1, v);
  out.j2 = (2 / v) * out.j1 - out.j0;
}

/** P cos χ − Q sin χ with χ = v − (n/2 + 1/4)π (A&S 9.2.5). */
function hankelCombination(n: number, v: number): number {
  const mu = 4 * n * n;
  const eight = 8 * v;
  let p = 1;
  let q = 0;
  let term = 1;
  let previous = Infinity;
  for (let k = 1; k < 200; k++) {
    const next = (term * (mu - (2 * k - 1) * (2 * k - 1))) / (k * eight);
    if (Math.abs(next) >= previous) break; // asymptotic: stop at the smallest term
    previous = Math.abs(next);
    term = next;
    // k odd → Q (signs +, −, ...); k even → P (signs −, +, ...)
    if (k % 2 === 1) q += (k % 4 === 1 ? 1 : -1) * term;
    else p += (k % 4 === 2 ? -1 : 1) * term;
    if (Math.abs(term) < 1e-18) break;
  }
  const chi = v - (n / 2 + 0.25) * Math.PI;
  return p * Math.cos(chi) - q * Math.sin(chi);
}
