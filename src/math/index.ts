/**
 * Special functions and distributions below fit/ and stats/: gamma and beta functions, the
 * normal, χ², F and Student-t distributions, and monotone CDF inversion. Pure numerics with no
 * knowledge of fits (each file names its published source).
 */
export * from "./gamma.js";
export * from "./beta.js";
export * from "./normal.js";
export * from "./chiSquared.js";
export * from "./fDistribution.js";
export * from "./studentT.js";
export * from "./invert.js";
