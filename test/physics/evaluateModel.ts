// Test helper: evaluate a registered model at x from named parameter values (SI units).
import { getModel, type ModelOptions } from "../../src/physics/registry.js";
import { paramVector } from "../../src/physics/simulate.js";

/** Model `id` (registry options `options`) at positions x (m) with the named parameter values. */
export function evaluate(id: string, values: Record<string, number>, x: Float64Array, options: ModelOptions = {}): Float64Array {
  const model = getModel(id, options);
  const out = new Float64Array(x.length);
  model.evaluate(x, paramVector(model, values), out);
  return out;
}
