// Everything fringekit has, for tools and experts ("fringekit/advanced"): solver internals,
// parsers, statistics and figure building blocks. Notebooks need only "fringekit". Re-exports only.
export * from "./api/index.js";
export * from "./errors.js";
export type { Profile, Provenance } from "./profile.js";
export type { Model, ParameterSpec } from "./physics/model.js";
export * from "./physics/modelSource.js";
export * from "./fit/index.js";
export * from "./report/index.js";
export * from "./stats/index.js";
export * from "./physics/index.js";
export * from "./random.js";
export * from "./io/index.js";
export * from "./units/index.js";
