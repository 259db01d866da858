/** State of the coherence-scan widget. */
import { DOMWidgetModel } from "@jupyter-widgets/base";
import { arraySerializers } from "./arrayWire.js";
import { FringekitModel, moduleDefaults } from "./fringekitModel.js";

export type { ScanQuantity } from "../shared/state.js";

/**
 * Visibility against slit separation: measured points (`separation` in m, `visibility`,
 * optional `visibility_err`), the fitted source model on a fine grid (`curve_separation`,
 * `curve_visibility`) with its confidence band (`band_lower`, `band_upper`) at level
 * `band_level`; `model_id` names the fitted coherence model.
 */
export class CoherenceScanModel extends FringekitModel {
  override defaults() {
    return {
      ...super.defaults(),
      ...moduleDefaults("CoherenceScanModel", "CoherenceScanView"),
      title: "Coherence scan",
      separation: null,
      visibility: null,
      visibility_err: null,
      curve_separation: null,
      curve_visibility: null,
      band_lower: null,
      band_upper: null,
      band_level: 0.95,
      model_id: "",
      source_label: "",
      quantities: [],
    };
  }

  static override serializers = {
    ...DOMWidgetModel.serializers,
    separation: arraySerializers,
    visibility: arraySerializers,
    visibility_err: arraySerializers,
    curve_separation: arraySerializers,
    curve_visibility: arraySerializers,
    band_lower: arraySerializers,
    band_upper: arraySerializers,
  };
}
