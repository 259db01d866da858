"""The kernel's global types: Node's always; other @types packages of the notebook folder only
when a cell imports their package or FRINGEKIT_KERNEL_TYPES names them. Semantics of the
compiler option `types` (TypeScript handbook, tsconfig reference "types": with `types` set,
only the listed packages enter the global scope; imports still find @types packages).
argv[1]: a project folder with node_modules/@types/labglob (declares the global `labGlobal`) and
node_modules/labmod + node_modules/@types/labmod (exports `answer: number`)."""
import os
import sys

from harness import Checks, execute, kernel

checks = Checks()
project = sys.argv[1]


def result_text(msgs):
    return [m["content"]["data"]["text/plain"] for m in msgs if m["msg_type"] == "execute_result"]


with kernel(cwd=project) as (km, kc):
    reply, msgs = execute(kc, 'const b: Buffer = Buffer.from("ab");\n[typeof process.version, b.length]')
    checks.check("default: Node's globals type-check", result_text(msgs) == ["[ 'string', 2 ]"], result_text(msgs) or reply["content"])
    reply, msgs = execute(kc, "typeof labGlobal")
    evalue = reply["content"].get("evalue", "")
    checks.check("default: globals of an unimported @types package are unknown", reply["content"]["status"] == "error" and "Cannot find name 'labGlobal'" in evalue, evalue or result_text(msgs))
    reply, msgs = execute(kc, 'import { answer } from "labmod";\nconst n: string = answer;')
    evalue = reply["content"].get("evalue", "")
    checks.check("default: an imported package gets its @types declarations", reply["content"]["status"] == "error" and "Type 'number' is not assignable to type 'string'" in evalue, evalue or result_text(msgs))

with kernel(cwd=project, env={**os.environ, "FRINGEKIT_KERNEL_TYPES": "labglob"}) as (km, kc):
    reply, msgs = execute(kc, "const s: string | undefined = typeof labGlobal === 'string' ? labGlobal : undefined;\n[typeof labGlobal, s]")
    checks.check("FRINGEKIT_KERNEL_TYPES=labglob: its globals type-check", result_text(msgs) == ["[ 'undefined', undefined ]"], result_text(msgs) or reply["content"])
    reply, msgs = execute(kc, "typeof process.version")
    checks.check("FRINGEKIT_KERNEL_TYPES=labglob: Node's globals stay", result_text(msgs) == ["'string'"], result_text(msgs) or reply["content"])

checks.report()
