// JupyterLab 4 plugin: registers fringekit's widget module with the widget registry that
// jupyterlab_widgets provides (@jupyter-widgets/base is shared, never bundled here).
import { IJupyterWidgetRegistry } from "@jupyter-widgets/base";
import * as widgets from "../index.js";
import { registerPhysicsModels } from "../registerPhysics.js";

registerPhysicsModels();

const plugin = {
  id: "fringekit-widgets:plugin",
  description: "fringekit's interference-fit widgets (explorer, comparison, uncertainty, coherence scan)",
  requires: [IJupyterWidgetRegistry],
  autoStart: true,
  activate(_app: unknown, registry: { registerWidget(data: { name: string; version: string; exports: unknown }): void }): void {
    registry.registerWidget({ name: widgets.MODULE_NAME, version: widgets.MODULE_VERSION, exports: widgets });
  },
};

export default plugin;
