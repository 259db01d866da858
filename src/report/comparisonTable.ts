/**
 * The table comparing several fits of the same data: χ²/ν, ln L, AIC (Akaike 1974) with
 * Δ to the best and Akaike weights exp(−Δ/2)/Σ exp(−Δ/2) (Burnham & Anderson 2002, §2.9),
 * and BIC (Schwarz 1978) with its Δ.
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import { comparisonRows } from "../stats/comparisonRows.js";
import type { ComparisonResult, Criterion } from "../stats/comparisonTypes.js";
import type { NestedTestResult } from "../stats/nested.js";
import { pText } from "../stats/residualDiagnostics.js";
import { DOUBTFUL_CODES, fixed, NOISE_WORDS } from "./fitTable.js";
import type { ReportTable, ReportTableRow } from "./table.js";

/** One fit in a comparison, with the label it is shown under (user text, escaped on output). */
export interface LabelledFit {
  label: string;
  result: FitResult;
}

/** Options of comparisonTable. */
export interface ComparisonTableOptions {
  caption?: string;
  /** A verdict in plain words (e.g. compareFits(...).verdict), printed as a note. */
  verdict?: string;
  /** The fits by label, for the goodness-of-fit column and the notes on doubtful fits. */
  fits?: readonly LabelledFit[];
  /** Nested-model tests (compareFits(...).tests), one note each with the statistics and p-values. */
  tests?: readonly NestedTestResult[];
  notes?: string[];
}



/**
 * Build the comparison table (one row per fit, best first) from a `compareFits` result, so the
 * table shows exactly the ranking its verdict speaks of. Ranking happens in stats/compareFits
 * (or compare() in api/); this only lays the numbers out.
 * @param comparison the ranking (criteria dimensionless)
 * @param options    caption, verdict, nested tests, notes, and the fits by label for the goodness-of-fit column
 */
export function comparisonTable(comparison: ComparisonResult, options: ComparisonTableOptions = {}): ReportTable {
  if (!comparison || typeof comparison !== "object" || !Array.isArray((comparison as ComparisonResult).rows) || comparison.rows.length === 0) {
    throw new InvalidArgumentError("comparison", Array.isArray(comparison) ? "a list of fits" : comparison, "a compareFits(...) result (rank a list of fits with compareFits or compare first)");
  }
  const ranking = comparisonRows(comparison);
  const criterion = comparison.criterion;
  const byLabel = new Map((options.fits ?? []).map((f) => [f.label, f.result]));
  const fitWord = (label: string): string => {
    const g = byLabel.get(label)?.goodness;
    if (!g) return "–";
    return g.verdict === "poor" ? "POOR" : g.verdict === "not-tested" ? "not tested" : g.verdict;
  };
  const rows: ReportTableRow[] = ranking.map((r) => ({
    cells: [
      r.converged ? r.label : `${r.label} (not converged)`,
      fitWord(r.label),
      String(r.k),
      fixed(r.reducedChi2, 3),
      fixed(r.logLikelihood, 1),
      fixed(r.aic, 1),
      fixed(r.deltaAic, 1),
      !r.converged ? "0" : r.weight < 0.001 ? "< 0.001" : r.weight.toFixed(3),
      fixed(r.bic, 1),
      fixed(r.deltaBic, 1),
    ],
  }));
  const n = comparison.rows[0].n;
  const noise = comparison.noise;
  const name = CRITERION_NAMES[criterion];
  const notes = [`${ranking.length} fits of the same ${n} points, noise model ${NOISE_WORDS[noise] ?? noise}; best ${name} first.`];
  if (ranking.some((r) => !r.converged)) notes.push("Fits that did not converge are listed last with weight 0.");
  for (const r of ranking) {
    const result = byLabel.get(r.label);
    for (const w of result?.warnings ?? []) {
      if (DOUBTFUL_CODES.includes(w.code)) notes.push(`${r.label}: ${w.message}; its AIC and weight rank a fit that is not credible.`);
    }
  }
  for (const t of options.tests ?? []) notes.push(testNote(t));
  if (options.verdict) notes.push(options.verdict);
  notes.push(...(options.notes ?? []));
  return {
    caption: options.caption ?? "Model comparison",
    columns: ["Model", "goodness of fit", "k", "χ²/ν", "ln L", "AIC", "ΔAIC", criterion === "aic" ? "Akaike weight" : `${name} weight`, "BIC", "ΔBIC"],
    align: ["l", "l", "r", "r", "r", "r", "r", "r", "r", "r"],
    rows,
    notes,
  };
}

const CRITERION_NAMES: Record<Criterion, string> = { aic: "AIC", aicc: "AICc", bic: "BIC" };

/** One line for a nested-model test: likelihood ratio (Wilks 1938) and F test, with p-values. */
export function testNote(t: NestedTestResult): string {
  const extra = `${t.extraParameters} extra parameter${t.extraParameters === 1 ? "" : "s"}`;
  return `${t.simpler} within ${t.larger} (${extra}): likelihood ratio ${fixed(t.likelihoodRatio, 2)}, ${pText(t.likelihoodRatioPValue)}; ` +
    `F(${t.fDof[0]}, ${t.fDof[1]}) = ${fixed(t.f, 2)}, ${pText(t.fPValue)}` +
    (t.boundaryCorrected ? " (likelihood-ratio p halved: the simpler model sits on a bound)." : ".");
}
