/**
 * Closed-form helpers for planning and checking two-slit and grating measurements.
 * All lengths in m, angles in rad. Far-field (Fraunhofer) geometry with the slits on the
 * optical axis; "exact" forms use sin θ_m = mλ/d and x = L tan θ_m (Hecht, Optics, §9.3).
 */
import { InvalidArgumentError } from "../errors.js";

/** Speed of light in vacuum, m/s (exact by the SI definition, 2019). */
export const SPEED_OF_LIGHT = 299_792_458;

/**
 * Small-angle fringe spacing Δx = λL/d (m).
 * @example fringeSpacing(632.8e-9, 1.0, 0.25e-3) // 2.5312e-3 m
 */
export function fringeSpacing(wavelength: number, distance: number, separation: number): number {
  positive("wavelength", wavelength);
  positive("distance", distance);
  positive("separation", separation);
  return (wavelength * distance) / separation;
}

/**
 * Angle θ (rad) of the interference maximum of order m: sin θ = mλ/d.
 * Throws when |mλ/d| > 1 (that order does not propagate).
 */
export function maximumAngle(order: number, wavelength: number, separation: number): number {
  return orderAngle("order", order, wavelength, separation);
}

/** Angle θ (rad) of the minimum between orders m and m + 1: sin θ = (m + ½)λ/d. */
export function minimumAngle(order: number, wavelength: number, separation: number): number {
  return orderAngle("order", order + 0.5, wavelength, separation);
}

/**
 * Detector position (m, from the pattern centre) of the maximum of order m.
 * small-angle: x = mλL/d; exact: x = L tan(asin(mλ/d)).
 */
export function maximumPosition(order: number, wavelength: number, distance: number, separation: number, exact = false): number {
  positive("distance", distance);
  if (!exact) return (order * fringeSpacing(wavelength, distance, separation));
  return distance * Math.tan(maximumAngle(order, wavelength, separation));
}

/**
 * Detector position (m) of the minimum between orders m and m + 1.
 * small-angle: x = (m + ½)λL/d; exact: x = L tan(asin((m + ½)λ/d)).
 */
export function minimumPosition(order: number, wavelength: number, distance: number, separation: number, exact = false): number {
  positive("distance", distance);
  if (!exact) return ((order + 0.5) * fringeSpacing(wavelength, distance, separation));
  return distance * Math.tan(minimumAngle(order, wavelength, separation));
}

/**
 * Interference orders m (1 … maxOrder) that fall on zeros of the single-slit envelope,
 * i.e. where m·a/d is a non-zero integer (Hecht §10.2.3). Empty unless d/a is rational
 * with a small denominator (checked to a relative 1e-9).
 * @example missingOrders(0.3e-3, 0.1e-3, 10) // [3, 6, 9]
 */
export function missingOrders(separation: number, width: number, maxOrder: number): number[] {
  positive("separation", separation);
  positive("width", width);
  if (!Number.isInteger(maxOrder) || maxOrder < 1) throw new InvalidArgumentError("maxOrder", maxOrder, "an integer ≥ 1");
  if (width >= separation) throw new InvalidArgumentError("width", width, `less than the separation ${separation} m`);
  const orders: number[] = [];
  for (let m = 1; m <= maxOrder; m++) {
    const ratio = (m * width) / separation;
    if (Math.abs(ratio - Math.round(ratio)) < 1e-9 * Math.max(1, ratio)) orders.push(m);
  }
  return orders;
}

/**
 * Coherence length l_c = λ²/Δλ (m), Δλ the spectral FWHM. Convention: this plain form
 * (common practice). Other conventions differ by factors of order 1: for the Gaussian
 * spectrum of "two-slit-broadband" the fringe contrast falls to 1/e at a path difference of
 * (2√(ln 2)/π)·λ²/Δλ ≈ 0.53 λ²/Δλ; quote the convention with any number.
 * @example coherenceLengthFromBandwidth(632.8e-9, 1e-9) // 4.004e-4 m
 */
export function coherenceLengthFromBandwidth(wavelength: number, bandwidth: number): number {
  positive("wavelength", wavelength);
  positive("bandwidth", bandwidth);
  return (wavelength * wavelength) / bandwidth;
}

/** Coherence time τ_c = l_c / c (s) with l_c = λ²/Δλ. */
export function coherenceTimeFromBandwidth(wavelength: number, bandwidth: number): number {
  return coherenceLengthFromBandwidth(wavelength, bandwidth) / SPEED_OF_LIGHT;
}

/**
 * Fresnel number N_F = a²/(λL) of an aperture of size a (m) at distance L (m).
 * Convention: a = full slit width (some texts use the half-width, giving N_F/4).
 */
export function fresnelNumber(size: number, wavelength: number, distance: number): number {
  positive("size", size);
  positive("wavelength", wavelength);
  positive("distance", distance);
  return (size * size) / (wavelength * distance);
}

/** Result of `farFieldCheck`. */
export interface FarFieldCheck {
  /** a²/(λL) of one slit. */
  fresnelNumber: number;
  /** (N − 1)·d·a/(λL): the quadratic phase that shifts the slits' envelopes against each other. */
  offsetNumber: number;
  /** True when both numbers are below `limit`: the far-field models apply. */
  valid: boolean;
  /** One sentence for reports and warnings. */
  message: string;
}

/**
 * Whether the Fraunhofer (far-field) models apply: both a²/(λL) and (N − 1)·d·a/(λL) below
 * `limit` (default 0.1; common practice asks for N_F ≪ 1). Otherwise use "two-slit-fresnel".
 */
export function farFieldCheck(geometry: { width: number; separation?: number; slits?: number; wavelength: number; distance: number }, limit = 0.1): FarFieldCheck {
  const slits = geometry.slits ?? 2;
  const separation = geometry.separation ?? 0;
  if (!Number.isInteger(slits) || slits < 1) throw new InvalidArgumentError("slits", slits, "an integer ≥ 1");
  if (!(separation >= 0)) throw new InvalidArgumentError("separation", separation, "a length ≥ 0 in m");
  positive("limit", limit);
  positive("width", geometry.width);
  const fresnel = fresnelNumber(geometry.width, geometry.wavelength, geometry.distance);
  const offsetNumber = ((slits - 1) * separation * geometry.width) / (geometry.wavelength * geometry.distance);
  const valid = fresnel < limit && offsetNumber < limit;
  const message = valid
    ? `far field: a²/(λL) = ${fresnel.toPrecision(3)}, (N−1)da/(λL) = ${offsetNumber.toPrecision(3)} (both < ${limit})`
    : `not far field: a²/(λL) = ${fresnel.toPrecision(3)}, (N−1)da/(λL) = ${offsetNumber.toPrecision(3)} (limit ${limit}); use the near-field model "two-slit-fresnel" or a longer distance`;
  return { fresnelNumber: fresnel, offsetNumber, valid, message };
}

function orderAngle(name: string, order: number, wavelength: number, separation: number): number {
  positive("wavelength", wavelength);
  positive("separation", separation);
  if (!Number.isFinite(order)) throw new InvalidArgumentError(name, order, "a finite number");
  const sine = (order * wavelength) / separation;
  if (Math.abs(sine) > 1) {
    throw new InvalidArgumentError(name, order, `|m|·λ/d ≤ 1; order ${order} does not propagate for d = ${separation} m`);
  }
  return Math.asin(sine);
}

function positive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) throw new InvalidArgumentError(name, value, "a positive finite number (SI units)");
}
