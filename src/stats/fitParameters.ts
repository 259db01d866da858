/** Small helpers to read named parameters out of a FitResult. */
import { InvalidArgumentError } from "../errors.js";
import type { FitParameter, FitResult } from "../fit/types.js";

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
