/** State of the model-comparison widget. */
import { DOMWidgetModel } from "@jupyter-widgets/base";
import { arraySerializers } from "./arrayWire.js";
import { FringekitModel, moduleDefaults } from "./fringekitModel.js";

export type { ComparisonTableRow as ComparisonRow } from "../shared/state.js";

/**
 * Several fits of one profile: `curves` and `residuals` are k × n float64 arrays (one row per
 * fit, in `table` order), `x` in m; `verdict` is the comparison's one-line conclusion.
 */
export class ComparisonModel extends FringekitModel {
  override defaults() {
    return {
      ...super.defaults(),
      ...moduleDefaults("ComparisonModel", "ComparisonView"),
      title: "Model comparison",
      x: null,
      y: null,
      y_unit: "counts",
      curves: null,
      residuals: null,
      table: [],
      verdict: "",
    };
  }

  static override serializers = {
    ...DOMWidgetModel.serializers,
    x: arraySerializers,
    y: arraySerializers,
    curves: arraySerializers,
    residuals: arraySerializers,
  };
}
