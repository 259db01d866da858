// Offline renderer (placeholder entry until the static-page renderer lands): registers the module.
import { registerPhysicsModels } from "../registerPhysics.js";
import * as widgets from "../index.js";

registerPhysicsModels();
(globalThis as Record<string, unknown>).fringekitWidgets = widgets;
