// Hand-made FitResult objects for testing comparison code without the fitter.
import type { FitResult, NoiseModelId } from "../../src/fit/types.js";
import { goodnessOfFit } from "../../src/fit/goodness.js";

export interface FakeFitSpec {
  modelId: string;
  free: string[];
  /** All parameters with values; those not in `free` are fixed. */
  values: Record<string, number>;
  uncertainty?: Record<string, number>;
  covariance?: number[];
  logLikelihood: number;
  chi2: number;
  n: number;
  residuals?: Float64Array;
  noise?: NoiseModelId;
  converged?: boolean;
}

/** A deterministic uniform generator (mulberry32, common practice) and Gaussian draws by Box–Muller. */
export function seeded(seed: number): { uniform: () => number; normal: () => number } {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  return { uniform, normal };
}

export function fakeFit(spec: FakeFitSpec): FitResult {
  const k = spec.free.length;
  const names = Object.keys(spec.values);
  const covariance = new Float64Array(spec.covariance ?? spec.free.flatMap((a) => spec.free.map((b) => (a === b ? (spec.uncertainty?.[a] ?? 0) ** 2 : 0))));
  const residuals = spec.residuals ?? new Float64Array(spec.n).map((_, i) => (i % 2 ? 1 : -1));
  const lnL = spec.logLikelihood;
  return {
    modelId: spec.modelId,
    noise: spec.noise ?? "gaussian",
    converged: spec.converged ?? true,
    reason: "converged-objective",
    message: "converged",
    iterations: 5,
    evaluations: 6,
    jacobianEvaluations: 5,
    parameters: names.map((name) => ({
      name,
      unit: "1",
      value: spec.values[name],
      uncertainty: spec.free.includes(name) ? (spec.uncertainty?.[name] ?? 0) : 0,
      fixed: !spec.free.includes(name),
      tied: null,
      atBound: null,
      lower: -Infinity,
      upper: Infinity,
    })),
    freeNames: spec.free,
    covariance,
    correlation: new Float64Array(k * k),
    covarianceScaled: false,
    statistics: {
      n: spec.n,
      nFree: k,
      dof: spec.n - k,
      chi2: spec.chi2,
      reducedChi2: spec.chi2 / (spec.n - k),
      objective: spec.chi2,
      logLikelihood: lnL,
      aic: -2 * lnL + 2 * k,
      aicc: NaN,
      bic: NaN,
    },
    warnings: [],
    model: new Float64Array(residuals.length),
    residuals,
    flagged: [],
    goodness: goodnessOfFit(spec.chi2, spec.n - k, false),
  };
}
