/**
 * The JSON object `fringekit fit --json` prints: values in SI units; an uncertainty that could
 * not be estimated (Infinity) is written as null because JSON has no infinity.
 */
import type { FitResult, Provenance } from "../src/advanced.js";
import type { AssumedDefault } from "./fitSettings.js";

/** The documented shape of `fringekit fit --json`. */
export interface FitJson {
  model: string;
  converged: boolean;
  reason: string;
  params: Record<string, { value: number; uncertainty: number | null; unit: string; fixed: boolean }>;
  stats: { n: number; dof: number; chi2: number; reducedChi2: number; logLikelihood: number; aic: number; aicc: number; bic: number };
  warnings: { code: string; message: string; parameter?: string }[];
  /** The goodness-of-fit test (fit/goodness): verdict, χ²/ν, p-value (null when not tested), thresholds, fringe detection. */
  goodness: Record<string, unknown> | null;
  provenance: Provenance | null;
}

/**
 * Builds the JSON object of a fit.
 * @param result     the fit
 * @param provenance where the data came from
 * @param dataWarnings warnings met while reading the data
 * @param assumed    parameters held at model defaults the user did not give (see assumedDefaults)
 */
export function fitJson(result: FitResult, provenance: Provenance | undefined, dataWarnings: readonly string[], assumed: readonly AssumedDefault[] = []): FitJson {
  const params: FitJson["params"] = {};
  for (const p of result.parameters) params[p.name] = { value: p.value, uncertainty: Number.isFinite(p.uncertainty) ? p.uncertainty : null, unit: p.unit, fixed: p.fixed };
  const s = result.statistics;
  return {
    model: result.modelId,
    converged: result.converged,
    reason: result.reason,
    params,
    stats: { n: s.n, dof: s.dof, chi2: s.chi2, reducedChi2: s.reducedChi2, logLikelihood: s.logLikelihood, aic: s.aic, aicc: s.aicc, bic: s.bic },
    warnings: [...dataWarnings.map((message) => ({ code: "data", message })), ...assumed.map((a) => ({ code: a.code, message: a.message, parameter: a.parameter })), ...result.warnings.map((w) => ({ ...w }))],
    goodness: result.goodness ? JSON.parse(JSON.stringify(result.goodness, (_key, value) => (typeof value === "number" && !Number.isFinite(value) ? null : value))) as Record<string, unknown> : null,
    provenance: provenance ?? null,
  };
}
