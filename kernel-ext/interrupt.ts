/**
 * Interrupting long work from the notebook's stop button. The kernel aborts the running
 * cell's signal on interrupt (SIGINT or interrupt_request); fits watch it via their `signal`
 * option: `fit(model, profile, { signal: interruptSignal() })`.
 */
import { getRuntime } from "./runtime.js";

const NEVER = new AbortController().signal;

/**
 * The AbortSignal of the running cell: `aborted` turns true when the user interrupts the
 * kernel. Outside the fringekit kernel it is a signal that never aborts.
 */
export function interruptSignal(): AbortSignal {
  return getRuntime()?.interruptSignal() ?? NEVER;
}
