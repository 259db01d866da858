/**
 * One name for the far-field check: of a planned geometry (design numbers, before measuring)
 * or of a fit (fitted numbers with their uncertainties).
 */
import type { FitResult } from "../fit/types.js";
import { farFieldCheck, type FarFieldCheck } from "../physics/formulas.js";
import { farFieldValidity as validityOfFit, type FarFieldValidity } from "../stats/farField.js";
import type { Calibration } from "../stats/quantity.js";

/** A planned geometry: slit width and separation (m), slit count, wavelength (m), slit-to-detector distance (m). */
export interface PlannedGeometry {
  width: number;
  separation?: number;
  slits?: number;
  wavelength: number;
  distance: number;
}

/**
 * Whether the far field (Fraunhofer) applies: slit Fresnel number a²/(λL) and envelope-offset
 * number (N − 1)·d·a/(λL) against `limit` (default 0.1; common practice N_F ≪ 1).
 * For a fit, the numbers carry uncertainties from its covariance and the calibration.
 * @example farFieldValidity({ width: 0.5e-3, separation: 1.2e-3, wavelength: 680e-9, distance: 0.12 }).message
 * @example farFieldValidity(fit).fresnelNumber // { value, uncertainty, unit: "1" }
 */
export function farFieldValidity(geometry: PlannedGeometry, limit?: number): FarFieldCheck;
export function farFieldValidity(fit: FitResult, calibration?: Calibration, limit?: number): FarFieldValidity;
export function farFieldValidity(what: PlannedGeometry | FitResult, a?: number | Calibration, limit?: number): FarFieldCheck | FarFieldValidity {
  if ("parameters" in what) return validityOfFit(what, (a as Calibration | undefined) ?? {}, limit);
  return farFieldCheck(what, a as number | undefined);
}
