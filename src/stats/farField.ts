/**
 * Far-field validity of a fitted geometry, with uncertainties: the slit Fresnel number
 * a²/(λL) and the envelope-offset number (N − 1)·d·a/(λL) of the physics helper
 * `farFieldCheck` (limit 0.1 by default, common practice: N_F ≪ 1), propagated from the fit
 * and the calibration. A far-field model used outside that range gets a warning.
 */
import type { FitResult } from "../fit/types.js";
import { farFieldCheck } from "../physics/formulas.js";
import { getModel } from "../physics/registry.js";
import { findFitParameter, requireFitParameter } from "./fitParameters.js";
import { derivedQuantity, propagateDerived, type Calibration, type DerivedQuantity, type Values } from "./quantity.js";

/** Result of farFieldValidity: Fresnel numbers (dimensionless) ± u and the verdict on the far-field model. */
export interface FarFieldValidity {
  fresnelNumber: DerivedQuantity;
  offsetNumber: DerivedQuantity;
  /** True when both numbers are below the limit. */
  valid: boolean;
  /** Whether the fitted model is a far-field model (its id has no "fresnel"). */
  farFieldModel: boolean;
  /** Set when a far-field model is used outside its range. */
  warning?: string;
  /** The physics helper's one-sentence summary. */
  message: string;
}

/** Model ids of far-field (Fraunhofer) patterns; "two-slit-fresnel" is the near-field model. */
export function isFarFieldModel(modelId: string): boolean {
  return ["two-slit", "n-slit", "single-slit", "two-slit-broadband", "two-slit-broadband-wavelength", "two-slit-spectrum", "two-slit-disc-source", "two-slit-gaussian-source"].includes(modelId);
}

/**
 * Fresnel numbers of the fitted (or calibrated) geometry and whether the far-field model applies.
 * @param fit         fit with width (m), wavelength (m), distance (m), optionally separation (m) and slits
 * @param calibration distance, wavelength ± u (m) replace the fit's values
 * @param limit       largest acceptable number (default 0.1)
 */
export function farFieldValidity(fit: FitResult, calibration: Calibration = {}, limit = 0.1): FarFieldValidity {
  for (const name of ["width", "wavelength", "distance"]) requireFitParameter(fit, name, "the far-field check");
  const slits = findFitParameter(fit, "slits")?.value ?? 2;
  const lambda = (v: Values) => v["cal.wavelength"] ?? v.wavelength;
  const distance = (v: Values) => v["cal.distance"] ?? v.distance;
  const fresnel = propagateDerived(fit, calibration, (v) => (v.width * v.width) / (lambda(v) * distance(v)));
  const offset = propagateDerived(fit, calibration, (v) => ((slits - 1) * (v.separation ?? 0) * v.width) / (lambda(v) * distance(v)));
  const value = (name: string) => fit.parameters.find((p) => p.name === name)?.value;
  const check = farFieldCheck({
    width: value("width")!,
    separation: value("separation") ?? 0,
    slits,
    wavelength: calibration.wavelength?.value ?? value("wavelength")!,
    distance: calibration.distance?.value ?? value("distance")!,
  }, limit);
  const farFieldModel = isFarFieldModel(fit.modelId);
  const result: FarFieldValidity = {
    fresnelNumber: derivedQuantity("fresnelNumber", fresnel, "1", "a²/(λL), a = slit width"),
    offsetNumber: derivedQuantity("offsetNumber", offset, "1", "(N−1)·d·a/(λL)"),
    valid: check.valid,
    farFieldModel,
    message: check.message,
  };
  if (farFieldModel && !check.valid) {
    const lambdaUsed = calibration.wavelength?.value ?? value("wavelength")!;
    const a = value("width")!, d = value("separation") ?? 0;
    // Distance at which both numbers reach the limit: L ≥ max(a², (N−1)·d·a)/(limit·λ).
    const farEnough = Math.max(a * a, (slits - 1) * d * a) / (limit * lambdaUsed);
    const lacking = nearFieldLacks(fit);
    const advice = lacking.length === 0
      ? `fit "two-slit-fresnel" instead or move the detector to at least ${farEnough.toPrecision(2)} m`
      : `the near-field model "two-slit-fresnel" has no ${lacking.join(" or ")}, which this fit needs, so no built-in model covers these data: move the detector to at least ${farEnough.toPrecision(2)} m or narrow the slits`;
    result.warning = `${fit.modelId} is a far-field model used outside its range (a²/(λL) = ${check.fresnelNumber.toPrecision(3)}, ` +
      `(N−1)da/(λL) = ${check.offsetNumber.toPrecision(3)}, limit ${limit}): ${advice}`;
  }
  return result;
}

/** Neutral values of the parameters the near-field model lacks: at these it needs none of them. */
const NEUTRAL: Record<string, number> = { visibility: 1, phase: 0, bandwidth: 0, diameter: 0, rmsSize: 0 };

/**
 * Parameters of the fit that "two-slit-fresnel" does not have and that sit away from their
 * neutral value (fixed elsewhere, or fitted more than 2 standard uncertainties away): a fit
 * needing them must not be sent to the near-field model. Spectrum-table fits always need theirs.
 */
function nearFieldLacks(fit: FitResult): string[] {
  const nearNames = new Set(getModel("two-slit-fresnel").parameters.map((p) => p.name));
  const lacking: string[] = [];
  if (fit.modelId === "two-slit-spectrum") lacking.push("source spectrum");
  for (const p of fit.parameters) {
    if (nearNames.has(p.name) || !(p.name in NEUTRAL)) continue;
    const neutral = NEUTRAL[p.name]!;
    const away = p.fixed ? p.value !== neutral : !(Math.abs(p.value - neutral) <= 2 * (Number.isFinite(p.uncertainty) ? p.uncertainty : 0));
    if (away) lacking.push(WORDS[p.name] ?? p.name);
  }
  return lacking;
}

const WORDS: Record<string, string> = {
  visibility: "visibility below 1 (partial coherence)",
  phase: "phase offset",
  bandwidth: "spectral bandwidth",
  diameter: "source size",
  rmsSize: "source size",
};
