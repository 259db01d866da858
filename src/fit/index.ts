// Fitting engine: re-exports only.
export type * from "./types.js";
export * from "./status.js";
export * from "./leastSquares.js";
export * from "./formula.js";
export * from "./formulaModel.js";
export { setFormulaEngine, type FormulaEngine } from "./formulaEngine.js";
// The solver's fitProfile returns a plain FitResult; the public fitProfile (api/) wraps it in a Fit.
export { fitProfile as fitProfileResult, bestOf, buildProblem, prepareFit, solvePrepared, startVector, usedPoints, summarize, fitWithStarts, type PreparedFit } from "./fitProfile.js";
export * from "./fitSource.js";
export * from "./refit.js";
export * from "./autoStart.js";
export * from "./profileInterval.js";
export * from "./profileCurve.js";
export * from "./propagate.js";
export * from "./bootstrap.js";
export * from "./fitJoint.js";
export * from "./goodness.js";
export * from "./fringeDetection.js";
export * from "./fitChecks.js";
export * from "./optionQuantities.js";
export * from "./starts/crossSeed.js";
export * from "./residualScale.js";
