// Interference models, detector effects, helpers and simulation: re-exports only.
export type { Model, ParameterSpec } from "./model.js";
export type { PointPattern } from "./pattern.js";
export * from "./quadrature.js";
export * from "./detector.js";
export * from "./withDetector.js";
export * from "./twoSlit.js";
export * from "./nSlit.js";
export * from "./twoBeam.js";
export * from "./broadband.js";
export * from "./broadbandWavelength.js";
export * from "./nearField.js";
export * from "./coherence.js";
export * from "./sourceModel.js";
export * from "./formulas.js";
export * from "./fresnelIntegrals.js";
export * from "./bessel.js";
export * from "./simulate.js";
export * from "./registry.js";
