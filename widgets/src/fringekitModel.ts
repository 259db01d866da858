/** Base model of every fringekit widget: module names and versions for the widget protocol. */
import { DOMWidgetModel } from "@jupyter-widgets/base";
import { checkBufferPaths } from "../shared/bufferPaths.js";
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
  /**
   * Refuses a comm message whose `buffer_paths` hold `__proto__`, `constructor` or `prototype`
   * before the base class's put_buffers walks them (prototype pollution in the page).
   */
  override _handle_comm_msg(msg: Parameters<DOMWidgetModel["_handle_comm_msg"]>[0]): Promise<void> {
    const paths = (msg.content.data as { buffer_paths?: unknown }).buffer_paths;
    if (paths !== undefined) {
      try {
        checkBufferPaths(paths);
      } catch (error) {
        console.warn(`fringekit widget: message refused: ${(error as Error).message}`);
        return Promise.resolve();
      }
    }
    return super._handle_comm_msg(msg);
  }

  /** True when a kernel is on the other end (live notebook), false in a static page. */
  get hasKernel(): boolean {
    return (this as unknown as { comm?: unknown }).comm !== undefined && (this as unknown as { comm_live?: boolean }).comm_live !== false;
  }
}
