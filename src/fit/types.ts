import type { ModelSource } from "../physics/modelSource.js";

/**
 * Result types shared by the fitter, comparison, reports, the command line and widgets.
 * A fit that fails is a FitResult with converged = false, never an exception.
 */
import type { GoodnessOfFit } from "./goodness.js";

/** A parameter value: a number in SI units, or text with a unit ("532 nm", "0.85 m", "2 mrad"). */
export type QuantityInput = number | string;

/** How the data's scatter is modelled. "auto" picks poisson for integer counts, else gaussian. */
export type NoiseModelId = "gaussian" | "poisson" | "robust";

/** Why the solver stopped. One table (fit/status) maps each to a message. */
export type StopReason =
  | "converged-gradient"
  | "converged-step"
  | "converged-objective"
  | "max-evaluations"
  | "cancelled"
  | "non-finite"
  | "singular"
  | "invalid-start";

export interface FitParameter {
  name: string;
  /** SI unit symbol. */
  unit: string;
  /** Best-fit value (SI). */
  value: number;
  /** Standard uncertainty (SI); 0 for fixed parameters, Infinity when it cannot be estimated. */
  uncertainty: number;
  fixed: boolean;
  /** Expression this parameter is tied to, or null. */
  tied: string | null;
  /** Which bound the value sits on at the end, if any. */
  atBound: "lower" | "upper" | null;
  lower: number;
  upper: number;
}

export interface FitStatistics {
  /** Number of points used (mask = 1). */
  n: number;
  /** Number of free parameters. */
  nFree: number;
  /** n − nFree. */
  dof: number;
  /** Σ ((y − f)/σ)²; for the Poisson model, Pearson's χ² with σ² = f. */
  chi2: number;
  reducedChi2: number;
  /** The minimised objective: χ² (gaussian), Poisson deviance 2Σ[f − y + y ln(y/f)] (poisson), robust loss sum (robust). */
  objective: number;
  /** Full log-likelihood at the optimum, including constants, for AIC/BIC. */
  logLikelihood: number;
  aic: number;
  aicc: number;
  bic: number;
}

export interface FitWarning {
  /** Stable code, e.g. "at-bound", "ill-conditioned", "non-finite-model", "outliers-flagged". */
  code: string;
  message: string;
  parameter?: string;
}

export interface FitResult {
  modelId: string;
  noise: NoiseModelId;
  converged: boolean;
  reason: StopReason;
  /** Human-readable stop message (from the status table). */
  message: string;
  iterations: number;
  /** Model evaluations (Jacobian evaluations counted separately). */
  evaluations: number;
  jacobianEvaluations: number;
  /** All model parameters in model order, fixed ones included. */
  parameters: FitParameter[];
  /** Names of the free parameters, in the order of covariance rows/columns. */
  freeNames: string[];
  /** Covariance of the free parameters, row-major nFree × nFree (SI²). */
  covariance: Float64Array;
  /** Correlation matrix of the free parameters, row-major nFree × nFree. */
  correlation: Float64Array;
  /** Whether the covariance was scaled by the reduced χ² (σ treated as relative). */
  covarianceScaled: boolean;
  statistics: FitStatistics;
  warnings: FitWarning[];
  /** Model values at every x of the profile (masked points included). */
  model: Float64Array;
  /** Normalised residuals (y − f)/σ (Pearson) at every x; NaN where masked. */
  residuals: Float64Array;
  /** Indices flagged as outliers by the robust loss (empty otherwise). */
  flagged: number[];
  /** Goodness-of-fit test (χ² against its distribution when the noise scale is known) and fringe detection; see fit/goodness. */
  goodness: GoodnessOfFit;
  /** How the global stage went: candidate starts tried, converged, and in agreement with the best (fitProfile only). */
  starts?: StartsSummary;
  /** What the fit was made from (model, options, data fingerprint); set by the public fitProfile. */
  source?: FitSource;
}

/**
 * The global stage of a fit (see src/fit/starts/search.ts). Two starts reached the "same"
 * optimum when their objectives differ by at most 1e-3 of one unit of reduced χ² (plus 1e-6 of
 * the objective) and every free parameter by at most 0.1 of its standard uncertainty (phase
 * modulo 2π). `agreeing` ≥ 2 confirms the best basin; 1 means only one start found it.
 */
export interface StartsSummary {
  /** Candidate starts the solver was run from. */
  tried: number;
  /** Of those, how many converged. */
  converged: number;
  /** Of those, how many reached the best optimum (the best included). */
  agreeing: number;
  /** Where the candidates came from, e.g. "far-field spectrum", "near-field shadow edges", "given start". */
  method: string;
}

/** What a fit was made from, so later steps (intervals, replay, comparison) need nothing else. */
export interface FitSource {
  /** The model: registry id and options, or formula text. */
  model: ModelSource;
  /** Fit options as given (callbacks and abort signals left out); JSON-safe. */
  options: Record<string, unknown>;
  /** profileFingerprint of the data (x, y, σ, mask). */
  fingerprint: string;
  /** The data file's name and SHA-256 when the profile was read from a file, else null. */
  file: { source: string; sha256: string } | null;
  /** Points in the profile (masked ones included). */
  points: number;
}

/** Progress of a running fit, reported once per solver iteration. */
export interface FitProgress {
  iteration: number;
  evaluations: number;
  /** Current value of the minimised objective (see FitStatistics.objective). */
  objective: number;
}

/** Options of fitProfile (all optional; names are model parameter names). */
export interface FitOptions {
  /** Starting values (SI numbers, or text with units such as "532 nm"); parameters not given start from the automatic start or the model default. */
  start?: Record<string, QuantityInput>;
  /** Parameters held fixed: name → value (SI number or text with a unit), or names held at their start/default value. */
  fix?: Record<string, QuantityInput> | string[];
  /** Parameters that are fixedByDefault in the model but should be fitted. */
  free?: string[];
  /** Parameters tied to others: name → expression of other parameter names, e.g. { width: "separation/5" }. */
  tie?: Record<string, string>;
  /** Bounds (SI numbers or text with units) replacing the model's physical bounds: name → [lower, upper]. */
  bounds?: Record<string, [QuantityInput, QuantityInput]>;
  /** Noise model; "auto" (default) is poisson for integer counts, gaussian otherwise. */
  noise?: NoiseModelId | "auto";
  /**
   * Treat σ as absolute (covariance not scaled by the reduced χ²). Default false; Poisson is never scaled.
   * The goodness-of-fit test takes a σ from the data (σ column, counts) as absolute unless this is
   * set to false explicitly.
   */
  sigmaAbsolute?: boolean;
  /** Robust loss scale in units of σ (soft-L1 loss; default 2). */
  robustScale?: number;
  /** Limit on model evaluations (default 200·(nFree + 1) per start). */
  maxEvaluations?: number;
  /** Find starting values from the data (default: true unless start gives every free parameter). */
  autoStart?: boolean;
  /** Relative stopping tolerance on objective, step and gradient (default 1e-10; 1e-15 for reference-grade digits). */
  tolerance?: number;
  /** Use geodesic acceleration in the solver (default false for profile fits). */
  geodesic?: boolean;
  onProgress?: (progress: FitProgress) => void;
  /** Checked once per iteration; the fit returns with reason "cancelled" when aborted. */
  signal?: { readonly aborted: boolean };
}

/** FitOptions with every value in SI numbers (text with units parsed): what the fitter works with. */
export type ResolvedFitOptions = Omit<FitOptions, "start" | "fix" | "bounds"> & {
  start?: Record<string, number>;
  fix?: Record<string, number> | string[];
  bounds?: Record<string, [number, number]>;
};
