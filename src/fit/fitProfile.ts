/**
 * fitProfile: validate → solve → wrap. Fits a model to a profile under a noise model with
 * fixed, tied and bounded parameters, automatic starting values and honest uncertainties.
 */
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { addFitChecks } from "./fitChecks.js";
import { rescaleCandidate, searchStarts, startCandidates, summarizeStarts, type SearchResult } from "./starts/index.js";
import type { SolverOutcome } from "./leastSquares.js";
import { prepareFit, type PreparedFit } from "./preparedFit.js";
import { summarize } from "./summarize.js";
import type { FitOptions, FitResult, FitWarning } from "./types.js";

export { buildProblem, prepareFit, solvePrepared, startVector, usedPoints, type PreparedFit } from "./preparedFit.js";
export { summarize } from "./summarize.js";

/**
 * Fits `model` to `profile`.
 * Method: bounded Levenberg–Marquardt (see leastSquares) on the residuals of the noise model
 * (gaussian χ², Poisson deviance, or soft-L1 robust loss), from automatic starting values
 * (src/fit/starts: candidates for every built-in model, ranked, run until the best optimum is
 * reached from two starts; `result.starts` reports it) unless `start` gives every free parameter.
 * Units: SI throughout (positions m, parameters in their spec units, intensities as in y).
 * A fit that does not converge is returned with converged = false and a reason.
 * @example fitProfile(profile, getModel("two-slit"), { fix: { pixelWidth: 5.5e-6 } })
 * @throws InvalidArgumentError for bad input (unknown names, bad bounds, too few points), before any work
 */
export function fitProfile(profile: Profile, model: Model, options: FitOptions = {}): FitResult {
  return fitWithStarts(profile, model, options, []);
}

/**
 * fitProfile with extra candidate starts tried first (SI values by parameter name, e.g. another
 * model's fit of the same data when comparing models); their amplitude and background are
 * refitted linearly before use, so the other model's meaning of `amplitude` does not matter.
 * The automatic candidates follow (when wanted), and the global stage (starts/search.ts) runs
 * them until the best optimum is confirmed; `result.starts` says how that went.
 */
export function fitWithStarts(profile: Profile, model: Model, options: FitOptions, extra: Record<string, number>[]): FitResult {
  let prep = prepareFit(profile, model, options);
  const warnings: FitWarning[] = [];
  const allGiven = prep.plan.free.every((j) => options.start?.[prep.plan.names[j]] !== undefined);
  const wantAuto = options.autoStart ?? !allGiven;
  const candidates: Record<string, number>[] = extra.map((c) => rescaleCandidate(prep, c).start);
  const methods: string[] = extra.length > 0 ? ["seeded from other fits"] : [];
  if (wantAuto) {
    const plan = startCandidates(prep);
    candidates.push(...plan.candidates);
    if (plan.candidates.length > 0) methods.push(plan.method);
    else if (plan.method !== "none") warnings.push({ code: "no-auto-start", message: `automatic starting values (${plan.method}) found nothing to start from in these data; started from the defaults and the given start` });
    else if (options.autoStart) warnings.push({ code: "no-auto-start", message: `automatic starting values are not available for model ${model.id} (no start heuristic and no free parameter with finite bounds); started from the defaults and the given start` });
  }
  if (candidates.length === 0) {
    candidates.push({});
    methods.push(allGiven ? "given start" : "given start and model defaults");
  }
  const method = methods.join(" + ");

  if (prep.noise.id === "robust" && prep.noise.sigmaSource === "unknown") {
    // σ unknown: a gaussian fit first, then σ from the median absolute deviation of its residuals.
    const gaussian = prepareFit(profile, model, { ...options, noise: "gaussian" });
    const first = searchStarts(gaussian, candidates).best;
    const residuals: number[] = [];
    const fitted = summarize(gaussian, first);
    gaussian.used.forEach((i) => residuals.push(Math.abs(fitted.residuals[i])));
    residuals.sort((a, b) => a - b);
    const sigma = 1.4826 * residuals[Math.floor(residuals.length / 2)] || 1;
    prep = { ...prep, noise: { ...prep.noise, sigma: prep.noise.sigma.map(() => sigma), sigmaSource: "given" } };
    const start: Record<string, number> = {};
    fitted.parameters.forEach((p) => { start[p.name] = p.value; });
    return addFitChecks(prep, withStarts(prep, searchStarts(prep, [start]), warnings, `${method}, then a gaussian fit's optimum`), options);
  }
  // A start the user gave for every free parameter is run as given; automatic or seeded starts
  // are run until the best optimum is confirmed by a second start.
  const automatic = candidates.length > 1 || extra.length > 0 || wantAuto;
  // Checks after the fit (issue 12): data warnings, default geometry, goodness, fringe detection.
  return addFitChecks(prep, withStarts(prep, searchStarts(prep, candidates, automatic), warnings, method), options);
}

/** Summarizes the best outcome and adds `starts` and any "starts-disagree" warning. */
function withStarts(prep: PreparedFit, search: SearchResult, warnings: FitWarning[], method: string): FitResult {
  const result = summarize(prep, search.best, warnings);
  const uncertainty = result.freeNames.map((name) => result.parameters.find((p) => p.name === name)!.uncertainty);
  const { starts, warning } = summarizeStarts(prep, search, uncertainty, method);
  if (warning) result.warnings.push(warning);
  result.starts = starts;
  return result;
}

/**
 * Fits from each candidate start and keeps the converged outcome with the lowest objective.
 * When the noise scale is known (Poisson, or σ absolute), a converged fit whose objective is
 * within 3 standard deviations of its expectation (dof + 3√(2·dof), χ² statistics) ends the
 * search early: a wrong fringe order or phase branch leaves a far larger objective.
 * (No confirmation by a second start: for refits from a known optimum, e.g. bootstrap.)
 */
export function bestOf(prep: PreparedFit, candidates: Record<string, number>[]): SolverOutcome {
  return searchStarts(prep, candidates, false).best;
}
