// Statistics of fringekit: re-exports only.
export * from "../math/index.js";
export * from "./fingerprint.js";
export * from "./criteria.js";
export * from "./nested.js";
export * from "./fitParameters.js";
export * from "./residualTests.js";
export * from "./residualDiagnostics.js";
export * from "./comparisonTypes.js";
export * from "./compareFits.js";
export * from "./comparisonRows.js";
export * from "./quantity.js";
export * from "./fringeGeometry.js";
export * from "./measuredExtrema.js";
export * from "./coherence.js";
// farFieldValidity is offered by api/ (a planned geometry or a fit: one name for both).
export { isFarFieldModel, type FarFieldValidity } from "./farField.js";
export * from "./sourceSize.js";
export * from "./localVisibility.js";
export * from "./derivedQuantities.js";
export * from "./jointSourceSize.js";
