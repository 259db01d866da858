/**
 * Bootstrap uncertainties of a fit (Efron & Tibshirani, An Introduction to the Bootstrap, 1993,
 * ch. 6 and 9): refit many synthetic profiles made from the fitted model and
 *   parametric — new noise from the fit's noise model (Poisson draws of f̂, or f̂ + s·σ·N(0,1));
 *   residual   — f̂ plus the fit's Pearson residuals resampled with replacement (times σ or √f̂).
 * Seeded, so a result re-runs identically. Percentile intervals; derived quantities on request.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { createRandom } from "../random.js";
import { bestOf, prepareFit } from "./fitProfile.js";
import { quantileSorted } from "./propagate.js";
import { checkRefittable, optionsFromResult } from "./refit.js";
import { STOP_REASONS } from "./status.js";
import type { FitOptions, FitResult } from "./types.js";

/** Options of {@link bootstrap}. */
export interface BootstrapOptions {
  method?: "parametric" | "residual";
  /** Number of synthetic profiles (default 200). */
  samples?: number;
  /** Seed (default 1). */
  seed?: number;
  /** Interval coverage (default 0.6827). */
  level?: number;
  /** Derived quantities computed from every refit's parameters (by name, SI). */
  derived?: Record<string, (values: Record<string, number>) => number>;
  /** Fit options to reuse (default: read back from the result). */
  fit?: FitOptions;
  onProgress?: (done: number, total: number) => void;
  signal?: { readonly aborted: boolean };
}

/** Draws, standard errors (SI) and percentile intervals from {@link bootstrap}. */
export interface BootstrapSummary {
  /** Draws of each free parameter and derived quantity (converged refits only). */
  draws: Record<string, Float64Array>;
  /** Sample standard deviation of the draws. */
  uncertainty: Record<string, number>;
  /** Percentile interval at `level`. */
  interval: Record<string, [number, number]>;
  level: number;
  method: "parametric" | "residual";
  /** Refits that did not converge (left out). */
  failed: number;
  /** True when stopped early by the signal. */
  cancelled: boolean;
}

/**
 * Parametric or residual bootstrap of a fit.
 * @example bootstrap(result, profile, model, { samples: 500, seed: 7, derived: { ratio: (p) => p.separation / p.width } })
 */
export function bootstrap(result: FitResult, profile: Profile, model: Model, options: BootstrapOptions = {}): BootstrapSummary {
  const method = options.method ?? "parametric";
  if (method !== "parametric" && method !== "residual") throw new InvalidArgumentError("method", method, `"parametric" or "residual"`);
  const samples = options.samples ?? 200;
  if (!Number.isInteger(samples) || samples < 2) throw new InvalidArgumentError("samples", samples, "an integer >= 2");
  const level = options.level ?? 0.6827;
  if (!(level > 0 && level < 1)) throw new InvalidArgumentError("level", level, "a probability between 0 and 1");
  checkRefittable(result, profile, "bootstrap");
  const fitOptions = optionsFromResult(result, model, options.fit);
  const prep = prepareFit(profile, model, fitOptions);
  const rng = createRandom(options.seed ?? 1);
  const n = prep.used.length;
  const fitted = Float64Array.from(prep.used, (i) => result.model[i]);
  const pearson = Float64Array.from(prep.used, (i) => result.residuals[i]);
  const scale = result.noise === "gaussian" && result.covarianceScaled ? Math.sqrt(result.statistics.reducedChi2) : 1;
  const names = [...result.freeNames, ...Object.keys(options.derived ?? {})];
  const collected: number[][] = names.map(() => []);
  let failed = 0, cancelled = false;
  const synthetic = new Float64Array(n);
  for (let s = 0; s < samples; s++) {
    if (options.signal?.aborted) { cancelled = true; break; }
    for (let k = 0; k < n; k++) {
      const f = fitted[k];
      const sigma = result.noise === "poisson" ? Math.sqrt(Math.max(f, 0)) : prep.noise.sigma[k];
      if (method === "parametric") {
        synthetic[k] = result.noise === "poisson" ? rng.poisson(Math.max(f, 0)) : f + scale * sigma * rng.normal();
      } else {
        const r = pearson[Math.min(n - 1, Math.floor(rng.uniform() * n))];
        synthetic[k] = f + r * sigma;
        if (result.noise === "poisson" && synthetic[k] < 0) synthetic[k] = 0;
      }
    }
    const outcome = bestOf({ ...prep, y: Float64Array.from(synthetic) }, [{}]);
    options.onProgress?.(s + 1, samples);
    if (!STOP_REASONS[outcome.reason].converged) { failed++; continue; }
    const values: Record<string, number> = Object.fromEntries(result.parameters.map((p) => [p.name, p.value]));
    prep.plan.free.forEach((j, k) => { values[prep.plan.names[j]] = outcome.x[k]; });
    result.freeNames.forEach((name, k) => collected[k].push(values[name]));
    Object.values(options.derived ?? {}).forEach((fn, d) => collected[result.freeNames.length + d].push(fn(values)));
  }
  const draws: Record<string, Float64Array> = {}, uncertainty: Record<string, number> = {}, interval: Record<string, [number, number]> = {};
  names.forEach((name, k) => {
    const values = Float64Array.from(collected[k]);
    draws[name] = values;
    const sorted = Float64Array.from(values).sort();
    let mean = 0;
    for (const v of sorted) mean += v;
    mean /= Math.max(sorted.length, 1);
    let ss = 0;
    for (const v of sorted) ss += (v - mean) ** 2;
    uncertainty[name] = sorted.length > 1 ? Math.sqrt(ss / (sorted.length - 1)) : NaN;
    interval[name] = [quantileSorted(sorted, (1 - level) / 2), quantileSorted(sorted, (1 + level) / 2)];
  });
  return { draws, uncertainty, interval, level, method, failed, cancelled };
}
