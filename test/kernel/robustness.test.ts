// The kernel survives bad input on its sockets and keeps answering (py/robustness.py drives a
// raw zeromq socket; signatures are checked with Python's hmac module per messaging spec 5.3).
import * as vitest from "vitest";
import { checksSuite } from "./helpers.js";

await checksSuite(vitest, {
  title: "kernel robustness: malformed frames, wrong signatures, unknown comms, huge buffers, bursts",
  script: "robustness.py",
  minimumChecks: 20,
  required: [
    "kernel answers after a wrong signature",
    "kernel answers after malformed JSON header",
    "kernel answers after a comm_msg to an unknown comm id",
    "kernel_info_reply signature verifies with Python's hmac",
    "64 MiB buffer echoed byte for byte",
    "iopub message with a buffer verifies with Python's hmac",
    "all 3000 burst messages answered in order",
    "cells still run after all of it",
  ],
});
