/**
 * The models the browser can evaluate, keyed by id. The bundle entry registers fringekit's
 * physics models (the same code the kernel runs), so sliders recompute curves without the kernel.
 */
import type { Model } from "../../src/physics/model.js";

const models = new Map<string, Model>();

/** Make `model` available to explorer views under `model.id`. */
export function registerModel(model: Model): void {
  models.set(model.id, model);
}

/** The model with this id, or a clear error naming the ids that exist. */
export function modelById(id: string): Model {
  const model = models.get(id);
  if (model === undefined) {
    throw new Error(`unknown model ${JSON.stringify(id)} in the browser (known: ${[...models.keys()].join(", ") || "none"}); ` +
      "rebuild the widget bundle after adding a model");
  }
  return model;
}

type Builder = (id: string, options: Record<string, unknown>) => Model;
let builder: Builder | null = null;
const built = new Map<string, Model>();

/** How to build a model from its id and options (the bundle registers getModel). */
export function registerModelBuilder(build: Builder): void {
  builder = build;
  built.clear();
}

/**
 * The model with this id built with `options` (e.g. { smallAngle: true }), so the preview and
 * the page's fitter use exactly the model the kernel fits; without options the registered one.
 */
export function modelFor(id: string, options: Record<string, unknown> | null | undefined): Model {
  if (!options || Object.keys(options).length === 0 || builder === null) return modelById(id);
  const key = `${id} ${JSON.stringify(options)}`;
  let model = built.get(key);
  if (model === undefined) {
    model = builder(id, options);
    built.set(key, model);
  }
  return model;
}

/** Ids of every registered model, in registration order. */
export function modelIds(): string[] {
  return [...models.keys()];
}
