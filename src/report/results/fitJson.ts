/**
 * The one JSON shape of a fit: what `fringekit fit --json` prints, what the widgets carry in
 * their state, and what a results document records for each fit. Parameters are keyed by name,
 * as `fit.params` reads them; every number is SI. JSON has no infinity, so a number that is not
 * finite (an uncertainty that could not be estimated is Infinity) is written
 * {"nonFinite": "Infinity"} exactly as everywhere else in results files (see encodeNumber).
 * The summary leaves out what only a replay needs (covariance, model curve, residuals, bounds);
 * the full form, written into results documents, keeps every field of the FitResult.
 * readFitJson reads this shape and the shapes written before it (`parameters` lists, `stats`).
 */
import { DataError } from "../../errors.js";
import type { FitParameter, FitResult, FitStatistics, FitWarning } from "../../fit/types.js";
import { decodeJson, encodeJson, encodeNumber } from "./arrays.js";

/** A number in JSON: itself when finite, else {"nonFinite": "NaN" | "Infinity" | "-Infinity"}. */
export type JsonNumber = number | { nonFinite: string };

/** One parameter in the JSON of a fit (SI); the name is the key it is stored under. */
export interface ParamJson {
  value: JsonNumber;
  /** Standard uncertainty (SI); 0 when fixed, {"nonFinite": "Infinity"} when it cannot be estimated. */
  uncertainty: JsonNumber;
  unit: string;
  fixed: boolean;
  atBound: "lower" | "upper" | null;
  /** Full form only: tie expression and bounds (SI). */
  tied?: string | null;
  lower?: JsonNumber;
  upper?: JsonNumber;
}

/** The JSON of a fit (summary form; the full form adds the FitResult's remaining fields). */
export interface FitJson {
  modelId: string;
  noise: string;
  converged: boolean;
  reason: string;
  message: string;
  iterations: number;
  /** Every parameter by name, in model order: `params.separation.value` (m). */
  params: Record<string, ParamJson>;
  /** n, nFree, dof, χ², reduced χ², objective, ln L, AIC, AICc, BIC (dimensionless). */
  statistics: Record<keyof FitStatistics, JsonNumber>;
  warnings: FitWarning[];
  /** The goodness-of-fit test and fringe detection (fit/goodness); null for results recorded before it existed. */
  goodness: Record<string, unknown> | null;
  /** Full form only: the FitResult's other fields (encoded: typed arrays as base64). */
  [more: string]: unknown;
}

/** The fields a replay needs besides the summary; written by the full form only. */
const FULL_ONLY = ["evaluations", "jacobianEvaluations", "freeNames", "covariance", "correlation", "covarianceScaled", "model", "residuals", "flagged", "starts", "source"] as const;

/**
 * The JSON of a fit, JSON-safe as it stands (non-finite numbers tagged, typed arrays as base64).
 * @param result the fit
 * @param form   "summary" (command line, widgets) or "full" (results documents: every field, exact)
 */
export function fitJson(result: FitResult, form: "summary" | "full" = "summary"): FitJson {
  const full = form === "full";
  const params: Record<string, ParamJson> = {};
  for (const p of result.parameters) {
    params[p.name] = {
      value: encodeNumber(p.value),
      uncertainty: encodeNumber(p.uncertainty),
      unit: p.unit,
      fixed: p.fixed,
      atBound: p.atBound,
      ...(full ? { tied: p.tied, lower: encodeNumber(p.lower), upper: encodeNumber(p.upper) } : {}),
    };
  }
  const out: FitJson = {
    modelId: result.modelId,
    noise: result.noise,
    converged: result.converged,
    reason: result.reason,
    message: result.message,
    iterations: result.iterations,
    params,
    statistics: encodeJson(result.statistics) as FitJson["statistics"],
    warnings: result.warnings.map((w) => ({ code: w.code, message: w.message, ...(w.parameter ? { parameter: w.parameter } : {}) })),
    goodness: result.goodness ? (encodeJson(result.goodness) as Record<string, unknown>) : null,
  };
  if (full) {
    for (const key of FULL_ONLY) {
      const value = (result as unknown as Record<string, unknown>)[key];
      if (value !== undefined) out[key] = encodeJson(value);
    }
  }
  return out;
}

