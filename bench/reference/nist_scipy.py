"""NIST StRD nonlinear regression with SciPy least_squares(method="lm") (MINPACK), for comparison
with bench/nist.ts. Reads the .dat files of the folder given as argv[1] as published, translates
the model line to a numpy expression, fits from both starts with a finite-difference Jacobian
(SciPy's default) and prints the minimum log relative error over the parameters for each, then
`SciPy NIST StRD: K/54 dataset-starts with every parameter to >= 6 digits`.
LRE = -log10(|estimate - certified| / |certified|), capped at 11.
"""
import math
import os
import re
import sys

import numpy as np
from scipy.optimize import least_squares


def parse(path):
    lines = open(path).read().splitlines()
    model_at = next(i for i, l in enumerate(lines) if l.startswith("Model:"))
    starts_at = next(i for i, l in enumerate(lines) if i > model_at and re.search(r"Starting\s+values", l, re.I))
    statements = []
    for raw in lines[model_at + 1:starts_at]:
        line = raw.strip()
        if not line or re.search(r"Parameters? \(", line) or "Class" in line:
            continue
        if "=" in line and not re.match(r"^[+\-*/]", line) and not (statements and re.search(r"[/*+-]$", statements[-1])):
            statements.append(line)
        else:
            statements[-1] += " " + line
    constants, lhs, rhs = {}, "", ""
    for st in statements:
        left, right = [s.strip() for s in st.split("=", 1)]
        if re.fullmatch(r"[A-Za-z]+", left) and re.fullmatch(r"[-+0-9.Ee]+", right):
            constants[left] = right
        else:
            lhs, rhs = left, right
    expr = re.sub(r"\+\s*e\s*$", "", rhs).replace("[", "(").replace("]", ")")
    expr = re.sub(r"\barctan\b", "arctan", expr)
    for name, value in constants.items():
        expr = re.sub(rf"\b{name}\b", f"({value})", expr)
    params, s1, s2, cert = [], [], [], []
    for line in lines[starts_at:]:
        m = re.match(r"^\s*(b\d+)\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$", line)
        if m:
            params.append(m.group(1)); s1.append(float(m.group(2))); s2.append(float(m.group(3))); cert.append(float(m.group(4)))
    data_at = next(i for i, l in enumerate(lines) if re.match(r"^\s*Data:\s+y\s", l))
    names = lines[data_at].replace("Data:", "").split()
    rows = np.array([[float(v) for v in l.split()] for l in lines[data_at + 1:] if l.strip()])
    y = rows[:, 0]
    if lhs.replace(" ", "") == "log[y]":
        y = np.log(y)
    columns = {n: rows[:, k] for k, n in enumerate(names) if k > 0}
    return expr, params, (s1, s2), cert, y, columns


def lre(estimate, certified):
    if not math.isfinite(estimate):
        return 0.0
    if estimate == certified:
        return 11.0
    return max(0.0, min(11.0, -math.log10(abs(estimate - certified) / abs(certified))))


def main():
    folder = sys.argv[1]
    passed = total = 0
    scope = {"exp": np.exp, "log": np.log, "cos": np.cos, "sin": np.sin, "arctan": np.arctan, "pi": np.pi}
    for name in sorted(f for f in os.listdir(folder) if f.endswith(".dat")):
        expr, params, starts, cert, y, columns = parse(os.path.join(folder, name))
        code = compile(expr, name, "eval")

        def residuals(b):
            env = dict(scope, **columns, **{p: b[k] for k, p in enumerate(params)})
            with np.errstate(all="ignore"):
                return y - eval(code, {"__builtins__": {}}, env)

        for k, start in enumerate(starts):
            try:
                result = least_squares(residuals, np.array(start), method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=20000)
                digits = min(lre(result.x[j], cert[j]) for j in range(len(params)))
            except Exception:
                digits = 0.0
            total += 1
            passed += digits >= 6
            print(f"{name[:-4]:10s} {k + 1:5d}  {digits:6.1f}")
    print(f"SciPy NIST StRD: {passed}/{total} dataset-starts with every parameter to >= 6 digits")


if __name__ == "__main__":
    main()
