/**
 * Inversion of a monotone increasing CDF by bracketing and bisection (common practice):
 * slow but sure, which is what quantiles behind decisions need.
 */

/**
 * The x in [lower, upper) where cdf(x) = p, for a non-decreasing cdf.
 * The bracket grows upward (doubling) when cdf(upper) < p.
 * @param cdf   the distribution function
 * @param p     target probability, 0 < p < 1
 * @param lower a point with cdf(lower) ≤ p
 * @param upper a first guess of a point with cdf(upper) ≥ p (> lower)
 */
export function invertCdf(cdf: (x: number) => number, p: number, lower: number, upper: number): number {
  let lo = lower;
  let hi = upper;
  for (let i = 0; i < 2000 && cdf(hi) < p; i++) {
    lo = hi;
    hi = hi * 2 + 1;
  }
  for (let i = 0; i < 300; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (cdf(mid) < p) lo = mid;
    else hi = mid;
    if (hi - lo <= 1e-15 * Math.abs(hi)) break;
  }
  return 0.5 * (lo + hi);
}
