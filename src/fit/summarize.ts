/**
 * From a solver outcome to a FitResult: statistics with the full log-likelihood, covariance
 * (Fisher information for Poisson), warnings, model values and Pearson residuals.
 */
import { covarianceFromJacobian } from "./covariance.js";
import { goodnessOfFit } from "./goodness.js";
import type { SolverOutcome } from "./leastSquares.js";
import { logLikelihood, noiseResiduals } from "./noise.js";
import { expandParameters, expansionJacobian } from "./parameterPlan.js";
import type { PreparedFit } from "./preparedFit.js";
import { STOP_REASONS } from "./status.js";
import type { FitParameter, FitResult, FitWarning } from "./types.js";

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
      name: spec.name, unit: spec.unit, value: full[j], uncertainty: stderr,
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
  const goodness = goodnessOfFit(chi2, dof, ...noiseScaleKnown(prep));
  if (goodness.verdict === "poor") warnings.push({ code: "poor-fit", message: goodness.summary });
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
    goodness,
  };
}

/**
 * Whether the noise scale is known in absolute terms, so that χ² can be tested: Poisson counts,
 * or a gaussian fit with σ from the data (σ column, or √counts) unless the caller declared σ
 * relative (sigmaAbsolute: false). Second element: why not, for the report.
 */
function noiseScaleKnown(prep: PreparedFit): [boolean, string] {
  const { noise } = prep;
  if (noise.id === "poisson") return [true, ""];
  if (noise.id === "robust") return [false, "the robust loss down-weights outliers, so χ² has no reference distribution"];
  if (noise.sigmaSource === "unknown") return [prep.sigmaAbsolute, "the profile has no σ, so the noise scale is unknown (give a σ column or counts)"];
  if (prep.options.sigmaAbsolute === false) return [false, "σ was declared relative (sigmaAbsolute: false)"];
  return [true, ""];
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
