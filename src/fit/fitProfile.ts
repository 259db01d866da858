/**
 * fitProfile: validate → solve → wrap. Fits a model to a profile under a noise model with
 * fixed, tied and bounded parameters, automatic starting values and honest uncertainties.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { autoStartCandidates, supportsAutoStart } from "./autoStart.js";
import { covarianceFromJacobian } from "./covariance.js";
import { leastSquares, type LeastSquaresProblem, type SolverOutcome } from "./leastSquares.js";
import { logLikelihood, noiseResiduals, resolveNoise, type NoiseSetup } from "./noise.js";
import { expandParameters, expansionJacobian, makePlan, type ParameterPlan } from "./parameterPlan.js";
import { STOP_REASONS } from "./status.js";
import type { FitOptions, FitParameter, FitResult, FitWarning } from "./types.js";

/** A validated fit problem: the used points, the parameter plan and the noise settings. */
export interface PreparedFit {
  profile: Profile;
  model: Model;
  plan: ParameterPlan;
  noise: NoiseSetup;
  /** Indices of the used (unmasked) points. */
  used: Int32Array;
  x: Float64Array;
  y: Float64Array;
  sigmaAbsolute: boolean;
  options: FitOptions;
}

/** Checks the profile and returns the indices of the points with mask = 1. */
export function usedPoints(profile: Profile): Int32Array {
  const { x, y, mask } = profile;
  if (!(x instanceof Float64Array) || !(y instanceof Float64Array)) throw new InvalidArgumentError("profile.x/y", typeof x, "Float64Arrays of positions (m) and intensities");
  if (x.length !== y.length) throw new InvalidArgumentError("profile.y", `${y.length} values`, `the same length as profile.x (${x.length})`);
  if (mask && mask.length !== x.length) throw new InvalidArgumentError("profile.mask", `${mask.length} values`, `the same length as profile.x (${x.length})`);
  if (profile.sigma && profile.sigma.length !== x.length) throw new InvalidArgumentError("profile.sigma", `${profile.sigma.length} values`, `the same length as profile.x (${x.length})`);
  const list: number[] = [];
  for (let i = 0; i < x.length; i++) {
    if (mask && mask[i] === 0) continue;
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) {
      throw new InvalidArgumentError(`profile point ${i}`, `x = ${x[i]}, y = ${y[i]}`, "finite values; set mask[i] = 0 to exclude the point");
    }
    list.push(i);
  }
  return Int32Array.from(list);
}

/** Validates everything and builds the problem description (no fitting yet). */
export function prepareFit(profile: Profile, model: Model, options: FitOptions = {}, guess: Record<string, number> = {}): PreparedFit {
  if (!model || typeof model.evaluate !== "function" || !Array.isArray(model.parameters)) {
    throw new InvalidArgumentError("model", model, "a Model (getModel(id) or formulaModel(expression))");
  }
  const used = usedPoints(profile);
  const plan = makePlan(model, options, guess);
  if (used.length <= plan.free.length) {
    throw new InvalidArgumentError("profile", `${used.length} used points`, `more points than the ${plan.free.length} free parameters; unmask points or fix parameters`);
  }
  const noise = resolveNoise(profile, used, options.noise, options.robustScale);
  if (options.tolerance !== undefined && !(options.tolerance > 0 && options.tolerance < 1)) {
    throw new InvalidArgumentError("tolerance", options.tolerance, "a relative tolerance between 0 and 1, e.g. 1e-10");
  }
  if (options.maxEvaluations !== undefined && !(Number.isInteger(options.maxEvaluations) && options.maxEvaluations > 0)) {
    throw new InvalidArgumentError("maxEvaluations", options.maxEvaluations, "a positive integer");
  }
  return {
    profile, model, plan, noise, used,
    x: Float64Array.from(used, (i) => profile.x[i]),
    y: Float64Array.from(used, (i) => profile.y[i]),
    sigmaAbsolute: options.sigmaAbsolute ?? false,
    options,
  };
}

/** The least-squares problem of a prepared fit, in the free parameters θ. */
export function buildProblem(prep: PreparedFit): LeastSquaresProblem {
  const { model, plan, noise, x, y } = prep;
  const n = x.length, q = plan.free.length, P = plan.names.length;
  const full = new Float64Array(P), f = new Float64Array(n), drdf = new Float64Array(n);
  const problem: LeastSquaresProblem = {
    n, p: q,
    residuals(theta, out) {
      expandParameters(plan, theta, full);
      model.evaluate(x, full, f);
      noiseResiduals(noise, y, f, out);
    },
  };
  if (model.jacobian) {
    const fullJac = new Float64Array(n * P), expansion = new Float64Array(P * q), scratch = new Float64Array(n);
    const modelJacobian = model.jacobian.bind(model);
    problem.jacobianWritesResiduals = true;
    problem.jacobian = (theta, jac, out) => {
      expandParameters(plan, theta, full);
      modelJacobian(x, full, fullJac, f);
      noiseResiduals(noise, y, f, out ?? scratch, drdf);
      if (plan.ties.length === 0) {
        for (let i = 0; i < n; i++) {
          const d = drdf[i], row = i * P;
          for (let k = 0; k < q; k++) jac[i * q + k] = d * fullJac[row + plan.free[k]];
        }
        return;
      }
      expansionJacobian(plan, full, expansion);
      for (let i = 0; i < n; i++) {
        const d = drdf[i], row = i * P;
        for (let k = 0; k < q; k++) {
          let s = 0;
          for (let j = 0; j < P; j++) { const e = expansion[j * q + k]; if (e !== 0) s += fullJac[row + j] * e; }
          jac[i * q + k] = d * s;
        }
      }
    };
  }
  return problem;
}

