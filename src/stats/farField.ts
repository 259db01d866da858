/**
 * Far-field validity of a fitted geometry, with uncertainties: the slit Fresnel number
 * a²/(λL) and the envelope-offset number (N − 1)·d·a/(λL) of the physics helper
 * `farFieldCheck` (limit 0.1 by default, common practice: N_F ≪ 1), propagated from the fit
 * and the calibration. A far-field model used outside that range gets a warning.
 */
import type { FitResult } from "../fit/types.js";
import { farFieldCheck } from "../physics/formulas.js";
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
  return ["two-slit", "n-slit", "single-slit", "two-slit-broadband", "two-slit-spectrum", "two-slit-disc-source", "two-slit-gaussian-source"].includes(modelId);
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
    result.warning = `${fit.modelId} is a far-field model used outside its range (a²/(λL) = ${check.fresnelNumber.toPrecision(3)}, ` +
      `(N−1)da/(λL) = ${check.offsetNumber.toPrecision(3)}, limit ${limit}): fit "two-slit-fresnel" instead or move the detector further away`;
  }
  return result;
}
