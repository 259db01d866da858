// Bundle entry of the widget module ("fringekit-widgets"): classes plus the physics models.
import { registerPhysicsModels } from "../registerPhysics.js";

registerPhysicsModels();
export * from "../index.js";
