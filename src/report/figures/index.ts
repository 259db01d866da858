// Figure descriptions (plotly.js JSON) for papers and widgets: re-exports only.
export * from "./palette.js";
export * from "./journal.js";
export * from "./figureSpec.js";
export * from "./axes.js";
export * from "./confidenceBand.js";
export * from "./profileTraces.js";
export * from "./fitFigure.js";
export * from "./comparisonFigure.js";
export * from "./coherenceScanFigure.js";
export * from "./correlationFigure.js";
export * from "./profileLikelihoodFigure.js";
export * from "./binnedResiduals.js";
export * from "./modelDifferenceFigure.js";
