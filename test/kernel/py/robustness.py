"""The fringekit kernel survives bad input on its shell socket and keeps answering: frames
without delimiter, wrong signatures, malformed JSON, unknown message types and comm ids, a
64 MiB buffer, and a burst of thousands of messages. Signatures of replies are checked
independently with Python's hmac module (wire protocol, messaging spec 5.3)."""
import hashlib
import hmac
import json
import time
import uuid

import zmq

from harness import Checks, drain_iopub, execute, kernel, shell_reply

checks = Checks()
DELIM = b"<IDS|MSG>"

ECHO_CELL = r'''
import { registerCommTarget } from "fringekit/kernel-protocol";
registerCommTarget("fk.test.quiet", (comm) => {
  comm.onMessage((d, bufs) => comm.send({ n: d.n, sizes: bufs.map((b) => b.byteLength) }, {}, bufs.length > 0 && d.back ? bufs : []));
});
'''


def alive(kc, label):
    try:
        reply = shell_reply(kc, kc.kernel_info(), timeout=30)
        checks.check(f"kernel answers after {label}", reply["content"].get("status") == "ok", reply["content"])
    except Exception as error:
        checks.check(f"kernel answers after {label}", False, repr(error))


with kernel() as (km, kc):
    info = km.get_connection_info()
    key = info["key"] if isinstance(info["key"], bytes) else info["key"].encode()
    ctx = zmq.Context.instance()
    raw = ctx.socket(zmq.DEALER)
    raw.setsockopt(zmq.LINGER, 0)
    raw.connect(f"{info['transport']}://{info['ip']}:{info['shell_port']}")
    sub = ctx.socket(zmq.SUB)
    sub.setsockopt(zmq.LINGER, 0)
    sub.setsockopt(zmq.SUBSCRIBE, b"")
    sub.connect(f"{info['transport']}://{info['ip']}:{info['iopub_port']}")

    def frames_for(msg_type, content, buffers=(), signature=None, header_bytes=None):
        header = {"msg_id": uuid.uuid4().hex, "session": "raw", "username": "test", "date": "2026-01-01T00:00:00Z", "msg_type": msg_type, "version": "5.3"}
        parts = [header_bytes if header_bytes is not None else json.dumps(header).encode(), b"{}", b"{}", json.dumps(content).encode()]
        sig = signature if signature is not None else hmac.new(key, b"".join(parts), hashlib.sha256).hexdigest().encode()
        return header["msg_id"], [DELIM, sig, *parts, *buffers]

    reply, _ = execute(kc, ECHO_CELL)
    checks.check("echo target cell runs", reply["content"]["status"] == "ok", reply["content"])
    cid = uuid.uuid4().hex
    _, frames = frames_for("comm_open", {"comm_id": cid, "target_name": "fk.test.quiet", "data": {}})
    raw.send_multipart(frames)
    time.sleep(0.3)

    bad_inputs = {
        "frames without delimiter": [b"garbage", b"more"],
        "too few frames": [DELIM, b"sig", b"{}"],
        "a wrong signature": frames_for("kernel_info_request", {}, signature=b"0" * 64)[1],
        "malformed JSON header": frames_for("kernel_info_request", {}, header_bytes=b"{not json")[1],
        "a header that is a list": frames_for("kernel_info_request", {}, header_bytes=b"[1, 2]")[1],
        "a header without msg_type": frames_for("kernel_info_request", {}, header_bytes=b'{"msg_id": "x"}')[1],
        "an unknown message type": frames_for("no_such_request", {})[1],
        "a comm_msg to an unknown comm id": frames_for("comm_msg", {"comm_id": "nope", "data": {}})[1],
        "a comm_close for an unknown comm id": frames_for("comm_close", {"comm_id": "nope", "data": {}})[1],
        "a comm_msg without content fields": frames_for("comm_msg", {})[1],
        "a comm_open without target": frames_for("comm_open", {"comm_id": "x"})[1],
        "a non-UTF-8 content frame": [DELIM, b"", b"\xff\xfe", b"{}", b"{}", b"\xff"],
    }
    for label, frames in bad_inputs.items():
        raw.send_multipart(frames)
        alive(kc, label)

    # A reply on the raw socket carries a signature Python's hmac module accepts.
    msg_id, frames = frames_for("kernel_info_request", {})
    raw.send_multipart(frames)
    got = raw.recv_multipart() if raw.poll(10000) else []
    if got:
        at = got.index(DELIM)
        want = hmac.new(key, b"".join(got[at + 2:at + 6]), hashlib.sha256).hexdigest().encode()
        checks.check("kernel_info_reply signature verifies with Python's hmac", got[at + 1] == want, (got[at + 1], want))
    else:
        checks.check("kernel_info_reply signature verifies with Python's hmac", False, "no reply on raw socket")

    # A 64 MiB buffer goes in and comes back; the iopub copy is signed over the JSON frames only.
    big = bytes(range(256)) * (64 * 1024 * 4)
    time.sleep(0.5)  # let the SUB socket join
    msg_id, frames = frames_for("comm_msg", {"comm_id": cid, "data": {"n": -1, "back": True}}, buffers=[big])
    raw.send_multipart(frames)
    echo = None
    deadline = time.time() + 60
    while time.time() < deadline and sub.poll(1000):
        f = sub.recv_multipart()
        at = f.index(DELIM)
        header = json.loads(f[at + 2])
        parent = json.loads(f[at + 3])
        if header["msg_type"] == "comm_msg" and parent.get("msg_id") == msg_id:
            echo = f
            break
    if echo:
        at = echo.index(DELIM)
        want = hmac.new(key, b"".join(echo[at + 2:at + 6]), hashlib.sha256).hexdigest().encode()
        checks.check("64 MiB buffer echoed byte for byte", echo[at + 6:] == [big], [len(b) for b in echo[at + 6:]])
        checks.check("iopub message with a buffer verifies with Python's hmac", echo[at + 1] == want, (echo[at + 1], want))
    else:
        checks.check("64 MiB buffer echoed byte for byte", False, "no echo within 60 s")
    alive(kc, "a 64 MiB buffer")

    # A burst of 3000 comm messages: every one is answered, in order, and the kernel still replies.
    count = 3000
    sent_ids = []
    for n in range(count):
        mid, frames = frames_for("comm_msg", {"comm_id": cid, "data": {"n": n}})
        sent_ids.append(mid)
        raw.send_multipart(frames)
    seen = []
    deadline = time.time() + 120
    while len(seen) < count and time.time() < deadline and sub.poll(5000):
        f = sub.recv_multipart()
        at = f.index(DELIM)
        if json.loads(f[at + 2])["msg_type"] == "comm_msg":
            seen.append(json.loads(f[at + 5])["data"]["n"])
    checks.check(f"all {count} burst messages answered in order", seen == list(range(count)), f"{len(seen)} answers, first wrong at {next((i for i, v in enumerate(seen) if v != i), None)}")
    alive(kc, f"a burst of {count} messages")

    reply, msgs = execute(kc, "1 + 1")
    results = [m for m in msgs if m["msg_type"] == "execute_result"]
    checks.check("cells still run after all of it", reply["content"]["status"] == "ok" and results and results[0]["content"]["data"]["text/plain"] == "2", msgs)
    raw.close()
    sub.close()

checks.report()
