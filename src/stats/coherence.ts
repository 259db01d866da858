/**
 * Coherence quantities from visibilities.
 * Two-beam visibility V = 2√(I1 I2)/(I1 + I2) · |γ12| (Born & Wolf, Principles of Optics,
 * §10.3.1), so |γ12| = V (1 + r)/(2√r) with r = I1/I2. Coherence length l_c = λ²/Δλ (common
 * practice). For a Gaussian spectrum of FWHM Δλ the visibility at path difference mλ
 * (order m) decays as V_m = V_0 exp[−(π m Δλ/λ)²/(4 ln 2)] (Fourier transform of the
 * Gaussian line, Wiener–Khinchin; Goodman, Statistical Optics, §5.2); a weighted straight-line
 * fit of ln V_m against m² gives Δλ.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Measured, DerivedQuantity } from "./quantity.js";

/**
 * |γ12| from a visibility V (1) and the beam intensity ratio r = I1/I2 (1), each ± u.
 * @example degreeOfCoherence({ value: 0.8, uncertainty: 0.01 }, { value: 1, uncertainty: 0 }) // 0.8 ± 0.01
 */
export function degreeOfCoherence(visibility: Measured, intensityRatio: Measured): DerivedQuantity {
  if (!(visibility.value >= 0 && visibility.value <= 1)) throw new InvalidArgumentError("visibility", visibility.value, "a visibility between 0 and 1");
  if (!(intensityRatio.value > 0)) throw new InvalidArgumentError("intensityRatio", intensityRatio.value, "I1/I2 > 0");
  const r = intensityRatio.value;
  const factor = (1 + r) / (2 * Math.sqrt(r));
  const value = visibility.value * factor;
  // ∂|γ|/∂r = V (r − 1)/(4 r^{3/2}).
  const dr = (visibility.value * (r - 1)) / (4 * r ** 1.5);
  const uncertainty = Math.hypot(factor * visibility.uncertainty, dr * intensityRatio.uncertainty);
  return { name: "degreeOfCoherence", value, uncertainty, unit: "1", note: value > 1 ? "above 1: visibility or intensity ratio inconsistent" : "|γ12| from V and I1/I2" };
}

/**
 * Coherence length l_c = λ²/Δλ (m; the plain convention, quote it with the number) from the
 * centre wavelength λ (m) and bandwidth Δλ (m, FWHM), each ± u or a plain number (taken as exact).
 * @example coherenceLength(632.8e-9, 1e-9).value // 4.004e-4 m
 */
export function coherenceLength(wavelengthIn: Measured | number, bandwidthIn: Measured | number): DerivedQuantity {
  const wavelength = typeof wavelengthIn === "number" ? { value: wavelengthIn, uncertainty: 0 } : wavelengthIn;
  const bandwidth = typeof bandwidthIn === "number" ? { value: bandwidthIn, uncertainty: 0 } : bandwidthIn;
  if (!(wavelength.value > 0)) throw new InvalidArgumentError("wavelength", wavelength.value, "a positive length in m");
  if (!(bandwidth.value > 0)) throw new InvalidArgumentError("bandwidth", bandwidth.value, "a positive FWHM in m");
  const value = wavelength.value ** 2 / bandwidth.value;
  const uncertainty = value * Math.hypot((2 * wavelength.uncertainty) / wavelength.value, bandwidth.uncertainty / bandwidth.value);
  return { name: "coherenceLength", value, uncertainty, unit: "m", note: "λ²/Δλ" };
}

/**
 * Bandwidth Δλ (m, FWHM of a Gaussian spectrum) from visibilities measured at several fringe
 * orders. Returns Δλ, the zero-order visibility V_0 and the coherence length, each ± u
 * (u from the weighted line fit, scaled by √(χ²/ν) when ν > 0 and χ²/ν > 1, plus λ's u).
 * @param orders       fringe orders m (path difference mλ), at least 2 distinct
 * @param visibilities V_m ± u (1)
 * @param wavelength   centre wavelength ± u (m)
 */
export function bandwidthFromVisibilityDecay(orders: readonly number[], visibilities: readonly Measured[], wavelength: Measured): DerivedQuantity[] {
  if (orders.length !== visibilities.length) throw new InvalidArgumentError("visibilities", visibilities.length, `one per order (${orders.length})`);
  if (new Set(orders.map((m) => m * m)).size < 2) throw new InvalidArgumentError("orders", orders, "at least two orders with different |m|");
  if (!(wavelength.value > 0)) throw new InvalidArgumentError("wavelength", wavelength.value, "a positive length in m");
  // Weighted line y = ln V = c0 − α m², u(ln V) = u(V)/V.
  let sw = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  const rows = orders.map((m, i) => {
    const v = visibilities[i];
    if (!(v.value > 0 && v.value <= 1) || !(v.uncertainty > 0)) {
      throw new InvalidArgumentError(`visibilities[${i}]`, v, "0 < V ≤ 1 with an uncertainty > 0");
    }
    const w = (v.value / v.uncertainty) ** 2;
    const xx = m * m;
    const y = Math.log(v.value);
    sw += w; sx += w * xx; sy += w * y; sxx += w * xx * xx; sxy += w * xx * y;
    return { w, xx, y };
  });
  const det = sw * sxx - sx * sx;
  const slope = (sw * sxy - sx * sy) / det;
  const intercept = (sxx * sy - sx * sxy) / det;
  let chi2 = 0;
  for (const r of rows) chi2 += r.w * (r.y - intercept - slope * r.xx) ** 2;
  const dof = rows.length - 2;
  const factor = dof > 0 ? Math.max(1, chi2 / dof) : 1;
  const varSlope = (factor * sw) / det;
  const varIntercept = (factor * sxx) / det;
  const alpha = -slope;
  if (!(alpha > 0)) {
    throw new InvalidArgumentError("visibilities", visibilities.map((v) => v.value), "visibility must fall with |m| to give a bandwidth; check the orders");
  }
  const lambda = wavelength.value;
  const c = Math.sqrt(4 * Math.LN2) / Math.PI;
  const bandwidth = c * lambda * Math.sqrt(alpha);
  // Δλ ∝ λ √α: relative u = ½ u(α)/α ⊕ u(λ)/λ.
  const uBandwidth = bandwidth * Math.hypot((0.5 * Math.sqrt(varSlope)) / alpha, wavelength.uncertainty / lambda);
  const v0 = Math.exp(intercept);
  const lc = lambda / (c * Math.sqrt(alpha));
  const uLc = lc * Math.hypot((0.5 * Math.sqrt(varSlope)) / alpha, wavelength.uncertainty / lambda);
  return [
    { name: "bandwidth", value: bandwidth, uncertainty: uBandwidth, unit: "m", note: "FWHM of a Gaussian spectrum" },
    { name: "visibilityAtZeroPath", value: v0, uncertainty: v0 * Math.sqrt(varIntercept), unit: "1" },
    { name: "coherenceLength", value: lc, uncertainty: uLc, unit: "m", note: "λ²/Δλ" },
  ];
}
