// Reports: value ± uncertainty formatting, tables, figure descriptions, results files. Re-exports only.
export * from "./rounding.js";
export * from "./siPrefix.js";
export * from "./formatQuantity.js";
export * from "./escape.js";
export * from "./labels.js";
export * from "./table.js";
export * from "./tableText.js";
export * from "./fitTable.js";
export * from "./comparisonTable.js";
export * from "./quantityTable.js";
export * from "./tableReport.js";
export * from "./figures/index.js";
export * from "./version.js";
export * from "./results/index.js";
export * from "./render/index.js";
