/**
 * Replay: re-run the fits of a results document on the same data and say whether they
 * reproduce (numbers equal within tolerance) or what differs. Refuses data whose SHA-256
 * does not match the one recorded. This is the logic behind `fringekit replay RESULT.json
 * [--data FILE]`; reading files and computing the hash happen at the edge (io, cli).
 */
import { DataError, InvalidArgumentError } from "../errors.js";
import { fitProfile } from "../fit/fitProfile.js";
import { rebuildModel } from "../fit/fitSource.js";
import type { FitOptions, FitResult } from "../fit/types.js";
import type { Model } from "../physics/model.js";
import { getModel } from "../physics/registry.js";
import type { Profile } from "../profile.js";
import { embeddedProfile, type ResultsDocument } from "../report/results/resultsDocument.js";

/** The fitting machinery replay calls: the registry's getModel and the fitter's fitProfile. */
export interface ReplayEngine {
  getModel(id: string, options?: Record<string, unknown>): Model;
  fitProfile(profile: Profile, model: Model, options?: FitOptions): FitResult;
}

/** fringekit's own model registry and fitter: what replay uses unless told otherwise. */
export const DEFAULT_REPLAY_ENGINE: ReplayEngine = { getModel, fitProfile };

/** Tolerances of replay, and the data's SHA-256 when the profile carries none. */
export interface ReplayOptions {
  /** Relative tolerance on fixed values and statistics (default 1e-6). */
  relative?: number;
  /** Allowed change of a fitted value as a fraction of its standard error (default 1e-3). */
  stderrFraction?: number;
  /** Allowed relative change of a standard error (default 1e-3). */
  stderrRelative?: number;
  /** SHA-256 of the data file's bytes when the profile carries no provenance. */
  sha256?: string;
}

/** One number (or flag) that did not reproduce. */
export interface ReplayDifference {
  fit: string;
  quantity: string;
  recorded: number | string | boolean;
  replayed: number | string | boolean;
  allowed: string;
}

/** Outcome of a replay: reproduced or not, each difference, the new results and a summary. */
export interface ReplayReport {
  reproduced: boolean;
  differences: ReplayDifference[];
  /** The new results, in the order of doc.fits. */
  replayed: FitResult[];
  /** How the data were identified: by the file's SHA-256, or embedded in the results file. */
  dataCheck: "sha256" | "embedded";
  /** One paragraph in plain words. */
  summary: string;
}

/**
 * Re-run every fit of `doc` on `profile` (or on the data embedded in `doc` when profile is
 * null) and compare. Throws DataError when the data's SHA-256 differs from the recorded one,
 * or when no data is given for a document that does not embed it.
 * @param profile the profile read from the data file with doc.input.readOptions, its provenance holding the file's SHA-256
 */
export function replayResults(
  doc: ResultsDocument,
  profile: Profile | null,
  engine: ReplayEngine = DEFAULT_REPLAY_ENGINE,
  options: ReplayOptions = {},
): ReplayReport {
  checkReplayCost(doc);
  const { data, dataCheck } = chooseData(doc, profile, options);
  const relative = options.relative ?? 1e-6;
  const fraction = options.stderrFraction ?? 1e-3;
  const stderrRelative = options.stderrRelative ?? 1e-3;
  const differences: ReplayDifference[] = [];
  const replayed: FitResult[] = [];
  for (const record of doc.fits) {
    // Formula models are rebuilt from their recorded text; registry models through the engine.
    const model = record.formula
      ? rebuildModel({ id: record.modelId, options: {}, formula: record.formula })
      : engine.getModel(record.modelId, record.modelOptions);
    const now = engine.fitProfile(data, model, { ...record.fitOptions } as FitOptions);
    replayed.push(now);
    differences.push(...compareResults(record.label, record.result, now, { relative, fraction, stderrRelative }));
  }
  const reproduced = differences.length === 0;
  const num = (x: number) => (x < 1e-3 ? x.toExponential(0) : String(x));
  const what = `${doc.fits.length} fit${doc.fits.length === 1 ? "" : "s"} (${doc.fits.map((f) => f.label).join(", ")})`;
  const dataWords = dataCheck === "sha256" ? `data ${doc.input.source ?? ""} matched by SHA-256` : "data embedded in the results file";
  const summary = reproduced
    ? `Reproduced: ${what} on ${dataWords}; every fitted value within ${num(fraction)} standard uncertainties, fixed ones within ${num(relative)} relative, standard uncertainties within ${num(stderrRelative * 100)} %, statistics within ${num(relative)} relative.`
    : `NOT reproduced: ${differences.length} difference${differences.length === 1 ? "" : "s"} in ${what} on ${dataWords}: ` +
      differences.slice(0, 5).map((d) => `${d.fit} ${d.quantity} ${d.recorded} → ${d.replayed} (allowed ${d.allowed})`).join("; ") +
      (differences.length > 5 ? `; and ${differences.length - 5} more` : "") + ".";
  return { reproduced, differences, replayed, dataCheck, summary };
}

