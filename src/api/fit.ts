/**
 * Fit: a fit result that knows what it was made from (profile, model, options), so everything a
 * user does next — parameters by name, intervals, confidence bands, reports, figures, results
 * files — is one call on the fit itself.
 */
import { InvalidArgumentError } from "../errors.js";
import { bootstrap, type BootstrapOptions, type BootstrapSummary } from "../fit/bootstrap.js";
import { profileInterval, type ProfileInterval } from "../fit/profileInterval.js";
import { propagate, type Propagated, type PropagateOptions } from "../fit/propagate.js";
import type { FitParameter, FitResult, FitSource } from "../fit/types.js";
import type { Model } from "../physics/model.js";
import type { Profile } from "../profile.js";
import { confidenceBand, type Band } from "../report/figures/confidenceBand.js";
import { coherenceScanFigure, type CoherenceScanFigureOptions } from "../report/figures/coherenceScanFigure.js";
import type { FigureSpec } from "../report/figures/figureSpec.js";
import { fitFigure, type FitFigureOptions } from "../report/figures/fitFigure.js";
import type { FitTableOptions } from "../report/fitTable.js";
import { formatParameter, type FormatOptions } from "../report/formatQuantity.js";
import { fitDocument, resultsJson, scanDocument, stringifyResults, type DocumentOptions, type ResultsDocument } from "../report/results/resultsDocument.js";
import { fitReport, quantityReport, type TableReport } from "../report/tableReport.js";
import { replayResults, type ReplayOptions, type ReplayReport } from "./replay.js";
import { derivedQuantities, type DerivedOptions, type DerivedReport } from "../stats/derivedQuantities.js";
import type { DerivedQuantity } from "../stats/quantity.js";

/**
 * A FitResult (every field of it, plain data) plus what it was made from and what users do
 * next. Values are SI; `params.separation.value` in m, `.uncertainty` the standard uncertainty.
 * The profile and model are kept off the enumerable fields, so the result still copies and
 * posts like plain data.
 */
export class Fit implements FitResult {
  declare modelId: FitResult["modelId"];
  declare noise: FitResult["noise"];
  declare converged: boolean;
  declare reason: FitResult["reason"];
  declare message: string;
  declare iterations: number;
  declare evaluations: number;
  declare jacobianEvaluations: number;
  declare parameters: FitParameter[];
  declare freeNames: string[];
  declare covariance: Float64Array;
  declare correlation: Float64Array;
  declare covarianceScaled: boolean;
  declare statistics: FitResult["statistics"];
  declare warnings: FitResult["warnings"];
  declare model: Float64Array;
  declare residuals: Float64Array;
  declare flagged: number[];
  /** The goodness-of-fit test and fringe detection (see fit/goodness). */
  declare goodness: FitResult["goodness"];
  /** How the global stage went: starts tried, converged, agreeing on the best optimum. */
  declare starts?: FitResult["starts"];
  declare source: FitSource;
  /** The profile that was fitted (x in m). */
  declare readonly profile: Profile;
  /** The model object that was fitted (`model` is its curve at every x). */
  declare readonly fittedModel: Model;

  /**
   * Wraps a result of `fittedModel` fitted to `profile`; `result.source` must be set
   * (fitProfile does this — user code rarely calls the constructor).
   */
  constructor(result: FitResult & { source: FitSource }, profile: Profile, fittedModel: Model) {
    Object.assign(this, result);
    Object.defineProperty(this, "profile", { value: profile, enumerable: false });
    Object.defineProperty(this, "fittedModel", { value: fittedModel, enumerable: false });
  }

  /**
   * Every parameter by name: `fit.params.separation.value` (SI), `.uncertainty` (standard
   * uncertainty, SI; 0 when fixed, Infinity when it cannot be estimated), `.unit`, `.fixed`.
   */
  get params(): Readonly<Record<string, FitParameter>> {
    return Object.fromEntries(this.parameters.map((p) => [p.name, p]));
  }

  /** The parameter called `name`; throws naming the parameters the model has when missing. */
  param(name: string): FitParameter {
    const found = this.parameters.find((p) => p.name === name);
    if (!found) throw new InvalidArgumentError("parameter", name, `one of ${this.parameters.map((p) => p.name).join(", ")} (model ${this.modelId})`);
    return found;
  }

