/**
 * Goodness of fit when the noise scale is known (Poisson counts, or σ from the data).
 *
 * Test: Pearson's χ² = Σ ((y − f)/σ)² (σ² = f for Poisson) against the χ² distribution with
 * ν = n − k degrees of freedom (Pearson 1900; for Poisson data Baker & Cousins 1984, NIM 221:437,
 * §2, on its large-count limit). Verdicts:
 *   "poor"     upper-tail p < 0.001 AND χ²/ν > 1.5: the model does not describe the data;
 *   "marginal" p < 0.001 but χ²/ν ≤ 1.5: a statistically significant misfit too small to make
 *              the parameters meaningless (at very high counts a 1 % model imperfection is
 *              already significant); uncertainties should be read as scaled by √(χ²/ν);
 *   "low"      lower-tail p < 0.001: the scatter is smaller than σ says (σ overestimated?);
 *   "good"     otherwise; "not-tested" when the noise scale is unknown (σ relative, robust loss).
 * The floor 1.5 means the misfit variance is at least half the noise variance: beyond it the
 * residual structure is as large as the noise itself.
 */
import { chiSquaredCdf, chiSquaredSurvival } from "../math/chiSquared.js";
import type { FringeDetection } from "./fringeDetection.js";

/** Significance level of the χ² test (two one-sided tails, each at this level). */
export const GOODNESS_P_THRESHOLD = 1e-3;
/** χ²/ν below which a significant misfit is only "marginal" (dimensionless). */
export const GOODNESS_REDUCED_CHI2_FLOOR = 1.5;

/** The goodness-of-fit test of a result and its verdict (`result.goodness`). */
export interface GoodnessOfFit {
  /** "pearson-chi2" when tested, "none" when the noise scale is unknown. */
  test: "pearson-chi2" | "none";
  verdict: "good" | "marginal" | "poor" | "low" | "not-tested";
  /** Pearson χ² (dimensionless), degrees of freedom ν and χ²/ν. */
  chi2: number;
  dof: number;
  reducedChi2: number;
  /** Upper-tail probability P(χ²_ν ≥ χ²) (NaN when not tested). */
  pValue: number;
  /** Thresholds used: p-value level and the χ²/ν floor of a "poor" verdict. */
  threshold: { pValue: number; reducedChi2Floor: number };
  /** One sentence for reports, e.g. "the model does not describe these data (χ²/ν = 4270, …)". */
  summary: string;
  /** Fringe detection on the data and the fitted period (fringe models only). */
  fringes?: FringeDetection;
}

/**
 * Tests χ² against the χ² distribution with ν degrees of freedom when the noise scale is known.
 * @param chi2       Pearson χ² at the optimum (dimensionless)
 * @param dof        degrees of freedom ν = n − k
 * @param knownScale whether σ is known in absolute terms (Poisson, or σ from the data)
 * @param why        why the scale is unknown (for the summary), when knownScale is false
 */
export function goodnessOfFit(chi2: number, dof: number, knownScale: boolean, why = "the noise scale is not known"): GoodnessOfFit {
  const reducedChi2 = dof > 0 ? chi2 / dof : NaN;
  const threshold = { pValue: GOODNESS_P_THRESHOLD, reducedChi2Floor: GOODNESS_REDUCED_CHI2_FLOOR };
  const base = { chi2, dof, reducedChi2, threshold };
  if (!knownScale || !(dof > 0) || !Number.isFinite(chi2)) {
    const reason = !knownScale ? why : !(dof > 0) ? "no degrees of freedom are left" : "χ² is not finite";
    return { ...base, test: "none", verdict: "not-tested", pValue: NaN, summary: `goodness of fit not tested: ${reason}` };
  }
  const pValue = chiSquaredSurvival(chi2, dof);
  const lower = chiSquaredCdf(chi2, dof);
  const spread = Math.sqrt(2 / dof); // standard deviation of χ²/ν under the hypothesis
  const facts = `χ²/ν = ${significant(reducedChi2)} for ν = ${dof}, p ${pText(pValue)}; expected 1 ± ${significant(spread)}`;
  if (pValue < GOODNESS_P_THRESHOLD && reducedChi2 > GOODNESS_REDUCED_CHI2_FLOOR) {
    return { ...base, test: "pearson-chi2", verdict: "poor", pValue, summary: `the model does not describe these data (${facts})` };
  }
  if (pValue < GOODNESS_P_THRESHOLD) {
    return { ...base, test: "pearson-chi2", verdict: "marginal", pValue, summary: `small but significant misfit (${facts}; below the ${GOODNESS_REDUCED_CHI2_FLOOR} floor of a poor fit)` };
  }
  if (lower < GOODNESS_P_THRESHOLD) {
    return { ...base, test: "pearson-chi2", verdict: "low", pValue, summary: `scatter smaller than σ says (${facts}): σ may be overestimated` };
  }
  return { ...base, test: "pearson-chi2", verdict: "good", pValue, summary: `consistent with the noise (${facts})` };
}

/** Three significant digits, plain notation when reasonable. */
function significant(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  return a >= 1e5 || (a > 0 && a < 1e-3) ? x.toExponential(2) : String(Number(x.toPrecision(3)));
}

/** "= 0.23", "< 1e-300". */
function pText(p: number): string {
  if (p < 1e-300) return "< 1e-300";
  return `= ${p < 1e-3 ? p.toExponential(1) : String(Number(p.toPrecision(2)))}`;
}
