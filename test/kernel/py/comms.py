"""Comm protocol of the fringekit kernel, checked with Debian's jupyter_client against the
Jupyter messaging specification 5.3 ("Custom Messages", "Comm info", "Kernel history")."""
import struct
import time
import uuid

from harness import Checks, drain_iopub, execute, kernel, shell_reply

checks = Checks()
HEADER_KEYS = {"msg_id", "username", "session", "date", "msg_type", "version"}
# Required content keys and types per message type (messaging spec 5.3).
SHAPES = {
    "comm_open": {"comm_id": str, "target_name": str, "data": dict},
    "comm_msg": {"comm_id": str, "data": dict},
    "comm_close": {"comm_id": str, "data": dict},
    "comm_info_reply": {"status": str, "comms": dict},
    "history_reply": {"status": str, "history": list},
    "stream": {"name": str, "text": str},
    "status": {"execution_state": str},
}


def shape_problems(msg):
    problems = []
    missing = HEADER_KEYS - set(msg["header"])
    if missing:
        problems.append(f"header lacks {sorted(missing)}")
    if msg["header"].get("version") != "5.3":
        problems.append(f"header version {msg['header'].get('version')!r}")
    for key, typ in SHAPES.get(msg["msg_type"], {}).items():
        if not isinstance(msg["content"].get(key), typ):
            problems.append(f"{msg['msg_type']}.{key} is {type(msg['content'].get(key)).__name__}, want {typ.__name__}")
    return problems


def send(kc, msg_type, content, buffers=(), metadata=None):
    msg = kc.session.msg(msg_type, content, metadata=metadata or {})
    kc.session.send(kc.shell_channel.socket, msg, buffers=list(buffers))
    return msg["header"]["msg_id"]


def of_type(msgs, msg_type):
    return [m for m in msgs if m["msg_type"] == msg_type]


def stdout_text(msgs):
    return "".join(m["content"]["text"] for m in of_type(msgs, "stream"))


ECHO_CELL = r'''
import { registerCommTarget } from "fringekit/kernel-protocol";
registerCommTarget("fk.test.echo", (comm, data, buffers) => {
  console.log("opened with " + JSON.stringify(data) + " and " + buffers.length + " buffers");
  comm.onMessage((d, bufs) => {
    if (d.fail) throw new Error("handler asked to fail");
    console.log("echo " + bufs.length + " buffers");
    comm.send({ echo: d, sizes: bufs.map((b) => b.byteLength) }, { kind: "echo" }, bufs);
  });
  comm.onClose((d) => console.log("closed by frontend " + JSON.stringify(d)));
});
'''