  /**
   * Profile-likelihood confidence interval of a free parameter (ends in its SI unit), re-fitted
   * with the same model, noise model, tolerances and robust scale as this fit.
   * @param level confidence level in (0, 1), default 0.6827 (1σ)
   * @example fit.interval("bandwidth", 0.95) // { lower, upper, ... } in m
   */
  interval(name: string, level = 0.6827): ProfileInterval {
    return profileInterval(this, this.profile, this.fittedModel, name, level);
  }

  /**
   * Pointwise confidence band of the fitted curve (delta method, see confidenceBand).
   * @param x     positions (m); default the profile's x
   * @param level confidence level in (0, 1), default 0.95
   */
  band(x: Float64Array = this.profile.x, level = 0.95): Band {
    return confidenceBand(this.fittedModel, this, x, level);
  }

  /**
   * Uncertainty of a derived quantity g(parameters) (delta method or Monte Carlo, see propagate).
   * @param fn receives every parameter by name (SI) and returns g (its own unit)
   */
  propagate(fn: (values: Record<string, number>) => number, options: PropagateOptions = {}): Propagated {
    return propagate(this, fn, options);
  }

  /** Bootstrap of the fit (parametric or residual resampling, see bootstrap); re-fits with this fit's model and options. */
  bootstrap(options: BootstrapOptions = {}): BootstrapSummary {
    return bootstrap(this, this.profile, this.fittedModel, options);
  }

  /** "value ± uncertainty unit" of one parameter, rounded to its uncertainty (see formatParameter). */
  format(name: string, options: FormatOptions = {}): string {
    return formatParameter(this.param(name), options).text;
  }

  /**
   * Every derived quantity the parameters allow (fringe spacing, coherence length, …; SI with
   * standard uncertainties), see derivedQuantities; `byName.coherenceLength` reads one, `report()`
   * tables the finite ones with the warnings as notes.
   */
  derived(options: Omit<DerivedOptions, "profile"> = {}): DerivedReport & { byName: Readonly<Record<string, DerivedQuantity>>; report(): TableReport } {
    const found = derivedQuantities(this, { ...options, profile: this.profile });
    return {
      ...found,
      byName: Object.fromEntries(found.quantities.map((q) => [q.name, q])),
      report: () => quantityReport(found.quantities.filter((q) => Number.isFinite(q.value)), { notes: found.warnings }),
    };
  }

  /** The fit's report table (HTML, Markdown, LaTeX, text); the data's file name is the default source. */
  report(options: FitTableOptions = {}): TableReport {
    return fitReport(this, { source: this.profile.provenance?.source, ...options });
  }

  /**
   * The fit's figure (a FigureSpec): data, model and normalised residuals, or for a coherence
   * scan the visibilities with the fitted curve and its band. Save it with saveFigure.
   */
  figure(options: FitFigureOptions & CoherenceScanFigureOptions = {}): FigureSpec {
    if (isScanModel(this.modelId)) return coherenceScanFigure(this.profile, this, this.fittedModel, options);
    return fitFigure(this.profile, this, options);
  }

  /** The results document of this fit (model, options, data identity, every number), see resultsDocument. */
  document(options: DocumentOptions & { label?: string } = {}): ResultsDocument {
    const record = { label: options.label, result: this };
    return isScanModel(this.modelId) ? scanDocument(this.profile, record, options) : fitDocument(this.profile, record, options);
  }

  /** The results file's text (what saveResults writes; parseResults reads it back). */
  toResultsText(options: DocumentOptions & { label?: string } = {}): string {
    return stringifyResults(this.document(options));
  }

  /**
   * Re-runs this fit from its own record (model, options) on its profile and says whether the
   * numbers reproduce, exactly as a colleague replaying the results file would (see replayResults).
   */
  replay(options: ReplayOptions = {}): ReplayReport {
    return replayResults(this.document(), this.profile, undefined, options);
  }

  /** JSON.stringify(fit) gives the results document (each fit in the one JSON shape of a fit, see fitJson). */
  toJSON(): unknown {
    return resultsJson(this.document());
  }
}

/** Coherence-scan models fit visibility against slit separation, not intensity against position. */
function isScanModel(modelId: string): boolean {
  return modelId.startsWith("coherence-");
}

/** True for a Fit from fitProfile (it keeps its profile and model), also across module copies. */
export function isFit(value: unknown): value is Fit {
  return value instanceof Fit || (typeof value === "object" && value !== null && "fittedModel" in value && "profile" in value && "source" in value);
}
