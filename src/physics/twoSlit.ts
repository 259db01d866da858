/**
 * Far-field (Fraunhofer) two-slit pattern with finite slit width and partial visibility.
 *
 *   I(x) = (amplitude/2) · sinc²(π a s / λ) · [1 + V cos(2π d s / λ + φ)],
 *   s = sin θ = (x − center) / √((x − center)² + L²)   (or (x − center)/L, small-angle option)
 *
 * Fraunhofer diffraction by two slits of width a at spacing d (Born & Wolf, Principles of
 * Optics, §8.5–8.6; Hecht, Optics, §10.2); V < 1 covers unequal beam intensities and
 * partial coherence (V = 2√(I1 I2)/(I1 + I2)·|γ12|, see coherence helpers).
 * `amplitude` is the peak above background of the fully coherent pattern (V = 1), as in every
 * model (see specs.ts). Detector effects (pixel width, blur, background) are added by `detectorModel`.
 */
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel, type DetectorOptions } from "./detector.js";
import { sinCosInto } from "./sincos.js";
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
  let amplitude = 0, center = 0, separation = 0, width = 0, visibility = 0, phase = 0;
  let wavelength = 0, distance = 0, k = 0;
  // The per-node loops live in the bulk methods (one call per block of nodes, nothing boxed);
  // value/valueGrad at a single position go through them with one-element scratch arrays.
  // The direction sine and sinc are written out in the loops, with the prepared parameters in
  // locals, so the optimiser keeps every intermediate in registers (same formulas as
  // geometry.ts and sinc.ts, including sinc's series below |β| < 1e-3).
  const one = new Float64Array(1), oneValue = new Float64Array(1);
  // Per-node scratch of the kernels, grown on demand (the detector passes ≤ ~1024 nodes).
  let size = 0;
  let sines = new Float64Array(0), dsdus = new Float64Array(0), dsdLs = new Float64Array(0);
  let betas = new Float64Array(0), gammas = new Float64Array(0);
  let sinB = new Float64Array(0), cosB = new Float64Array(0), sinG = new Float64Array(0), cosG = new Float64Array(0);
  const reserve = (count: number): void => {
    if (count <= size) return;
    size = Math.max(count, 1024);
    [sines, dsdus, dsdLs, betas, gammas, sinB, cosB, sinG, cosG] = Array.from({ length: 9 }, () => new Float64Array(size));
  };
  // Value only: the same passes without the gradient (sinCosInto beats a lone Math.sin).
  const valuesAt = (positions: Float64Array, count: number, values: Float64Array): void => {
    reserve(count);
    const c = center, L = distance, L2 = distance * distance, kHalfWidth = 0.5 * k * width, kSep = k * separation;
    const A = amplitude, V = visibility, phi = phase;
    for (let t = 0; t < count; t++) {
      const u = positions[t]! - c;
      const s = smallAngle ? u / L : u / Math.sqrt(u * u + L2);
      betas[t] = kHalfWidth * s;
      gammas[t] = kSep * s + phi;
    }
    sinCosInto(betas, count, sinB, cosB);
    sinCosInto(gammas, count, sinG, cosG);
    for (let t = 0; t < count; t++) {
      const beta = betas[t]!;
      let sincValue: number;
      if (Math.abs(beta) < 1e-3) {
        const b2 = beta * beta;
        sincValue = 1 - (b2 / 6) * (1 - b2 / 20);
      } else {
        sincValue = sinB[t]! / beta;
      }
      values[t] = A * (sincValue * sincValue) * (1 + V * cosG[t]!);
    }
  };
  // Gradient of node t in grads[9t … 9t + 8]. Three passes: geometry and phases; sin and cos
  // of β and γ with one shared argument reduction each (sinCosInto); then values and gradients.
  const valueGradsAt = (positions: Float64Array, count: number, values: Float64Array, grads: Float64Array): void => {
    reserve(count);
    const c = center, L = distance, L2 = distance * distance, kHalfWidth = 0.5 * k * width, kSep = k * separation;
    const A = amplitude, V = visibility, phi = phase, lambda = wavelength, halfK = 0.5 * k;
    for (let t = 0; t < count; t++) {
      const u = positions[t]! - c;
      let s: number;
      if (smallAngle) {
        s = u / L; dsdus[t] = 1 / L; dsdLs[t] = -u / L2;
      } else {
        const r2 = u * u + L2;
        const r = Math.sqrt(r2);
        const inv3 = 1 / (r2 * r);
        s = u / r; dsdus[t] = L2 * inv3; dsdLs[t] = -u * L * inv3;
      }
      sines[t] = s;
      betas[t] = kHalfWidth * s;
      gammas[t] = kSep * s + phi;
    }
    sinCosInto(betas, count, sinB, cosB);
    sinCosInto(gammas, count, sinG, cosG);
    for (let t = 0; t < count; t++) {
      const s = sines[t]!, beta = betas[t]!;
      let sincValue: number, sincSlope: number;
      if (Math.abs(beta) < 1e-3) {
        const b2 = beta * beta;
        sincValue = 1 - (b2 / 6) * (1 - b2 / 20);
        sincSlope = -(beta / 3) * (1 - b2 / 10);
      } else {
        const sb = sinB[t]!;
        sincValue = sb / beta;
        sincSlope = (beta * cosB[t]! - sb) / (beta * beta);
      }
      const envelope = sincValue * sincValue;
      const path = kSep * s; // optical phase difference without φ
      const cosGamma = cosG[t]!;
      const fringe = 1 + V * cosGamma;
      const dBeta = A * 2 * sincValue * sincSlope * fringe; // ∂I/∂β
      const dGamma = -A * envelope * V * sinG[t]!; // ∂I/∂γ
      const dS = dBeta * kHalfWidth + dGamma * kSep; // ∂I/∂s
      const dU = dS * dsdus[t]!;
      const o = 9 * t;
      values[t] = A * envelope * fringe;
      grads[o] = 0.5 * envelope * fringe; // amplitude is the coherent peak: I uses amplitude/2
      grads[o + 1] = -dU;
      grads[o + 2] = dGamma * k * s;
      grads[o + 3] = dBeta * halfK * s;
      grads[o + 4] = A * envelope * cosGamma;
      grads[o + 5] = dGamma;
      grads[o + 6] = -(dBeta * beta + dGamma * path) / lambda;
      grads[o + 7] = dS * dsdLs[t]!;
      grads[o + 8] = dU;
    }
  };
  return {
    id: "two-slit",
    description: "Far-field two-slit pattern: sinc² envelope × (1 + V cos) fringes",
    parameters: specs("amplitude", "center", "separation", "width", "visibility", "phase", "wavelength", "distance"),
    prepare(p) {
      // `amplitude` (the parameter) is the peak of the fully coherent pattern (V = 1): 2 × this factor.
      amplitude = 0.5 * p[0]!; center = p[1]!; separation = p[2]!; width = p[3]!;
      visibility = p[4]!; phase = p[5]!; wavelength = p[6]!; distance = p[7]!;
      k = (2 * Math.PI) / wavelength;
    },
    value(x) {
      one[0] = x;
      valuesAt(one, 1, oneValue);
      return oneValue[0]!;
    },
    valueGrad(x, g) {
      one[0] = x;
      valueGradsAt(one, 1, oneValue, g);
      return oneValue[0]!;
    },
    valuesAt,
    valueGradsAt,
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
