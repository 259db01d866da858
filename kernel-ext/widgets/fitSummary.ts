/** JSON form of a FitResult for widget state (JSON has no Infinity: "cannot be estimated" is null). */
import type { FitResult } from "../../src/fit/types.js";
import type { FitSummary } from "../../widgets/src/fitSummary.js";

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
      name: p.name, unit: p.unit, value: p.value, stderr: p.fixed ? 0 : finiteOrNull(p.stderr), fixed: p.fixed, atBound: p.atBound,
    })),
    statistics: {
      n: s.n, nFree: s.nFree, dof: s.dof,
      chi2: finiteOrNull(s.chi2) ?? NaN, reducedChi2: finiteOrNull(s.reducedChi2) ?? NaN,
      aic: finiteOrNull(s.aic) ?? NaN, bic: finiteOrNull(s.bic) ?? NaN,
    },
    warnings: result.warnings.map((w) => ({ code: w.code, message: w.message, ...(w.parameter ? { parameter: w.parameter } : {}) })),
  };
}
