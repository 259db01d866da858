/**
 * Information criteria and Akaike weights.
 * AIC = −2 ln L + 2k (Akaike 1974); AICc = AIC + 2k(k + 1)/(n − k − 1) (Hurvich & Tsai 1989);
 * BIC = −2 ln L + k ln n (Schwarz 1978); weights w_i = exp(−Δ_i/2) / Σ exp(−Δ_j/2)
 * (Burnham & Anderson 2002, §2.9).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";

/** AIC, AICc and BIC of one fit with the counts behind them. */
export interface InformationCriteria {
  /** Points used. */
  n: number;
  /** Free parameters counted by the criteria. */
  k: number;
  /** Full log-likelihood at the optimum (dimensionless). */
  logLikelihood: number;
  aic: number;
  /** Infinity when n ≤ k + 1 (the correction is undefined). */
  aicc: number;
  bic: number;
}

/**
 * AIC, AICc and BIC (dimensionless) from a log-likelihood (natural log, dimensionless), k free
 * parameters and n points.
 * @example informationCriteria(-10, 2, 20) // { aic: 24, aicc: 24.705..., bic: 25.99... }
 */
export function informationCriteria(logLikelihood: number, k: number, n: number): InformationCriteria {
  if (!Number.isFinite(logLikelihood)) throw new InvalidArgumentError("logLikelihood", logLikelihood, "a finite number");
  if (!Number.isInteger(k) || k < 0) throw new InvalidArgumentError("k", k, "a whole number of free parameters >= 0");
  if (!Number.isInteger(n) || n < 1) throw new InvalidArgumentError("n", n, "a whole number of points >= 1");
  const aic = -2 * logLikelihood + 2 * k;
  const aicc = n - k - 1 > 0 ? aic + (2 * k * (k + 1)) / (n - k - 1) : Infinity;
  const bic = -2 * logLikelihood + k * Math.log(n);
  return { n, k, logLikelihood, aic, aicc, bic };
}

/** Information criteria of a fit, recomputed from its log-likelihood, free-parameter count and n. */
export function fitCriteria(fit: FitResult): InformationCriteria {
  const s = fit.statistics;
  return informationCriteria(s.logLikelihood, s.nFree, s.n);
}

/**
 * Differences to the smallest value and Akaike weights for a list of criterion values
 * (AIC, AICc or BIC; dimensionless). Infinite values get Δ = ∞ and weight 0; weights sum to 1.
 */
export function akaikeWeights(values: readonly number[]): { delta: number[]; weight: number[] } {
  if (values.length === 0) throw new InvalidArgumentError("values", values, "at least one criterion value");
  const best = Math.min(...values);
  if (!Number.isFinite(best)) throw new InvalidArgumentError("values", values, "at least one finite criterion value");
  const delta = values.map((v) => v - best);
  const raw = delta.map((d) => Math.exp(-0.5 * d));
  const total = raw.reduce((a, b) => a + b, 0);
  return { delta, weight: raw.map((r) => r / total) };
}
