// Interrupt (SIGINT, the kernelspec's interrupt_mode "signal", sent by Debian's jupyter_client)
// stops an awaiting cell, aborts interruptSignal() for the work it watches, and breaks a busy loop.
import * as vitest from "vitest";
import { checksSuite } from "./helpers.js";

await checksSuite(vitest, {
  title: "kernel interrupt via jupyter_client",
  script: "interrupt.py",
  minimumChecks: 7,
  required: [
    "awaiting cell ends with an error reply after interrupt",
    "work watching interruptSignal() stopped",
    "busy synchronous loop is broken by interrupt",
    "next cell runs with a fresh, unaborted signal",
  ],
});
