/**
 * Two-beam interference under a Gaussian envelope (e.g. two overlapping laser beams, or
 * slits lit by a Gaussian beam, seen on the detector):
 *
 *   I(x) = (amplitude/2) · exp(−2u²/w²) · [1 + V cos(2π d s / λ + φ)]   (amplitude = coherent peak),  u = x − center,
 *
 * s = sin θ as in two-slit, w = beamWaist (1/e² intensity radius on the detector).
 * V = 2√(I1 I2)/(I1 + I2)·|γ12| carries unequal intensities and partial coherence
 * (Born & Wolf §10.4.1; helpers in coherence.ts).
 */
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel } from "./detector.js";
import { directionSine, type SineResult } from "./geometry.js";
import { specs } from "./specs.js";
import type { FarFieldOptions } from "./twoSlit.js";

/**
 * Two-beam point pattern. Parameters: amplitude (counts), center (m), separation (m),
 * beamWaist (m), visibility (1), phase (rad), wavelength (m), distance (m).
 */
export function twoBeamPattern(options: { smallAngle?: boolean } = {}): PointPattern {
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  let amplitude = 0, center = 0, separation = 0, waist = 0, visibility = 0, phase = 0, wavelength = 0, distance = 0, k = 0;
  return {
    id: "two-beam",
    description: "Two-beam fringes under a Gaussian envelope: exp(−2u²/w²) × (1 + V cos)",
    parameters: specs("amplitude", "center", "separation", "beamWaist", "visibility", "phase", "wavelength", "distance"),
    prepare(p) {
      amplitude = 0.5 * p[0]!; center = p[1]!; separation = p[2]!; waist = p[3]!; // parameter = coherent peak
      visibility = p[4]!; phase = p[5]!; wavelength = p[6]!; distance = p[7]!;
      k = (2 * Math.PI) / wavelength;
    },
    value(x) {
      const u = x - center;
      directionSine(u, distance, smallAngle, geo);
      const envelope = Math.exp((-2 * u * u) / (waist * waist));
      return amplitude * envelope * (1 + visibility * Math.cos(k * separation * geo.s + phase));
    },
    valueGrad(x, g) {
      const u = x - center;
      directionSine(u, distance, smallAngle, geo);
      const envelope = Math.exp((-2 * u * u) / (waist * waist));
      const path = k * separation * geo.s;
      const cosG = Math.cos(path + phase);
      const fringe = 1 + visibility * cosG;
      const value = amplitude * envelope * fringe;
      const dGamma = -amplitude * envelope * visibility * Math.sin(path + phase);
      const dU = value * ((-4 * u) / (waist * waist)) + dGamma * k * separation * geo.dsdu;
      g[0] = 0.5 * envelope * fringe;
      g[1] = -dU;
      g[2] = dGamma * k * geo.s;
      g[3] = (value * 4 * u * u) / (waist * waist * waist);
      g[4] = amplitude * envelope * cosG;
      g[5] = dGamma;
      g[6] = -(dGamma * path) / wavelength;
      g[7] = dGamma * k * separation * geo.dsdL;
      g[8] = dU;
      return value;
    },
  };
}

/**
 * Model "two-beam": Gaussian-envelope two-beam pattern plus detector effects. Parameters:
 * amplitude, center, separation, beamWaist, visibility, phase, wavelength, distance,
 * background, backgroundSlope, pixelWidth, blur (SI units).
 */
export function twoBeamModel(options: FarFieldOptions = {}): Model {
  return detectorModel(twoBeamPattern(options), options);
}
