/**
 * compareFits: one call from several fits of the same data to a ranked table, nested-model
 * tests, residual diagnostics and a plain-words verdict.
 * Strength words follow the ΔAIC rules of thumb of Burnham & Anderson (Model Selection and
 * Multimodel Inference, 2002, §2.6): below 2 indistinct, above 10 no support for the worse model.
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import { akaikeWeights, fitCriteria } from "./criteria.js";
import { farFieldValidity, isFarFieldModel } from "./farField.js";
import { profileFingerprint } from "./fingerprint.js";
import { isNestedByParameters, nestedTest, type NestedTestResult } from "./nested.js";
import { formatP, residualDiagnostics, type ResidualDiagnostics } from "./residualDiagnostics.js";

/** A fit to compare, optionally with the profile it was fitted to and a label. */
export interface ComparisonEntry {
  fit: FitResult;
  /** The data the fit used; when given for every entry, the data fingerprints must agree. */
  profile?: Profile;
  /** Row name (default: the model id, made unique). */
  label?: string;
}

export type Criterion = "aic" | "aicc" | "bic";

export interface CompareOptions {
  /** The data all fits used (positions for the periodicity test, fingerprint check). */
  profile?: Profile;
  /** Criterion that ranks the models and drives the weights (default "aic"). */
  criterion?: Criterion;
  /** Pairs [simpler, larger] (labels) the caller asserts are nested although the model ids differ. */
  nested?: [string, string][];
  /** Significance level for the nested tests and residual diagnostics (default 0.01). */
  alpha?: number;
}

export interface ModelComparisonRow {
  label: string;
  modelId: string;
  converged: boolean;
  n: number;
  k: number;
  logLikelihood: number;
  chi2: number;
  reducedChi2: number;
  aic: number;
  aicc: number;
  bic: number;
  /** Differences to the best converged fit, for each criterion. */
  deltaAic: number;
  deltaAicc: number;
  deltaBic: number;
  /** Akaike weight under the chosen criterion (0 for fits that did not converge). */
  weight: number;
  diagnostics: ResidualDiagnostics;
}

export interface ComparisonResult {
  criterion: Criterion;
  noise: FitResult["noise"];
  /** Rows sorted best first by the criterion (fits that did not converge last). */
  rows: ModelComparisonRow[];
  /** Label of the preferred fit. */
  preferred: string;
  /** Nested-model tests for every pair found nested or asserted. */
  tests: NestedTestResult[];
  /** Short warnings, also woven into the verdict. */
  warnings: string[];
  /** Plain-words conclusion with the numbers behind it. */
  verdict: string;
}

/** Shape of `fringekit compare --json`. */
export interface ComparisonJson {
  ranking: {
    model: string;
    label: string;
    converged: boolean;
    n: number;
    k: number;
    logLikelihood: number;
    chi2: number;
    reducedChi2: number;
    aic: number;
    aicc: number;
    bic: number;
    deltaAic: number;
    deltaBic: number;
    weight: number;
    residualsStructured: boolean;
  }[];
  preferred: string;
  criterion: Criterion;
  tests: NestedTestResult[];
  warnings: string[];
  verdict: string;
}

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
  return {
    criterion,
    noise: entries[0].fit.noise,
    rows,
    preferred: rows[0].label,
    tests,
    warnings,
    verdict: writeVerdict(rows, tests, warnings, criterion, alpha),
  };
}

/** The `fringekit compare --json` document of a comparison. */
export function comparisonJson(result: ComparisonResult): ComparisonJson {
  return {
    ranking: result.rows.map((r) => ({
      model: r.modelId,
      label: r.label,
      converged: r.converged,
      n: r.n,
      k: r.k,
      logLikelihood: r.logLikelihood,
      chi2: r.chi2,
      reducedChi2: r.reducedChi2,
      aic: r.aic,
      aicc: r.aicc,
      bic: r.bic,
      deltaAic: r.deltaAic,
      deltaBic: r.deltaBic,
      weight: r.weight,
      residualsStructured: r.diagnostics.structured,
    })),
    preferred: result.preferred,
    criterion: result.criterion,
    tests: result.tests,
    warnings: result.warnings,
    verdict: result.verdict,
  };
}

interface Entry {
  fit: FitResult;
  profile?: Profile;
  label: string;
}

function normaliseEntries(fits: readonly (FitResult | ComparisonEntry)[], shared: Profile | undefined): Entry[] {
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

function checkSameData(entries: Entry[]): void {
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

function nestedPairs(entries: Entry[], asserted: [string, string][]): NestedTestResult[] {
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
    }
  }
  return tests;
}

