/**
 * Student's t distribution with ν degrees of freedom:
 * P(|T| > t) = I_{ν/(ν+t²)}(ν/2, ½) (A&S 26.7.1 with 26.5.27).
 */
import { InvalidArgumentError } from "../errors.js";
import { regularizedBeta } from "./beta.js";
import { invertCdf } from "./invert.js";

function checkDof(nu: number): void {
  if (!(nu > 0) || !Number.isFinite(nu)) throw new InvalidArgumentError("degrees of freedom", nu, "a finite number > 0");
}

/** P(T ≤ t) for T ~ t(ν); t dimensionless, ν degrees of freedom. */
export function studentTCdf(t: number, nu: number): number {
  checkDof(nu);
  if (Number.isNaN(t)) throw new InvalidArgumentError("t", t, "t must be a number");
  if (t === Infinity) return 1;
  if (t === -Infinity) return 0;
  const tail = 0.5 * regularizedBeta(nu / (nu + t * t), nu / 2, 0.5);
  return t > 0 ? 1 - tail : tail;
}

/** Two-sided p-value P(|T| ≥ |t|) for T ~ t(ν); t dimensionless, ν degrees of freedom. */
export function studentTTwoSided(t: number, nu: number): number {
  checkDof(nu);
  if (Number.isNaN(t)) throw new InvalidArgumentError("t", t, "t must be a number");
  if (!Number.isFinite(t)) return 0;
  return regularizedBeta(nu / (nu + t * t), nu / 2, 0.5);
}

/**
 * The t (dimensionless) with P(T ≤ t) = p for T ~ t(ν), 0 < p < 1, ν degrees of freedom — e.g. the coverage factor of a
 * 95 % interval is studentTQuantile(0.975, ν).
 */
export function studentTQuantile(p: number, nu: number): number {
  checkDof(nu);
  if (!(p > 0 && p < 1)) throw new InvalidArgumentError("p", p, "a probability strictly between 0 and 1");
  if (p === 0.5) return 0;
  const q = p > 0.5 ? 1 - p : p;
  // Invert the two-sided tail on t ≥ 0: P(|T| ≥ t) = 2q.
  const t = invertCdf((x) => -studentTTwoSided(x, nu), -2 * q, 0, 10);
  return p > 0.5 ? t : -t;
}
