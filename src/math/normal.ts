/**
 * The standard normal distribution: CDF, survival and quantile.
 * CDF through erfc(z/√2) = Q(½, z²/2) (A&S 7.1.2 with 6.5.17); quantile from the rational
 * start of A&S 26.2.23 polished by Halley steps on the exact CDF.
 */
import { InvalidArgumentError } from "../errors.js";
import { regularizedGammaP, regularizedGammaQ } from "./gamma.js";

/** Φ(z), the standard normal CDF at z (z in standard deviations). */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) throw new InvalidArgumentError("z", z, "z must be a number");
  if (z === 0) return 0.5;
  const half = 0.5 * regularizedGammaQ(0.5, 0.5 * z * z);
  return z < 0 ? half : 1 - half;
}

/** 1 − Φ(z), the upper tail, accurate far into the tail (z in standard deviations). */
export function normalSurvival(z: number): number {
  return normalCdf(-z);
}

/** Two-sided tail probability P(|Z| ≥ |z|) = erfc(|z|/√2), z in standard deviations. */
export function normalTwoSided(z: number): number {
  if (Number.isNaN(z)) throw new InvalidArgumentError("z", z, "z must be a number");
  return z === 0 ? 1 : regularizedGammaQ(0.5, 0.5 * z * z);
}

/** Standard normal density φ(z) = exp(−z²/2)/√(2π), z in standard deviations (per standard deviation). */
export function normalPdf(z: number): number {
  return Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
}

/**
 * Φ⁻¹(p): the z (in standard deviations) with Φ(z) = p, for 0 < p < 1.
 * @example normalQuantile(0.975) // ≈ 1.959964
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new InvalidArgumentError("p", p, "a probability strictly between 0 and 1");
  if (p === 0.5) return 0;
  const lower = p < 0.5;
  const q = lower ? p : 1 - p;
  // A&S 26.2.23 (|error| < 4.5e-4) as the starting point.
  const t = Math.sqrt(-2 * Math.log(q));
  let z = t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  z = lower ? -z : z;
  for (let i = 0; i < 6; i++) {
    // Halley step on f(z) = Φ(z) − p; work on the smaller tail to keep relative accuracy.
    const error = z < 0 ? normalCdf(z) - p : 1 - p - normalSurvival(z);
    const pdf = normalPdf(z);
    if (pdf === 0) break;
    const u = error / pdf;
    const step = u / (1 + 0.5 * z * u);
    z -= step;
    if (Math.abs(step) < 1e-15 * Math.max(1, Math.abs(z))) break;
  }
  return z;
}
