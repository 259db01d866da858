// Headless figure export (Node side): re-exports only.
export * from "./exportFigure.js";
export * from "./saveFigure.js";
export * from "./atomicWrite.js";
export { setPngDpi } from "../../src/report/render/pngDensity.js";
export * from "./figureBundle.js";
export * from "./exportReport.js";
// The builders of the figures fits and comparisons draw, so a script that only makes paper
// figures needs this one entry (the rest of the builders: "fringekit/advanced").
export { fitFigure, type FitFigureOptions, type FitCurves } from "../../src/report/figures/fitFigure.js";
export { comparisonFigure } from "../../src/report/figures/comparisonFigure.js";
export type { FigureSpec } from "../../src/report/figures/figureSpec.js";
