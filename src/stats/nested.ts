/**
 * Tests between nested models: the likelihood-ratio test (Wilks 1938: 2 Δln L ~ χ²(Δk) under
 * the simpler model) and the extra-sum-of-squares F-test
 * F = [(χ²_s − χ²_l)/Δk] / [χ²_l/ν_l] ~ F(Δk, ν_l) (e.g. Bevington & Robinson, Data Reduction
 * and Error Analysis, 3rd ed., §11.4).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import { chiSquaredSurvival } from "./chiSquared.js";
import { fSurvival } from "./fDistribution.js";

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
  /** How nesting was established: "parameters" (same model, free set ⊂) or "asserted" by the caller. */
  nesting: "parameters" | "asserted";
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
 * nesting must be true — see isNestedByParameters).
 * @param labels names used in the result (default: the model ids)
 */
export function nestedTest(
  simpler: FitResult,
  larger: FitResult,
  nesting: "parameters" | "asserted" = "parameters",
  labels: [string, string] = [simpler.modelId, larger.modelId],
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
    likelihoodRatioPValue: chiSquaredSurvival(lr, extra),
    f,
    fPValue: Number.isFinite(f) ? fSurvival(f, extra, dof) : NaN,
    fDof: [extra, dof],
    nesting,
  };
}
