/**
 * Versioned results files: one JSON document for a fit, a comparison of fits, or a coherence
 * scan, holding everything needed to re-run and check it — fringekit version, model id and
 * options, fit options, noise model, seeds, the input's name, SHA-256, reading options and
 * mask, the statistics and warnings — and reading back into the same FitResult objects.
 */
import { DataError, InvalidArgumentError } from "../../errors.js";
import { recordableOptions } from "../../fit/fitSource.js";
import type { FitResult } from "../../fit/types.js";
import type { FormulaSource } from "../../physics/modelSource.js";
import type { Profile } from "../../profile.js";
import { FRINGEKIT_VERSION } from "../version.js";
import { decodeJson, encodeJson } from "./arrays.js";
import { fitJson, parametersFromJson } from "./fitJson.js";

/** Value of the "format" field that marks a fringekit results file. */
export const RESULTS_FORMAT = "fringekit-results";
/**
 * Version of the document layout; readers refuse newer versions with a clear message.
 * 2: each fit's result in the one JSON shape of a fit (parameters keyed by name, see fitJson);
 * 1: parameters as a list (still read).
 */
export const RESULTS_FORMAT_VERSION = 2;

/** What a results file holds: one fit, a comparison of fits, or a coherence-scan fit. */
export type ResultsKind = "fit" | "comparison" | "scan";

/** What the fits were made to. `sha256` is null for data that never was a file (then `data` is embedded). */
export interface InputRecord {
  source: string | null;
  sha256: string | null;
  /** Options used to read the file into a profile (columns, pitch, ROI, ...). */
  readOptions: Record<string, unknown>;
  notes: string[];
  points: number;
  yUnit: string;
  counts: boolean;
  /** 1 = used, 0 = excluded, per point; null when every point was used. */
  mask: Uint8Array | null;
  /** The data itself, when embedded (always for profiles without a file). */
  data: { x: Float64Array; y: Float64Array; sigma: Float64Array | null } | null;
}

/** One fit as recorded: the label, the model (id and construction options), the fit options, the result. */
export interface FitRecord {
  label: string;
  modelId: string;
  modelOptions: Record<string, unknown>;
  /** Options passed to fitProfile (functions such as onProgress are not recorded). */
  fitOptions: Record<string, unknown>;
  /** Formula models only: the expression, variable and parameter specs, so replay can rebuild the model. */
  formula?: FormulaSource;
  result: FitResult;
}

/** A results file as an object (the JSON text's content, decoded). */
export interface ResultsDocument {
  format: typeof RESULTS_FORMAT;
  formatVersion: number;
  kind: ResultsKind;
  fringekitVersion: string;
  createdAt: string | null;
  input: InputRecord;
  fits: FitRecord[];
  /** Seeds of every random stream used (bootstrap, Monte Carlo, simulation), by purpose. */
  seeds: Record<string, number>;
  /** Plain-words verdict of a comparison, when there is one. */
  verdict: string | null;
  /** Derived quantities (e.g. source size from a scan) as recorded by the caller. */
  derived: Record<string, unknown>;
  notes: string[];
}

/** A fit to record: its result and how it was made. */
export interface FitToRecord {
  label?: string;
  result: FitResult;
  modelOptions?: Record<string, unknown>;
  fitOptions?: Record<string, unknown>;
}

/** What else a results document records: seeds, verdict, derived quantities, notes, embedded data. */
export interface DocumentOptions {
  seeds?: Record<string, number>;
  verdict?: string;
  derived?: Record<string, unknown>;
  notes?: string[];
  /** Embed x, y, σ (default: only when the profile has no file provenance). */
  embedData?: boolean;
  /** Time stamp to write (ISO 8601); default none, so identical runs give identical files. */
  createdAt?: string;
}

/**
 * Build the results document of fits made to `profile`.
 * kind "fit": exactly one fit; "comparison": two or more; "scan": one fit of a coherence scan
 * (x = slit separation in m, y = visibility).
 */
