/**
 * One call for every derived quantity a fit supports, each a value ± standard uncertainty
 * with its unit, plus the warnings a report should carry (e.g. far-field model out of range).
 */
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import { degreeOfCoherence, coherenceLength } from "./coherence.js";
import { farFieldValidity } from "./farField.js";
import { findFitParameter } from "./fitParameters.js";
import { fringeGeometry, fringeMaxima } from "./fringeGeometry.js";
import { measuredExtrema, type Extremum } from "./measuredExtrema.js";
import type { Calibration, DerivedQuantity, Measured } from "./quantity.js";
import { sourceSize } from "./sourceSize.js";

/** Options of derivedQuantities. */
export interface DerivedOptions {
  /** The profile the fit used: enables predicted maxima in range and measured extrema. */
  profile?: Profile;
  calibration?: Calibration;
  /** Beam intensity ratio I1/I2 ± u: enables |γ12| from the fitted visibility. */
  intensityRatio?: Measured;
  /** Confidence level of source-size intervals (default 0.95). */
  level?: number;
}

/** What derivedQuantities returns; every number is SI with its standard uncertainty. */
export interface DerivedReport {
  quantities: DerivedQuantity[];
  /** Maxima predicted by the fit inside the profile (order, position ± u). */
  maxima: { order: number; position: DerivedQuantity }[];
  /** Maxima and minima measured in the data. */
  extrema: Extremum[];
  /** Source-size confidence interval (m), when the fit is a coherence scan. */
  sourceInterval?: { interval: [number, number]; level: number };
  warnings: string[];
}

/**
 * Every derived quantity the fit's parameters allow: fringe spacing and frequency, separation
 * (or wavelength from a calibrated separation), Fresnel numbers, |γ12| (with an intensity
 * ratio), coherence length (from a fitted bandwidth), source size (coherence-scan fits), and
 * with the profile the predicted and measured extrema. All SI.
 * @example derivedQuantities(fit, { profile, calibration: { distance: { value: 1, uncertainty: 1e-3 }, pixelPitchRelative: 1e-3 } })
 */
export function derivedQuantities(fit: FitResult, options: DerivedOptions = {}): DerivedReport {
  const calibration = options.calibration ?? {};
  const has = (...names: string[]) => names.every((n) => findFitParameter(fit, n) !== undefined);
  const report: DerivedReport = { quantities: [], maxima: [], extrema: [], warnings: [] };
  if (!fit.converged) report.warnings.push(`the fit did not converge (${fit.message}); derived values are not reliable`);
  if (has("separation", "wavelength", "distance")) {
    report.quantities.push(...fringeGeometry(fit, calibration));
    if (options.profile && has("center")) {
      const x = options.profile.x;
      report.maxima = fringeMaxima(fit, x[0], x[x.length - 1], calibration);
      report.extrema = measuredExtrema(options.profile, fit, calibration);
    }
  }
  if (has("width", "wavelength", "distance")) {
    const validity = farFieldValidity(fit, calibration);
    report.quantities.push(validity.fresnelNumber, validity.offsetNumber);
    if (validity.warning) report.warnings.push(validity.warning);
  }
  const visibility = findFitParameter(fit, "visibility");
  if (visibility && options.intensityRatio && has("separation")) {
    report.quantities.push(degreeOfCoherence({ value: visibility.value, uncertainty: visibility.uncertainty }, options.intensityRatio));
  }
  const bandwidth = findFitParameter(fit, "bandwidth");
  const wavelength = findFitParameter(fit, "wavelength");
  if (bandwidth && wavelength && bandwidth.value > 0) {
    const lambda = calibration.wavelength ?? { value: wavelength.value, uncertainty: wavelength.uncertainty };
    report.quantities.push(coherenceLength(lambda, { value: bandwidth.value, uncertainty: bandwidth.uncertainty }));
  }
  if (fit.modelId === "coherence-disc" || fit.modelId === "coherence-gaussian") {
    const size = sourceSize(fit, calibration, options.level ?? 0.95);
    report.quantities.push(size.size, size.angularSize);
    report.sourceInterval = { interval: size.interval, level: size.level };
  }
  for (const q of report.quantities) {
    if (!Number.isFinite(q.uncertainty)) report.warnings.push(`${q.name}: uncertainty could not be estimated (a parameter has no finite standard error)`);
  }
  return report;
}
