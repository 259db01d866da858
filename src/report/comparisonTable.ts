/**
 * The table comparing several fits of the same data: χ²/ν, ln L, AIC (Akaike 1974) with
 * Δ to the best and Akaike weights exp(−Δ/2)/Σ exp(−Δ/2) (Burnham & Anderson 2002, §2.9),
 * and BIC (Schwarz 1978) with its Δ.
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import { akaikeWeights } from "../stats/criteria.js";
import type { NestedTestResult } from "../stats/nested.js";
import { fixed } from "./fitTable.js";
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
  /** Nested-model tests (compareFits(...).tests), one note each with the statistics and p-values. */
  tests?: readonly NestedTestResult[];
  notes?: string[];
}

/** Numbers of one comparison row; also used by figures and results files. */
export interface ComparisonRow {
  label: string;
  modelId: string;
  k: number;
  reducedChi2: number;
  logLikelihood: number;
  aic: number;
  deltaAic: number;
  weight: number;
  bic: number;
  deltaBic: number;
}

/**
 * AIC/BIC ranking of fits to the same data, best (lowest AIC) first; Δ and Akaike weights
 * from stats' `akaikeWeights` (the same arithmetic `compareFits` uses).
 * Refuses fits with different point counts or noise models: their likelihoods are not comparable.
 */
export function rankFits(fits: readonly LabelledFit[]): ComparisonRow[] {
  if (!Array.isArray(fits) || fits.length === 0) throw new InvalidArgumentError("fits", fits, "a non-empty list of {label, result}");
  const first = fits[0].result;
  for (const f of fits) {
    if (f.result.statistics.n !== first.statistics.n || f.result.noise !== first.noise) {
      throw new InvalidArgumentError(
        "fits",
        f.label,
        `every fit must use the same data and noise model (first: n = ${first.statistics.n}, ${first.noise}; this: n = ${f.result.statistics.n}, ${f.result.noise})`,
      );
    }
  }
  // Δ and weights come from stats (one implementation of the criteria arithmetic); the
  // values ranked are the ones the fits report, which the table shows beside them.
  const aic = akaikeWeights(fits.map((f) => f.result.statistics.aic));
  const bic = akaikeWeights(fits.map((f) => f.result.statistics.bic));
  return fits
    .map((f, i) => ({
      label: f.label,
      modelId: f.result.modelId,
      k: f.result.statistics.nFree,
      reducedChi2: f.result.statistics.reducedChi2,
      logLikelihood: f.result.statistics.logLikelihood,
      aic: f.result.statistics.aic,
      deltaAic: aic.delta[i],
      weight: aic.weight[i],
      bic: f.result.statistics.bic,
      deltaBic: bic.delta[i],
    }))
    .sort((a, b) => a.aic - b.aic);
}

/** Build the comparison table (one row per fit, best first). */
export function comparisonTable(fits: readonly LabelledFit[], options: ComparisonTableOptions = {}): ReportTable {
  const ranking = rankFits(fits);
  const rows: ReportTableRow[] = ranking.map((r) => ({
    cells: [
      r.label,
      String(r.k),
      fixed(r.reducedChi2, 3),
      fixed(r.logLikelihood, 1),
      fixed(r.aic, 1),
      fixed(r.deltaAic, 1),
      r.weight < 0.001 ? "< 0.001" : r.weight.toFixed(3),
      fixed(r.bic, 1),
      fixed(r.deltaBic, 1),
    ],
  }));
  const notes = [`${fits.length} fits of the same ${fits[0].result.statistics.n} points, ${fits[0].result.noise} noise model; best AIC first.`];
  for (const t of options.tests ?? []) notes.push(testNote(t));
  if (options.verdict) notes.push(options.verdict);
  notes.push(...(options.notes ?? []));
  return {
    caption: options.caption ?? "Model comparison",
    columns: ["Model", "k", "χ²/ν", "ln L", "AIC", "ΔAIC", "Akaike weight", "BIC", "ΔBIC"],
    align: ["l", "r", "r", "r", "r", "r", "r", "r", "r"],
    rows,
    notes,
  };
}

/** One line for a nested-model test: likelihood ratio (Wilks 1938) and F test, with p-values. */
export function testNote(t: NestedTestResult): string {
  // Below 1e-12 the tail probability is beyond the accuracy of the distributions: say so.
  const p = (x: number) => (x < 1e-12 ? "< 1e-12" : x < 1e-4 ? `= ${x.toExponential(1)}` : `= ${x.toPrecision(2)}`);
  const extra = `${t.extraParameters} extra parameter${t.extraParameters === 1 ? "" : "s"}`;
  return `${t.simpler} within ${t.larger} (${extra}): likelihood ratio ${fixed(t.likelihoodRatio, 2)}, p ${p(t.likelihoodRatioPValue)}; ` +
    `F(${t.fDof[0]}, ${t.fDof[1]}) = ${fixed(t.f, 2)}, p ${p(t.fPValue)}` +
    (t.boundaryCorrected ? " (likelihood-ratio p halved: the simpler model sits on a bound)." : ".");
}
