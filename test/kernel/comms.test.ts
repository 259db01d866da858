// Comm protocol checks against the Jupyter messaging specification 5.3, driven by Debian's
// jupyter_client (py/comms.py), which also verifies every message's HMAC on receipt.
import * as vitest from "vitest";
import { checksSuite } from "./helpers.js";

await checksSuite(vitest, {
  title: "comm_open / comm_msg / comm_close / comm_info_request with jupyter_client",
  script: "comms.py",
  minimumChecks: 27,
  required: [
    "comm_info_request gets a comm_info_reply",
    "comm_info_request with target_name filters",
    "binary buffers come back byte for byte (HMAC accepted by jupyter_client)",
    "kernel comm_open buffer is the Float64Array bytes",
    "comm_open to unknown target is answered with comm_close",
    "comm_msg handler output is routed to the comm_msg",
    "comm_msg is answered while a cell awaits",
    "history_request gets an empty, valid history_reply",
  ],
});