/**
 * Read the JSON of a fit, in this shape or an older one: `parameters` as a list (widget state
 * and results files before the one shape), `model`/`stats` and null uncertainties (the command's
 * --json before it). Returns this shape with plain numbers (non-finite ones decoded; an
 * uncertainty of null, meaning "could not be estimated", becomes Infinity).
 * @param value  parsed JSON (untrusted)
 * @param source where it came from, for the error message
 */
export function readFitJson(value: unknown, source = "fit JSON"): FitJson & { params: Record<string, ParamJson & { value: number; uncertainty: number }> } {
  const raw = value as Record<string, unknown> | null;
  if (!raw || typeof raw !== "object") throw new DataError(source, `not the JSON of a fit (${typeof value})`, "give the object written by fringekit for one fit");
  const o = decodeJson(raw) as Record<string, unknown>;
  if (o.modelId === undefined && typeof o.model === "string") {
    o.modelId = o.model;
    delete o.model;
  }
  if (o.statistics === undefined && o.stats && typeof o.stats === "object") {
    o.statistics = o.stats;
    delete o.stats;
  }
  if (o.params === undefined && Array.isArray(o.parameters)) {
    o.params = paramsFromList(o.parameters as Partial<FitParameter>[]);
    delete o.parameters;
  }
  const params = o.params as Record<string, Record<string, unknown>> | undefined;
  if (typeof o.modelId !== "string" || !params || typeof params !== "object" || Array.isArray(params)) {
    throw new DataError(source, "not the JSON of a fit (no modelId or params)", "give the object written by fringekit for one fit (fit --json, widget state or a results file's fits[i].result)");
  }
  for (const [name, p] of Object.entries(params)) {
    if (!p || typeof p.value !== "number") throw new DataError(source, `parameter ${name} has no value`, "the file is damaged or was edited by hand");
    // Written before the one shape: null meant "could not be estimated"; older still: `stderr`.
    if (p.uncertainty === undefined && typeof p.stderr === "number") {
      p.uncertainty = p.stderr;
      delete p.stderr;
    }
    if (p.uncertainty === null || p.uncertainty === undefined) p.uncertainty = p.fixed ? 0 : Infinity;
    if (p.atBound === undefined) p.atBound = null;
  }
  if (o.goodness === undefined) o.goodness = null;
  if (!Array.isArray(o.warnings)) o.warnings = [];
  for (const key of Object.keys((o.statistics as Record<string, unknown>) ?? {})) {
    const s = o.statistics as Record<string, unknown>;
    if (s[key] === null) s[key] = NaN;
  }
  return o as ReturnType<typeof readFitJson>;
}

/** The parameter list of a FitResult from the keyed `params` of the full form (name from the key). */
export function parametersFromJson(params: Record<string, Partial<FitParameter>>): FitParameter[] {
  return Object.entries(params).map(([name, p]) => ({
    name,
    unit: String(p.unit ?? ""),
    value: Number(p.value),
    uncertainty: Number(p.uncertainty),
    fixed: Boolean(p.fixed),
    tied: p.tied ?? null,
    atBound: p.atBound ?? null,
    lower: p.lower ?? -Infinity,
    upper: p.upper ?? Infinity,
  }));
}

function paramsFromList(list: readonly Partial<FitParameter>[]): Record<string, Record<string, unknown>> {
  const out: Record<string, Record<string, unknown>> = {};
  for (const p of list) {
    if (typeof p?.name !== "string" || p.name === "__proto__") continue;
    const { name, ...rest } = p;
    out[name] = rest;
  }
  return out;
}
