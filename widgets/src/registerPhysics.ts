/** Registers fringekit physics models with the browser catalog (same code the kernel runs). */
import { getModel, listModels } from "../../src/physics/index.js";
import { registerModel, registerModelBuilder } from "../shared/catalog.js";

/**
 * Register every detector-axis model of src/physics that can be built without options.
 * Models that need data to exist (e.g. a measured spectrum) are skipped here; a widget that
 * needs one registers the built instance itself. Safe to call more than once.
 */
export function registerPhysicsModels(): void {
  registerModelBuilder((id, options) => getModel(id, options));
  for (const info of listModels()) {
    if (info.axis !== "detector") continue;
    try {
      registerModel(getModel(info.id));
    } catch {
      // needs options (spectrum table, ...): registered by whoever has them
    }
  }
}
