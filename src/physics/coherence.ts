/**
 * Spatial coherence of extended incoherent sources (van Cittert–Zernike theorem,
 * Born & Wolf §10.4.2) and the two-beam visibility relations.
 *
 * Models of visibility against slit separation d (x = d in m, y = visibility):
 *  - "coherence-disc": uniform circular source of diameter D at distance R:
 *      V(d) = V0 · |2 J1(v) / v|,  v = π D d / (λ R)   (Born & Wolf §10.4.3)
 *  - "coherence-gaussian": source with Gaussian intensity of rms width σ along the slit axis:
 *      V(d) = V0 · exp(−2π² σ² d² / (λ R)²)   (Fourier transform of the Gaussian)
 * V0 = `visibility`, the visibility at zero separation (1 for ideal optics).
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "./model.js";
import { besselJ012, type BesselTriple } from "./bessel.js";
import { specs } from "./specs.js";

/**
 * Model "coherence-disc". Parameters: visibility (V0, 1), diameter (m), sourceDistance (m),
 * wavelength (m). Position x: slit separation (m). Output: visibility (1).
 */
export function coherenceDiscModel(): Model {
  const triple: BesselTriple = { j0: 0, j1: 0, j2: 0 };
  const parameters = specs("visibility", "diameter", "sourceDistance", "wavelength");
  parameters[0]!.description = "Visibility at zero slit separation (instrument limit).";
  /** |2J1(v)/v| and its derivative in v; J1(v)/v and J2(v)/v by series when v is tiny. */
  const shape = (v: number, slope: { d: number }): number => {
    if (Math.abs(v) < 1e-4) {
      const v2 = v * v;
      slope.d = -(v / 4) * (1 - v2 / 12); // −2 J2(v)/v = −v/4 + v³/48
      return 1 - v2 / 8;
    }
    besselJ012(v, triple);
    const value = (2 * triple.j1) / v;
    const derivative = (-2 * triple.j2) / v;
    slope.d = value < 0 ? -derivative : derivative;
    return Math.abs(value);
  };
  const slope = { d: 0 };
  return {
    id: "coherence-disc",
    description: "Visibility vs slit separation for a uniform circular source: V0 |2J1(v)/v|, v = πDd/(λR)",
    parameters,
    evaluate(x, p, out) {
      const factor = (Math.PI * p[1]!) / (p[3]! * p[2]!);
      for (let i = 0; i < x.length; i++) out[i] = p[0]! * shape(factor * x[i]!, slope);
    },
    jacobian(x, p, jac, out) {
      const v0 = p[0]!, diameter = p[1]!, sourceDistance = p[2]!, wavelength = p[3]!;
      const factor = (Math.PI * diameter) / (wavelength * sourceDistance);
      for (let i = 0; i < x.length; i++) {
        const v = factor * x[i]!;
        const value = shape(v, slope);
        const dv = v0 * slope.d * v; // ∂y/∂(ln v)
        const row = 4 * i;
        jac[row] = value;
        jac[row + 1] = dv / diameter;
        jac[row + 2] = -dv / sourceDistance;
        jac[row + 3] = -dv / wavelength;
        if (out) out[i] = v0 * value;
      }
    },
  };
}

/**
 * Model "coherence-gaussian". Parameters: visibility (V0, 1), rmsSize (m), sourceDistance (m),
 * wavelength (m). Position x: slit separation (m). Output: visibility (1).
 */
