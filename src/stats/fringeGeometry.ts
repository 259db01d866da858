/**
 * Quantities from the fitted fringe frequency. The pattern only fixes the spatial frequency
 * q = d/(λ L) (cycles per metre on the detector, small-angle two-beam geometry — Hecht,
 * Optics, §9.3), measured in the detector's length scale s (true length = s × nominal).
 * Hence: fringe spacing Λ = s/q, separation d = λ q L / s, wavelength λ = d s/(q L).
 */
import type { FitResult } from "../fit/types.js";
import { requireFitParameter } from "./fitParameters.js";
import { propagateDerived, derivedQuantity, type Calibration, type DerivedQuantity, type Values } from "./quantity.js";

/** The fitted q in detector units (cycles per nominal metre) from the fit's own values. */
function frequency(v: Values): number {
  return v.separation / (v.wavelength * v.distance);
}
const distanceOf = (v: Values) => v["cal.distance"] ?? v.distance;

/**
 * Fringe spacing Λ (m), slit separation d (m) and — when the calibration gives a known
 * separation — the wavelength λ (m), each with uncertainty from the fit covariance, the
 * distance, wavelength and pixel-pitch calibration.
 * @param fit         fit of a model with separation, wavelength and distance parameters
 * @param calibration distance ± u (m), wavelength ± u (m), separation ± u (m), pixel pitch relative u
 * @example fringeGeometry(fit, { distance: { value: 1, uncertainty: 1e-3 }, pixelPitchRelative: 1e-3 })
 */
export function fringeGeometry(fit: FitResult, calibration: Calibration = {}): DerivedQuantity[] {
  for (const name of ["separation", "wavelength", "distance"]) requireFitParameter(fit, name, "fringe geometry");
  const out: DerivedQuantity[] = [
    derivedQuantity("fringeSpacing", propagateDerived(fit, calibration, (v) => v.scale / frequency(v)), "m", "λL/d on the detector"),
    derivedQuantity("fringeFrequency", propagateDerived(fit, calibration, (v) => frequency(v) / v.scale), "m^-1", "fringes per metre on the detector"),
  ];
  if (!calibration.separation || calibration.wavelength) {
    out.push(derivedQuantity("separation", propagateDerived(fit, calibration, (v) => ((v["cal.wavelength"] ?? v.wavelength) * frequency(v) * distanceOf(v)) / v.scale),
      "m", calibration.wavelength ? "from the calibrated wavelength" : "from the fit's wavelength"));
  }
  if (calibration.separation) {
    out.push(derivedQuantity("wavelength", propagateDerived(fit, calibration, (v) => (v["cal.separation"] * v.scale) / (frequency(v) * distanceOf(v))),
      "m", "from the known separation"));
  }
  return out;
}

/**
 * Maxima predicted by the fit: order m (integer), position x_m (m) and its uncertainty, for
 * every maximum inside [xMin, xMax]. Maxima sit where 2π d sin θ/λ + φ = 2πm, so
 * sin θ_m = (m − φ/2π) λ/d and x_m = center + L tan θ_m (exact geometry).
 * @param xMin, xMax detector range (m), e.g. the profile's first and last x
 */
export function fringeMaxima(fit: FitResult, xMin: number, xMax: number, calibration: Calibration = {}): { order: number; position: DerivedQuantity }[] {
  for (const name of ["separation", "wavelength", "distance", "center"]) requireFitParameter(fit, name, "fringe orders");
  const phase = fit.parameters.find((p) => p.name === "phase")?.value ?? 0;
  const v0: Record<string, number> = Object.fromEntries(fit.parameters.map((p) => [p.name, p.value]));
  const spacing = v0.wavelength * v0.distance / v0.separation;
  const orders: { order: number; position: DerivedQuantity }[] = [];
  const mLow = Math.ceil((xMin - v0.center) / spacing + phase / (2 * Math.PI)) - 1;
  const mHigh = Math.floor((xMax - v0.center) / spacing + phase / (2 * Math.PI)) + 1;
  for (let m = mLow; m <= mHigh; m++) {
    const at = (v: Values) => {
      const s = ((m - (v.phase ?? 0) / (2 * Math.PI)) * v.wavelength) / v.separation;
      if (Math.abs(s) >= 1) return NaN;
      return (v.center + (v.distance * s) / Math.sqrt(1 - s * s)) * v.scale;
    };
    const result = propagateDerived(fit, calibration, at);
    if (result.value >= xMin && result.value <= xMax) {
      orders.push({ order: m, position: derivedQuantity(`maximum ${m}`, result, "m", "predicted by the fit") });
    }
  }
  return orders;
}
