import type { FitResult } from "../../src/fit/types.js";

/**
 * The JSON form of a fit result that widgets carry in their state (no typed arrays, no
 * Infinity: JSON cannot hold it, so "cannot be estimated" travels as null).
 */

export interface SummaryParameter {
  name: string;
  unit: string;
  value: number;
  /** Standard uncertainty (SI); null when it cannot be estimated. */
  uncertainty: number | null;
  fixed: boolean;
  atBound: "lower" | "upper" | null;
}

export interface FitSummary {
  modelId: string;
  noise: string;
  converged: boolean;
  reason: string;
  message: string;
  iterations: number;
  parameters: SummaryParameter[];
  statistics: {
    n: number;
    nFree: number;
    dof: number;
    chi2: number;
    reducedChi2: number;
    aic: number;
    bic: number;
  };
  warnings: { code: string; message: string; parameter?: string }[];
}

const finiteOrNull = (value: number): number | null => (Number.isFinite(value) ? value : null);

/** The parts of `result` the widgets show: values ± standard uncertainties (SI), statistics, warnings. */
export function fitSummary(result: FitResult): FitSummary {
  const s = result.statistics;
  return {
    modelId: result.modelId,
    noise: result.noise,
    converged: result.converged,
    reason: result.reason,
    message: result.message,
    iterations: result.iterations,
    parameters: result.parameters.map((p) => ({
      name: p.name, unit: p.unit, value: p.value, uncertainty: p.fixed ? 0 : finiteOrNull(p.uncertainty), fixed: p.fixed, atBound: p.atBound,
    })),
    statistics: {
      n: s.n, nFree: s.nFree, dof: s.dof,
      chi2: finiteOrNull(s.chi2) ?? NaN, reducedChi2: finiteOrNull(s.reducedChi2) ?? NaN,
      aic: finiteOrNull(s.aic) ?? NaN, bic: finiteOrNull(s.bic) ?? NaN,
    },
    warnings: result.warnings.map((w) => ({ code: w.code, message: w.message, ...(w.parameter ? { parameter: w.parameter } : {}) })),
  };
}
