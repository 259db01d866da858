/**
 * fitProfile: validate → solve → wrap. Fits a model to a profile under a noise model with
 * fixed, tied and bounded parameters, automatic starting values and honest uncertainties.
 */
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { autoStartCandidates, supportsAutoStart } from "./autoStart.js";
import { addFitChecks } from "./fitChecks.js";
import type { SolverOutcome } from "./leastSquares.js";
import { prepareFit, solvePrepared, startVector, type PreparedFit } from "./preparedFit.js";
import { STOP_REASONS } from "./status.js";
import { summarize } from "./summarize.js";
import type { FitOptions, FitResult, FitWarning } from "./types.js";

export { buildProblem, prepareFit, solvePrepared, startVector, usedPoints, type PreparedFit } from "./preparedFit.js";
export { summarize } from "./summarize.js";

/**
 * Fits `model` to `profile`.
 * Method: bounded Levenberg–Marquardt (see leastSquares) on the residuals of the noise model
 * (gaussian χ², Poisson deviance, or soft-L1 robust loss), from automatic starting values
 * (a few candidates, best objective kept) unless `start` gives every free parameter.
 * Units: SI throughout (positions m, parameters in their spec units, intensities as in y).
 * A fit that does not converge is returned with converged = false and a reason.
 * @example fitProfile(profile, getModel("two-slit"), { fix: { pixelWidth: 5.5e-6 } })
 * @throws InvalidArgumentError for bad input (unknown names, bad bounds, too few points), before any work
 */
export function fitProfile(profile: Profile, model: Model, options: FitOptions = {}): FitResult {
  let prep = prepareFit(profile, model, options);
  const candidates: Record<string, number>[] = [];
  const warnings: FitWarning[] = [];
  const allGiven = prep.plan.free.every((j) => options.start?.[prep.plan.names[j]] !== undefined);
  const wantAuto = options.autoStart ?? !allGiven;
  if (wantAuto) {
    if (supportsAutoStart(model)) {
      const value = (name: string): number => prep.plan.base[prep.plan.names.indexOf(name)];
      const fringes = prep.plan.names.includes("separation");
      candidates.push(...autoStartCandidates(prep.x, prep.y, value("wavelength"), value("distance"), false, 3, fringes));
      if (candidates.length === 0) warnings.push({ code: "no-auto-start", message: "no fringes found in the spectrum for automatic starting values; started from the defaults and the given start" });
    } else if (options.autoStart) {
      warnings.push({ code: "no-auto-start", message: `automatic starting values are not available for model ${model.id}; started from the defaults and the given start` });
    }
  }
  if (candidates.length === 0) candidates.push({});

  if (prep.noise.id === "robust" && prep.noise.sigmaSource === "unknown") {
    // σ unknown: a gaussian fit first, then σ from the median absolute deviation of its residuals.
    const gaussian = prepareFit(profile, model, { ...options, noise: "gaussian" });
    const first = bestOf(gaussian, candidates);
    const residuals: number[] = [];
    const fitted = summarize(gaussian, first);
    gaussian.used.forEach((i) => residuals.push(Math.abs(fitted.residuals[i])));
    residuals.sort((a, b) => a - b);
    const sigma = 1.4826 * residuals[Math.floor(residuals.length / 2)] || 1;
    prep = { ...prep, noise: { ...prep.noise, sigma: prep.noise.sigma.map(() => sigma), sigmaSource: "given" } };
    const start: Record<string, number> = {};
    fitted.parameters.forEach((p) => { start[p.name] = p.value; });
    return addFitChecks(prep, summarize(prep, bestOf(prep, [start]), warnings), options);
  }
  // Checks after the fit (issue 12): data warnings, default geometry, fringe detection.
  return addFitChecks(prep, summarize(prep, bestOf(prep, candidates), warnings), options);
}

/**
 * Fits from each candidate start and keeps the converged outcome with the lowest objective.
 * When the noise scale is known (Poisson, or σ absolute), a converged fit whose objective is
 * within 5 standard deviations of its expectation (dof ± 5√(2·dof), χ² statistics) ends the
 * search early: a wrong fringe order or phase branch leaves a far larger objective.
 */
export function bestOf(prep: PreparedFit, candidates: Record<string, number>[]): SolverOutcome {
  let best: SolverOutcome | null = null;
  const dof = prep.x.length - prep.plan.free.length;
  const knownScale = prep.noise.id === "poisson" || (prep.noise.id === "gaussian" && prep.sigmaAbsolute && prep.noise.sigmaSource !== "unknown");
  for (const candidate of candidates) {
    const outcome = solvePrepared(prep, startVector(prep, candidate));
    if (outcome.reason === "cancelled") return outcome;
    if (knownScale && STOP_REASONS[outcome.reason].converged && outcome.cost <= dof + 5 * Math.sqrt(2 * dof)) {
      if (best === null || outcome.cost < best.cost || !STOP_REASONS[best.reason].converged) return outcome;
    }
    const better = best === null
      || (STOP_REASONS[outcome.reason].converged && !STOP_REASONS[best.reason].converged)
      || (STOP_REASONS[outcome.reason].converged === STOP_REASONS[best.reason].converged && outcome.cost < best.cost);
    if (better) best = outcome;
  }
  return best!;
}
