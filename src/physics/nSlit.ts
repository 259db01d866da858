/**
 * Far-field N-slit (grating) and single-slit patterns with finite slit width.
 *
 *   I(x) = amplitude · sinc²(π a s / λ) · [sin(N π d s / λ) / (N sin(π d s / λ))]²
 *
 * (Born & Wolf, Principles of Optics, §8.6.1; Hecht, Optics, §10.2.3), s = sin θ as in
 * two-slit. Normalised so the central maximum equals `amplitude`. Orders m with
 * m·a/d a non-zero integer fall on zeros of the envelope (missing orders).
 */
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel } from "./detector.js";
import { directionSine, type SineResult } from "./geometry.js";
import { sinc, sincWithSlope, type SincResult } from "./sinc.js";
import { specs } from "./specs.js";
import type { FarFieldOptions } from "./twoSlit.js";

/** Scratch for `gratingFactor`: g and dg/dφ. */
interface GratingResult {
  g: number;
  dg: number;
}

/**
 * g(φ) = sin(Nφ) / (N sin φ) and dg/dφ, stable at the principal maxima φ = mπ
 * (reduced to φ = mπ + e, g = (−1)^{m(N−1)} sin(Ne)/(N sin e); Taylor series when |Ne| < 1e-3).
 */
function gratingFactor(n: number, phi: number, out: GratingResult): void {
  const m = Math.round(phi / Math.PI);
  const e = phi - m * Math.PI;
  const flip = (Math.abs(m) % 2 === 1) && (n % 2 === 0) ? -1 : 1;
  if (Math.abs(n * e) < 1e-3) {
    const n2 = n * n;
    const e2 = e * e;
    const c4 = (3 * n2 * n2 - 10 * n2 + 7) / 360;
    out.g = flip * (1 - ((n2 - 1) * e2) / 6 + c4 * e2 * e2);
    out.dg = flip * (-((n2 - 1) * e) / 3 + 4 * c4 * e2 * e);
    return;
  }
  const sinNe = Math.sin(n * e);
  const sinE = Math.sin(e);
  out.g = (flip * sinNe) / (n * sinE);
  out.dg = (flip * (n * Math.cos(n * e) * sinE - sinNe * Math.cos(e))) / (n * sinE * sinE);
}

/**
 * N-slit point pattern. Parameters: amplitude (counts), center (m), separation (m),
 * width (m), slits (integer ≥ 1, never fitted: its Jacobian column is 0), wavelength (m),
 * distance (m).
 */
export function nSlitPattern(options: { smallAngle?: boolean } = {}): PointPattern {
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  const grating: GratingResult = { g: 0, dg: 0 };
  let amplitude = 0, center = 0, separation = 0, width = 0, slits = 2, wavelength = 0, distance = 0, k = 0;
  return {
    id: "n-slit",
    description: "Far-field N-slit pattern: sinc² envelope × grating factor (N = 1 single slit)",
    parameters: specs("amplitude", "center", "separation", "width", "slits", "wavelength", "distance"),
    prepare(p) {
      amplitude = p[0]!; center = p[1]!; separation = p[2]!; width = p[3]!;
      slits = Math.max(1, Math.round(p[4]!)); wavelength = p[5]!; distance = p[6]!;
      k = (2 * Math.PI) / wavelength;
    },
    value(x) {
      directionSine(x - center, distance, smallAngle, geo);
      const beta = 0.5 * k * width * geo.s;
      const sincValue = sinc(beta);
      const envelope = sincValue * sincValue;
      gratingFactor(slits, 0.5 * k * separation * geo.s, grating);
      return amplitude * envelope * grating.g * grating.g;
    },
    valueGrad(x, g) {
      directionSine(x - center, distance, smallAngle, geo);
      const s = geo.s;
      const beta = 0.5 * k * width * s;
      const phi = 0.5 * k * separation * s;
      sincWithSlope(beta, envelopeSinc);
      const sincValue = envelopeSinc.value;
      const sincSlope = envelopeSinc.slope;
      gratingFactor(slits, phi, grating);
      const envelope = sincValue * sincValue;
      const interference = grating.g * grating.g;
      const dBeta = amplitude * 2 * sincValue * sincSlope * interference;
      const dPhi = amplitude * envelope * 2 * grating.g * grating.dg;
      const dS = (dBeta * width + dPhi * separation) * 0.5 * k;
      const dU = dS * geo.dsdu;
      g[0] = envelope * interference;
      g[1] = -dU;
      g[2] = dPhi * 0.5 * k * s;
      g[3] = dBeta * 0.5 * k * s;
      g[4] = 0;
      g[5] = -(dBeta * beta + dPhi * phi) / wavelength;
      g[6] = dS * geo.dsdL;
      g[7] = dU;
      return amplitude * envelope * interference;
    },
  };
}

/**
 * Single-slit point pattern I = amplitude · sinc²(π a s / λ). Parameters: amplitude (counts),
 * center (m), width (m), wavelength (m), distance (m).
 */
export function singleSlitPattern(options: { smallAngle?: boolean } = {}): PointPattern {
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  let amplitude = 0, center = 0, width = 0, wavelength = 0, distance = 0, k = 0;
  return {
    id: "single-slit",
    description: "Far-field single-slit pattern: amplitude · sinc²(π a sinθ / λ)",
    parameters: specs("amplitude", "center", "width", "wavelength", "distance"),
    prepare(p) {
      amplitude = p[0]!; center = p[1]!; width = p[2]!; wavelength = p[3]!; distance = p[4]!;
      k = (2 * Math.PI) / wavelength;
    },
    value(x) {
      directionSine(x - center, distance, smallAngle, geo);
      const sincValue = sinc(0.5 * k * width * geo.s);
      return amplitude * sincValue * sincValue;
    },
    valueGrad(x, g) {
      directionSine(x - center, distance, smallAngle, geo);
      const s = geo.s;
      const beta = 0.5 * k * width * s;
      sincWithSlope(beta, envelopeSinc);
      const sincValue = envelopeSinc.value;
      const sincSlope = envelopeSinc.slope;
      const dBeta = amplitude * 2 * sincValue * sincSlope;
      const dS = dBeta * 0.5 * k * width;
      const dU = dS * geo.dsdu;
      g[0] = sincValue * sincValue;
      g[1] = -dU;
      g[2] = dBeta * 0.5 * k * s;
      g[3] = -(dBeta * beta) / wavelength;
      g[4] = dS * geo.dsdL;
      g[5] = dU;
      return amplitude * sincValue * sincValue;
    },
  };
}

const envelopeSinc: SincResult = { value: 0, slope: 0 };

/**
 * Model "n-slit": N-slit pattern plus detector effects (see detectorModel). Parameters:
 * amplitude, center, separation, width, slits, wavelength, distance, background,
 * backgroundSlope, pixelWidth, blur (SI units).
 */
export function nSlitModel(options: FarFieldOptions = {}): Model {
  return detectorModel(nSlitPattern(options), options);
}

/**
 * Model "single-slit": single-slit pattern plus detector effects. Parameters: amplitude,
 * center, width, wavelength, distance, background, backgroundSlope, pixelWidth, blur (SI).
 */
export function singleSlitModel(options: FarFieldOptions = {}): Model {
  return detectorModel(singleSlitPattern(options), options);
}
