/**
 * compare in one line: several fits of one profile → ranking, the best fit itself, a verdict in
 * plain words, a report, a figure of what tells the models apart, and a results document.
 * A wrapper over compareFits (information criteria, nested tests, residual diagnostics).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import type { ComparisonTableOptions } from "../report/comparisonTable.js";
import type { FigureSpec } from "../report/figures/figureSpec.js";
import { modelDifferenceFigure, type ModelDifferenceFigureOptions } from "../report/figures/modelDifferenceFigure.js";
import { comparisonDocument, resultsJson, stringifyResults, type DocumentOptions, type ResultsDocument } from "../report/results/resultsDocument.js";
import { comparisonReport, type TableReport } from "../report/tableReport.js";
import { compareFits, comparisonJson } from "../stats/compareFits.js";
import type { CompareOptions, ComparisonJson, ComparisonResult, ModelComparisonRow } from "../stats/comparisonTypes.js";
import type { Fit } from "./fit.js";

/** Fits to compare: { label: fit, … }, a list of fits (labelled by model id), or a list of { label, fit }. */
export type FitsToCompare<F extends FitResult = Fit> = Readonly<Record<string, F>> | readonly F[] | readonly { label: string; fit: F }[];

/** The outcome of compare: the ranked fits, the preferred one, the verdict and what to do next. */
export class Comparison<F extends FitResult = Fit> {
  /** The fits as given, each with its (unique) label. */
  readonly fits: readonly { label: string; fit: F }[];
  /** The full compareFits result (rows, nested tests, warnings, verdict). */
  readonly result: ComparisonResult;
  /** The profile every fit was made to (x in m). */
  readonly profile: Profile;

  constructor(fits: readonly { label: string; fit: F }[], result: ComparisonResult, profile: Profile) {
    this.fits = fits;
    this.result = result;
    this.profile = profile;
  }

  /**
   * The preferred fit itself (lowest criterion among converged fits), or null when no
   * preference can be stated because a fit plainly failed (see `unreliable` and `verdict`).
   */
  get best(): F | null {
    const label = this.result.preferred;
    return label === null ? null : this.fits.find((f) => f.label === label)!.fit;
  }
  /** Label of the preferred fit, or null (see `best`). */
  get preferred(): string | null {
    return this.result.preferred;
  }
  /** Fits that plainly failed (not converged, poor fit, no fringe, aliased fringe), each with its reasons. */
  get unreliable(): ComparisonResult["unreliable"] {
    return this.result.unreliable;
  }
  /** Rows best first: criteria (AIC, BIC, …; dimensionless), Δ to the best, weights, residual diagnostics. */
  get ranking(): readonly ModelComparisonRow[] {
    return this.result.rows;
  }
  /** The conclusion in plain words, with the numbers behind it. */
  get verdict(): string {
    return this.result.verdict;
  }
  /** Warnings of the comparison (also woven into the verdict). */
  get warnings(): readonly string[] {
    return this.result.warnings;
  }
  /** The fit with the given label. */
  fit(label: string): F {
    const found = this.fits.find((f) => f.label === label);
    if (!found) throw new InvalidArgumentError("label", label, `one of ${this.fits.map((f) => f.label).join(", ")}`);
    return found.fit;
  }

  /** The comparison table with the verdict and nested tests as notes. */
  report(options: ComparisonTableOptions = {}): TableReport {
    return comparisonReport(this.result, { verdict: this.result.verdict, tests: this.result.tests, fits: this.fits.map((f) => ({ label: f.label, result: f.fit })), ...options });
  }

  /** Data with every model, and binned residuals per model: where each model misses (see modelDifferenceFigure). */
  figure(options: ModelDifferenceFigureOptions = {}): FigureSpec {
    return modelDifferenceFigure(this.profile, this.fits.map((f) => ({ label: f.label, result: f.fit })), options);
  }

  /** The results document of the comparison (every fit with its model and options, the verdict). */
  document(options: DocumentOptions = {}): ResultsDocument {
    return comparisonDocument(this.profile, this.fits.map((f) => ({ label: f.label, result: f.fit })), { verdict: this.result.verdict, ...options });
  }

  /** The results file's text (what saveResults writes). */
  toResultsText(options: DocumentOptions = {}): string {
    return stringifyResults(this.document(options));
  }

  /** The `fringekit compare --json` shape: ranking, preferred, tests, warnings, verdict. */
  summary(): ComparisonJson {
    return comparisonJson(this.result);
  }

  /** JSON.stringify(comparison) gives the results document. */
  toJSON(): unknown {
    return resultsJson(this.document());
  }
}

/**
 * Compares fits of one profile by information criteria (AIC by default), nested-model tests
 * and residual diagnostics; refuses fits of different data or noise models.
 * @param fits    { ideal: fitA, broadband: fitB }, [fitA, fitB], or [{ label, fit }, …]
 * @param options criterion, significance level, nested pairs; `profile` only for plain FitResults
 * @example compare({ ideal: fitA, broadband: fitB }).best.params.bandwidth.value // m
 */
export function compare<F extends FitResult = Fit>(fits: FitsToCompare<F>, options: CompareOptions = {}): Comparison<F> {
  const labelled = labelFits(fits);
  if (labelled.length < 2) throw new InvalidArgumentError("fits", `${labelled.length} fit`, "two or more fits of the same profile");
  const profiles = labelled.map((f) => (f.fit as Partial<Fit>).profile ?? options.profile);
  const profile = profiles[0];
  if (!profile || profiles.some((p) => !p)) {
    throw new InvalidArgumentError("fits", "a fit without its profile", "fits from fitProfile (they keep their profile), or give options.profile");
  }
  const result = compareFits(labelled.map((f, i) => ({ fit: f.fit, label: f.label, profile: profiles[i] })), { ...options, profile });
  return new Comparison(labelled, result, profile);
}

function labelFits<F extends FitResult>(fits: FitsToCompare<F>): { label: string; fit: F }[] {
  let raw: { label: string; fit: F }[];
  if (Array.isArray(fits)) {
    raw = (fits as readonly unknown[]).map((item, i) => {
      if (item && typeof item === "object" && "fit" in item && "label" in item) return item as { label: string; fit: F };
      if (item && typeof item === "object" && "statistics" in item) return { label: (item as F).modelId, fit: item as F };
      throw new InvalidArgumentError(`fits[${i}]`, typeof item, "a fit or { label, fit }");
    });
  } else if (fits && typeof fits === "object") {
    raw = Object.entries(fits as Record<string, F>).map(([label, fit]) => ({ label, fit }));
  } else throw new InvalidArgumentError("fits", fits, "{ label: fit, … } or a list of fits");
  const seen = new Map<string, number>();
  return raw.map((f) => {
    if (!f.fit || typeof f.fit !== "object" || !("statistics" in f.fit)) throw new InvalidArgumentError(`fit "${f.label}"`, typeof f.fit, "a fit from fitProfile");
    const count = seen.get(f.label) ?? 0;
    seen.set(f.label, count + 1);
    return { label: count > 0 ? `${f.label} #${count + 1}` : f.label, fit: f.fit };
  });
}
