"""Cells import fringekit and fringekit/kernel, and tslab's type-checker reads their .d.ts:
from the kernel's working directory given as argv[1] (a project with fringekit installed, or a
folder inside the fringekit repository)."""
import sys

from harness import Checks, execute, kernel

checks = Checks()
where = sys.argv[2] if len(sys.argv) > 2 else "project"


def result_text(msgs):
    return [m["content"]["data"]["text/plain"] for m in msgs if m["msg_type"] == "execute_result"]


with kernel(cwd=sys.argv[1]) as (km, kc):
    reply, msgs = execute(kc, 'import { openComm, getRuntime } from "fringekit/kernel-protocol";\nimport { FringekitError } from "fringekit";\n[typeof openComm, typeof FringekitError, getRuntime() !== undefined]')
    checks.check(f"{where}: cells import fringekit and fringekit/kernel", result_text(msgs) == ["[ 'function', 'function', true ]"], result_text(msgs) or reply["content"])
    reply, msgs = execute(kc, 'import { openComm as oc } from "fringekit/kernel-protocol";\nconst wrong: number = oc;')
    evalue = reply["content"].get("evalue", "")
    checks.check(f"{where}: the type-checker reads fringekit's .d.ts", reply["content"]["status"] == "error" and "is not assignable to type 'number'" in evalue, evalue)
    reply, msgs = execute(kc, 'import { InvalidArgumentError } from "fringekit";\nconst e: InvalidArgumentError = new InvalidArgumentError("wavelength", -1, "a positive length in m");\ne.argument')
    checks.check(f"{where}: classes from fringekit work with their types", result_text(msgs) == ["'wavelength'"], result_text(msgs) or reply["content"])

checks.report()
