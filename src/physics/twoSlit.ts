/**
 * Far-field (Fraunhofer) two-slit pattern with finite slit width and partial visibility.
 *
 *   I(x) = amplitude · sinc²(π a s / λ) · [1 + V cos(2π d s / λ + φ)],
 *   s = sin θ = (x − center) / √((x − center)² + L²)   (or (x − center)/L, small-angle option)
 *
 * Fraunhofer diffraction by two slits of width a at spacing d (Born & Wolf, Principles of
 * Optics, §8.5–8.6; Hecht, Optics, §10.2); V < 1 covers unequal beam intensities and
 * partial coherence (V = 2√(I1 I2)/(I1 + I2)·|γ12|, see coherence helpers).
 * Detector effects (pixel width, blur, background) are added by `detectorModel`.
 */
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel, type DetectorOptions } from "./detector.js";
import { directionSine, type SineResult } from "./geometry.js";
import { sinc, sincWithSlope, type SincResult } from "./sinc.js";
import { specs } from "./specs.js";

/** Options of the far-field models. */
export interface FarFieldOptions extends DetectorOptions {
  /** Use sin θ ≈ (x − center)/distance instead of the exact direction sine (default false). */
  smallAngle?: boolean;
}

/**
 * The two-slit point pattern (no detector effects). Parameters, in order:
 * amplitude (counts), center (m), separation (m), width (m), visibility (1), phase (rad),
 * wavelength (m), distance (m).
 */
export function twoSlitPattern(options: { smallAngle?: boolean } = {}): PointPattern {
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  const envelopeSinc: SincResult = { value: 0, slope: 0 };
  let amplitude = 0, center = 0, separation = 0, width = 0, visibility = 0, phase = 0;
  let wavelength = 0, distance = 0, k = 0;
  return {
    id: "two-slit",
    description: "Far-field two-slit pattern: sinc² envelope × (1 + V cos) fringes",
    parameters: specs("amplitude", "center", "separation", "width", "visibility", "phase", "wavelength", "distance"),
    prepare(p) {
      amplitude = p[0]!; center = p[1]!; separation = p[2]!; width = p[3]!;
      visibility = p[4]!; phase = p[5]!; wavelength = p[6]!; distance = p[7]!;
      k = (2 * Math.PI) / wavelength;
    },
    value(x) {
      directionSine(x - center, distance, smallAngle, geo);
      const envelopeValue = sinc(0.5 * k * width * geo.s);
      const envelope = envelopeValue * envelopeValue;
      return amplitude * envelope * (1 + visibility * Math.cos(k * separation * geo.s + phase));
    },
    valueGrad(x, g) {
      directionSine(x - center, distance, smallAngle, geo);
      const s = geo.s;
      const beta = 0.5 * k * width * s;
      sincWithSlope(beta, envelopeSinc);
      const sincValue = envelopeSinc.value;
      const envelope = sincValue * sincValue;
      const path = k * separation * s; // optical phase difference without φ
      const gamma = path + phase;
      const cosG = Math.cos(gamma);
      const sinG = Math.sin(gamma);
      const fringe = 1 + visibility * cosG;
      const value = amplitude * envelope * fringe;
      const dBeta = amplitude * 2 * sincValue * envelopeSinc.slope * fringe; // ∂I/∂β
      const dGamma = -amplitude * envelope * visibility * sinG; // ∂I/∂γ
      const dS = dBeta * 0.5 * k * width + dGamma * k * separation; // ∂I/∂s
      const dU = dS * geo.dsdu;
      g[0] = envelope * fringe;
      g[1] = -dU;
      g[2] = dGamma * k * s;
      g[3] = dBeta * 0.5 * k * s;
      g[4] = amplitude * envelope * cosG;
      g[5] = dGamma;
      g[6] = -(dBeta * beta + dGamma * path) / wavelength;
      g[7] = dS * geo.dsdL;
      g[8] = dU;
      return value;
    },
  };
}

/**
 * Model "two-slit": the pattern above plus detector effects. Parameters: amplitude (counts),
 * center (m), separation (m), width (m), visibility (1), phase (rad), wavelength (m),
 * distance (m), background (counts), backgroundSlope (counts/m), pixelWidth (m), blur (m).
 * @example const m = twoSlitModel(); // evaluate(x, params, out) with x in m
 */
export function twoSlitModel(options: FarFieldOptions = {}): Model {
  return detectorModel(twoSlitPattern(options), options);
}