export function resultsDocument(kind: ResultsKind, profile: Profile, fits: readonly FitToRecord[], options: DocumentOptions = {}): ResultsDocument {
  if (kind !== "fit" && kind !== "comparison" && kind !== "scan") throw new InvalidArgumentError("kind", kind, '"fit", "comparison" or "scan"');
  const wanted = kind === "comparison" ? "two or more fits" : "exactly one fit";
  if (!Array.isArray(fits) || (kind === "comparison" ? fits.length < 2 : fits.length !== 1)) {
    throw new InvalidArgumentError("fits", Array.isArray(fits) ? `${fits.length} fits` : fits, `${wanted} for a ${kind} document`);
  }
  const n = profile.x.length;
  for (const f of fits) {
    if (f.result.model.length !== n) {
      throw new InvalidArgumentError("fits", f.label ?? f.result.modelId, `results of this profile (${n} points)`);
    }
  }
  const provenance = profile.provenance;
  const embed = options.embedData ?? !provenance;
  const mask = profile.mask && profile.mask.some((m) => m === 0) ? Uint8Array.from(profile.mask) : null;
  return {
    format: RESULTS_FORMAT,
    formatVersion: RESULTS_FORMAT_VERSION,
    kind,
    fringekitVersion: FRINGEKIT_VERSION,
    createdAt: options.createdAt ?? null,
    input: {
      source: provenance?.source ?? null,
      sha256: provenance?.sha256 ?? null,
      readOptions: { ...(provenance?.options ?? {}) },
      notes: [...(provenance?.notes ?? [])],
      points: n,
      yUnit: profile.yUnit,
      counts: profile.counts,
      mask,
      data: embed ? { x: Float64Array.from(profile.x), y: Float64Array.from(profile.y), sigma: profile.sigma ? Float64Array.from(profile.sigma) : null } : null,
    },
    fits: fits.map((f) => {
      // A fit from the public fitProfile carries its model and options; given ones take precedence.
      const source = f.result.source;
      return {
        label: f.label ?? f.result.modelId,
        modelId: f.result.modelId,
        modelOptions: { ...(f.modelOptions ?? source?.model.options ?? {}) },
        ...(source?.model.formula ? { formula: source.model.formula } : {}),
        fitOptions: recordableOptions(f.fitOptions ?? source?.options ?? {}),
        result: f.result,
      };
    }),
    seeds: { ...(options.seeds ?? {}) },
    verdict: options.verdict ?? null,
    derived: { ...(options.derived ?? {}) },
    notes: [...(options.notes ?? [])],
  };
}

/** Results document of one fit (see resultsDocument). */
export function fitDocument(profile: Profile, fit: FitToRecord, options: DocumentOptions = {}): ResultsDocument {
  return resultsDocument("fit", profile, [fit], options);
}

/** Results document of a comparison of two or more fits of one profile. */
export function comparisonDocument(profile: Profile, fits: readonly FitToRecord[], options: DocumentOptions = {}): ResultsDocument {
  return resultsDocument("comparison", profile, fits, options);
}

/** Results document of a coherence-scan fit (scan: x = slit separation in m, y = visibility). */
export function scanDocument(scan: Profile, fit: FitToRecord, options: DocumentOptions = {}): ResultsDocument {
  return resultsDocument("scan", scan, [fit], options);
}

/**
 * A results document as JSON data: each fit's result in the one JSON shape of a fit (full form,
 * see fitJson), typed arrays as base64, exact numbers. What Fit.toJSON returns.
 */
export function resultsJson(doc: ResultsDocument): unknown {
  return encodeJson({ ...doc, fits: doc.fits.map((f) => ({ ...f, result: fitJson(f.result, "full") })) });
}

/** The JSON text of a results document (2-space indent; see resultsJson). */
export function stringifyResults(doc: ResultsDocument): string {
  return `${JSON.stringify(resultsJson(doc), null, 2)}\n`;
}

/**
 * Read a results document from JSON text. Refuses, with a DataError naming `source` and the
 * field, anything that is not a fringekit results file of a version this fringekit reads.
 */
export function parseResults(text: string, source = "results file"): ResultsDocument {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    throw new DataError(source, `not JSON (${(error as Error).message})`, "give the .json file written by fringekit");
  }
  const top = raw as Record<string, unknown>;
  if (!top || typeof top !== "object" || top.format !== RESULTS_FORMAT) {
    throw new DataError(source, `not a fringekit results file (format is ${JSON.stringify(top?.format)})`, `give a file whose "format" is "${RESULTS_FORMAT}"`);
  }
  if (typeof top.formatVersion !== "number" || top.formatVersion > RESULTS_FORMAT_VERSION || top.formatVersion < 1) {
    throw new DataError(source, `results format version ${JSON.stringify(top.formatVersion)} is not readable by fringekit ${FRINGEKIT_VERSION} (reads 1–${RESULTS_FORMAT_VERSION})`, "update fringekit to the version that wrote the file");
  }
  let doc: ResultsDocument;
  try {
    doc = decodeJson(raw) as ResultsDocument;
  } catch (error) {
    throw new DataError(source, (error as Error).message, "the file is damaged; write it again from the original result");
  }
  upgradeOldFields(doc);
  checkDocument(doc, source);
  return doc;
}

