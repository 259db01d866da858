/**
 * compareFits: one call from several fits of the same data to a ranked table, nested-model
 * tests, residual diagnostics and a plain-words verdict (see verdict.ts).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import { comparisonRows } from "./comparisonRows.js";
import type { CompareOptions, ComparisonEntry, ComparisonJson, ComparisonResult, Criterion, LabelledEntry, ModelComparisonRow, UnreliableFit } from "./comparisonTypes.js";
import { akaikeWeights, fitCriteria } from "./criteria.js";
import { profileFingerprint } from "./fingerprint.js";
import { isNestedByParameters, knownNesting, nestedTest, type NestedTestResult } from "./nested.js";
import { residualDiagnostics } from "./residualDiagnostics.js";
import { collectWarnings, writeVerdict } from "./verdict.js";

/**
 * Compares fits of one profile by information criteria, nested tests and residual diagnostics.
 * Refuses fits of different data (fingerprint, point count or mask differ) or with different
 * noise models, naming the two fits and what to do.
 * @example compareFits([farFit, nearFit], { profile }).verdict
 */
export function compareFits(fits: readonly (FitResult | ComparisonEntry)[], options: CompareOptions = {}): ComparisonResult {
  const entries = normaliseEntries(fits, options.profile);
  const criterion = options.criterion ?? "aic";
  if (!["aic", "aicc", "bic"].includes(criterion)) throw new InvalidArgumentError("criterion", criterion, 'one of "aic", "aicc", "bic"');
  const alpha = options.alpha ?? 0.01;
  if (!(alpha > 0 && alpha < 1)) throw new InvalidArgumentError("alpha", alpha, "a significance level between 0 and 1");
  checkSameData(entries);

  const criteria = entries.map((e) => fitCriteria(e.fit));
  const usable = entries.map((e) => e.fit.converged);
  if (!usable.some(Boolean)) {
    throw new InvalidArgumentError("fits", entries.map((e) => e.label), "at least one fit must have converged; refit with other start values");
  }
  const pick = (key: Criterion) => criteria.map((c, i) => (usable[i] ? c[key] : Infinity));
  const aic = akaikeWeights(pick("aic"));
  const aicc = akaikeWeights(pick("aicc"));
  const bic = akaikeWeights(pick("bic"));
  const chosen = { aic, aicc, bic }[criterion];

  const rows: ModelComparisonRow[] = entries.map((e, i) => ({
    label: e.label,
    modelId: e.fit.modelId,
    converged: e.fit.converged,
    n: criteria[i].n,
    k: criteria[i].k,
    logLikelihood: criteria[i].logLikelihood,
    chi2: e.fit.statistics.chi2,
    reducedChi2: e.fit.statistics.reducedChi2,
    aic: criteria[i].aic,
    aicc: criteria[i].aicc,
    bic: criteria[i].bic,
    deltaAic: aic.delta[i],
    deltaAicc: aicc.delta[i],
    deltaBic: bic.delta[i],
    weight: chosen.weight[i],
    diagnostics: residualDiagnostics(e.fit, { x: e.profile?.x, alpha }),
  }));
  const deltaKey = ({ aic: "deltaAic", aicc: "deltaAicc", bic: "deltaBic" } as const)[criterion];
  rows.sort((a, b) => a[deltaKey] - b[deltaKey] || a.k - b.k);
  const tests = nestedPairs(entries, options.nested ?? []);
  const warnings = collectWarnings(rows, entries);
  const unreliable = unreliableFits(entries, rows[0].label);
  return {
    criterion,
    noise: entries[0].fit.noise,
    rows,
    preferred: unreliable.length > 0 ? null : rows[0].label,
    unreliable,
    tests,
    warnings,
    verdict: writeVerdict(rows, tests, warnings, criterion, alpha, unreliable),
  };
}

/** Warning codes that mark a fit as plainly failed: a comparison with it states no preference. */
export const FAILED_FIT_CODES: readonly string[] = ["poor-fit", "no-fringes", "fringe-aliased"];

/**
 * The fits of a comparison that plainly failed: not converged (with the solver's reason), or a
 * warning whose code is in {@link FAILED_FIT_CODES} (with its message). Ranking such a fit against
 * the others would compare a model with a failure to find its optimum, so no preference is stated.
 * A poor fit ("poor-fit") of a model that ranks below `best` is what a comparison is for (the
 * wrong model does not describe the data) and does not count; a poor fit of the best-ranked model
 * does: then no candidate describes the data.
 * @param best label of the best-ranked fit (omit to count every poor fit)
 */
