/**
 * What the kernel side and the browser side of the widgets exchange besides arrays: table rows,
 * profiled parameters, fitted source quantities, fit progress. Pure (no DOM, no Node); imported
 * by kernel-ext/widgets and widgets/src alike.
 */
import type { ComparisonRow } from "../../src/stats/comparisonTypes.js";

/** One row of the comparison widget's table: the comparison row every table and JSON file shows (stats/comparisonRows). */
export type ComparisonTableRow = ComparisonRow;

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