/**
 * Cost limits of replaying a results file, which may come from anyone: checked before any
 * model is built or fit run (README, "Limits and security").
 * - fits: fits in one document
 * - spectrumSamples: samples of a source spectrum table
 * - nodes: pixelNodes and blurNodes (each)
 * - evaluationCost: points × pixel nodes × blur nodes × spectrum samples (pattern evaluations per model evaluation)
 * - maxEvaluations: the largest evaluation budget a fit may ask for
 */
export const REPLAY_LIMITS = { fits: 100, spectrumSamples: 10_000, nodes: 64, evaluationCost: 50_000_000, maxEvaluations: 100_000 } as const;

/** Defaults of the detector quadrature (physics/detector.ts), used when a record gives none. */
const DEFAULT_PIXEL_NODES = 5;
const DEFAULT_BLUR_NODES = 16;

/**
 * Throws a DataError naming the limit when replaying `doc` would cost more than REPLAY_LIMITS allow.
 * @param doc a parsed results document (untrusted)
 */
export function checkReplayCost(doc: ResultsDocument): void {
  const source = doc.input?.source ?? "the results file";
  const refuse = (what: string) => { throw new DataError(source, what, "this results file asks for more work than replay allows; fit the data again instead"); };
  const fits = Array.isArray(doc.fits) ? doc.fits : [];
  if (fits.length > REPLAY_LIMITS.fits) refuse(`${fits.length} fits, above the limit of ${REPLAY_LIMITS.fits}`);
  const points = Number(doc.input?.points) || 0;
  for (const record of fits) {
    const where = `fit "${String(record?.label ?? "").slice(0, 40)}"`;
    const options = (record?.modelOptions ?? {}) as Record<string, unknown>;
    const count = (name: "pixelNodes" | "blurNodes", fallback: number): number => {
      const value = options[name];
      if (value === undefined) return fallback;
      if (typeof value !== "number" || !(value <= REPLAY_LIMITS.nodes)) refuse(`${where}: ${name} ${String(value).slice(0, 20)}, above the limit of ${REPLAY_LIMITS.nodes}`);
      return value as number;
    };
    const pixelNodes = count("pixelNodes", DEFAULT_PIXEL_NODES);
    const blurNodes = count("blurNodes", DEFAULT_BLUR_NODES);
    const spectrum = options.spectrum as { wavelengths?: unknown; weights?: unknown } | undefined;
    const samples = spectrum === undefined ? 1 : Math.max(lengthOf(spectrum?.wavelengths), lengthOf(spectrum?.weights), 1);
    if (samples > REPLAY_LIMITS.spectrumSamples) refuse(`${where}: a spectrum of ${samples} samples, above the limit of ${REPLAY_LIMITS.spectrumSamples}`);
    const cost = points * pixelNodes * blurNodes * samples;
    if (cost > REPLAY_LIMITS.evaluationCost) {
      refuse(`${where}: a model cost of ${cost.toExponential(2)} pattern evaluations per model evaluation (${points} points × ${pixelNodes} × ${blurNodes} nodes × ${samples} spectrum samples), above the limit of ${REPLAY_LIMITS.evaluationCost.toExponential(0)}`);
    }
    const budget = (record?.fitOptions as Record<string, unknown> | undefined)?.maxEvaluations;
    if (budget !== undefined && !(typeof budget === "number" && budget <= REPLAY_LIMITS.maxEvaluations)) {
      refuse(`${where}: maxEvaluations ${String(budget).slice(0, 20)}, above the limit of ${REPLAY_LIMITS.maxEvaluations}`);
    }
  }
}

function lengthOf(value: unknown): number {
  return Array.isArray(value) ? value.length : 0;
}

/**
 * Compare two results of the same fit: convergence, point and parameter counts, each
 * parameter's value and standard error, χ², log-likelihood, AIC, BIC, and warning codes.
 * Tolerances: `relative` and `stderrRelative` are relative changes, `fraction` is in standard errors (all dimensionless).
 */
