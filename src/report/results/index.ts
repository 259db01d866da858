// Results files: re-exports only (replay, which re-fits, is in api/).
export * from "./base64.js";
export * from "./arrays.js";
export * from "./resultsDocument.js";
export * from "./fitJson.js";
