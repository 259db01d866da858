/** Types of model comparison: entries, options, table rows, result and the compare --json shape. */
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import type { NestedTestResult } from "./nested.js";
import type { ResidualDiagnostics } from "./residualDiagnostics.js";

/** A fit to compare, optionally with the profile it was fitted to and a label. */
export interface ComparisonEntry {
  fit: FitResult;
  /** The data the fit used; when given for every entry, the data fingerprints must agree. */
  profile?: Profile;
  /** Row name (default: the model id, made unique). */
  label?: string;
}

/** Information criterion that ranks the models. */
export type Criterion = "aic" | "aicc" | "bic";

/** Options of compareFits. */
export interface CompareOptions {
  /** The data all fits used (positions for the periodicity test, fingerprint check). */
  profile?: Profile;
  /** Criterion that ranks the models and drives the weights (default "aic"). */
  criterion?: Criterion;
  /** Pairs [simpler, larger] (labels) the caller asserts are nested although the model ids differ. */
  nested?: [string, string][];
  /** Significance level for the nested tests and residual diagnostics (default 0.01). */
  alpha?: number;
}

/** One row of the comparison table (criteria dimensionless, χ² of the normalised residuals). */
export interface ModelComparisonRow {
  label: string;
  modelId: string;
  converged: boolean;
  n: number;
  k: number;
  logLikelihood: number;
  chi2: number;
  reducedChi2: number;
  aic: number;
  aicc: number;
  bic: number;
  /** Differences to the best converged fit, for each criterion. */
  deltaAic: number;
  deltaAicc: number;
  deltaBic: number;
  /** Akaike weight under the chosen criterion (0 for fits that did not converge). */
  weight: number;
  diagnostics: ResidualDiagnostics;
}

/** Everything compareFits returns: table, preferred fit, tests, warnings and verdict. */
export interface ComparisonResult {
  criterion: Criterion;
  noise: FitResult["noise"];
  /** Rows sorted best first by the criterion (fits that did not converge last). */
  rows: ModelComparisonRow[];
  /** Label of the preferred fit; null when some fit is unreliable (then no preference is stated). */
  preferred: string | null;
  /** Fits that plainly failed (did not converge, or warned poor-fit / no-fitted-fringes / aliasing), with why. */
  unreliable: UnreliableFit[];
  /** Nested-model tests for every pair found nested or asserted. */
  tests: NestedTestResult[];
  /** Short warnings, also woven into the verdict. */
  warnings: string[];
  /** Plain-words conclusion with the numbers behind it. */
  verdict: string;
}

/** A fit a comparison cannot rank, and why (plain words). */
export interface UnreliableFit {
  label: string;
  reasons: string[];
}

/**
 * One row of a comparison as every table, widget and JSON file shows it: the comparison's own
 * row (criteria dimensionless) with the residual diagnostics reduced to one flag. Built by
 * comparisonRows; `fringekit compare --json` ranking, the comparison widget's table and the
 * report table all use it.
 */
export type ComparisonRow = Omit<ModelComparisonRow, "diagnostics"> & {
  /** The residual diagnostics found structure (see residualDiagnostics). */
  residualsStructured: boolean;
};

/** Shape of `fringekit compare --json`. */
export interface ComparisonJson {
  /** The rows best first (see ComparisonRow). */
  ranking: ComparisonRow[];
  preferred: string | null;
  unreliable: UnreliableFit[];
  criterion: Criterion;
  tests: NestedTestResult[];
  warnings: string[];
  verdict: string;
}

/** A fit with its (unique) label and the profile it used, once normalised. */
export interface LabelledEntry {
  fit: FitResult;
  profile?: Profile;
  label: string;
}
