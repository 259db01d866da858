"""B8 driver: notebook latency of Jupyter kernels through jupyter_client (Debian python3-jupyter-client).

Usage: python3 kernel_latency.py JOB_JSON
JOB_JSON: {"rounds": R, "trivial": N, "hold": S, "kernels": [{"name": kernelspec, "first": code, "trivial": code, "cwd": dir}]}
For each round and each kernel in turn (interleaved): start the kernel and wait until it answers
kernel_info (start_new_kernel does that), run the first cell, then the trivial cell N times, each
timed until its execute_reply; keep the kernel S seconds more (default 0: a warm-up start that
lets the kernel write its caches), then shut it down. Prints one JSON object: name -> lists of seconds.
"""
import json
import sys
import time

from jupyter_client.manager import start_new_kernel


def run_cell(kc, code):
    t0 = time.perf_counter()
    reply = kc.execute(code, reply=True, timeout=300)
    elapsed = time.perf_counter() - t0
    if reply["content"]["status"] != "ok":
        raise SystemExit(f"cell failed: {code!r}: {reply['content']}")
    return elapsed


def main():
    job = json.loads(sys.argv[1])
    out = {k["name"]: {"start": [], "first": [], "trivial": []} for k in job["kernels"]}
    for _ in range(job["rounds"]):
        for k in job["kernels"]:
            t0 = time.perf_counter()
            km, kc = start_new_kernel(kernel_name=k["name"], startup_timeout=300, cwd=k["cwd"])
            try:
                out[k["name"]]["start"].append(time.perf_counter() - t0)
                out[k["name"]]["first"].append(run_cell(kc, k["first"]))
                for _ in range(job["trivial"]):
                    out[k["name"]]["trivial"].append(run_cell(kc, k["trivial"]))
                time.sleep(job.get("hold", 0))
            finally:
                kc.stop_channels()
                km.shutdown_kernel(now=False)
    print(json.dumps(out))


if __name__ == "__main__":
    main()