function collectWarnings(rows: ModelComparisonRow[], entries: Entry[]): string[] {
  const warnings: string[] = [];
  const best = rows[0];
  for (const row of rows) {
    if (!row.converged) warnings.push(`${row.label} did not converge and is left out of the ranking`);
  }
  if (best.diagnostics.structured) {
    const hint = isFarFieldModel(best.modelId) ? ": consider the near-field model" : ": consider a model with more physics (finite pixels, blur, bandwidth)";
    warnings.push(`residuals of ${best.label} still structured — ${best.diagnostics.reasons.join("; ")}${hint}`);
  }
  if (best.reducedChi2 > 1.5 && entries[0].fit.noise !== "robust") {
    warnings.push(`reduced χ² of ${best.label} is ${best.reducedChi2.toFixed(2)}: the scatter is larger than the noise model says, so uncertainties from an unscaled covariance are too small`);
  } else if (best.reducedChi2 < 0.5) {
    warnings.push(`reduced χ² of ${best.label} is ${best.reducedChi2.toFixed(2)}: σ seems overestimated`);
  }
  const bestFit = entries.find((e) => e.label === best.label)!.fit;
  if (isFarFieldModel(best.modelId)) {
    try {
      const validity = farFieldValidity(bestFit);
      if (validity.warning) warnings.push(validity.warning);
    } catch {
      // The model lacks width/wavelength/distance: nothing to check.
    }
  }
  const fitWarnings = bestFit.warnings;
  for (const w of fitWarnings) warnings.push(`${best.label}: ${w.message}`);
  return warnings;
}

function strength(delta: number): string {
  if (delta < 2) return "the data hardly tell them apart";
  if (delta < 4) return "weak preference";
  if (delta < 10) return "clear preference";
  return "decisive preference";
}

function writeVerdict(rows: ModelComparisonRow[], tests: NestedTestResult[], warnings: string[], criterion: Criterion, alpha: number): string {
  const name = criterion.toUpperCase().replace("AICC", "AICc");
  const deltaKey = ({ aic: "deltaAic", aicc: "deltaAicc", bic: "deltaBic" } as const)[criterion];
  const best = rows[0];
  const parts: string[] = [];
  const ranked = rows.filter((r) => r.converged);
  if (ranked.length === 1) {
    parts.push(`Only ${best.label} can be ranked (${name} ${best[criterion].toFixed(1)}, reduced χ² ${best.reducedChi2.toFixed(3)}).`);
  } else {
    const second = ranked[1];
    const delta = second[deltaKey];
    parts.push(`${best.label} is preferred over ${second.label}: Δ${name} = ${delta.toFixed(1)} (${strength(delta)}; ` +
      `weight ${best.weight.toFixed(3)} against ${second.weight.toFixed(3)}).`);
    if (delta < 2 && second.k < best.k) parts.push(`With so small a difference the simpler ${second.label} is as good a description.`);
    parts.push(`Reduced χ²: ${ranked.map((r) => `${r.label} ${r.reducedChi2.toFixed(3)}`).join(", ")}.`);
  }
  for (const t of tests) {
    const significant = t.likelihoodRatioPValue < alpha;
    parts.push(`${t.larger} against ${t.simpler} (${t.extraParameters} extra parameter${t.extraParameters > 1 ? "s" : ""}): ` +
      `likelihood ratio ${t.likelihoodRatio.toFixed(1)}, p = ${formatP(t.likelihoodRatioPValue)}; F = ${Number.isFinite(t.f) ? t.f.toFixed(2) : "n/a"}, ` +
      `p = ${formatP(t.fPValue)} — the extra parameter${t.extraParameters > 1 ? "s are" : " is"} ${significant ? "needed" : "not needed"} at the ${alpha} level.`);
  }
  const d = best.diagnostics;
  if (!d.structured) {
    const periodic = d.periodicity ? `, power at the fringe frequency ${d.periodicity.ratio.toFixed(1)} × noise floor (p = ${formatP(d.periodicity.pValue)})` : "";
    parts.push(`Residuals of ${best.label} look like noise (runs test p = ${formatP(d.runs.pValue)}, Durbin–Watson ${d.durbinWatson.toFixed(2)}${periodic}).`);
  }
  if (warnings.length) parts.push(`Warning: ${warnings.join("; ")}.`);
  return parts.join(" ");
}
