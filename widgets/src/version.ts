// The widget module names and versions live in widgets/shared (used by the kernel side too).
export * from "../shared/version.js";
