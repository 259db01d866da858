/**
 * The profile-likelihood curve of one parameter (drawn by report/figures/profileLikelihoodFigure): the parameter is
 * held at each value of a grid around its best fit while every other free parameter is
 * re-fitted by fitProfile; the rise of the objective, scaled like the fitter's own profile
 * intervals, is Δχ² (asymptotically χ²₁ distributed, Wilks 1938).
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { fitProfile } from "./fitProfile.js";
import { objectiveScale, optionsFromResult } from "./refit.js";
import type { FitOptions, FitResult } from "./types.js";

/** One profiled parameter: values tried (SI) and the objective's rise above its minimum at each. */
export interface ProfileCurve {
  /** Project-wide parameter name. */
  name: string;
  /** SI unit symbol. */
  unit: string;
  values: ArrayLike<number>;
  /** Δχ² (or 2Δ(−ln L)) at each value, ≥ 0, 0 at the best fit. */
  deltaObjective: ArrayLike<number>;
  /** Best-fit value (SI), drawn as a vertical guide when given. */
  best?: number;
  /** Quadratic (covariance) standard error (SI); the parabola Δ = ((θ−best)/se)² is drawn for comparison. */
  uncertainty?: number;
}

/** Options of profileCurve: grid size and span (standard errors), extra fit options. */
export interface ProfileCurveOptions {
  /** Grid points (odd, 5–101; default 15). */
  points?: number;
  /** Half-width of the grid in standard errors (default 3). */
  span?: number;
  /** Extra fit options for the re-fits (e.g. maxEvaluations). */
  fitOptions?: FitOptions;
}

/**
 * Profile curve of free parameter `name` of `result`, over best ± span standard errors
 * (clipped to the parameter's bounds). Costs `points` fits.
 * @param profile and model: the ones the fit used
 */
export function profileCurve(result: FitResult, profile: Profile, model: Model, name: string, options: ProfileCurveOptions = {}): ProfileCurve {
  const parameter = result.parameters.find((p) => p.name === name);
  if (!parameter || !result.freeNames.includes(name)) {
    throw new InvalidArgumentError("parameter", name, `a free parameter of the fit: ${result.freeNames.join(", ")}`);
  }
  if (!(Number.isFinite(parameter.uncertainty) && parameter.uncertainty > 0)) {
    throw new InvalidArgumentError(`${name} standard error`, parameter.uncertainty, "a finite standard error to size the grid (the fit could not estimate one)");
  }
  const points = options.points ?? 15;
  if (!Number.isInteger(points) || points < 5 || points > 101) throw new InvalidArgumentError("points", points, "an integer from 5 to 101");
  const span = options.span ?? 3;
  if (!(span > 0 && span <= 20)) throw new InvalidArgumentError("span", span, "a half-width from 0 to 20 standard errors");
  const lo = Math.max(parameter.value - span * parameter.uncertainty, parameter.lower);
  const hi = Math.min(parameter.value + span * parameter.uncertainty, parameter.upper);
  const base = optionsFromResult(result, model, options.fitOptions);
  const scale = objectiveScale(result);
  const best = result.statistics.objective;
  const values = new Float64Array(points);
  const delta = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    const v = lo + ((hi - lo) * i) / (points - 1);
    values[i] = v;
    const start = { ...base.start };
    delete start[name];
    const free = (base.free ?? []).filter((n) => n !== name);
    const refit = fitProfile(profile, model, { ...base, start, free, fix: { ...(base.fix as Record<string, number>), [name]: v } });
    // A re-fit that fails leaves a gap rather than a wrong point.
    delta[i] = refit.converged ? Math.max(0, (refit.statistics.objective - best) / scale) : NaN;
  }
  return { name, unit: parameter.unit, values, deltaObjective: delta, best: parameter.value, uncertainty: parameter.uncertainty };
}
