// Fitting engine: re-exports only.
export type * from "./types.js";
export * from "./status.js";
export * from "./leastSquares.js";
export * from "./formula.js";
export * from "./formulaModel.js";
export * from "./fitProfile.js";
export * from "./autoStart.js";
export * from "./profileInterval.js";
export * from "./propagate.js";
export * from "./bootstrap.js";
export * from "./fitJoint.js";
export * from "./starts/crossSeed.js";
