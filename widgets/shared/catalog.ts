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

/**
 * The model with this id, or a clear error naming the ids that exist. Models not registered
 * one by one come from the registered builder, built on first use (only the models a page shows).
 */
export function modelById(id: string): Model {
  let model = models.get(id);
  if (model === undefined && builder !== null) {
    try {
      model = builder(id, {});
      models.set(id, model);
    } catch {
      // unknown id or one that needs options: the error below names the ids there are
    }
  }
  if (model === undefined) {
    throw new Error(`unknown model ${JSON.stringify(id)} in the browser (known: ${modelIds().join(", ") || "none"}); ` +
      "rebuild the widget bundle after adding a model");
  }
  return model;
}

type Builder = (id: string, options: Record<string, unknown>) => Model;
let builder: Builder | null = null;
const built = new Map<string, Model>();
/** Ids the builder offers, listed on first need (listing builds every model once). */
let listIds: (() => string[]) | null = null;
let listed: string[] | null = null;

/**
 * How to build a model from its id and options (the bundle registers getModel), and the ids it
 * offers without options (`ids`, called once when first needed).
 */
export function registerModelBuilder(build: Builder, ids?: () => string[]): void {
  builder = build;
  built.clear();
  if (ids) {
    listIds = ids;
    listed = null;
  }
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

/** Ids of every registered model: the builder's in its order, then those registered one by one. */
export function modelIds(): string[] {
  if (listIds !== null && listed === null) listed = listIds();
  return [...new Set([...(listed ?? []), ...models.keys()])];
}
