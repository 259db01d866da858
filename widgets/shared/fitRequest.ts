/**
 * Fit options from the explorer's parameter state: the same translation in the kernel and in
 * the static page's fitter, so Fit means the same thing everywhere.
 */
import type { FitOptions } from "../../src/fit/types.js";
import type { Model } from "../../src/physics/model.js";
import { paramsForModel, type ParamState } from "./preview.js";

/**
 * Start values for free parameters, fixed values for held ones, freed fixed-by-default names,
 * changed bounds, and the noise model. Integer parameters (slits) are always held.
 */
export function fitOptionsFromParams(model: Model, state: Record<string, ParamState>, noise: string): Omit<FitOptions, "onProgress" | "signal"> {
  const params = paramsForModel(model, state);
  const start: Record<string, number> = {};
  const fix: Record<string, number> = {};
  const free: string[] = [];
  const bounds: Record<string, [number, number]> = {};
  for (const spec of model.parameters) {
    const p = params[spec.name]!;
    if (p.fixed || spec.integer) {
      fix[spec.name] = p.value;
      continue;
    }
    start[spec.name] = p.value;
    if (spec.fixedByDefault) free.push(spec.name);
    if (p.lower !== spec.lower || p.upper !== spec.upper) bounds[spec.name] = [p.lower, p.upper];
  }
  return { start, fix, free, bounds, noise: noise as FitOptions["noise"], autoStart: false };
}
