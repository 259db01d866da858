// Public API of fringekit: re-exports only.
export * from "./errors.js";
export type { DataWarning, Profile, Provenance } from "./profile.js";
export type { Model, ParameterSpec } from "./physics/model.js";
export * from "./fit/index.js";
export * from "./report/index.js";
export * from "./stats/index.js";
export * from "./physics/index.js";
export * from "./random.js";
export * from "./io/index.js";
export * from "./units/index.js";
