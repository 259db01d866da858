/** Small helpers to read named parameters out of a FitResult. */
import { InvalidArgumentError } from "../errors.js";
import type { FitParameter, FitResult } from "../fit/types.js";
import type { Profile } from "../profile.js";

/** The parameter called `name`, or undefined when the model has none. */
export function findFitParameter(fit: FitResult, name: string): FitParameter | undefined {
  return fit.parameters.find((p) => p.name === name);
}

/** The parameter called `name`; throws naming the model and what it has when missing. */
export function requireFitParameter(fit: FitResult, name: string, purpose: string): FitParameter {
  const found = findFitParameter(fit, name);
  if (!found) {
    throw new InvalidArgumentError("fit", fit.modelId,
      `${purpose} needs a parameter "${name}"; model ${fit.modelId} has ${fit.parameters.map((p) => p.name).join(", ")}`);
  }
  return found;
}

/**
 * Spatial fringe frequency on the detector, q = separation / (wavelength · distance)
 * (cycles per metre, small-angle two-beam geometry — common practice), or undefined when the
 * fit lacks any of the three parameters.
 */
export function fringeFrequencyOf(fit: FitResult): number | undefined {
  const d = findFitParameter(fit, "separation")?.value;
  const lambda = findFitParameter(fit, "wavelength")?.value;
  const distance = findFitParameter(fit, "distance")?.value;
  if (d === undefined || lambda === undefined || distance === undefined) return undefined;
  const q = d / (lambda * distance);
  return Number.isFinite(q) && q > 0 ? q : undefined;
}

/** Where a fit puts the fringes: the far-field geometry parameters of a two-slit-like model. */
export interface FringeLayout {
  /** Pattern centre on the detector (m). */
  center: number;
  /** Slit or beam separation d (m). */
  separation: number;
  /** Wavelength λ (m). */
  wavelength: number;
  /** Slit-to-detector distance L (m). */
  distance: number;
  /** Fringe phase φ (rad); 0 when the model has none. */
  phase: number;
}

/**
 * The fringe layout of `fit` for a measurement on `profile`: checks that the profile is the
 * one the fit used (same point count) and that the model has center, separation, wavelength
 * and distance (phase optional), naming `purpose` in the error.
 */
export function fringeLayoutOf(profile: Profile, fit: FitResult, purpose: string): FringeLayout {
  if (profile.x.length !== fit.model.length) {
    throw new InvalidArgumentError("profile", `${profile.x.length} points`, `the profile the fit used (${fit.model.length} points)`);
  }
  const get = (name: string) => requireFitParameter(fit, name, purpose).value;
  return {
    center: get("center"),
    separation: get("separation"),
    wavelength: get("wavelength"),
    distance: get("distance"),
    phase: findFitParameter(fit, "phase")?.value ?? 0,
  };
}
