"""Reference Poisson maximum-likelihood fit with SciPy for the fitter's tests.

Reads JSON on stdin: {"x": [...], "y": [...] (counts), "start": [a, b, c]} for the model
f = a*exp(-b*x) + c, minimises the Poisson deviance 2*sum[f - y + y*ln(y/f)] with
scipy.optimize.minimize (BFGS with the analytic gradient, gtol 1e-10), and writes {"values": [...], "stderr": [...], "deviance": d}: standard
errors from the inverse Fisher information sum_i grad f_i grad f_i^T / f_i at the optimum.
"""
import json
import sys

import numpy as np
from scipy.optimize import minimize


def main():
    job = json.load(sys.stdin)
    x = np.asarray(job["x"], float)
    y = np.asarray(job["y"], float)

    def model(p):
        a, b, c = p
        e = np.exp(-b * x)
        f = a * e + c
        grad = np.stack([e, -a * x * e, np.ones_like(x)], axis=1)
        return f, grad

    def deviance(p):
        f, grad = model(p)
        if np.any(f <= 0):
            return np.inf, np.zeros(3)
        ylog = np.where(y > 0, y * np.log(np.where(y > 0, y, 1) / f), 0.0)
        d = 2 * np.sum(f - y + ylog)
        g = 2 * grad.T @ (1 - y / f)
        return d, g

    result = minimize(deviance, np.asarray(job["start"], float), jac=True, method="BFGS", options={"gtol": 1e-10, "maxiter": 10000})
    f, grad = model(result.x)
    fisher = grad.T @ (grad / f[:, None])
    cov = np.linalg.inv(fisher)
    json.dump({"values": result.x.tolist(), "stderr": np.sqrt(np.diag(cov)).tolist(), "deviance": float(result.fun)}, sys.stdout)


if __name__ == "__main__":
    main()
