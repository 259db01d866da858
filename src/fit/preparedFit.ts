/**
 * A validated fit problem (used points, parameter plan, noise settings) and its least-squares
 * form in the free parameters: validation happens here, once, before any work.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { leastSquares, type LeastSquaresProblem, type SolverOutcome } from "./leastSquares.js";
import { noiseResiduals, resolveNoise, type NoiseSetup } from "./noise.js";
import { expandParameters, expansionJacobian, makePlan, type ParameterPlan } from "./parameterPlan.js";
import { resolveFitOptions } from "./optionQuantities.js";
import type { FitOptions, ResolvedFitOptions } from "./types.js";

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
  /** The options with every value in SI numbers (text with units parsed). */
  options: ResolvedFitOptions;
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
export function prepareFit(profile: Profile, model: Model, given: FitOptions = {}, guess: Record<string, number> = {}): PreparedFit {
  if (!model || typeof model.evaluate !== "function" || !Array.isArray(model.parameters)) {
    throw new InvalidArgumentError("model", model, "a Model (getModel(id) or formulaModel(expression))");
  }
  const options = resolveFitOptions(model, given);
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
  // plain loops: Float64Array.from(typed, mapFn) takes a slow generic path (about 1 ms here)
  const x = new Float64Array(used.length), y = new Float64Array(used.length);
  for (let k = 0; k < used.length; k++) { x[k] = profile.x[used[k]]; y[k] = profile.y[used[k]]; }
  return {
    profile, model, plan, noise, used, x, y,
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
    // Only the free parameters' columns are used (all of them when ties mix columns).
    const columns = new Uint8Array(P).fill(plan.ties.length > 0 ? 1 : 0);
    for (const j of plan.free) columns[j] = 1;
    problem.jacobianWritesResiduals = true;
    problem.jacobian = (theta, jac, out) => {
      expandParameters(plan, theta, full);
      modelJacobian(x, full, fullJac, f, columns);
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