/** Typical magnitudes of the free parameters, for numerical differentiation steps. */
function typicalScales(prep: PreparedFit, theta: Float64Array): Float64Array {
  const span = prep.x.length > 1 ? Math.abs(prep.x[prep.x.length - 1] - prep.x[0]) : 1;
  return Float64Array.from(prep.plan.free, (j, k) => {
    const spec = prep.model.parameters[j];
    const magnitude = Math.max(Math.abs(theta[k]), Math.abs(spec.default));
    if (magnitude > 0) return magnitude;
    return spec.unit === "m" ? 1e-3 * span : 1;
  });
}

/** Runs the solver from θ₀ with the fit's options. */
export function solvePrepared(prep: PreparedFit, theta0: Float64Array, overrides: { maxEvaluations?: number } = {}): SolverOutcome {
  const problem = buildProblem(prep);
  const { onProgress, signal } = prep.options;
  return leastSquares(problem, theta0, {
    lower: prep.plan.lower, upper: prep.plan.upper,
    maxEvaluations: overrides.maxEvaluations ?? prep.options.maxEvaluations ?? 200 * (prep.plan.free.length + 1),
    // Relative tolerances far below the statistical precision (a change of 1e-10·χ² is ≪ 1),
    // without iterating to machine precision; geodesic acceleration off: on fringe fits it
    // costs an evaluation per iteration and the multi-start already guards the start.
    ftol: prep.options.tolerance ?? 1e-10, xtol: prep.options.tolerance ?? 1e-10, gtol: prep.options.tolerance ?? 1e-10,
    geodesic: prep.options.geodesic ?? false,
    typical: typicalScales(prep, theta0),
    onProgress: onProgress ? (s) => onProgress({ iteration: s.iteration, evaluations: s.evaluations, objective: s.cost }) : undefined,
    signal,
  });
}

/** Free-parameter start vector from a full-parameter record, clipped into the bounds; user start wins. */
export function startVector(prep: PreparedFit, candidate: Record<string, number> = {}): Float64Array {
  return Float64Array.from(prep.plan.free, (j, k) => {
    const name = prep.plan.names[j];
    const given = prep.options.start?.[name];
    const value = given ?? (Number.isFinite(candidate[name]) ? candidate[name] : prep.plan.base[j]);
    return Math.min(prep.plan.upper[k], Math.max(prep.plan.lower[k], value));
  });
}