export function compareResults(
  label: string,
  recorded: FitResult,
  replayed: FitResult,
  tol: { relative: number; fraction: number; stderrRelative: number },
): ReplayDifference[] {
  const out: ReplayDifference[] = [];
  const add = (quantity: string, a: number | string | boolean, b: number | string | boolean, allowed: string) =>
    out.push({ fit: label, quantity, recorded: a, replayed: b, allowed });
  if (recorded.converged !== replayed.converged) add("converged", recorded.converged, replayed.converged, "the same");
  if (recorded.statistics.n !== replayed.statistics.n) add("points used", recorded.statistics.n, replayed.statistics.n, "the same");
  if (recorded.statistics.nFree !== replayed.statistics.nFree) add("free parameters", recorded.statistics.nFree, replayed.statistics.nFree, "the same");
  for (const p of recorded.parameters) {
    const q = replayed.parameters.find((r) => r.name === p.name);
    if (!q) {
      add(p.name, "present", "missing", "the same parameters");
      continue;
    }
    if (p.fixed !== q.fixed) add(`${p.name} fixed`, p.fixed, q.fixed, "the same");
    // A fitted value may move by a small fraction of its uncertainty; a fixed one only by rounding.
    const valueTol = Number.isFinite(p.uncertainty) && p.uncertainty > 0 ? tol.fraction * p.uncertainty : tol.relative * Math.abs(p.value);
    if (!within(p.value, q.value, valueTol)) add(`${p.name} value`, p.value, q.value, `± ${valueTol.toPrecision(2)}`);
    const seTol = Math.max(tol.stderrRelative, tol.relative) * Math.abs(p.uncertainty);
    if (!within(p.uncertainty, q.uncertainty, seTol)) add(`${p.name} uncertainty`, p.uncertainty, q.uncertainty, `± ${seTol.toPrecision(2)}`);
  }
  for (const key of ["chi2", "logLikelihood", "aic", "bic"] as const) {
    const a = recorded.statistics[key];
    const b = replayed.statistics[key];
    const t = Math.max(tol.relative * Math.abs(a), 1e-9);
    if (!within(a, b, t)) add(key, a, b, `± ${t.toPrecision(2)}`);
  }
  // Results recorded before the fit checks existed (no `goodness`) lack their warnings: leave those codes out.
  const older = (recorded as Partial<FitResult>).goodness === undefined;
  const codes = (r: FitResult) => r.warnings.filter((w) => !(older && CHECK_CODES.includes(w.code))).map((w) => `${w.code}${w.parameter ? `:${w.parameter}` : ""}`).sort().join(", ");
  if (codes(recorded) !== codes(replayed)) add("warnings", codes(recorded) || "none", codes(replayed) || "none", "the same warnings");
  return out;
}

/** Warning codes added by the fit checks (goodness of fit, fringe detection, default geometry, saturation). */
const CHECK_CODES = ["poor-fit", "no-fringes", "fringe-aliased", "default-geometry", "saturated-masked", "saturated-kept"];

/** Equal within `tolerance`; NaN equals NaN and ∞ equals ∞ of the same sign (an unestimable error stays unestimable). */
function within(a: number, b: number, tolerance: number): boolean {
  if (Number.isNaN(a) || Number.isNaN(b)) return Number.isNaN(a) && Number.isNaN(b);
  if (!Number.isFinite(a) || !Number.isFinite(b)) return a === b;
  return Math.abs(a - b) <= tolerance;
}

function chooseData(doc: ResultsDocument, profile: Profile | null, options: ReplayOptions): { data: Profile; dataCheck: "sha256" | "embedded" } {
  const source = doc.input.source ?? "the data";
  if (!profile) {
    const embedded = embeddedProfile(doc);
    if (!embedded) {
      throw new DataError(source, "the results file does not embed its data", `give the data file it was made from (--data ${doc.input.source ?? "FILE"})`);
    }
    return { data: embedded, dataCheck: "embedded" };
  }
  const recorded = doc.input.sha256;
  const actual = profile.provenance?.sha256 ?? options.sha256;
  if (recorded === null) {
    throw new DataError(source, "the results file records no SHA-256 for its data (it was not read from a file)", "replay it without --data: the data are embedded");
  }
  if (typeof actual !== "string" || !/^[0-9a-f]{64}$/.test(actual)) {
    throw new InvalidArgumentError("profile", "no SHA-256", "a profile read from a file (provenance.sha256) or options.sha256 with the file's hash");
  }
  if (actual !== recorded) {
    throw new DataError(
      profile.provenance?.source ?? source,
      `SHA-256 ${actual.slice(0, 16)}… does not match ${recorded.slice(0, 16)}… recorded for ${source}`,
      "this is not the data the result was made from; give the original file (--data FILE)",
    );
  }
  if (profile.x.length !== doc.input.points) {
    throw new DataError(source, `read ${profile.x.length} points but the result used ${doc.input.points}`, `read the file with the recorded options ${JSON.stringify(doc.input.readOptions)}`);
  }
  // The recorded mask is what was fitted; it replaces whatever the reader produced.
  const data: Profile = { ...profile };
  if (doc.input.mask) data.mask = doc.input.mask;
  else delete data.mask;
  return { data, dataCheck: "sha256" };
}
