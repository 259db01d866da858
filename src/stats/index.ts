// Statistics of fringekit: re-exports only.
export * from "./gamma.js";
export * from "./beta.js";
export * from "./normal.js";
export * from "./chiSquared.js";
export * from "./fDistribution.js";
export * from "./studentT.js";
export * from "./fingerprint.js";
export * from "./criteria.js";
export * from "./nested.js";
export * from "./fitParameters.js";
export * from "./residualTests.js";
export * from "./residualDiagnostics.js";
export * from "./compareFits.js";
export * from "./quantity.js";
export * from "./fringeGeometry.js";
export * from "./measuredExtrema.js";
export * from "./coherence.js";
