/**
 * Tests of whether normalised residuals look like white noise: Wald–Wolfowitz runs test
 * (Wald & Wolfowitz 1940), Durbin–Watson statistic (Durbin & Watson 1950), lag-k
 * autocorrelation with its large-sample N(0, 1/N) null (Box & Jenkins, Time Series Analysis,
 * 1976, §6.2), and the Lomb–Scargle power at one frequency (Lomb 1976; Scargle 1982, whose
 * single-frequency power is Exp(1) under Gaussian white noise when normalised by the variance,
 * Horne & Baliunas 1986).
 */
import { InvalidArgumentError } from "../errors.js";
import { normalCdf, normalTwoSided } from "../math/normal.js";

/** Result of the Wald–Wolfowitz runs test. */
export interface RunsTestResult {
  /** Number of runs of equal sign (zeros skipped). */
  runs: number;
  positives: number;
  negatives: number;
  /** Expected runs and z score under randomness. */
  expected: number;
  z: number;
  /** One-sided p-value for too few runs (the sign of a misfit). */
  pTooFew: number;
  /** Two-sided p-value. */
  pValue: number;
}

/** Wald–Wolfowitz runs test on the signs of `residuals` (normalised, dimensionless; NaN entries skipped). */
export function runsTest(residuals: ArrayLike<number>): RunsTestResult {
  let positives = 0;
  let negatives = 0;
  let runs = 0;
  let last = 0;
  for (let i = 0; i < residuals.length; i++) {
    const r = residuals[i];
    if (r === 0 || Number.isNaN(r)) continue;
    const sign = r > 0 ? 1 : -1;
    if (sign > 0) positives++;
    else negatives++;
    if (sign !== last) runs++;
    last = sign;
  }
  const n = positives + negatives;
  if (positives === 0 || negatives === 0 || n < 3) {
    return { runs, positives, negatives, expected: NaN, z: NaN, pTooFew: NaN, pValue: NaN };
  }
  const product = 2 * positives * negatives;
  const expected = product / n + 1;
  const variance = (product * (product - n)) / (n * n * (n - 1));
  const z = variance > 0 ? (runs - expected) / Math.sqrt(variance) : NaN;
  return { runs, positives, negatives, expected, z, pTooFew: normalCdf(z), pValue: normalTwoSided(z) };
}

/** Durbin–Watson d = Σ(r_i − r_{i−1})² / Σ r_i² over consecutive finite residuals (any unit; d dimensionless); ≈ 2 for white noise. */
export function durbinWatson(residuals: ArrayLike<number>): number {
  let numerator = 0;
  let denominator = 0;
  let previous = NaN;
  for (let i = 0; i < residuals.length; i++) {
    const r = residuals[i];
    if (Number.isNaN(r)) continue;
    if (!Number.isNaN(previous)) numerator += (r - previous) ** 2;
    denominator += r * r;
    previous = r;
  }
  return denominator > 0 ? numerator / denominator : NaN;
}

/**
 * Lag-k (k in samples) sample autocorrelation ρ_k (dimensionless) of the finite residuals (in their order) and its two-sided
 * p-value from ρ_k √N ~ N(0, 1).
 */
export function autocorrelation(residuals: ArrayLike<number>, lag = 1): { lag: number; value: number; pValue: number } {
  if (!Number.isInteger(lag) || lag < 1) throw new InvalidArgumentError("lag", lag, "a whole number >= 1");
  const r = finite(residuals);
  if (r.length <= lag + 1) return { lag, value: NaN, pValue: NaN };
  const mean = r.reduce((a, b) => a + b, 0) / r.length;
  let c0 = 0;
  let ck = 0;
  for (let i = 0; i < r.length; i++) {
    c0 += (r[i] - mean) ** 2;
    if (i + lag < r.length) ck += (r[i] - mean) * (r[i + lag] - mean);
  }
  const value = c0 > 0 ? ck / c0 : NaN;
  return { lag, value, pValue: Number.isFinite(value) ? normalTwoSided(value * Math.sqrt(r.length)) : NaN };
}

/**
 * Lomb–Scargle power of the residuals at `frequency` (cycles per unit of x), normalised by
 * the residual variance; under white Gaussian noise it is Exp(1), so p = exp(−power).
 * @param x         positions (m), same length as residuals; NaN residuals are skipped
 * @param residuals normalised residuals
 * @param frequency cycles per metre (> 0)
 */
export function lombScarglePower(x: ArrayLike<number>, residuals: ArrayLike<number>, frequency: number): number {
  if (!(frequency > 0) || !Number.isFinite(frequency)) throw new InvalidArgumentError("frequency", frequency, "cycles per metre, > 0");
  if (x.length !== residuals.length) throw new InvalidArgumentError("x", x.length, `one position per residual (${residuals.length})`);
  const omega = 2 * Math.PI * frequency;
  let n = 0;
  let mean = 0;
  let s2 = 0;
  let c2 = 0;
  for (let i = 0; i < x.length; i++) {
    if (Number.isNaN(residuals[i])) continue;
    n++;
    mean += residuals[i];
    s2 += Math.sin(2 * omega * x[i]);
    c2 += Math.cos(2 * omega * x[i]);
  }
  if (n < 3) return NaN;
  mean /= n;
  const tau = Math.atan2(s2, c2) / (2 * omega);
  let yc = 0, ys = 0, cc = 0, ss = 0, variance = 0;
  for (let i = 0; i < x.length; i++) {
    const r = residuals[i];
    if (Number.isNaN(r)) continue;
    const d = r - mean;
    const phase = omega * (x[i] - tau);
    const c = Math.cos(phase);
    const s = Math.sin(phase);
    yc += d * c;
    ys += d * s;
    cc += c * c;
    ss += s * s;
    variance += d * d;
  }
  variance /= n - 1;
  if (!(variance > 0)) return 0;
  const power = (cc > 1e-12 * n ? (yc * yc) / cc : 0) + (ss > 1e-12 * n ? (ys * ys) / ss : 0);
  return power / (2 * variance);
}

function finite(values: ArrayLike<number>): number[] {
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) out.push(values[i]);
  return out;
}
