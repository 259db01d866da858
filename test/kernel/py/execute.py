"""Execution messages of the fringekit kernel per Jupyter messaging spec 5.3 ("Execute",
"Display Data", "Execution errors"): rich execute_result bundles, silent runs, compile and
runtime errors, and output routing for work that outlives its cell."""
import time

from harness import Checks, drain_iopub, execute, kernel, shell_reply

checks = Checks()


def of_type(msgs, msg_type):
    return [m for m in msgs if m["msg_type"] == msg_type]


with kernel() as (km, kc):
    reply, msgs = execute(kc, '''({ [Symbol.for("fringekit.mimeBundle")]() { return {
  "text/plain": "fringe figure", "text/markdown": "**V** = 0.81",
  "application/vnd.plotly.v1+json": { data: [{ x: [0, 1], y: [1, 0.5], type: "scatter" }], layout: { title: { text: "fringes" } } } }; } })''')
    results = of_type(msgs, "execute_result")
    data = results[0]["content"]["data"] if results else {}
    checks.check("execute_result carries the value's plotly JSON as an object", isinstance(data.get("application/vnd.plotly.v1+json"), dict) and data["application/vnd.plotly.v1+json"]["data"][0]["y"] == [1, 0.5], data)
    checks.check("execute_result keeps markdown and plain text", data.get("text/markdown") == "**V** = 0.81" and data.get("text/plain") == "fringe figure", data)
    checks.check("execute_result has execution_count equal to the reply's", results and results[0]["content"]["execution_count"] == reply["content"]["execution_count"], results)

    reply, msgs = execute(kc, '({ toMimeBundle() { return { "text/html": 42 }; } })')
    data = of_type(msgs, "execute_result")[0]["content"]["data"] if of_type(msgs, "execute_result") else {}
    errs = "".join(m["content"]["text"] for m in of_type(msgs, "stream") if m["content"]["name"] == "stderr")
    checks.check("a broken bundle falls back to plain text and says why", reply["content"]["status"] == "ok" and list(data) == ["text/plain"] and "text/html must be a string" in errs, (data, errs))

    before = reply["content"]["execution_count"]
    msg_id = kc.execute("40 + 2", silent=True)
    reply = shell_reply(kc, msg_id)
    msgs = drain_iopub(kc, msg_id)
    checks.check("silent execution publishes no execute_input or result", reply["content"]["status"] == "ok" and not of_type(msgs, "execute_input") and not of_type(msgs, "execute_result"), [m["msg_type"] for m in msgs])
    checks.check("silent execution does not advance the execution count", reply["content"]["execution_count"] == before, reply["content"])

    reply, msgs = execute(kc, "const n: number = 1;\nconst s: string = n;")
    errors = of_type(msgs, "error")
    checks.check("type error: error reply and one iopub error with ename, evalue, traceback", reply["content"]["status"] == "error" and reply["content"]["ename"] == "TypeScriptError" and len(errors) == 1 and errors[0]["content"]["evalue"].startswith("2:7"), (reply["content"], errors))
    checks.check("type error is not also printed on stderr", not of_type(msgs, "stream"), msgs)

    reply, msgs = execute(kc, "(JSON.parse(\"null\") as any).x")
    checks.check("runtime TypeError reports its name", reply["content"]["status"] == "error" and reply["content"]["ename"] == "TypeError", reply["content"])

    reply, msgs = execute(kc, "async function later() { throw new SyntaxError('from async'); }\nawait later();")
    checks.check("rejected await reports the thrown error", reply["content"]["status"] == "error" and reply["content"]["ename"] == "SyntaxError" and reply["content"]["evalue"] == "from async", reply["content"])

    first = kc.execute('setTimeout(() => console.log("late output"), 800); "scheduled"')
    shell_reply(kc, first)
    drain_iopub(kc, first)
    second = kc.execute("await new Promise((r) => setTimeout(r, 1500)); 7")
    seen = []  # every iopub message until the second cell is idle, whatever its parent
    while True:
        m = kc.get_iopub_msg(timeout=60)
        seen.append(m)
        if m["parent_header"].get("msg_id") == second and m["msg_type"] == "status" and m["content"]["execution_state"] == "idle":
            break
    shell_reply(kc, second)
    late = [m for m in seen if m["msg_type"] == "stream" and "late output" in m["content"]["text"]]
    in_second = [m for m in late if m["parent_header"].get("msg_id") == second]
    checks.check("output of a timer lands under the cell that started it", len(late) == 1 and late[0]["parent_header"]["msg_id"] == first and not in_second, ([m["parent_header"]["msg_id"] for m in late], first, len(in_second)))

    reply, msgs = execute(kc, 'import { display, updateDisplay } from "fringekit/kernel";\ndisplay({ toMimeBundle: () => ({ "text/plain": "v1" }) }, { displayId: "status" });')
    reply, msgs2 = execute(kc, 'updateDisplay("status", { toMimeBundle: () => ({ "text/plain": "v2" }) });')
    updates = of_type(msgs2, "update_display_data")
    checks.check("updateDisplay from a later cell sends update_display_data with the display_id", len(updates) == 1 and updates[0]["content"]["transient"] == {"display_id": "status"} and updates[0]["content"]["data"]["text/plain"] == "v2", updates)

checks.report()