/** Turns a solver outcome into a FitResult (statistics, covariance, warnings, residuals). */
export function summarize(prep: PreparedFit, outcome: SolverOutcome, extraWarnings: FitWarning[] = []): FitResult {
  const { model, plan, noise, x, y, profile } = prep;
  const n = x.length, q = plan.free.length, P = plan.names.length;
  const full = new Float64Array(P);
  expandParameters(plan, outcome.x, full);
  const f = new Float64Array(n);
  model.evaluate(x, full, f);
  let chi2 = 0;
  const pearsonSigma = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    pearsonSigma[i] = noise.id === "poisson" ? Math.sqrt(Math.max(f[i], 1e-300)) : noise.sigma[i];
    chi2 += ((y[i] - f[i]) / pearsonSigma[i]) ** 2;
  }
  const objective = outcome.cost;
  const dof = n - q;
  const reducedChi2 = dof > 0 ? chi2 / dof : NaN;
  const warnings: FitWarning[] = [...extraWarnings];
  const info = STOP_REASONS[outcome.reason];

  // Jacobian for the covariance: Fisher information for Poisson (∂f/∂θ / √f), else the solver's.
  const jac = Float64Array.from(outcome.jacobian);
  if (noise.id === "poisson") {
    const drdf = new Float64Array(n), scratch = new Float64Array(n);
    noiseResiduals(noise, y, f, scratch, drdf);
    for (let i = 0; i < n; i++) {
      const factor = drdf[i] !== 0 && Number.isFinite(drdf[i]) ? 1 / (drdf[i] * Math.sqrt(f[i])) : 0;
      for (let k = 0; k < q; k++) jac[i * q + k] *= factor;
    }
  }
  const scaled = noise.id === "robust" || (noise.id === "gaussian" && !prep.sigmaAbsolute);
  const scale = noise.id === "robust" ? objective / dof : scaled ? reducedChi2 : 1;
  const freeNames = plan.free.map((j) => plan.names[j]);
  const cov = covarianceFromJacobian(jac, n, q, Number.isFinite(scale) ? scale : 1, freeNames);
  warnings.push(...cov.warnings);
  if (!info.converged) warnings.push({ code: "not-converged", message: `the fit did not converge: ${info.message}` });
  if (outcome.nonFiniteTrials > 0) warnings.push({ code: "non-finite-model", message: `the model or objective was non-finite at ${outcome.nonFiniteTrials} trial point(s); those steps were rejected (consider bounds that keep the model finite)` });
  if (outcome.nonFiniteJacobian) warnings.push({ code: "non-finite-model", message: "the model or its derivatives were non-finite at some points; those derivatives were taken as 0" });
  if (noise.id === "gaussian" && noise.sigmaSource === "unknown" && prep.sigmaAbsolute) {
    warnings.push({ code: "sigma-unknown", message: "sigmaAbsolute is set but the profile has no σ and no counts: σ = 1 was used" });
  }

  const parameters: FitParameter[] = model.parameters.map((spec, j) => {
    const k = plan.free.indexOf(j);
    let atBound: FitParameter["atBound"] = null;
    if (k >= 0) {
      if (full[j] <= plan.lower[k]) atBound = "lower";
      else if (full[j] >= plan.upper[k]) atBound = "upper";
      if (atBound) warnings.push({ code: "at-bound", parameter: spec.name, message: `${spec.name} = ${full[j]} ${spec.unit} sits on its ${atBound} bound; its uncertainty assumes the bound is not active` });
    }
    let stderr = 0;
    if (k >= 0) stderr = cov.stderr[k];
    else if (plan.tiedExpression[j] !== null) stderr = tiedStderr(prep, full, j, cov.covariance);
    return {
      name: spec.name, unit: spec.unit, value: full[j], stderr,
      fixed: k < 0 && plan.tiedExpression[j] === null, tied: plan.tiedExpression[j],
      atBound, lower: k >= 0 ? plan.lower[k] : spec.lower, upper: k >= 0 ? plan.upper[k] : spec.upper,
    };
  });

  // Model at every profile point, Pearson residuals at used points.
  const modelAll = new Float64Array(profile.x.length);
  if (prep.used.length === profile.x.length) modelAll.set(f);
  else model.evaluate(profile.x, full, modelAll);
  const residuals = new Float64Array(profile.x.length).fill(NaN);
  prep.used.forEach((i, k) => { residuals[i] = (y[k] - f[k]) / pearsonSigma[k]; });
  const flagged: number[] = [];
  if (noise.id === "robust") {
    prep.used.forEach((i, k) => { if (Math.abs(y[k] - f[k]) / noise.sigma[k] > 5) flagged.push(i); });
    if (flagged.length > 0) warnings.push({ code: "outliers-flagged", message: `${flagged.length} point(s) deviate by more than 5σ and were down-weighted by the robust loss` });
  }
  const ll = logLikelihood(noise, y, f, objective, chi2, prep.sigmaAbsolute);
  const k = q;
  return {
    modelId: model.id,
    noise: noise.id,
    converged: info.converged,
    reason: outcome.reason,
    message: info.message,
    iterations: outcome.iterations,
    evaluations: outcome.evaluations,
    jacobianEvaluations: outcome.jacobianEvaluations,
    parameters,
    freeNames,
    covariance: cov.covariance,
    correlation: cov.correlation,
    covarianceScaled: scaled,
    statistics: {
      n, nFree: q, dof, chi2, reducedChi2, objective, logLikelihood: ll,
      aic: -2 * ll + 2 * k,
      aicc: n - k - 1 > 0 ? -2 * ll + 2 * k + (2 * k * (k + 1)) / (n - k - 1) : Infinity,
      bic: -2 * ll + k * Math.log(n),
    },
    warnings,
    model: modelAll,
    residuals,
    flagged,
  };
}

/** Standard error of a tied parameter by the delta method through its tie expression. */
function tiedStderr(prep: PreparedFit, full: Float64Array, index: number, covariance: Float64Array): number {
  const q = prep.plan.free.length, P = prep.plan.names.length;
  const expansion = new Float64Array(P * q);
  expansionJacobian(prep.plan, Float64Array.from(full), expansion);
  let variance = 0;
  for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) variance += expansion[index * q + a] * covariance[a * q + b] * expansion[index * q + b];
  return Math.sqrt(variance);
}

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
    return summarize(prep, bestOf(prep, [start]), warnings);
  }
  return summarize(prep, bestOf(prep, candidates), warnings);
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
