// Execution messages (Jupyter messaging spec 5.3) checked with Debian's jupyter_client:
// rich execute_result bundles, silent runs, error content, output routing.
import * as vitest from "vitest";
import { checksSuite } from "./helpers.js";

await checksSuite(vitest, {
  title: "execute_request: results, errors and output routing",
  script: "execute.py",
  minimumChecks: 12,
  required: [
    "execute_result carries the value's plotly JSON as an object",
    "silent execution publishes no execute_input or result",
    "type error: error reply and one iopub error with ename, evalue, traceback",
    "rejected await reports the thrown error",
    "output of a timer lands under the cell that started it",
    "updateDisplay from a later cell sends update_display_data with the display_id",
  ],
});
