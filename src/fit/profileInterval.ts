/**
 * Profile-likelihood confidence intervals: the set of values θ_k for which the objective,
 * re-minimised over all other free parameters, rises by less than the χ²₁ quantile of the
 * level (Venzon & Moolgavkar 1988, Applied Statistics 37:87; Wilks' theorem). Asymmetric where
 * the likelihood is; open at a bound when the objective never rises far enough.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { normalQuantile } from "../math/normal.js";
import { bestOf, prepareFit } from "./fitProfile.js";
import { checkRefittable, objectiveScale, optionsFromResult } from "./refit.js";
import type { FitOptions, FitResult, FitWarning } from "./types.js";

/** Thrown inside the search when the caller cancels; turned into a warning at the top. */
const CANCELLED = Symbol("cancelled");

/** A profile-likelihood interval (ends in the parameter's SI unit). */
export interface ProfileInterval {
  parameter: string;
  unit: string;
  value: number;
  /** Lower and upper end (SI); a bound value when the interval is open there (see openLower/openUpper). */
  lower: number;
  upper: number;
  openLower: boolean;
  openUpper: boolean;
  level: number;
  /** Rise of the (scaled) objective that defines the interval: χ²₁ quantile at `level`. */
  threshold: number;
  /** Fits run to find the interval. */
  fits: number;
  warnings: FitWarning[];
}

/**
 * Profile-likelihood interval of one free parameter of a fit.
 * @param result the fit (its fixed/tied parameters, bounds and noise model are reused)
 * @param profile and model: the same ones the fit used
 * @param name   a free parameter of the fit
 * @param level  confidence level, default 0.6827 (1σ)
 * @example profileInterval(result, profile, model, "separation", 0.95) // { lower, upper, ... } in m
 */
export function profileInterval(result: FitResult, profile: Profile, model: Model, name: string, level = 0.6827, options?: FitOptions): ProfileInterval {
  const k = result.freeNames.indexOf(name);
  if (k < 0) throw new InvalidArgumentError("parameter", name, `a free parameter of the fit: ${result.freeNames.join(", ")}`);
  if (!(level > 0 && level < 1)) throw new InvalidArgumentError("level", level, "a probability between 0 and 1, e.g. 0.6827 or 0.95");
  checkRefittable(result, profile, "profileInterval");
  const parameter = result.parameters.find((p) => p.name === name)!;
  const z = normalQuantile(0.5 + level / 2);
  const threshold = z * z;
  const scale = objectiveScale(result);
  const base = optionsFromResult(result, model, options);
  const best = result.statistics.objective;
  const warnings: FitWarning[] = [];
  let fits = 0;
  let starts: Record<string, number> = { ...base.start };

  // Rise of the scaled objective above the optimum with `name` held at `value`, minus the threshold.
  const excess = (value: number): number => {
    const fix = { ...(base.fix as Record<string, number>), [name]: value };
    const start = { ...starts };
    delete start[name];
    const bounds = { ...base.bounds };
    delete bounds[name];
    const prep = prepareFit(profile, model, { ...base, fix, start, bounds, free: (base.free ?? []).filter((f) => f !== name) });
    const outcome = bestOf(prep, [{}]);
    fits++;
    if (outcome.reason === "cancelled") throw CANCELLED;
    prep.plan.free.forEach((j, i) => { starts[prep.plan.names[j]] = outcome.x[i]; });
    return (outcome.cost - best) / scale - threshold;
  };

  const side = (direction: 1 | -1): { end: number; open: boolean } => {
    starts = { ...base.start };
    const limit = direction > 0 ? parameter.upper : parameter.lower;
    const se = Number.isFinite(parameter.uncertainty) && parameter.uncertainty > 0 ? parameter.uncertainty : Math.abs(parameter.value) * 1e-3 || 1e-6;
    let inside = parameter.value, insideExcess = -threshold;
    let step = z * se;
    for (let expand = 0; expand < 30; expand++) {
      let trial = parameter.value + direction * step;
      const atLimit = direction > 0 ? trial >= limit : trial <= limit;
      if (atLimit) trial = limit;
      const g = excess(trial);
      if (g >= 0) return { end: refine(inside, insideExcess, trial, g), open: false };
      inside = trial; insideExcess = g;
      if (atLimit) {
        warnings.push({ code: "interval-open", parameter: name, message: `the ${direction > 0 ? "upper" : "lower"} end of the ${level} interval of ${name} reaches its bound ${limit}` });
        return { end: limit, open: true };
      }
      step *= 2;
    }
    warnings.push({ code: "interval-open", parameter: name, message: `the objective did not rise enough on the ${direction > 0 ? "upper" : "lower"} side of ${name}: the parameter is not bounded by the data at level ${level}` });
    return { end: direction > 0 ? Infinity : -Infinity, open: true };
  };

  // Regula falsi (Illinois variant) between a point inside (g < 0) and one outside (g ≥ 0).
  const refine = (a: number, ga: number, b: number, gb: number): number => {
    const tolerance = 1e-4 * (Number.isFinite(parameter.uncertainty) && parameter.uncertainty > 0 ? parameter.uncertainty : Math.abs(b - a));
    let side = 0;
    for (let it = 0; it < 40 && Math.abs(b - a) > tolerance; it++) {
      const c = (a * gb - b * ga) / (gb - ga);
      const gc = excess(c);
      if (gc >= 0) { b = c; gb = gc; if (side === -1) ga /= 2; side = -1; }
      else { a = c; ga = gc; if (side === 1) gb /= 2; side = 1; }
    }
    return (a * gb - b * ga) / (gb - ga);
  };

  let lower: { end: number; open: boolean }, upper: { end: number; open: boolean };
  try {
    lower = side(-1); upper = side(1);
  } catch (error) {
    if (error !== CANCELLED) throw error;
    warnings.push({ code: "cancelled", parameter: name, message: "cancelled by the caller (signal.aborted); the interval is unknown" });
    lower = { end: NaN, open: true }; upper = { end: NaN, open: true };
  }
  return {
    parameter: name, unit: parameter.unit, value: parameter.value,
    lower: lower.end, upper: upper.end, openLower: lower.open, openUpper: upper.open,
    level, threshold, fits, warnings,
  };
}
