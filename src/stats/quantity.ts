/**
 * Derived quantities with uncertainties: linear propagation of the fit covariance and of
 * independent calibration inputs, u²(f) = gᵀ C g + Σ (∂f/∂c_i)² u²(c_i)
 * (GUM, JCGM 100:2008, §5.1.2 and §5.2.2), gradients by central differences.
 */
import { InvalidArgumentError } from "../errors.js";
import type { FitResult } from "../fit/types.js";

/** A reported number: value ± standard uncertainty, in an SI unit. */
export interface DerivedQuantity {
  name: string;
  value: number;
  /** Standard uncertainty (same unit); Infinity when it cannot be estimated. */
  uncertainty: number;
  /** SI unit symbol ("m", "1", "m^-1", ...). */
  unit: string;
  /** How it was obtained or what limits it, in a few words. */
  note?: string;
}

/** A calibration input: value (SI) with its standard uncertainty. */
export interface Measured {
  value: number;
  uncertainty: number;
}

/**
 * Calibration of the bench, each an independent input with its standard uncertainty.
 * `distance`, `wavelength`, `separation` and `sourceDistance` replace the fit's fixed values
 * where given;
 * `pixelPitchRelative` is the relative standard uncertainty of the detector length scale
 * (e.g. 0.001 for ± 0.1 %).
 */
export interface Calibration {
  distance?: Measured;
  wavelength?: Measured;
  separation?: Measured;
  /** Source-to-slit distance (m) of a coherence scan. */
  sourceDistance?: Measured;
  pixelPitchRelative?: number;
}

/** Values seen by a derived-quantity function: fit parameters by name, plus "scale" (detector scale factor, 1 ± pitch uncertainty) and calibration inputs as "cal.<name>". */
export type Values = Readonly<Record<string, number>>;

/**
 * Value and standard uncertainty of f(values) given the fit covariance and the calibration.
 * @param fit         the fit whose free parameters vary with their covariance
 * @param calibration independent inputs
 * @param f           the derived quantity as a function of named values (SI)
 */
export function propagateDerived(fit: FitResult, calibration: Calibration, f: (v: Values) => number): { value: number; uncertainty: number } {
  const base: Record<string, number> = {};
  for (const p of fit.parameters) base[p.name] = p.value;
  base.scale = 1;
  const independent: [string, number][] = [["scale", calibration.pixelPitchRelative ?? 0]];
  for (const key of ["distance", "wavelength", "separation", "sourceDistance"] as const) {
    const input = calibration[key];
    if (!input) continue;
    checkMeasured(key, input);
    base[`cal.${key}`] = input.value;
    independent.push([`cal.${key}`, input.uncertainty]);
  }
  const value = f(base);
  const k = fit.freeNames.length;
  const gradient = fit.freeNames.map((name, j) => {
    const stderr = Math.sqrt(Math.max(fit.covariance[j * k + j], 0));
    return derivative(f, base, name, stderr);
  });
  let variance = 0;
  for (let a = 0; a < k; a++) {
    if (gradient[a] === 0) continue;
    for (let b = 0; b < k; b++) variance += gradient[a] * fit.covariance[a * k + b] * gradient[b];
  }
  for (const [name, u] of independent) {
    if (u > 0) variance += (derivative(f, base, name, u) * u) ** 2;
  }
  return { value, uncertainty: Number.isFinite(variance) ? Math.sqrt(Math.max(variance, 0)) : Infinity };
}

function derivative(f: (v: Values) => number, base: Record<string, number>, name: string, scale: number): number {
  if (!(scale > 0) || !Number.isFinite(scale)) return 0;
  const h = 1e-4 * scale;
  const plus = { ...base, [name]: base[name] + h };
  const minus = { ...base, [name]: base[name] - h };
  return (f(plus) - f(minus)) / (2 * h);
}

function checkMeasured(name: string, input: Measured): void {
  if (!Number.isFinite(input.value)) throw new InvalidArgumentError(`calibration.${name}.value`, input.value, "a finite SI value");
  if (!(input.uncertainty >= 0)) throw new InvalidArgumentError(`calibration.${name}.uncertainty`, input.uncertainty, "a standard uncertainty >= 0 in SI units");
}

/** A DerivedQuantity from a propagated value and uncertainty, both in `unit` (an SI unit symbol). */
export function derivedQuantity(name: string, result: { value: number; uncertainty: number }, unit: string, note?: string): DerivedQuantity {
  return note === undefined ? { name, ...result, unit } : { name, ...result, unit, note };
}
