// fringekit in notebook cells ("fringekit/kernel"): show rich output, update it, stop on interrupt.
// Comms, widget models and installers: "fringekit/kernel-protocol".
export { display, updateDisplay, clearOutput } from "./display.js";
export type { MimeBundle, MimeBundleProvider, DisplayContent, DisplayOptions } from "./display.js";
export { interruptSignal } from "./interrupt.js";
