/**
 * Source size from a coherence scan: visibilities measured at several slit separations d,
 * fitted (by the fit module) with "coherence-disc", V0 |2J1(v)/v|, v = πDd/(λR), or
 * "coherence-gaussian", V0 exp(−2π²σ²d²/(λR)²) (van Cittert–Zernike theorem; Born & Wolf,
 * Principles of Optics, §10.4.2–10.4.3). Only the products D/(λR) and σ/(λR) are measured,
 * so the size scales with the calibrated λ and R: D = D_fit · (λ_cal/λ_fit)(R_cal/R_fit).
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";
import { requireFitParameter } from "./fitParameters.js";
import { derivedQuantity, propagateDerived, type Calibration, type DerivedQuantity, type Values } from "./quantity.js";
import { studentTQuantile } from "../math/studentT.js";

/**
 * A Profile of a coherence scan for fitting with "coherence-disc" or "coherence-gaussian":
 * x = slit separations (m, sorted here), y = visibilities (1), σ = their standard uncertainties.
 * @example fitProfile(coherenceScanProfile([0.2e-3, 0.4e-3], [0.9, 0.6], [0.02, 0.02]), getModel("coherence-disc"), { fix: ["sourceDistance", "wavelength"] })
 */
export function coherenceScanProfile(separations: readonly number[], visibilities: readonly number[], uncertainties: readonly number[]): Profile {
  const n = separations.length;
  if (n < 3) throw new InvalidArgumentError("separations", separations, "at least 3 slit separations (m) to fit a source size");
  if (visibilities.length !== n) throw new InvalidArgumentError("visibilities", visibilities.length, `one visibility per separation (${n})`);
  if (uncertainties.length !== n) throw new InvalidArgumentError("uncertainties", uncertainties.length, `one uncertainty per separation (${n})`);
  const order = separations.map((_, i) => i).sort((a, b) => separations[a] - separations[b]);
  order.forEach((i, k) => {
    if (!(separations[i] >= 0) || !Number.isFinite(separations[i])) throw new InvalidArgumentError(`separations[${i}]`, separations[i], "a slit separation ≥ 0 in m");
    if (!(visibilities[i] >= 0 && visibilities[i] <= 1.5)) throw new InvalidArgumentError(`visibilities[${i}]`, visibilities[i], "a visibility between 0 and 1");
    if (!(uncertainties[i] > 0)) throw new InvalidArgumentError(`uncertainties[${i}]`, uncertainties[i], "a standard uncertainty > 0");
    if (k > 0 && separations[i] === separations[order[k - 1]]) {
      throw new InvalidArgumentError(`separations[${i}]`, separations[i], "distinct separations; average repeated measurements first");
    }
  });
  return {
    x: Float64Array.from(order, (i) => separations[i]),
    y: Float64Array.from(order, (i) => visibilities[i]),
    sigma: Float64Array.from(order, (i) => uncertainties[i]),
    yUnit: "1",
    counts: false,
  };
}

/**
 * Source diameter (coherence-disc) or rms size (coherence-gaussian) from a coherence-scan fit,
 * with standard uncertainty (fit covariance ⊕ wavelength and source-distance calibration) and
 * a two-sided confidence interval value ± t_{(1+level)/2}(ν) · u (Student t, ν = fit dof).
 * Also the angular size (rad) as seen from the slits.
 * @param fit         a converged fit of "coherence-disc" or "coherence-gaussian"
 * @param calibration wavelength ± u (m) and sourceDistance ± u (m)
 * @param level       confidence level of the interval (default 0.95)
 */
export function sourceSize(fit: FitResult, calibration: Calibration = {}, level = 0.95): { size: DerivedQuantity; angularSize: DerivedQuantity; interval: [number, number]; level: number } {
  if (!(level > 0 && level < 1)) throw new InvalidArgumentError("level", level, "a confidence level between 0 and 1");
  const name = fit.modelId === "coherence-disc" ? "diameter" : fit.modelId === "coherence-gaussian" ? "rmsSize" : undefined;
  if (!name) throw new InvalidArgumentError("fit", fit.modelId, 'a fit of "coherence-disc" or "coherence-gaussian"');
  requireFitParameter(fit, name, "the source size");
  if (!fit.freeNames.includes(name)) throw new InvalidArgumentError("fit", `${name} fixed`, `fit with ${name} free to measure the source size`);
  const scaled = (v: Values) =>
    v[name] * ((v["cal.wavelength"] ?? v.wavelength) / v.wavelength) * ((v["cal.sourceDistance"] ?? v.sourceDistance) / v.sourceDistance);
  const size = propagateDerived(fit, calibration, scaled);
  const angular = propagateDerived(fit, calibration, (v) => scaled(v) / (v["cal.sourceDistance"] ?? v.sourceDistance));
  const dof = Math.max(1, fit.statistics.dof);
  const t = studentTQuantile(0.5 + level / 2, dof);
  const label = name === "diameter" ? "uniform-disc diameter" : "Gaussian rms size";
  return {
    size: derivedQuantity(name, size, "m", label),
    angularSize: derivedQuantity(name === "diameter" ? "angularDiameter" : "angularRmsSize", angular, "rad", `${label} / source distance`),
    interval: [size.value - t * size.uncertainty, size.value + t * size.uncertainty],
    level,
  };
}
