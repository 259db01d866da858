/**
 * Two-slit patterns from a source with finite bandwidth (temporal coherence).
 *
 * Gaussian spectrum ("two-slit-broadband"): the spectrum is taken Gaussian in wavenumber
 * k = 2π/λ around k0 = 2π/λ0 with standard deviation σk = (2π Δλ / λ0²) / (2√(2 ln 2)),
 * Δλ = bandwidth (FWHM in wavelength, mapped to wavenumber to first order in Δλ/λ0).
 * Averaging the fringe term over it is exact (Gaussian characteristic function):
 *   ⟨cos(k D + φ)⟩ = exp(−σk² D² / 2) cos(k0 D + φ),  D = d sin θ (path difference).
 * The sinc² envelope is taken at λ0; that neglects terms of order (Δλ/λ0)²: about 1.4e-4 of
 * the peak at Δλ/λ0 = 1 % and 1.4e-6 at 0.1 % for a = 0.1 mm, d = 0.5 mm (measured against the
 * tabulated model in test/physics/broadband.test.ts). Use "two-slit-spectrum" for wider bands.
 *
 * Tabulated spectrum ("two-slit-spectrum"): the full two-slit pattern (envelope included)
 * summed over the samples with trapezoid weights; exact up to the table's resolution.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel } from "./detector.js";
import { directionSine, type SineResult } from "./geometry.js";
import { sincInto, type SincResult } from "./sinc.js";
import { specs } from "./specs.js";
import type { FarFieldOptions } from "./twoSlit.js";

const FWHM_TO_SIGMA = 1 / (2 * Math.sqrt(2 * Math.LN2));

/**
 * Gaussian-spectrum two-slit point pattern. Parameters: amplitude (counts), center (m),
 * separation (m), width (m), visibility (1), phase (rad), wavelength (centre, m),
 * bandwidth (FWHM, m), distance (m).
 */
export function twoSlitBroadbandPattern(options: { smallAngle?: boolean } = {}): PointPattern {
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  const envelopeSinc: SincResult = { value: 0, slope: 0 };
  let amplitude = 0, center = 0, separation = 0, width = 0, visibility = 0, phase = 0;
  let wavelength = 0, bandwidth = 0, distance = 0, k = 0, sigmaK = 0, dSigmaDBandwidth = 0;
  const evaluate = (x: number, g: Float64Array | null): number => {
    directionSine(x - center, distance, smallAngle, geo);
    const s = geo.s;
    const beta = 0.5 * k * width * s;
    sincInto(beta, g !== null, envelopeSinc);
    const sincValue = envelopeSinc.value;
    const sincSlope = envelopeSinc.slope;
    const envelope = sincValue * sincValue;
    const pathLength = separation * s; // D (m)
    const q = sigmaK * pathLength;
    const damping = Math.exp(-0.5 * q * q);
    const gamma = k * pathLength + phase;
    const cosG = Math.cos(gamma);
    const fringe = 1 + visibility * damping * cosG;
    const value = amplitude * envelope * fringe;
    if (!g) return value;
    const dBeta = amplitude * 2 * sincValue * sincSlope * fringe;
    const dGamma = -amplitude * envelope * visibility * damping * Math.sin(gamma);
    const dDamping = amplitude * envelope * visibility * cosG;
    const dSigma = dDamping * (-q * damping) * pathLength; // ∂I/∂σk
    const dPath = dGamma * k + dDamping * (-q * damping) * sigmaK; // ∂I/∂D
    const dS = dBeta * 0.5 * k * width + dPath * separation;
    const dU = dS * geo.dsdu;
    g[0] = 0.5 * envelope * fringe;
    g[1] = -dU;
    g[2] = dPath * s;
    g[3] = dBeta * 0.5 * k * s;
    g[4] = amplitude * envelope * damping * cosG;
    g[5] = dGamma;
    // k0 ∝ 1/λ0, σk ∝ Δλ/λ0²
    g[6] = -(dBeta * beta + dGamma * k * pathLength) / wavelength - (2 * dSigma * sigmaK) / wavelength;
    g[7] = dSigma * dSigmaDBandwidth;
    g[8] = dS * geo.dsdL;
    g[9] = dU;
    return value;
  };
  return {
    id: "two-slit-broadband",
    description: "Two-slit pattern from a spectrum Gaussian in wavenumber, FWHM `bandwidth` mapped to first order (fringe contrast falls off with path difference)",
    parameters: specs("amplitude", "center", "separation", "width", "visibility", "phase", "wavelength", "bandwidth", "distance"),
    prepare(p) {
      // amplitude (parameter) = peak of the fully coherent pattern: the two-beam sum uses half of it.
      amplitude = 0.5 * p[0]!; center = p[1]!; separation = p[2]!; width = p[3]!; visibility = p[4]!;
      phase = p[5]!; wavelength = p[6]!; bandwidth = p[7]!; distance = p[8]!;
      k = (2 * Math.PI) / wavelength;
      dSigmaDBandwidth = ((2 * Math.PI) / (wavelength * wavelength)) * FWHM_TO_SIGMA;
      sigmaK = dSigmaDBandwidth * bandwidth;
    },
    value: (x) => evaluate(x, null),
    valueGrad: (x, g) => evaluate(x, g),
  };
}

/**
 * Model "two-slit-broadband": Gaussian-spectrum two-slit pattern plus detector effects.
 * Parameters: amplitude, center, separation, width, visibility, phase, wavelength,
 * bandwidth, distance, background, backgroundSlope, pixelWidth, blur (SI units).
 */
export function twoSlitBroadbandModel(options: FarFieldOptions = {}): Model {
  return detectorModel(twoSlitBroadbandPattern(options), options);
}