/**
 * Results in the one JSON shape (version 2) key their parameters by name: back to the
 * FitResult's list. Files written before the rename call the standard uncertainty `stderr`;
 * read it as `uncertainty`.
 */
function upgradeOldFields(doc: ResultsDocument): void {
  for (const fit of Array.isArray(doc.fits) ? doc.fits : []) {
    const result = fit?.result as unknown as Record<string, unknown> | undefined;
    if (result && typeof result === "object" && result.parameters === undefined && result.params && typeof result.params === "object" && !Array.isArray(result.params)) {
      result.parameters = parametersFromJson(result.params as Record<string, Record<string, never>>);
      delete result.params;
    }
    for (const p of Array.isArray(fit?.result?.parameters) ? fit.result.parameters : []) {
      const old = p as unknown as { stderr?: number; uncertainty?: number };
      if (old.uncertainty === undefined && typeof old.stderr === "number") {
        old.uncertainty = old.stderr;
        delete old.stderr;
      }
    }
  }
}

/** The profile embedded in a results document, or null when the data must come from its file. */
export function embeddedProfile(doc: ResultsDocument): Profile | null {
  const data = doc.input.data;
  if (!data) return null;
  return {
    x: data.x, y: data.y, ...(data.sigma ? { sigma: data.sigma } : {}), ...(doc.input.mask ? { mask: doc.input.mask } : {}),
    yUnit: doc.input.yUnit, counts: doc.input.counts,
  };
}

function checkDocument(doc: ResultsDocument, source: string): void {
  const fail = (field: string, wanted: string): never => {
    throw new DataError(source, `field ${field} is missing or malformed`, `expected ${wanted}; the file is damaged or was edited by hand`);
  };
  if (doc.kind !== "fit" && doc.kind !== "comparison" && doc.kind !== "scan") fail("kind", '"fit", "comparison" or "scan"');
  if (typeof doc.fringekitVersion !== "string") fail("fringekitVersion", "a version string");
  const input = doc.input;
  if (!input || typeof input !== "object") fail("input", "an object");
  if (!Number.isInteger(input.points) || input.points < 1) fail("input.points", "a positive integer");
  if (input.sha256 !== null && !/^[0-9a-f]{64}$/.test(String(input.sha256))) fail("input.sha256", "64 lower-case hex digits or null");
  if (input.mask !== null && !(input.mask instanceof Uint8Array && input.mask.length === input.points)) fail("input.mask", `${input.points} mask bytes or null`);
  if (input.data !== null) {
    const d = input.data;
    if (!(d?.x instanceof Float64Array) || d.x.length !== input.points || !(d.y instanceof Float64Array) || d.y.length !== input.points) {
      fail("input.data", `x and y of ${input.points} values`);
    }
  }
  if (input.sha256 === null && input.data === null) fail("input", "either a file SHA-256 or embedded data");
  if (!Array.isArray(doc.fits) || doc.fits.length < 1) fail("fits", "a non-empty list");
  doc.fits.forEach((fit, i) => {
    const r = fit?.result;
    const at = `fits[${i}].result`;
    if (!r || typeof r.modelId !== "string" || typeof fit.modelId !== "string") fail(`fits[${i}].modelId`, "a model id");
    if (!Array.isArray(r.parameters) || r.parameters.some((p) => typeof p?.name !== "string" || typeof p.value !== "number")) fail(`${at}.parameters`, "a list of {name, value, ...}");
    const k = Array.isArray(r.freeNames) ? r.freeNames.length : -1;
    if (k < 0) fail(`${at}.freeNames`, "a list of names");
    if (!(r.covariance instanceof Float64Array) || r.covariance.length !== k * k) fail(`${at}.covariance`, `${k}×${k} float64 values`);
    if (!(r.correlation instanceof Float64Array) || r.correlation.length !== k * k) fail(`${at}.correlation`, `${k}×${k} float64 values`);
    if (!(r.model instanceof Float64Array) || r.model.length !== input.points) fail(`${at}.model`, `${input.points} float64 values`);
    if (!(r.residuals instanceof Float64Array) || r.residuals.length !== input.points) fail(`${at}.residuals`, `${input.points} float64 values`);
    if (!r.statistics || typeof r.statistics.chi2 !== "number") fail(`${at}.statistics`, "the fit statistics");
    if (!Array.isArray(r.warnings)) fail(`${at}.warnings`, "a list");
  });
}

