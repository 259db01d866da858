/**
 * The plain-words verdict of a comparison and its warnings. Strength words follow the ΔAIC rules
 * of thumb of Burnham & Anderson (Model Selection and Multimodel Inference, 2002, §2.6): below 2
 * the models are indistinct, above 10 the worse one has essentially no support.
 */
import { chiSquaredSurvival } from "../math/chiSquared.js";
import type { Criterion, LabelledEntry, ModelComparisonRow, UnreliableFit } from "./comparisonTypes.js";
import { farFieldValidity, isFarFieldModel } from "./farField.js";
import type { NestedTestResult } from "./nested.js";
import { pText } from "./residualDiagnostics.js";

/** Warnings about the preferred fit and the ones left out: structured residuals, far-field range, χ²/ν, fit warnings. */
export function collectWarnings(rows: ModelComparisonRow[], entries: LabelledEntry[]): string[] {
  const warnings: string[] = [];
  const best = rows[0];
  for (const row of rows) {
    if (!row.converged) warnings.push(`${row.label} did not converge and is left out of the ranking`);
  }
  if (best.diagnostics.structured) {
    const hint = isFarFieldModel(best.modelId) ? ": consider the near-field model" : ": consider a model with more physics (finite pixels, blur, bandwidth)";
    warnings.push(`residuals of ${best.label} still structured — ${best.diagnostics.reasons.join("; ")}${hint}`);
  }
  // χ² against its distribution with ν = n − k (Pearson χ² for Poisson fits); 0.1 % either tail.
  const dof = best.n - best.k;
  if (entries[0].fit.noise !== "robust" && dof > 0 && Number.isFinite(best.chi2)) {
    const upper = chiSquaredSurvival(best.chi2, dof);
    if (upper < 1e-3) {
      warnings.push(`reduced χ² of ${best.label} is ${best.reducedChi2.toFixed(2)} (${pText(upper)}): the scatter is larger than the noise model says, so uncertainties from an unscaled covariance are too small`);
    } else if (1 - upper < 1e-3) {
      warnings.push(`reduced χ² of ${best.label} is ${best.reducedChi2.toFixed(2)} (${pText(1 - upper)} for so small a value): σ seems overestimated`);
    }
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

/**
 * The verdict: which model, by how much, how sure, the nested tests, residuals and warnings;
 * `alpha` is the significance level (dimensionless). When some fit is unreliable (see
 * compareFits' unreliableFits) no preference is stated: the verdict names each unreliable fit and
 * why, and gives the criteria only as numbers.
 */
export function writeVerdict(rows: ModelComparisonRow[], tests: NestedTestResult[], warnings: string[], criterion: Criterion, alpha: number, unreliable: readonly UnreliableFit[] = []): string {
  const name = criterion.toUpperCase().replace("AICC", "AICc");
  const deltaKey = ({ aic: "deltaAic", aicc: "deltaAicc", bic: "deltaBic" } as const)[criterion];
  const best = rows[0];
  const parts: string[] = [];
  const ranked = rows.filter((r) => r.converged);
  if (unreliable.length > 0) {
    const which = unreliable.map((u) => `${u.label} (${u.reasons.join("; ")})`).join("; ");
    parts.push(`No model is preferred: the fit of ${which} ${unreliable.length > 1 ? "are" : "is"} unreliable, and a comparison with a failed fit says nothing about the models. ` +
      "Fix that fit first (starting values, model, mask or geometry) and compare again.");
    parts.push(`For the record, ${name} and reduced χ²: ${rows.map((r) => `${r.label} ${Number.isFinite(r[criterion]) ? r[criterion].toFixed(1) : "n/a"}, ${r.reducedChi2.toFixed(3)}`).join("; ")}.`);
    if (warnings.length) parts.push(`Warning: ${warnings.join("; ")}.`);
    return parts.join(" ");
  }
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
      `likelihood ratio ${t.likelihoodRatio.toFixed(1)}, ${pText(t.likelihoodRatioPValue)}${t.boundaryCorrected ? " (halved: the simpler model sits on the extra parameter's bound)" : ""}; F = ${Number.isFinite(t.f) ? t.f.toFixed(2) : "n/a"}, ` +
      `${pText(t.fPValue)} — the extra parameter${t.extraParameters > 1 ? "s are" : " is"} ${significant ? "needed" : "not needed"} at the ${alpha} level.`);
  }
  const d = best.diagnostics;
  if (!d.structured) {
    const periodic = d.periodicity ? `, power at the fringe frequency ${d.periodicity.ratio.toFixed(1)} × noise floor (${pText(d.periodicity.pValue)})` : "";
    parts.push(`Residuals of ${best.label} look like noise (runs test ${pText(d.runs.pValue)}, Durbin–Watson ${d.durbinWatson.toFixed(2)}${periodic}).`);
  }
  if (warnings.length) parts.push(`Warning: ${warnings.join("; ")}.`);
  return parts.join(" ");
}
