/** State of the profile explorer (see ExplorerView for what is drawn). */
import { DOMWidgetModel } from "@jupyter-widgets/base";
import { arraySerializers } from "./arrayWire.js";
import { FringekitModel, moduleDefaults } from "./fringekitModel.js";

/**
 * The profile explorer's model. Arrays (x in m, y, sigma, mask, fit_curve) travel as binary
 * buffers; params maps each parameter name to {value, fixed, lower, upper} in SI.
 */
export class ExplorerModel extends FringekitModel {
  override defaults() {
    return {
      ...super.defaults(),
      ...moduleDefaults("ExplorerModel", "ExplorerView"),
      title: "Profile explorer",
      x: null,
      y: null,
      sigma: null,
      mask: null,
      counts: false,
      y_unit: "counts",
      model_id: "",
      model_options: {},
      model_choices: [],
      params: {},
      noise: "auto",
      window: null,
      masked_ranges: [],
      fit_state: "idle",
      fit_progress: 0,
      fit_message: "",
      result: null,
      fit_curve: null,
    };
  }

  static override serializers = {
    ...DOMWidgetModel.serializers,
    x: arraySerializers,
    y: arraySerializers,
    sigma: arraySerializers,
    mask: arraySerializers,
    fit_curve: arraySerializers,
  };
}
