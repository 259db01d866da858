/** State of the uncertainty widget. */
import { DOMWidgetModel } from "@jupyter-widgets/base";
import { arraySerializers } from "./arrayWire.js";
import { FringekitModel, moduleDefaults } from "./fringekitModel.js";

export type { ProfiledParameter } from "../shared/state.js";

/**
 * Profile-likelihood curves and the correlation matrix. `grid` and `delta` are p × m float64
 * arrays (parameter values in SI, and Δ(−2 ln L) above the optimum); `correlation` is k × k for
 * `free_names`; `threshold` is the Δ(−2 ln L) that defines the interval at `level`.
 */
export class UncertaintyModel extends FringekitModel {
  override defaults() {
    return {
      ...super.defaults(),
      ...moduleDefaults("UncertaintyModel", "UncertaintyView"),
      title: "Uncertainty",
      parameters: [],
      grid: null,
      delta: null,
      level: 0.6827,
      threshold: 1,
      free_names: [],
      correlation: null,
      model_id: "",
    };
  }

  static override serializers = {
    ...DOMWidgetModel.serializers,
    grid: arraySerializers,
    delta: arraySerializers,
    correlation: arraySerializers,
  };
}
