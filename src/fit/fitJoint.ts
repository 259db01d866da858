/**
 * Joint fits: several profiles, each with its own model and noise model, fitted together with
 * some parameters shared (same slits at several wavelengths, same source at several separations).
 * The objective is the sum of the datasets' objectives; the solver vector holds each shared
 * parameter once, then every dataset's own free parameters.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { autoStartCandidates, supportsAutoStart } from "./autoStart.js";
import { covarianceFromJacobian } from "./covariance.js";
import { buildProblem, fitProfile, prepareFit, summarize, type PreparedFit } from "./fitProfile.js";
import { leastSquares, type LeastSquaresProblem } from "./leastSquares.js";
import { noiseResiduals } from "./noise.js";
import { STOP_REASONS } from "./status.js";
import type { FitOptions, FitResult, NoiseModelId, StopReason } from "./types.js";

/** One dataset of a joint fit. */
export interface JointDataset {
  profile: Profile;
  model: Model;
  /** Parameters fixed in this dataset only (e.g. its wavelength). */
  fix?: Record<string, number> | string[];
  start?: Record<string, number>;
  noise?: NoiseModelId | "auto";
}

/** Result of {@link fitJoint}: joint status, covariance and per-dataset results. */
export interface JointFitResult {
  converged: boolean;
  reason: StopReason;
  message: string;
  evaluations: number;
  /** Shared parameter names, in the order of the first rows of `covariance`. */
  shared: string[];
  /** Names of all joint free parameters: shared ones, then "name[d]" for dataset d's own. */
  freeNames: string[];
  /** Covariance of all joint free parameters (SI²), each dataset's rows weighted by its own σ scale. */
  covariance: Float64Array;
  /** Per dataset: a FitResult whose uncertainties come from the joint covariance. */
  results: FitResult[];
  /** Summed statistics: objective, χ², log-likelihood and criteria over all datasets. */
  statistics: FitResult["statistics"];
}

/**
 * Fit several profiles together with the `shared` parameters common to all.
 * Units: SI (each model's parameter units). Per-dataset options override `options` (fix, start, noise).
 * @example fitJoint([{ profile: red, model, fix: { wavelength: 632.8e-9 } }, { profile: green, model, fix: { wavelength: 532e-9 } }], ["separation", "width"])
 */
