/**
 * Tests between nested models: the likelihood-ratio test (Wilks 1938: 2 Δln L ~ χ²(Δk) under
 * the simpler model) and the extra-sum-of-squares F-test
 * F = [(χ²_s − χ²_l)/Δk] / [χ²_l/ν_l] ~ F(Δk, ν_l) (e.g. Bevington & Robinson, Data Reduction
 * and Error Analysis, 3rd ed., §11.4).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import { chiSquaredSurvival } from "../math/chiSquared.js";
import { fSurvival } from "../math/fDistribution.js";

/** Likelihood-ratio and F test of one nested pair of fits. */
export interface NestedTestResult {
  /** Labels of the simpler and the larger fit. */
  simpler: string;
  larger: string;
  /** Extra free parameters of the larger model. */
  extraParameters: number;
  /** Likelihood ratio statistic 2(ln L_l − ln L_s), clipped at 0. */
  likelihoodRatio: number;
  likelihoodRatioPValue: number;
  /** F statistic and its p-value; the denominator degrees of freedom are ν_l. */
  f: number;
  fPValue: number;
  fDof: [number, number];
  /** How nesting was established: "parameters" (same model, free set ⊂), "model" (a known
   * pair of model ids) or "asserted" by the caller. */
  nesting: "parameters" | "model" | "asserted";
  /** True when the null value sits on a parameter bound (e.g. bandwidth = 0) and the
   * likelihood-ratio p-value was halved for the ½χ²₀ + ½χ²₁ null (Self & Liang 1987). */
  boundaryCorrected: boolean;
}

/**
 * Pairs of models where the simpler one is the larger one with parameters held at a bound:
 * two-slit is two-slit-broadband at bandwidth = 0.
 */
const KNOWN_NESTED: Record<string, { larger: string; extra: string[] }[]> = {
  "two-slit": [{ larger: "two-slit-broadband", extra: ["bandwidth"] }],
};

/**
 * Whether `simpler` is nested in `larger` by a known pair of model ids (see KNOWN_NESTED) with
 * the same free parameters apart from the pair's extra ones. Returns the extra (boundary)
 * parameters, or undefined when the pair is not known.
 */
export function knownNesting(simpler: FitResult, larger: FitResult): string[] | undefined {
  const pair = KNOWN_NESTED[simpler.modelId]?.find((p) => p.larger === larger.modelId);
  if (!pair) return undefined;
  const big = new Set(larger.freeNames);
  const sameOtherwise = simpler.freeNames.every((n) => big.has(n))
    && larger.freeNames.every((n) => simpler.freeNames.includes(n) || pair.extra.includes(n))
    && pair.extra.every((n) => big.has(n));
  return sameOtherwise ? pair.extra : undefined;
}

/**
 * Whether `simpler` is nested in `larger` judged from the fits alone: same model id, and the
 * free parameters of `simpler` are a strict subset of those of `larger` (the extra ones are
 * held fixed in `simpler`, which defines the null hypothesis). Different model ids are never
 * judged nested here; the caller can assert it (compareFits option `nested`).
 */
export function isNestedByParameters(simpler: FitResult, larger: FitResult): boolean {
  if (simpler.modelId !== larger.modelId) return false;
  const big = new Set(larger.freeNames);
  return simpler.freeNames.length < larger.freeNames.length && simpler.freeNames.every((name) => big.has(name));
}

/** The goodness-of-fit sum the F-test uses: χ² for gaussian noise, the deviance (objective) otherwise. */
function fitSum(fit: FitResult): number {
  return fit.noise === "gaussian" ? fit.statistics.chi2 : fit.statistics.objective;
}

/**
 * Likelihood-ratio test and F-test of `simpler` against `larger` (same data, same noise model;
 * nesting must be true — see isNestedByParameters and knownNesting).
 * @param labels   names used in the result (default: the model ids)
 * @param boundary the simpler model holds the one extra parameter at a bound (halves the LR p-value)
 */
export function nestedTest(
  simpler: FitResult,
  larger: FitResult,
  nesting: "parameters" | "model" | "asserted" = "parameters",
  labels: [string, string] = [simpler.modelId, larger.modelId],
  boundary = false,
): NestedTestResult {
  const extra = larger.statistics.nFree - simpler.statistics.nFree;
  if (extra <= 0) {
    throw new InvalidArgumentError("nested pair", `${labels[0]} (${simpler.statistics.nFree} free) ⊂ ${labels[1]} (${larger.statistics.nFree} free)`,
      "the larger model must have more free parameters than the simpler one; swap them or drop the assertion");
  }
  if (simpler.noise !== larger.noise) {
    throw new InvalidArgumentError("nested pair", `${simpler.noise} vs ${larger.noise}`, "both fits must use the same noise model");
  }
  const lr = Math.max(0, 2 * (larger.statistics.logLikelihood - simpler.statistics.logLikelihood));
  const dof = larger.statistics.dof;
  const sumLarger = fitSum(larger);
  const f = dof > 0 && sumLarger > 0 ? Math.max(0, (fitSum(simpler) - sumLarger) / extra / (sumLarger / dof)) : NaN;
  return {
    simpler: labels[0],
    larger: labels[1],
    extraParameters: extra,
    likelihoodRatio: lr,
    likelihoodRatioPValue: (boundary && extra === 1 ? 0.5 : 1) * chiSquaredSurvival(lr, extra),
    f,
    fPValue: Number.isFinite(f) ? fSurvival(f, extra, dof) : NaN,
    fDof: [extra, dof],
    nesting,
    boundaryCorrected: boundary && extra === 1,
  };
}
