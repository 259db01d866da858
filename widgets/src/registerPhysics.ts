/** Registers fringekit physics models with the browser catalog (same code the kernel runs). */
import { getModel, listModels } from "../../src/physics/index.js";
import { registerModelBuilder } from "../shared/catalog.js";

/**
 * Register every detector-axis model of src/physics that can be built without options. Each is
 * built when a view first needs it (building all of them at page load cost ~0.1 s, mostly the
 * near-field tables); models that need data to exist (e.g. a measured spectrum) are left out
 * of the list, and a widget that needs one registers the built instance itself. Safe to call
 * more than once.
 */
export function registerPhysicsModels(): void {
  registerModelBuilder((id, options) => getModel(id, options), () => listModels().filter((info) => info.axis === "detector" && buildsWithoutOptions(info.id)).map((info) => info.id));
}

function buildsWithoutOptions(id: string): boolean {
  try {
    getModel(id);
    return true;
  } catch {
    return false; // needs options (spectrum table, ...): registered by whoever has them
  }
}