/** A source spectrum as a table: wavelengths (m, strictly increasing) and spectral densities (≥ 0, any scale). */
export interface SpectrumTable {
  wavelengths: ArrayLike<number>;
  weights: ArrayLike<number>;
}

/**
 * Tabulated-spectrum two-slit point pattern: Σ_j w_j · I_two-slit(x; λ_j), with trapezoid
 * weights w_j normalised to Σ w_j = 1. Parameters: amplitude (counts), center (m),
 * separation (m), width (m), visibility (1), phase (rad), distance (m); wavelengths come
 * from the table. Cost: one two-slit evaluation per table row per node.
 */
export function twoSlitSpectrumPattern(spectrum: SpectrumTable, options: { smallAngle?: boolean } = {}): PointPattern {
  const { ks, ws } = normaliseSpectrum(spectrum);
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  const envelopeSinc: SincResult = { value: 0, slope: 0 };
  let amplitude = 0, center = 0, separation = 0, width = 0, visibility = 0, phase = 0, distance = 0;
  const evaluate = (x: number, g: Float64Array | null): number => {
    directionSine(x - center, distance, smallAngle, geo);
    const s = geo.s;
    let value = 0, gA = 0, gSep = 0, gWidth = 0, gVis = 0, gPhase = 0, gS = 0;
    for (let j = 0; j < ks.length; j++) {
      const k = ks[j]!;
      const w = ws[j]!;
      const beta = 0.5 * k * width * s;
      sincInto(beta, g !== null, envelopeSinc);
      const sincValue = envelopeSinc.value;
      const sincSlope = envelopeSinc.slope;
      const envelope = sincValue * sincValue;
      const gamma = k * separation * s + phase;
      const cosG = Math.cos(gamma);
      const fringe = 1 + visibility * cosG;
      value += w * envelope * fringe;
      if (!g) continue;
      const dBeta = w * 2 * sincValue * sincSlope * fringe; // per unit amplitude
      const dGamma = -w * envelope * visibility * Math.sin(gamma);
      gA += w * envelope * fringe;
      gSep += dGamma * k * s;
      gWidth += dBeta * 0.5 * k * s;
      gVis += w * envelope * cosG;
      gPhase += dGamma;
      gS += dBeta * 0.5 * k * width + dGamma * k * separation;
    }
    if (!g) return amplitude * value;
    const dU = amplitude * gS * geo.dsdu;
    g[0] = 0.5 * gA;
    g[1] = -dU;
    g[2] = amplitude * gSep;
    g[3] = amplitude * gWidth;
    g[4] = amplitude * gVis;
    g[5] = amplitude * gPhase;
    g[6] = amplitude * gS * geo.dsdL;
    g[7] = dU;
    return amplitude * value;
  };
  return {
    id: "two-slit-spectrum",
    description: "Two-slit pattern summed over a tabulated source spectrum",
    parameters: specs("amplitude", "center", "separation", "width", "visibility", "phase", "distance"),
    prepare(p) {
      amplitude = 0.5 * p[0]!; center = p[1]!; separation = p[2]!; width = p[3]!; // parameter = coherent peak
      visibility = p[4]!; phase = p[5]!; distance = p[6]!;
    },
    value: (x) => evaluate(x, null),
    valueGrad: (x, g) => evaluate(x, g),
  };
}

/**
 * Model "two-slit-spectrum": tabulated-spectrum two-slit pattern plus detector effects.
 * @param spectrum wavelengths (m, increasing) and spectral densities (any scale)
 */
export function twoSlitSpectrumModel(spectrum: SpectrumTable, options: FarFieldOptions = {}): Model {
  return detectorModel(twoSlitSpectrumPattern(spectrum, options), options);
}

function normaliseSpectrum(spectrum: SpectrumTable): { ks: Float64Array; ws: Float64Array } {
  const wavelengths = spectrum?.wavelengths;
  const weights = spectrum?.weights;
  if (!wavelengths || !weights || wavelengths.length !== weights.length || wavelengths.length < 1) {
    throw new InvalidArgumentError("spectrum", spectrum, "{ wavelengths, weights } of equal, non-zero length");
  }
  const n = wavelengths.length;
  const ks = new Float64Array(n);
  const ws = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const lambda = wavelengths[j]!;
    const weight = weights[j]!;
    if (!(lambda > 0) || !Number.isFinite(lambda)) throw new InvalidArgumentError(`spectrum.wavelengths[${j}]`, lambda, "a positive wavelength in m");
    if (j > 0 && !(lambda > wavelengths[j - 1]!)) throw new InvalidArgumentError(`spectrum.wavelengths[${j}]`, lambda, "strictly increasing wavelengths");
    if (!(weight >= 0) || !Number.isFinite(weight)) throw new InvalidArgumentError(`spectrum.weights[${j}]`, weight, "a finite spectral density ≥ 0");
    ks[j] = (2 * Math.PI) / lambda;
  }
  // trapezoid rule in wavelength: w_j = S_j (λ_{j+1} − λ_{j−1}) / 2 (one row: weight 1)
  let total = 0;
  for (let j = 0; j < n; j++) {
    const left = j > 0 ? wavelengths[j - 1]! : wavelengths[j]!;
    const right = j < n - 1 ? wavelengths[j + 1]! : wavelengths[j]!;
    ws[j] = n === 1 ? weights[j]! : (weights[j]! * (right - left)) / 2;
    total += ws[j]!;
  }
  if (!(total > 0)) throw new InvalidArgumentError("spectrum.weights", "all zero", "at least one positive spectral density");
  for (let j = 0; j < n; j++) ws[j] = ws[j]! / total;
  return { ks, ws };
}
