/**
 * The regularised incomplete beta function I_x(a, b).
 * Method: continued fraction A&S 26.5.8 with the symmetry I_x(a, b) = 1 − I_{1−x}(b, a)
 * (A&S 26.5.2) to stay in its fast region, evaluated by the modified Lentz algorithm as in
 * Press et al., Numerical Recipes, 3rd ed., §6.4.
 */
import { InvalidArgumentError } from "../errors.js";
import { lnGamma } from "./gamma.js";

const EPS = 1e-16;
const TINY = 1e-300;
const MAX_ITERATIONS = 100_000;

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b), a, b > 0 dimensionless (A&S 6.2.2). */
export function logBeta(a: number, b: number): number {
  return lnGamma(a) + lnGamma(b) - lnGamma(a + b);
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m < MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    // Even step d_{2m} of A&S 26.5.8.
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    // Odd step d_{2m+1}.
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) break;
  }
  return h;
}

/**
 * Regularised incomplete beta I_x(a, b) = B_x(a, b) / B(a, b) for 0 ≤ x ≤ 1, a, b > 0
 * (all dimensionless).
 * @example regularizedBeta(0.5, 2, 2) // 0.5 by symmetry
 */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !Number.isFinite(a)) throw new InvalidArgumentError("a", a, "a must be finite and > 0");
  if (!(b > 0) || !Number.isFinite(b)) throw new InvalidArgumentError("b", b, "b must be finite and > 0");
  if (!(x >= 0 && x <= 1)) throw new InvalidArgumentError("x", x, "x must lie in [0, 1]");
  if (x === 0) return 0;
  if (x === 1) return 1;
  const front = Math.exp(a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b));
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(x, a, b)) / a;
  return 1 - (front * betaContinuedFraction(1 - x, b, a)) / b;
}
