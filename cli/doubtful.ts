/**
 * Exit status and stderr line for fits that converged but that a check calls doubtful:
 * "poor-fit" (χ² test), "no-fringes", "fringe-aliased". Status 3 unless --accept-doubtful.
 */
import { DOUBTFUL_CODES, type FitResult } from "../src/advanced.js";

/** Exit status of a converged fit that a check calls doubtful. */
export const DOUBTFUL_EXIT = 3;

/**
 * The doubtful warnings of converged fits, as one phrase ("" when none).
 * @param fits labelled fits (label "" for a single fit)
 */
export function doubtfulSummary(fits: readonly { label: string; fit: FitResult }[]): string {
  const parts: string[] = [];
  for (const { label, fit } of fits) {
    if (!fit.converged) continue;
    for (const w of fit.warnings) if (DOUBTFUL_CODES.includes(w.code)) parts.push(`${label ? `${label}: ` : ""}${w.message}`);
  }
  return parts.join("; ");
}

/** What to print after the doubtful phrase: where the result went and how to accept it. */
export function doubtfulAdvice(accepted: boolean): string {
  return accepted
    ? "the result was written and accepted (--accept-doubtful)"
    : `the result was still written; exit status ${DOUBTFUL_EXIT} (give --accept-doubtful to exit with 0 on such fits)`;
}