export function unreliableFits(entries: readonly { fit: FitResult; label: string }[], best?: string): UnreliableFit[] {
  const out: UnreliableFit[] = [];
  for (const { fit, label } of entries) {
    const reasons: string[] = [];
    if (!fit.converged) reasons.push(`did not converge (${fit.message})`);
    for (const w of fit.warnings) {
      if (!FAILED_FIT_CODES.includes(w.code)) continue;
      if (w.code === "poor-fit" && best !== undefined && label !== best) continue;
      reasons.push(`${w.code}: ${w.message}`);
    }
    if (reasons.length > 0) out.push({ label, reasons });
  }
  return out;
}

/** The `fringekit compare --json` document of a comparison. */
export function comparisonJson(result: ComparisonResult): ComparisonJson {
  return {
    ranking: comparisonRows(result),
    preferred: result.preferred,
    unreliable: result.unreliable,
    criterion: result.criterion,
    tests: result.tests,
    warnings: result.warnings,
    verdict: result.verdict,
  };
}

function normaliseEntries(fits: readonly (FitResult | ComparisonEntry)[], shared: Profile | undefined): LabelledEntry[] {
  if (!Array.isArray(fits) || fits.length === 0) throw new InvalidArgumentError("fits", fits, "a non-empty array of fit results");
  const seen = new Map<string, number>();
  return fits.map((item, i) => {
    const entry: ComparisonEntry = "fit" in item ? item : { fit: item };
    if (!entry.fit || !entry.fit.statistics || !entry.fit.residuals) {
      throw new InvalidArgumentError(`fits[${i}]`, typeof item, "a FitResult or { fit, profile?, label? }");
    }
    let label = entry.label ?? entry.fit.modelId;
    const count = seen.get(label) ?? 0;
    seen.set(label, count + 1);
    if (count > 0) label = `${label} #${count + 1}`;
    return { fit: entry.fit, profile: entry.profile ?? shared, label };
  });
}

function checkSameData(entries: LabelledEntry[]): void {
  const first = entries[0];
  const firstPrint = first.profile ? profileFingerprint(first.profile) : undefined;
  for (const other of entries.slice(1)) {
    const pair = `${first.label} and ${other.label}`;
    if (other.fit.noise !== first.fit.noise) {
      throw new InvalidArgumentError("fits", `${pair}: noise ${first.fit.noise} vs ${other.fit.noise}`,
        "information criteria only compare fits with the same noise model; refit with the same noise option");
    }
    if (other.fit.statistics.n !== first.fit.statistics.n || other.fit.residuals.length !== first.fit.residuals.length) {
      throw new InvalidArgumentError("fits", `${pair}: ${first.fit.statistics.n} vs ${other.fit.statistics.n} points used`,
        "fits of different data cannot be compared; fit every model to the same profile and mask");
    }
    for (let i = 0; i < first.fit.residuals.length; i++) {
      if (Number.isNaN(first.fit.residuals[i]) !== Number.isNaN(other.fit.residuals[i])) {
        throw new InvalidArgumentError("fits", `${pair}: masks differ at point ${i}`,
          "fits of different data cannot be compared; fit every model with the same mask");
      }
    }
    if (firstPrint && other.profile) {
      const print = profileFingerprint(other.profile);
      if (print !== firstPrint) {
        throw new InvalidArgumentError("fits", `${pair}: data fingerprints ${firstPrint} vs ${print}`,
          "fits of different data cannot be compared; fit every model to the same profile");
      }
    }
  }
}

function nestedPairs(entries: LabelledEntry[], asserted: [string, string][]): NestedTestResult[] {
  const byLabel = new Map(entries.map((e) => [e.label, e]));
  const tests: NestedTestResult[] = [];
  const done = new Set<string>();
  for (const [simple, large] of asserted) {
    const a = byLabel.get(simple);
    const b = byLabel.get(large);
    if (!a || !b) {
      throw new InvalidArgumentError("nested", [simple, large], `labels of the compared fits: ${[...byLabel.keys()].join(", ")}`);
    }
    tests.push(nestedTest(a.fit, b.fit, "asserted", [a.label, b.label]));
    done.add(`${a.label}\u0000${b.label}`);
  }
  for (const a of entries) {
    for (const b of entries) {
      if (a === b || !a.fit.converged || !b.fit.converged || done.has(`${a.label}\u0000${b.label}`)) continue;
      if (isNestedByParameters(a.fit, b.fit)) tests.push(nestedTest(a.fit, b.fit, "parameters", [a.label, b.label]));
      else if (knownNesting(a.fit, b.fit)) tests.push(nestedTest(a.fit, b.fit, "model", [a.label, b.label], true));
    }
  }
  return tests;
}
