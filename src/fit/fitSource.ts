/**
 * The record of what a fit was made from (FitSource) and the way back from it to a model, so a
 * result can be re-fitted, replayed or compared without being told its model and options again.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import { modelSource, type ModelSource } from "../physics/modelSource.js";
import { getModel } from "../physics/registry.js";
import type { Profile } from "../profile.js";
import { profileFingerprint } from "../stats/fingerprint.js";
import { formulaModel } from "./formulaModel.js";
import type { FitSource } from "./types.js";

/** Fit options as JSON can hold them: no callbacks, no abort signal, no undefined values. */
export function recordableOptions(options: object): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(options)) {
    if (k === "onProgress" || k === "signal" || typeof v === "function" || v === undefined) continue;
    out[k] = v;
  }
  return out;
}

/**
 * The FitSource of a fit of `model` to `profile` with `options`. A model built by hand (not by
 * getModel or formulaModel) is recorded by id only, marked `custom`: it cannot be rebuilt.
 */
export function describeFit(profile: Profile, model: Model, options: object): FitSource {
  const { rebuildable, ...source } = modelSource(model);
  const file = profile.provenance ? { source: profile.provenance.source, sha256: profile.provenance.sha256 } : null;
  return {
    model: rebuildable ? source : { ...source, custom: true },
    options: recordableOptions(options), fingerprint: profileFingerprint(profile), file, points: profile.x.length,
  };
}

/**
 * Builds the model a FitSource (or a results file's record) names: getModel(id, options), or
 * formulaModel(expression, …) for formula models.
 */
export function rebuildModel(source: ModelSource): Model {
  if (source.custom) {
    throw new InvalidArgumentError("model", source.id, "a model from getModel(id, options) or formulaModel(text); a hand-built model cannot be rebuilt from its record");
  }
  if (source.formula) {
    const f = source.formula;
    return formulaModel(f.expression, { variable: f.variable, parameters: f.parameters, id: source.id });
  }
  return getModel(source.id, source.options);
}
