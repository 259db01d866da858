// The one-line helpers: fitProfile → Fit, compare → Comparison. Re-exports only.
export * from "./fit.js";
export * from "./fitProfile.js";
export * from "./compare.js";
export * from "./replay.js";
export { farFieldValidity, type PlannedGeometry } from "./farField.js";
