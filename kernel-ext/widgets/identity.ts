/** Model/view names of fringekit's widgets as the kernel announces them (protocol 2.1). */
import type { WidgetIdentity } from "../widget/model.js";
import { MODULE_NAME, MODULE_VERSION } from "../../widgets/shared/version.js";

/** Identity of the frontend pair `${name}Model` / `${name}View` in the fringekit widget module. */
export function widgetIdentity(name: "Explorer" | "Comparison" | "Uncertainty" | "CoherenceScan"): WidgetIdentity {
  return {
    modelName: `${name}Model`,
    modelModule: MODULE_NAME,
    modelModuleVersion: MODULE_VERSION,
    viewName: `${name}View`,
    viewModule: MODULE_NAME,
    viewModuleVersion: MODULE_VERSION,
  };
}
