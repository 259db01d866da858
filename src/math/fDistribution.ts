/**
 * Snedecor's F distribution with (d1, d2) degrees of freedom:
 * CDF = I_{d1 x/(d1 x + d2)}(d1/2, d2/2) (A&S 26.6.2), survival from the mirrored beta.
 */
import { InvalidArgumentError } from "../errors.js";
import { regularizedBeta } from "./beta.js";
import { invertCdf } from "./invert.js";

function checkDof(d1: number, d2: number): void {
  if (!(d1 > 0) || !Number.isFinite(d1)) throw new InvalidArgumentError("d1", d1, "numerator degrees of freedom > 0");
  if (!(d2 > 0) || !Number.isFinite(d2)) throw new InvalidArgumentError("d2", d2, "denominator degrees of freedom > 0");
}

/** P(F ≤ x) for F ~ F(d1, d2); x ≥ 0 dimensionless. */
export function fCdf(x: number, d1: number, d2: number): number {
  checkDof(d1, d2);
  if (Number.isNaN(x)) throw new InvalidArgumentError("x", x, "x must be a number");
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return regularizedBeta((d1 * x) / (d1 * x + d2), d1 / 2, d2 / 2);
}

/** P(F > x) for F ~ F(d1, d2): the p-value of an observed F statistic x (dimensionless; d1, d2 degrees of freedom). */
export function fSurvival(x: number, d1: number, d2: number): number {
  checkDof(d1, d2);
  if (Number.isNaN(x)) throw new InvalidArgumentError("x", x, "x must be a number");
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return regularizedBeta(d2 / (d2 + d1 * x), d2 / 2, d1 / 2);
}

/** The x with P(F ≤ x) = p for F ~ F(d1, d2), 0 < p < 1 (all dimensionless; d1, d2 degrees of freedom). */
export function fQuantile(p: number, d1: number, d2: number): number {
  checkDof(d1, d2);
  if (!(p > 0 && p < 1)) throw new InvalidArgumentError("p", p, "a probability strictly between 0 and 1");
  if (p > 0.5) return invertCdf((x) => -fSurvival(x, d1, d2), -(1 - p), 0, 10);
  return invertCdf((x) => fCdf(x, d1, d2), p, 0, 10);
}
