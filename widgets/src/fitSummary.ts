/**
 * The JSON form of a fit result that widgets carry in their state (no typed arrays, no
 * Infinity: JSON cannot hold it, so "cannot be estimated" travels as null).
 */

export interface SummaryParameter {
  name: string;
  unit: string;
  value: number;
  /** Standard uncertainty (SI); null when it cannot be estimated. */
  stderr: number | null;
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
