/**
 * Re-running a fit with the settings a FitResult was made with (for profile likelihood and
 * bootstrap): fixed and tied parameters, bounds, noise model and σ handling are read back
 * from the result unless options are given.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import type { FitOptions, FitResult, ResolvedFitOptions } from "./types.js";

/** Fit options equivalent to the ones that produced `result`, with every free parameter started at its fitted value. */
export function optionsFromResult(result: FitResult, model: Model, given?: FitOptions): ResolvedFitOptions {
  const fix: Record<string, number> = {};
  const tie: Record<string, string> = {};
  const bounds: Record<string, [number, number]> = {};
  const start: Record<string, number> = {};
  const free: string[] = [];
  for (const p of result.parameters) {
    const spec = model.parameters.find((s) => s.name === p.name);
    if (p.tied !== null) tie[p.name] = p.tied;
    else if (p.fixed) fix[p.name] = p.value;
    else {
      start[p.name] = p.value;
      bounds[p.name] = [p.lower, p.upper];
      if (spec?.fixedByDefault) free.push(p.name);
    }
  }
  // Solver settings the fit recorded (robust scale, tolerance, evaluation limit, …) carry over
  // unless given again; the parameter plan always comes from the result.
  const recorded = result.source?.options ?? {};
  const carried: FitOptions = {};
  for (const key of ["robustScale", "tolerance", "maxEvaluations", "geodesic", "sigmaAbsolute"] as const) {
    if (recorded[key] !== undefined) (carried as Record<string, unknown>)[key] = recorded[key];
  }
  return {
    ...carried,
    ...given,
    fix, tie, bounds, start, free,
    noise: result.noise,
    sigmaAbsolute: given?.sigmaAbsolute ?? carried.sigmaAbsolute ?? (result.noise === "gaussian" ? !result.covarianceScaled : undefined),
    autoStart: false,
  };
}

/** Factor that turns a change of the objective into a change of −2 ln L (1, or 1/s² when σ was scaled). */
export function objectiveScale(result: FitResult): number {
  const s = result.statistics;
  if (result.noise === "poisson") return 1;
  if (result.noise === "robust") return s.dof > 0 ? s.objective / s.dof : 1;
  return result.covarianceScaled ? s.reducedChi2 : 1;
}

/**
 * Refuses refits that cannot reproduce the original objective: a robust fit of data with neither
 * σ nor counts estimated its σ from the residuals, which a refit would not repeat.
 */
export function checkRefittable(result: FitResult, profile: Profile, purpose: string): void {
  if (result.noise === "robust" && !profile.sigma && !profile.counts) {
    throw new InvalidArgumentError(`${purpose} of a robust fit`, "profile without σ or counts",
      "give the profile a σ (profile.sigma) and fit again, or use the covariance of the robust fit");
  }
}