export function coherenceGaussianModel(): Model {
  const parameters = specs("visibility", "rmsSize", "sourceDistance", "wavelength");
  parameters[0]!.description = "Visibility at zero slit separation (instrument limit).";
  return {
    id: "coherence-gaussian",
    description: "Visibility vs slit separation for a Gaussian source: V0 exp(−2π²σ²d²/(λR)²)",
    parameters,
    evaluate(x, p, out) {
      const c = (2 * Math.PI * Math.PI * p[1]! * p[1]!) / (p[3]! * p[2]!) ** 2;
      for (let i = 0; i < x.length; i++) out[i] = p[0]! * Math.exp(-c * x[i]! * x[i]!);
    },
    jacobian(x, p, jac, out) {
      const v0 = p[0]!, size = p[1]!, sourceDistance = p[2]!, wavelength = p[3]!;
      const c = (2 * Math.PI * Math.PI * size * size) / (wavelength * sourceDistance) ** 2;
      for (let i = 0; i < x.length; i++) {
        const exponent = c * x[i]! * x[i]!;
        const shape = Math.exp(-exponent);
        const value = v0 * shape;
        const row = 4 * i;
        jac[row] = shape;
        jac[row + 1] = (-2 * exponent * value) / size;
        jac[row + 2] = (2 * exponent * value) / sourceDistance;
        jac[row + 3] = (2 * exponent * value) / wavelength;
        if (out) out[i] = value;
      }
    },
  };
}

/**
 * Two-beam fringe visibility V = 2√(I1 I2)/(I1 + I2) · |γ12| (Born & Wolf §10.4.1, eq. 10.4-(17)).
 * @param intensity1 intensity of beam 1 (any unit, ≥ 0)
 * @param intensity2 intensity of beam 2 (same unit, ≥ 0, I1 + I2 > 0)
 * @param coherence  modulus of the complex degree of coherence |γ12|, 0…1
 * @example visibilityFromBeams(1, 1, 1) // 1; visibilityFromBeams(1, 0.25, 1) // 0.8
 */
export function visibilityFromBeams(intensity1: number, intensity2: number, coherence: number): number {
  checkIntensities(intensity1, intensity2);
  checkUnit("coherence", coherence);
  return ((2 * Math.sqrt(intensity1 * intensity2)) / (intensity1 + intensity2)) * coherence;
}

/**
 * |γ12| from a measured visibility and the two beam intensities (inverse of visibilityFromBeams).
 * Throws when the visibility exceeds what the intensity ratio allows (|γ12| would exceed 1).
 */
export function coherenceFromVisibility(visibility: number, intensity1: number, intensity2: number): number {
  checkUnit("visibility", visibility);
  checkIntensities(intensity1, intensity2);
  const limit = (2 * Math.sqrt(intensity1 * intensity2)) / (intensity1 + intensity2);
  const coherence = visibility / limit;
  if (!(coherence <= 1 + 1e-12)) {
    throw new InvalidArgumentError("visibility", visibility, `at most ${limit} for intensities ${intensity1} and ${intensity2}`);
  }
  return Math.min(1, coherence);
}

/**
 * Intensity ratio r = I_weak / I_strong (0 < r ≤ 1) that gives `visibility` at coherence |γ12|:
 * solves 2√r/(1 + r) = V/|γ12|, r = ((1 − √(1 − q²)) / q)², q = V/|γ12|.
 */
export function intensityRatioFromVisibility(visibility: number, coherence: number): number {
  checkUnit("visibility", visibility);
  checkUnit("coherence", coherence);
  if (visibility > coherence) {
    throw new InvalidArgumentError("visibility", visibility, `at most the coherence ${coherence}`);
  }
  if (visibility === 0) return 0;
  const q = visibility / coherence;
  const root = (1 - Math.sqrt(1 - q * q)) / q;
  return root * root;
}

function checkIntensities(intensity1: number, intensity2: number): void {
  if (!(intensity1 >= 0) || !Number.isFinite(intensity1)) throw new InvalidArgumentError("intensity1", intensity1, "a finite intensity ≥ 0");
  if (!(intensity2 >= 0) || !Number.isFinite(intensity2)) throw new InvalidArgumentError("intensity2", intensity2, "a finite intensity ≥ 0");
  if (intensity1 + intensity2 === 0) throw new InvalidArgumentError("intensity1 + intensity2", 0, "a positive total intensity");
}

function checkUnit(name: string, value: number): void {
  if (!(value >= 0 && value <= 1)) throw new InvalidArgumentError(name, value, "a number from 0 to 1");
}
