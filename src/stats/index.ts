// Statistics of fringekit: re-exports only.
export * from "./gamma.js";
export * from "./beta.js";
export * from "./normal.js";
export * from "./chiSquared.js";
export * from "./fDistribution.js";
export * from "./studentT.js";
