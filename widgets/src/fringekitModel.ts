/** Base model of every fringekit widget: module names and versions for the widget protocol. */
import { DOMWidgetModel } from "@jupyter-widgets/base";
import { MODULE_NAME, MODULE_VERSION } from "../shared/version.js";

/** Defaults shared by every fringekit model: `_model_module`, `_view_module` and their versions. */
export function moduleDefaults(modelName: string, viewName: string): Record<string, unknown> {
  return {
    _model_name: modelName,
    _view_name: viewName,
    _model_module: MODULE_NAME,
    _view_module: MODULE_NAME,
    _model_module_version: MODULE_VERSION,
    _view_module_version: MODULE_VERSION,
  };
}

/** Base class; subclasses spread `super.defaults()` and `moduleDefaults(...)`. */
export class FringekitModel extends DOMWidgetModel {
  /** True when a kernel is on the other end (live notebook), false in a static page. */
  get hasKernel(): boolean {
    return (this as unknown as { comm?: unknown }).comm !== undefined && (this as unknown as { comm_live?: boolean }).comm_live !== false;
  }
}
