"""Debian's jupyter_kernel_test (python3-jupyter-kernel-test) against the fringekit kernel.
Prints one JSON line with each test's outcome (ok / skipped / failed)."""
import json
import sys
import unittest

import jupyter_kernel_test as jkt

from harness import record_pid

FK = 'import { display, clearOutput } from "fringekit/kernel"; '


class FringekitKernelTests(jkt.KernelTests):
    kernel_name = "fringekit"
    language_name = "typescript"
    file_extension = ".ts"

    @classmethod
    def setUpClass(cls):
        super().setUpClass()
        record_pid(cls.km)

    code_hello_world = 'console.log("hello, world")'
    code_stderr = 'console.error("some error")'
    completion_samples = [
        {"text": "Math.PI.toFix", "matches": {"toFixed"}},
        {"text": "[1, 2].forE", "matches": {"forEach"}},
    ]
    complete_code_samples = ["1 + 1", "let a = 1;", "function f() { return 1; }", "await Promise.resolve(1)"]
    incomplete_code_samples = ["function f() {", "let a = [1,", "if (true) {"]
    invalid_code_samples = ["1 +* 2", "const 3x = 1;", "let x = ;", "f(1 2)"]
    code_generate_error = 'throw new Error("boom")'
    code_execute_result = [
        {"code": "6 * 7", "result": "42"},
        {"code": '"fringe" + "kit"', "result": "'fringekit'"},
        {"code": FK + '({ [Symbol.for("fringekit.mimeBundle")]() { return { "text/html": "<b>V = 0.8</b>" }; } })',
         "mime": "text/html", "result": "<b>V = 0.8</b>"},
    ]
    code_display_data = [
        {"code": FK + 'display({ toMimeBundle() { return { "text/markdown": "**fringe**" }; } })', "mime": "text/markdown"},
        {"code": 'import { display as tslabDisplay } from "tslab"; tslabDisplay.html("<i>x</i>")', "mime": "text/html"},
    ]
    code_inspect_sample = "Math.max"
    code_clear_output = FK + "clearOutput()"


if __name__ == "__main__":
    suite = unittest.defaultTestLoader.loadTestsFromTestCase(FringekitKernelTests)
    names = [test.id().split(".")[-1] for test in suite]
    result = unittest.TestResult()
    suite.run(result)
    outcome = {}
    for test, _ in result.skipped:
        outcome[test.id().split(".")[-1]] = "skipped"
    for test, trace in result.failures + result.errors:
        name = test.id().split(".")[-1].split(" ")[0]
        outcome[name] = "failed: " + trace[-1500:]
    for name in names:
        outcome.setdefault(name, "ok")
    print("FRINGEKIT-CONFORMANCE " + json.dumps(outcome), flush=True)
    sys.exit(0 if result.wasSuccessful() else 1)
