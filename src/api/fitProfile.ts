/**
 * fitProfile in one line: a model id or a model, options, and back comes a Fit that remembers
 * what it was made from.
 */
import { InvalidArgumentError } from "../errors.js";
import { fitProfile as solveProfile } from "../fit/fitProfile.js";
import { describeFit } from "../fit/fitSource.js";
import type { FitOptions } from "../fit/types.js";
import type { Model } from "../physics/model.js";
import { getModel, type ModelOptions } from "../physics/registry.js";
import type { Profile } from "../profile.js";
import { Fit } from "./fit.js";

/** Options of fitProfile: the fit options, and model options when the model is given by id. */
export interface FitProfileOptions extends FitOptions {
  /** Options for getModel when `model` is an id (e.g. { smallAngle: true }). */
  modelOptions?: ModelOptions;
}

/**
 * Fits a model to a profile (bounded Levenberg–Marquardt under the noise model, automatic
 * starting values; see the fitting section of the README). Units: SI throughout (x in m,
 * parameters in their spec units). A fit that does not converge comes back with
 * `converged: false` and a reason, never as an exception.
 * @param profile the data (x in m)
 * @param model   a model id ("two-slit", see listModels) or a model (getModel, formulaModel)
 * @param options fixed, free, tied and bounded parameters (SI), start values, noise model, …
 * @example fitProfile(profile, "two-slit", { fix: { wavelength: 680e-9, distance: 0.75 } }).params.separation.value // m
 * @throws InvalidArgumentError for bad input (unknown model or names, bad bounds, too few points), before any work
 */
export function fitProfile(profile: Profile, model: string | Model, options: FitProfileOptions = {}): Fit {
  const { modelOptions, ...fitOptions } = options;
  let built: Model;
  if (typeof model === "string") built = getModel(model, modelOptions ?? {});
  else if (model && typeof model === "object" && typeof model.evaluate === "function") {
    if (modelOptions) throw new InvalidArgumentError("modelOptions", modelOptions, "only with a model id; a model object already carries its options");
    built = model;
  } else throw new InvalidArgumentError("model", model, 'a model id such as "two-slit", or a model from getModel or formulaModel');
  const result = solveProfile(profile, built, fitOptions);
  return new Fit({ ...result, source: describeFit(profile, built, fitOptions) }, profile, built);
}
