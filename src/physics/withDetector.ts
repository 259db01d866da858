/**
 * Detector effects for any Model (for example a user's formula model): pixel averaging,
 * Gaussian blur and constant + linear background, as in `detectorModel`.
 *
 * The model is sampled one position at a time through `patternFromModel`. Its own analytic
 * Jacobian is used for its parameters; ∂I/∂x, needed only for the pixelWidth and blur
 * columns, is a central difference with step `xStep` (default 1 nm: truncation and rounding
 * errors both below ~1e-9 relative for fringes wider than a micrometre).
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { DETECTOR_PARAMETERS, detectorModel, type DetectorOptions } from "./detector.js";

/** Options of `withDetector` / `patternFromModel`. */
export interface WithDetectorOptions extends DetectorOptions {
  /** Step (m) of the central difference for ∂I/∂x; default 1e-9. */
  xStep?: number;
}

/**
 * A PointPattern that evaluates `model` at single positions (x in m), without allocation.
 * Models without `jacobian` give a pattern whose gradient is a central difference in every
 * parameter (relative step 1e-7).
 */
export function patternFromModel(model: Model, options: { xStep?: number } = {}): PointPattern {
  const xStep = options.xStep ?? 1e-9;
  if (!(xStep > 0) || !Number.isFinite(xStep)) throw new InvalidArgumentError("xStep", xStep, "a positive length in m");
  const p = model.parameters.length;
  const params = new Float64Array(p);
  const shifted = new Float64Array(p);
  const at = new Float64Array(1);
  const out = new Float64Array(1);
  const jac = new Float64Array(p);
  const single = (x: number, values: Float64Array): number => {
    at[0] = x;
    model.evaluate(at, values, out);
    return out[0]!;
  };
  return {
    id: model.id,
    description: model.description,
    parameters: model.parameters,
    prepare(values) {
      for (let j = 0; j < p; j++) params[j] = values[j]!;
    },
    value: (x) => single(x, params),
    valueGrad(x, g) {
      let value: number;
      if (model.jacobian) {
        at[0] = x;
        model.jacobian(at, params, jac, out);
        value = out[0]!;
        for (let j = 0; j < p; j++) g[j] = jac[j]!;
      } else {
        value = single(x, params);
        for (let j = 0; j < p; j++) {
          if (model.parameters[j]!.integer) { g[j] = 0; continue; }
          const h = 1e-7 * Math.max(Math.abs(params[j]!), 1e-12);
          shifted.set(params);
          shifted[j] = params[j]! + h;
          const plus = single(x, shifted);
          shifted[j] = params[j]! - h;
          g[j] = (plus - single(x, shifted)) / (2 * h);
        }
      }
      g[p] = (single(x + xStep, params) - single(x - xStep, params)) / (2 * xStep);
      return value;
    },
  };
}

/**
 * Wraps any Model of intensity against detector position x (m) with detector effects.
 * Parameters: the model's, then background, backgroundSlope, pixelWidth, blur (see
 * DETECTOR_PARAMETERS). Throws when the model already has one of those names.
 * @example const measured = withDetector(myFormulaModel, { pixelNodes: 5 });
 */
export function withDetector(model: Model, options: WithDetectorOptions = {}): Model {
  const names = new Set(model.parameters.map((spec) => spec.name));
  for (const spec of DETECTOR_PARAMETERS) {
    if (names.has(spec.name)) {
      throw new InvalidArgumentError("model", model.id, `a model without its own "${spec.name}" parameter (withDetector adds background, backgroundSlope, pixelWidth and blur)`);
    }
  }
  const xStep = options.xStep;
  return detectorModel(patternFromModel(model, xStep === undefined ? {} : { xStep }), options);
}
