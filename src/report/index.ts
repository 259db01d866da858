// Reports: value ± uncertainty formatting, tables, figure descriptions, results files. Re-exports only.
export * from "./rounding.js";
export * from "./siPrefix.js";
export * from "./formatQuantity.js";
