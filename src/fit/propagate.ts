/**
 * Propagation of fit uncertainties to a derived quantity g(θ): delta method
 * σ_g² = ∇gᵀ C ∇g (JCGM 100:2008, GUM §5.1.2, law of propagation of uncertainty) or Monte Carlo
 * (JCGM 101:2008, GUM Supplement 1: draws θ ~ N(θ̂, C), percentile interval).
 */
import { InvalidArgumentError } from "../errors.js";
import { createRandom } from "../random.js";
import { normalQuantile } from "../math/normal.js";
import { svdJacobi } from "./linalg.js";
import type { FitResult } from "./types.js";

/** Options of {@link propagate}. */
export interface PropagateOptions {
  /** "delta" (default) or "monte-carlo". */
  method?: "delta" | "monte-carlo";
  /** Monte Carlo draws (default 10000). */
  samples?: number;
  /** Seed of the Monte Carlo stream (default 1). */
  seed?: number;
  /** Coverage of the reported interval (default 0.6827). */
  level?: number;
}

/** A derived quantity with its standard uncertainty and interval (in the quantity's own unit). */
export interface Propagated {
  /** g at the fitted parameters. */
  value: number;
  /** Standard uncertainty of g (delta method, or the SD of the draws). */
  uncertainty: number;
  /** Interval at `level`: value ± z·uncertainty (delta) or percentiles of the draws (Monte Carlo). */
  interval: [number, number];
  level: number;
  method: "delta" | "monte-carlo";
  /** Monte Carlo draws of g (Monte Carlo only; non-finite draws are dropped and counted). */
  draws?: Float64Array;
  dropped?: number;
}

/**
 * Uncertainty of a derived quantity of the fitted parameters.
 * @param fn receives every parameter by name (SI) and returns the derived quantity (its own unit)
 * @example propagate(result, (p) => p.separation * 2e-3 / p.distance) // fringe-spacing-based quantity
 */
export function propagate(result: FitResult, fn: (values: Record<string, number>) => number, options: PropagateOptions = {}): Propagated {
  if (typeof fn !== "function") throw new InvalidArgumentError("fn", fn, "a function of the parameter values by name");
  const level = options.level ?? 0.6827;
  if (!(level > 0 && level < 1)) throw new InvalidArgumentError("level", level, "a probability between 0 and 1");
  const method = options.method ?? "delta";
  const q = result.freeNames.length;
  const values: Record<string, number> = Object.fromEntries(result.parameters.map((p) => [p.name, p.value]));
  const at = (theta: ArrayLike<number>): number => {
    const v = { ...values };
    result.freeNames.forEach((name, k) => { v[name] = theta[k]; });
    return fn(v);
  };
  const theta = Float64Array.from(result.freeNames, (name) => values[name]);
  const value = fn({ ...values });
  if (!Number.isFinite(value)) throw new InvalidArgumentError("fn(fitted values)", value, "a finite number at the fitted parameters");
  const se = Float64Array.from(result.freeNames, (_, k) => Math.sqrt(result.covariance[k * q + k]));
  if (method === "delta") {
    const grad = new Float64Array(q);
    for (let k = 0; k < q; k++) {
      // Step a thousandth of the parameter's own uncertainty: small against the curvature that matters.
      const h = 1e-3 * (se[k] > 0 && Number.isFinite(se[k]) ? se[k] : Math.max(Math.abs(theta[k]), 1e-12));
      const up = Float64Array.from(theta), down = Float64Array.from(theta);
      up[k] += h; down[k] -= h;
      grad[k] = (at(up) - at(down)) / (2 * h);
    }
    let variance = 0;
    for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) variance += grad[a] * result.covariance[a * q + b] * grad[b];
    const uncertainty = Math.sqrt(Math.max(variance, 0));
    const z = zOf(level);
    return { value, uncertainty, interval: [value - z * uncertainty, value + z * uncertainty], level, method };
  }
  if (method !== "monte-carlo") throw new InvalidArgumentError("method", method, `"delta" or "monte-carlo"`);
  const samples = options.samples ?? 10000;
  if (!Number.isInteger(samples) || samples < 10) throw new InvalidArgumentError("samples", samples, "an integer >= 10");
  const root = covarianceRoot(result.covariance, q);
  const rng = createRandom(options.seed ?? 1);
  const draws: number[] = [];
  const normal = new Float64Array(q), point = new Float64Array(q);
  let dropped = 0;
  for (let s = 0; s < samples; s++) {
    for (let k = 0; k < q; k++) normal[k] = rng.normal();
    for (let a = 0; a < q; a++) {
      let v = theta[a];
      for (let b = 0; b < q; b++) v += root[a * q + b] * normal[b];
      point[a] = v;
    }
    const g = at(point);
    if (Number.isFinite(g)) draws.push(g); else dropped++;
  }
  const sorted = Float64Array.from(draws).sort();
  let mean = 0;
  for (const g of sorted) mean += g;
  mean /= sorted.length;
  let ss = 0;
  for (const g of sorted) ss += (g - mean) ** 2;
  const uncertainty = Math.sqrt(ss / (sorted.length - 1));
  return {
    value, uncertainty, level, method, dropped, draws: Float64Array.from(draws),
    interval: [quantileSorted(sorted, (1 - level) / 2), quantileSorted(sorted, (1 + level) / 2)],
  };
}

/** Standard-normal z with P(|Z| < z) = level. */
export function zOf(level: number): number {
  return normalQuantile(0.5 + level / 2);
}

/** Linear interpolation between order statistics (type 7 of Hyndman & Fan 1996). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p, lo = Math.floor(h), hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** A square root R of a covariance (C = R Rᵀ) from its eigen-decomposition; negative eigenvalues are set to 0. */
export function covarianceRoot(covariance: Float64Array, q: number): Float64Array {
  const { singularValues, v } = svdJacobi(Float64Array.from(covariance), q, q);
  const root = new Float64Array(q * q);
  for (let a = 0; a < q; a++) for (let k = 0; k < q; k++) root[a * q + k] = v[a * q + k] * Math.sqrt(Math.max(singularValues[k], 0));
  return root;
}
