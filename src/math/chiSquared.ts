/**
 * The χ² distribution with k degrees of freedom: CDF P(k/2, x/2), survival Q(k/2, x/2)
 * (A&S 26.4.19) and quantile by inversion.
 */
import { InvalidArgumentError } from "../errors.js";
import { regularizedGammaP, regularizedGammaQ } from "./gamma.js";
import { invertCdf } from "./invert.js";

function checkDof(k: number): void {
  if (!(k > 0) || !Number.isFinite(k)) throw new InvalidArgumentError("degrees of freedom", k, "a finite number > 0");
}

/** P(X ≤ x) for X ~ χ²(k); x ≥ 0 dimensionless, k degrees of freedom. */
export function chiSquaredCdf(x: number, k: number): number {
  checkDof(k);
  if (Number.isNaN(x)) throw new InvalidArgumentError("x", x, "x must be a number");
  return x <= 0 ? 0 : regularizedGammaP(k / 2, x / 2);
}

/** P(X > x) for X ~ χ²(k): the p-value of an observed χ² statistic x (dimensionless; k degrees of freedom). */
export function chiSquaredSurvival(x: number, k: number): number {
  checkDof(k);
  if (Number.isNaN(x)) throw new InvalidArgumentError("x", x, "x must be a number");
  return x <= 0 ? 1 : regularizedGammaQ(k / 2, x / 2);
}

/**
 * The x with P(X ≤ x) = p for X ~ χ²(k), 0 < p < 1 (all dimensionless; k degrees of freedom).
 * @example chiSquaredQuantile(0.95, 1) // ≈ 3.841 (A&S Table 26.8)
 */
export function chiSquaredQuantile(p: number, k: number): number {
  checkDof(k);
  if (!(p > 0 && p < 1)) throw new InvalidArgumentError("p", p, "a probability strictly between 0 and 1");
  // Upper tail side is inverted on the survival function so tiny 1 − p keep their accuracy.
  if (p > 0.5) return invertCdf((x) => -chiSquaredSurvival(x, k), -(1 - p), 0, k + 10);
  return invertCdf((x) => chiSquaredCdf(x, k), p, 0, k + 10);
}
