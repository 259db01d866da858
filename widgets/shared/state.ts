/**
 * What the kernel side and the browser side of the widgets exchange besides arrays: table rows,
 * profiled parameters, fitted source quantities, fit progress. Pure (no DOM, no Node); imported
 * by kernel-ext/widgets and widgets/src alike.
 */
import type { ModelComparisonRow } from "../../src/stats/comparisonTypes.js";

/** One row of the comparison widget's table: the comparison's own row type, JSON part (criteria dimensionless). */
export type ComparisonTableRow = Pick<ModelComparisonRow, "label" | "modelId" | "k" | "reducedChi2" | "aic" | "bic" | "deltaAic" | "weight" | "converged">;

/** One profiled parameter of the uncertainty widget (JSON part; the curve itself is a row of `grid` / `delta`). */
export interface ProfiledParameter {
  name: string;
  unit: string;
  best: number;
  uncertainty: number | null;
  /** Profile-likelihood interval [lower, upper] (SI); null ends where the curve never crossed the threshold. */
  interval: [number | null, number | null];
}

/** A fitted quantity of the source model, shown beside the coherence-scan plot (SI). */
export interface ScanQuantity {
  name: string;
  unit: string;
  value: number;
  uncertainty: number | null;
}

/** Solver progress mapped to 0…1 for a progress bar: iterations on a log scale (the total is unknown). */
export function progressFraction(iteration: number): number {
  return Math.min(0.95, Math.log1p(iteration) / Math.log1p(60));
}
