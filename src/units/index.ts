// Unit parsing at the edges: re-exports only.
export * from "./parseQuantity.js";
export * from "./parseColumnHeader.js";
export * from "./unitTable.js";
export * from "./plausibility.js";