with kernel() as (km, kc):
    checks.check("session is signed (HMAC key set)", bool(kc.session.key), kc.session.key)
    reply, _ = execute(kc, ECHO_CELL)
    checks.check("cell registering a comm target runs", reply["content"]["status"] == "ok", reply["content"])

    # Frontend opens a comm with a binary buffer.
    cid = uuid.uuid4().hex
    open_id = send(kc, "comm_open", {"comm_id": cid, "target_name": "fk.test.echo", "data": {"hello": 1}}, [b"\x00\x01\x02"])
    msgs = drain_iopub(kc, open_id)
    states = [m["content"]["execution_state"] for m in of_type(msgs, "status")]
    checks.check("comm_open: busy then idle with the comm_open as parent", states == ["busy", "idle"], states)
    checks.check("comm_open: handler output is routed to the comm_open", 'opened with {"hello":1} and 1 buffers' in stdout_text(msgs), msgs)
    checks.check("comm_open: messages have spec 5.3 shapes", all(not shape_problems(m) for m in msgs), [shape_problems(m) for m in msgs])

    # comm_info_request with and without a target filter.
    info_id = kc.comm_info()
    info = shell_reply(kc, info_id)
    checks.check("comm_info_request gets a comm_info_reply", info["msg_type"] == "comm_info_reply", info["msg_type"])
    checks.check("comm_info_reply has spec shape and status ok", not shape_problems(info) and info["content"]["status"] == "ok", info["content"])
    checks.check("comm_info_reply lists the open comm with its target", info["content"]["comms"].get(cid) == {"target_name": "fk.test.echo"}, info["content"])
    info_id = kc.comm_info(target_name="fk.other")
    filtered = shell_reply(kc, info_id)
    checks.check("comm_info_request with target_name filters", filtered["content"]["comms"] == {}, filtered["content"])

    # Binary buffers both ways: float64 values and an 8 MiB block, echoed back by the kernel.
    values = struct.pack("<4d", 1.5, -2.25, 3e-9, 6.02e23)
    block = bytes(range(256)) * (8 * 1024 * 4)
    msg_id = send(kc, "comm_msg", {"comm_id": cid, "data": {"x": [1, 2]}}, [values, block])
    msgs = drain_iopub(kc, msg_id, timeout=60)
    echoes = of_type(msgs, "comm_msg")
    checks.check("comm_msg: one echo comes back under the comm_msg", len(echoes) == 1, [m["msg_type"] for m in msgs])
    if echoes:
        echo = echoes[0]
        checks.check("echo carries data and metadata", echo["content"]["data"].get("echo") == {"x": [1, 2]} and echo["metadata"] == {"kind": "echo"}, echo["content"])
        checks.check("kernel received buffers of the sent sizes", echo["content"]["data"].get("sizes") == [32, len(block)], echo["content"]["data"].get("sizes"))
        got = [bytes(b) for b in echo["buffers"]]
        checks.check("binary buffers come back byte for byte (HMAC accepted by jupyter_client)", got == [values, block], [len(b) for b in got])
        checks.check("echo comm_msg has the spec shape", not shape_problems(echo), shape_problems(echo))
    checks.check("comm_msg handler output is routed to the comm_msg", "echo 2 buffers" in stdout_text(msgs), stdout_text(msgs))

    # A failing handler reports on stderr under its message; the kernel keeps going.
    msg_id = send(kc, "comm_msg", {"comm_id": cid, "data": {"fail": True}})
    msgs = drain_iopub(kc, msg_id)
    errs = [m["content"]["text"] for m in of_type(msgs, "stream") if m["content"]["name"] == "stderr"]
    checks.check("failing comm handler shows its error under the comm_msg", any("handler asked to fail" in t for t in errs), msgs)

    # Unknown target: the kernel answers with comm_close (as ipykernel does).
    bad = uuid.uuid4().hex
    msg_id = send(kc, "comm_open", {"comm_id": bad, "target_name": "no.such.target", "data": {}})
    msgs = drain_iopub(kc, msg_id)
    closes = of_type(msgs, "comm_close")
    checks.check("comm_open to unknown target is answered with comm_close", len(closes) == 1 and closes[0]["content"]["comm_id"] == bad, msgs)

    # Kernel-opened comm with a buffer, parented to the executing cell.
    code = r'''
import { openComm } from "fringekit/kernel-protocol";
const cellComm = openComm("fk.test.frontend", { a: 1 }, { origin: "cell" }, [new Float64Array([1.5, 2.5])]);
cellComm.onMessage((d, b) => console.log("cell comm got " + JSON.stringify(d) + " " + b.length));
cellComm.id
'''
    exec_id = kc.execute(code)
    reply = shell_reply(kc, exec_id)
    msgs = drain_iopub(kc, exec_id)
    opens = of_type(msgs, "comm_open")
    checks.check("openComm sends comm_open parented to the cell", len(opens) == 1 and reply["content"]["status"] == "ok", [m["msg_type"] for m in msgs])
    if opens:
        o = opens[0]
        kid = o["content"]["comm_id"]
        checks.check("kernel comm_open has target, data, metadata", o["content"]["target_name"] == "fk.test.frontend" and o["content"]["data"] == {"a": 1} and o["metadata"] == {"origin": "cell"}, o)
        checks.check("kernel comm_open buffer is the Float64Array bytes", [bytes(b) for b in o["buffers"]] == [struct.pack("<2d", 1.5, 2.5)], o["buffers"])
        checks.check("kernel comm_open has the spec shape", not shape_problems(o), shape_problems(o))
        msg_id = send(kc, "comm_msg", {"comm_id": kid, "data": {"reply": True}})
        msgs = drain_iopub(kc, msg_id)
        checks.check("frontend message reaches a kernel-opened comm", 'cell comm got {"reply":true} 0' in stdout_text(msgs), msgs)

    # Comm traffic is served while an async cell awaits.
    slow_id = kc.execute("await new Promise((r) => setTimeout(r, 1500)); 1")
    time.sleep(0.3)
    msg_id = send(kc, "comm_msg", {"comm_id": cid, "data": {"during": "cell"}})
    msgs = drain_iopub(kc, msg_id)
    slow_reply = shell_reply(kc, slow_id)
    echo_time = of_type(msgs, "comm_msg")[0]["header"]["date"] if of_type(msgs, "comm_msg") else None
    checks.check("comm_msg is answered while a cell awaits", echo_time is not None and echo_time < slow_reply["header"]["date"], (echo_time, slow_reply["header"]["date"]))
    drain_iopub(kc, slow_id)

    # Frontend closes the comm; it disappears from comm_info; later messages to it are ignored.
    msg_id = send(kc, "comm_close", {"comm_id": cid, "data": {"bye": 1}})
    msgs = drain_iopub(kc, msg_id)
    checks.check("comm_close runs close listeners under the comm_close", 'closed by frontend {"bye":1}' in stdout_text(msgs), msgs)
    info = shell_reply(kc, kc.comm_info())
    checks.check("closed comm is gone from comm_info", cid not in info["content"]["comms"], info["content"])
    msg_id = send(kc, "comm_msg", {"comm_id": cid, "data": {}})
    msgs = drain_iopub(kc, msg_id)
    checks.check("comm_msg to a closed comm is ignored quietly", of_type(msgs, "comm_msg") == [] and [m["content"]["execution_state"] for m in of_type(msgs, "status")] == ["busy", "idle"], msgs)

    # history_request: an empty but valid reply.
    hist = shell_reply(kc, kc.history(hist_access_type="tail", n=10))
    checks.check("history_request gets an empty, valid history_reply", hist["msg_type"] == "history_reply" and hist["content"] == {"status": "ok", "history": []}, hist["content"])

checks.report()
