// Results files and replay: re-exports only.
export * from "./base64.js";
export * from "./arrays.js";
export * from "./resultsDocument.js";
export * from "./replay.js";
