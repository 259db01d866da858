// The widget module: model/view classes the widget manager looks up by name.
export { ExplorerModel } from "./explorerModel.js";
export { ExplorerView } from "./explorerView.js";
export { ComparisonModel } from "./comparisonModel.js";
export { ComparisonView } from "./comparisonView.js";
export { UncertaintyModel } from "./uncertaintyModel.js";
export { UncertaintyView } from "./uncertaintyView.js";
export { CoherenceScanModel } from "./coherenceScanModel.js";
export { CoherenceScanView } from "./coherenceScanView.js";
export { MODULE_NAME, MODULE_VERSION, PROTOCOL_VERSION } from "../shared/version.js";
export { registerModel, modelIds } from "../shared/catalog.js";
