"""Shared helpers for the kernel tests: start the fringekit kernel with jupyter_client and make
sure it stops, even when the calling test process is terminated."""
import contextlib
import json
import os
import signal
import sys

from jupyter_client.manager import start_new_kernel

TIMEOUT = 60


def _terminate(signum, frame):
    # Turn SIGTERM from the test runner into SystemExit so `finally` blocks stop the kernel.
    raise SystemExit(128 + signum)


signal.signal(signal.SIGTERM, _terminate)


def record_pid(km):
    """Appends the kernel's pid to FRINGEKIT_TEST_PIDFILE so the test runner can stop it."""
    pidfile = os.environ.get("FRINGEKIT_TEST_PIDFILE")
    proc = getattr(getattr(km, "provisioner", None), "process", None) or getattr(km, "kernel", None)
    if pidfile and proc is not None:
        with open(pidfile, "a") as f:
            f.write(f"{proc.pid}\n")


@contextlib.contextmanager
def kernel(**kwargs):
    km, kc = start_new_kernel(kernel_name="fringekit", startup_timeout=60, **kwargs)
    record_pid(km)
    try:
        yield km, kc
    finally:
        try:
            kc.stop_channels()
        finally:
            km.shutdown_kernel(now=False)


def drain_iopub(kc, parent_id, timeout=TIMEOUT):
    """iopub messages whose parent is `parent_id`, up to and including its idle status."""
    msgs = []
    while True:
        msg = kc.get_iopub_msg(timeout=timeout)
        if msg["parent_header"].get("msg_id") != parent_id:
            continue
        msgs.append(msg)
        if msg["msg_type"] == "status" and msg["content"]["execution_state"] == "idle":
            return msgs


def shell_reply(kc, parent_id, timeout=TIMEOUT):
    while True:
        msg = kc.get_shell_msg(timeout=timeout)
        if msg["parent_header"].get("msg_id") == parent_id:
            return msg


def execute(kc, code, timeout=TIMEOUT):
    """Runs `code`; returns (reply, iopub messages of that request)."""
    msg_id = kc.execute(code)
    reply = shell_reply(kc, msg_id, timeout)
    return reply, drain_iopub(kc, msg_id, timeout)


class Checks:
    """Collects named checks and prints them as one JSON line for the TypeScript test."""

    def __init__(self):
        self.results = []

    def check(self, name, ok, detail=""):
        self.results.append({"name": name, "ok": bool(ok), "detail": str(detail)[:2000]})

    def report(self):
        print("FRINGEKIT-CHECKS " + json.dumps(self.results), flush=True)
        sys.stdout.flush()
