// fringekit's widgets for notebook cells (kernel side): re-exports only.
export { explorer, Explorer } from "./explorer.js";
export type { ExplorerOptions, ExplorerState } from "./explorer.js";
export { comparison, ComparisonWidget } from "./comparison.js";
export type { LabelledResult } from "./comparison.js";
export { uncertainty, UncertaintyWidget } from "./uncertainty.js";
export type { UncertaintyOptions } from "./uncertainty.js";
export { coherenceScan, CoherenceScanWidget } from "./coherenceScan.js";
export type { CoherenceScanOptions } from "./coherenceScan.js";
export { exportNotebookHtml, notebookHtml, rendererBundlePath } from "./exportHtml.js";
export { widgetStateFromMessages } from "./widgetState.js";
export type { WidgetStateDocument, CommMessage } from "./widgetState.js";
export { installLabExtension, jupyterDataDir, labExtensionSource } from "./installLab.js";
