"""Interrupting the fringekit kernel (interrupt_mode "signal": SIGINT, as jupyter_client sends
it): an awaiting cell stops with an error, its interruptSignal() is aborted so the work it
watches stops, a busy synchronous loop is broken, and the next cell runs normally."""
import time

from harness import Checks, drain_iopub, execute, kernel, shell_reply


def wait_for_output(kc, msg_id, text, timeout=60):
    """Waits until the cell `msg_id` printed `text` (so it is really running), then returns."""
    deadline = time.time() + timeout
    while time.time() < deadline:
        msg = kc.get_iopub_msg(timeout=timeout)
        if msg["parent_header"].get("msg_id") == msg_id and msg["msg_type"] == "stream" and text in msg["content"]["text"]:
            return True
    return False

checks = Checks()

LOOP = r'''
import { interruptSignal } from "fringekit/kernel";
const signal = interruptSignal();
(globalThis as any).steps = 0;
(globalThis as any).stoppedBySignal = false;
console.log("loop started");
while (!signal.aborted) {
  await new Promise((r) => setTimeout(r, 5));
  (globalThis as any).steps++;
}
(globalThis as any).stoppedBySignal = true;
'''

with kernel() as (km, kc):
    msg_id = kc.execute(LOOP)
    checks.check("async loop cell starts", wait_for_output(kc, msg_id, "loop started"))
    time.sleep(0.3)
    km.interrupt_kernel()
    started = time.time()
    reply = shell_reply(kc, msg_id, timeout=20)
    checks.check("awaiting cell ends with an error reply after interrupt", reply["content"]["status"] == "error", reply["content"])
    checks.check("interrupt takes effect within 15 s", time.time() - started < 15, time.time() - started)
    time.sleep(0.2)
    reply, msgs = execute(kc, "[(globalThis as any).stoppedBySignal, (globalThis as any).steps > 10]")
    text = [m["content"]["data"]["text/plain"] for m in msgs if m["msg_type"] == "execute_result"]
    checks.check("work watching interruptSignal() stopped", text == ["[ true, true ]"], text or msgs)

    msg_id = kc.execute('console.log("spinning"); let spins = 0; while (true) { spins++; }')
    checks.check("busy loop cell starts", wait_for_output(kc, msg_id, "spinning"))
    time.sleep(0.3)
    km.interrupt_kernel()
    reply = shell_reply(kc, msg_id, timeout=20)
    checks.check("busy synchronous loop is broken by interrupt", reply["content"]["status"] == "error", reply["content"])

    reply, msgs = execute(kc, "import { interruptSignal } from \"fringekit/kernel\"; interruptSignal().aborted")
    text = [m["content"]["data"]["text/plain"] for m in msgs if m["msg_type"] == "execute_result"]
    checks.check("next cell runs with a fresh, unaborted signal", reply["content"]["status"] == "ok" and text == ["false"], text or reply["content"])

checks.report()
