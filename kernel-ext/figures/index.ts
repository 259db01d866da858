// Headless figure export (Node side): re-exports only.
export * from "./exportFigure.js";
export * from "./saveFigure.js";
export * from "./atomicWrite.js";
export { setPngDpi } from "../../src/report/render/pngDensity.js";
export * from "./figureBundle.js";
export * from "./exportReport.js";
