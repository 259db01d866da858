"""The kernel's start-up snapshot (kernel-ext/startSnapshot.ts): a kernel started from it answers
cells, type errors and completions exactly as the same kernel without it (FRINGEKIT_KERNEL_SNAPSHOT=0);
a corrupt snapshot is set aside and the kernel starts without it. The expected texts are
TypeScript's own diagnostics (TS2322 "Type 'string' is not assignable to type 'number'", TS2345
for a wrong argument; from memory) and Node's values.
argv: NODE LAUNCH_JS REPO. FRINGEKIT_CACHE_DIR (set by the test) is an empty temporary folder."""
import os
import subprocess
import sys
import time

from harness import Checks, execute, kernel

checks = Checks()
node, launcher, repo = sys.argv[1], sys.argv[2], sys.argv[3]
cache = os.environ["FRINGEKIT_CACHE_DIR"]

CELLS = [
    'const n: number = "text";',
    'const b: Buffer = Buffer.from("ab");\n[typeof process.version, b.length, typeof setTimeout, typeof require]',
    'import { readFileSync } from "node:fs";\ntypeof readFileSync',
    'import * as fk from "fringekit";\nfk.getModel("two-slit").id',
    "fk.getModel(42)",
    "const started = (globalThis as any)[Symbol.for(\"fringekit.kernelSnapshot\")] !== undefined;\nstarted",
]


def snapshot_status():
    out = subprocess.run([node, launcher, "--snapshot-status"], capture_output=True, text=True, env=os.environ)
    return out.stdout.strip()


def session(env, hold=0.0):
    """Answers of CELLS (result text or error value) and the completions of `process.memoryU`."""
    answers = []
    with kernel(cwd=repo, env=env) as (km, kc):
        for code in CELLS:
            reply, msgs = execute(kc, code)
            results = [m["content"]["data"]["text/plain"] for m in msgs if m["msg_type"] == "execute_result"]
            answers.append(results if reply["content"]["status"] == "ok" else reply["content"].get("evalue", ""))
        complete = kc.complete("process.memoryU", 15, reply=True, timeout=60)["content"]["matches"]
        time.sleep(hold)
    return answers, complete


plain = {**os.environ, "FRINGEKIT_KERNEL_SNAPSHOT": "0"}
without, without_complete = session(plain)
checks.check("without the snapshot: the type error is TypeScript's", "Type 'string' is not assignable to type 'number'" in str(without[0]), without[0])
checks.check("without the snapshot: Node's globals and node: imports type-check", without[1] == ["[ 'string', 2, 'function', 'function' ]"] and without[2] == ["'function'"], without[1:3])
checks.check("without the snapshot: the kernel does not run from one", without[5] == ["false"], without[5])

# A first start with the cache folder empty builds the snapshot in the background (a few
# seconds after it started); later starts use it.
first, _ = session(dict(os.environ), hold=5)
deadline = time.time() + 120
while snapshot_status() == "none" and time.time() < deadline:
    time.sleep(1)
blob = snapshot_status()
checks.check("a start without a snapshot builds one", blob != "none" and os.path.exists(blob), blob)

snap, snap_complete = session(dict(os.environ))
checks.check("a later start runs from the snapshot", snap[5] == ["true"], snap[5])
for i, code in enumerate(CELLS[:5]):
    checks.check(f"from the snapshot, cell {i + 1} answers as without it", snap[i] == without[i], f"{code!r}: {snap[i]!r} vs {without[i]!r}")
checks.check("from the snapshot, completions are those without it", "memoryUsage" in snap_complete and snap_complete == without_complete, f"{snap_complete} vs {without_complete}")
checks.check("fringekit's wrong argument is a type error from the snapshot too", "Argument of type 'number' is not assignable" in str(snap[4]), snap[4])

# A blob damaged just past the bytes its description records (same size and head, so it is
# still offered: Node itself rejects it) is set aside at the next start.
if blob != "none":
    with open(blob, "r+b") as f:
        f.seek(64)
        f.write(b"\0" * 4032)
    fallback, _ = session(dict(os.environ))
    checks.check("a corrupt snapshot: the kernel starts without it and answers", fallback[5] == ["false"] and fallback[3] == without[3], fallback)
    checks.check("a corrupt snapshot is removed", not os.path.exists(blob), os.listdir(cache))

checks.report()