export function fitJoint(datasets: JointDataset[], shared: string[], options: FitOptions = {}): JointFitResult {
  if (!Array.isArray(datasets) || datasets.length === 0) throw new InvalidArgumentError("datasets", datasets, "a non-empty array of { profile, model }");
  for (const name of shared) {
    datasets.forEach((d, i) => {
      if (!d.model.parameters.some((p) => p.name === name)) throw new InvalidArgumentError(`shared parameter of dataset ${i}`, name, `a parameter of model ${d.model.id}`);
    });
  }
  // Each dataset alone first: validation, and starting values (automatic where possible).
  const preps: PreparedFit[] = datasets.map((d, i) => {
    const merged: FitOptions = { ...options, fix: d.fix ?? options.fix, start: { ...options.start, ...d.start }, noise: d.noise ?? options.noise };
    let guess: Record<string, number> = {};
    if ((options.autoStart ?? true) && supportsAutoStart(d.model)) {
      const probe = prepareFit(d.profile, d.model, merged);
      const value = (name: string): number => probe.plan.base[probe.plan.names.indexOf(name)];
      guess = autoStartCandidates(probe.x, probe.y, value("wavelength"), value("distance"), false, 1, probe.plan.names.includes("separation"))[0] ?? {};
    }
    const prep = prepareFit(d.profile, d.model, merged, guess);
    if (prep.noise.id === "robust" && prep.noise.sigmaSource === "unknown") {
      throw new InvalidArgumentError(`noise of dataset ${i}`, "robust", "a profile with σ or counts for robust noise in a joint fit (σ cannot be estimated jointly)");
    }
    for (const name of shared) {
      const j = prep.plan.names.indexOf(name);
      if (!prep.plan.free.includes(j)) throw new InvalidArgumentError(`shared parameter ${name} in dataset ${i}`, "fixed or tied", "free in every dataset (remove it from fix/tie)");
    }
    return prep;
  });
  // Shared starting values: the mean over datasets of each dataset's own quick fit.
  const singles = preps.map((prep, i) => fitProfile(datasets[i].profile, datasets[i].model,
    { ...prep.options, start: Object.fromEntries(prep.plan.names.map((nm, j) => [nm, prep.plan.base[j]])), autoStart: false, onProgress: undefined }));

  // Joint vector layout.
  const columns: number[][] = preps.map((prep) => prep.plan.free.map((j) => {
    const s = shared.indexOf(prep.plan.names[j]);
    return s; // shared index, or −1 for own (filled below)
  }));
  const freeNames = [...shared];
  const lower: number[] = shared.map((name) => Math.max(...preps.map((p) => p.plan.lower[p.plan.free.indexOf(p.plan.names.indexOf(name))])));
  const upper: number[] = shared.map((name) => Math.min(...preps.map((p) => p.plan.upper[p.plan.free.indexOf(p.plan.names.indexOf(name))])));
  const start: number[] = shared.map((name) => singles.reduce((sum, r) => sum + r.parameters.find((p) => p.name === name)!.value, 0) / singles.length);
  preps.forEach((prep, d) => {
    prep.plan.free.forEach((j, k) => {
      if (columns[d][k] >= 0) return;
      columns[d][k] = freeNames.length;
      freeNames.push(`${prep.plan.names[j]}[${d}]`);
      lower.push(prep.plan.lower[k]); upper.push(prep.plan.upper[k]);
      start.push(singles[d].parameters[j].value);
    });
  });
  const q = freeNames.length;
  const problems = preps.map((prep) => buildProblem(prep));
  const offsets: number[] = [];
  let n = 0;
  for (const prep of preps) { offsets.push(n); n += prep.x.length; }
  const thetas = preps.map((prep) => new Float64Array(prep.plan.free.length));
  const buffers = preps.map((prep) => new Float64Array(prep.x.length));
  const jacobians = preps.map((prep) => new Float64Array(prep.x.length * prep.plan.free.length));
  const scatter = (theta: Float64Array): void => {
    thetas.forEach((t, d) => { for (let k = 0; k < t.length; k++) t[k] = theta[columns[d][k]]; });
  };
  const problem: LeastSquaresProblem = {
    n, p: q,
    residuals(theta, out) {
      scatter(theta);
      problems.forEach((pr, d) => { pr.residuals(thetas[d], buffers[d]); out.set(buffers[d], offsets[d]); });
    },
  };
  if (problems.every((pr) => pr.jacobian)) {
    problem.jacobian = (theta, jac) => {
      scatter(theta);
      jac.fill(0);
      problems.forEach((pr, d) => {
        pr.jacobian!(thetas[d], jacobians[d]);
        const local = thetas[d].length;
        for (let i = 0; i < buffers[d].length; i++) {
          for (let k = 0; k < local; k++) jac[(offsets[d] + i) * q + columns[d][k]] += jacobians[d][i * local + k];
        }
      });
    };
  }
  const outcome = leastSquares(problem, Float64Array.from(start), {
    lower: Float64Array.from(lower), upper: Float64Array.from(upper),
    maxEvaluations: options.maxEvaluations ?? 200 * (q + 1),
    ftol: options.tolerance ?? 1e-10, xtol: options.tolerance ?? 1e-10, gtol: options.tolerance ?? 1e-10,
    geodesic: options.geodesic ?? false,
    onProgress: options.onProgress ? (s) => options.onProgress!({ iteration: s.iteration, evaluations: s.evaluations, objective: s.cost }) : undefined,
    signal: options.signal,
  });

  // Per-dataset summaries from the joint solution, then the joint covariance.
  scatter(outcome.x);
  const results = preps.map((prep, d) => {
    const local = thetas[d].length, rows = prep.x.length;
    const jac = new Float64Array(rows * local);
    for (let i = 0; i < rows; i++) for (let k = 0; k < local; k++) jac[i * local + k] = outcome.jacobian[(offsets[d] + i) * q + columns[d][k]];
    const r = new Float64Array(rows);
    problems[d].residuals(thetas[d], r);
    let cost = 0;
    for (const v of r) cost += v * v;
    return summarize(prep, { ...outcome, x: Float64Array.from(thetas[d]), residuals: r, jacobian: jac, cost });
  });
  // Fisher rows: Poisson rows as ∂f/∂θ/√f, gaussian rows divided by the dataset's σ scale when scaled.
  const weighted = Float64Array.from(outcome.jacobian);
  preps.forEach((prep, d) => {
    const res = results[d];
    const rows = prep.x.length;
    const factor = new Float64Array(rows).fill(1);
    if (prep.noise.id === "poisson") {
      const f = Float64Array.from(prep.used, (i) => res.model[i]);
      const drdf = new Float64Array(rows), scratch = new Float64Array(rows);
      noiseResiduals(prep.noise, prep.y, f, scratch, drdf);
      for (let i = 0; i < rows; i++) factor[i] = drdf[i] !== 0 && Number.isFinite(drdf[i]) ? 1 / (drdf[i] * Math.sqrt(f[i])) : 0;
    } else if (res.covarianceScaled) {
      const s2 = prep.noise.id === "robust" ? res.statistics.objective / res.statistics.dof : res.statistics.reducedChi2;
      factor.fill(1 / Math.sqrt(s2));
    }
    for (let i = 0; i < rows; i++) for (let k = 0; k < q; k++) weighted[(offsets[d] + i) * q + k] *= factor[i];
  });
  const cov = covarianceFromJacobian(weighted, n, q, 1, freeNames);
  preps.forEach((prep, d) => {
    const res = results[d], local = thetas[d].length;
    const block = new Float64Array(local * local);
    for (let a = 0; a < local; a++) for (let b = 0; b < local; b++) block[a * local + b] = cov.covariance[columns[d][a] * q + columns[d][b]];
    res.covariance = block;
    res.freeNames.forEach((name, k) => {
      const p = res.parameters.find((x) => x.name === name)!;
      p.uncertainty = cov.stderr[columns[d][k]];
    });
    for (let a = 0; a < local; a++) for (let b = 0; b < local; b++) {
      const sa = Math.sqrt(block[a * local + a]), sb = Math.sqrt(block[b * local + b]);
      res.correlation[a * local + b] = sa > 0 && sb > 0 ? block[a * local + b] / (sa * sb) : a === b ? 1 : NaN;
    }
  });
  const sum = (pick: (r: FitResult) => number): number => results.reduce((s, r) => s + pick(r), 0);
  const ll = sum((r) => r.statistics.logLikelihood);
  const info = STOP_REASONS[outcome.reason];
  return {
    converged: info.converged, reason: outcome.reason, message: info.message, evaluations: outcome.evaluations,
    shared, freeNames, covariance: cov.covariance, results,
    statistics: {
      n, nFree: q, dof: n - q, chi2: sum((r) => r.statistics.chi2), reducedChi2: sum((r) => r.statistics.chi2) / (n - q),
      objective: outcome.cost, logLikelihood: ll, aic: -2 * ll + 2 * q,
      aicc: n - q - 1 > 0 ? -2 * ll + 2 * q + (2 * q * (q + 1)) / (n - q - 1) : Infinity, bic: -2 * ll + q * Math.log(n),
    },
  };
}
