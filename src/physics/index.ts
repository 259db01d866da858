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
// One name per quantity: the coherence length and the far-field check are offered as
// coherenceLength (stats) and farFieldValidity (api), which take plain numbers too; the
// number-only building blocks below them stay inside the library.
export {
  SPEED_OF_LIGHT, fringeSpacing, maximumAngle, minimumAngle, maximumPosition, minimumPosition, missingOrders,
  coherenceTimeFromBandwidth, fresnelNumber, type FarFieldCheck,
} from "./formulas.js";
export * from "./fresnelIntegrals.js";
export * from "./bessel.js";
export * from "./simulate.js";
export * from "./registry.js";
