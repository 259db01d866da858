/** The rows of a comparison without their diagnostics: what tables, widgets and JSON show. */
import type { ComparisonResult, ComparisonRow } from "./comparisonTypes.js";

/**
 * The rows of a compareFits result, in its order (best first), each without the residual
 * diagnostics but with their verdict (`residualsStructured`). Criteria are dimensionless.
 * @param result a compareFits result
 */
export function comparisonRows(result: ComparisonResult): ComparisonRow[] {
  return result.rows.map(({ diagnostics, ...row }) => ({ ...row, residualsStructured: diagnostics.structured }));
}
