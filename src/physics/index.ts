// Interference models, detector effects, helpers and simulation: re-exports only.
export type { Model, ParameterSpec } from "./model.js";
export type { PointPattern } from "./pattern.js";
export * from "./quadrature.js";
export * from "./detector.js";
export * from "./twoSlit.js";
export * from "./simulate.js";
export * from "./registry.js";
