"""Reference fit of the finite-width two-slit model with SciPy's least_squares(method="lm").

Reads a JSON job on stdin:
  {"x": [...] (m), "y": [...], "sigma": [...], "start": {name: value},
   "fixed": {"wavelength": m, "distance": m, "pixelWidth": m}, "repeats": int,
   "variant": "analytic" (numpy Jacobian, x_scale="jac") | "default" (least_squares(fun, p0, method="lm"))}
and writes JSON to stdout: parameter values, standard errors (covariance (J^T J)^-1 scaled by
the reduced chi-square, as curve_fit does), chi2, nfev, status and the median wall time per
fit over `repeats` runs after one warm-up.

Model (B1 of PROBLEMS.md): I = background + amplitude * mean_k[ sinc^2(pi a s/lambda)
* (1 + V cos(2 pi d s/lambda + phase)) ], s = u / sqrt(u^2 + L^2), u = x + o_k w - center,
o_k the 5-point Gauss-Legendre nodes on [-1/2, 1/2]; analytic Jacobian.
"""
import json
import sys
import time

import numpy as np
from scipy.optimize import least_squares

NAMES = ["amplitude", "center", "separation", "width", "visibility", "phase", "background"]


def make_model(x, fixed):
    lam, L, w = fixed["wavelength"], fixed["distance"], fixed["pixelWidth"]
    nodes, weights = np.polynomial.legendre.leggauss(5)
    offsets = (nodes / 2.0)[None, :] * w
    wts = (weights / 2.0)[None, :]
    xx = x[:, None] + offsets

    def parts(p):
        amp, c, d, a, vis, ph, bg = p
        u = xx - c
        root = np.sqrt(u * u + L * L)
        s = u / root
        beta = np.pi * a * s / lam
        beta_safe = np.where(beta == 0, 1.0, beta)
        sinc = np.where(beta == 0, 1.0, np.sin(beta_safe) / beta_safe)
        dsinc = np.where(beta == 0, 0.0, (np.cos(beta_safe) - sinc) / beta_safe)
        env = sinc * sinc
        gamma = 2 * np.pi * d * s / lam + ph
        cos, sin = np.cos(gamma), np.sin(gamma)
        fringe = 1 + vis * cos
        return amp, c, d, a, vis, ph, bg, u, root, s, sinc, dsinc, env, cos, sin, fringe

    def model(p):
        amp, *_rest = p
        r = parts(p)
        env, fringe, bg = r[12], r[15], r[6]
        return bg + amp * np.sum(wts * env * fringe, axis=1)

    def jacobian(p):
        amp, c, d, a, vis, ph, bg, u, root, s, sinc, dsinc, env, cos, sin, fringe = parts(p)
        denv = 2 * sinc * dsinc  # d env / d beta
        dsdu = L * L / root**3
        cols = [
            np.sum(wts * env * fringe, axis=1),
            amp * np.sum(wts * -(denv * np.pi * a / lam * fringe - env * vis * sin * 2 * np.pi * d / lam) * dsdu, axis=1),
            amp * np.sum(wts * env * -vis * sin * 2 * np.pi * s / lam, axis=1),
            amp * np.sum(wts * denv * np.pi * s / lam * fringe, axis=1),
            amp * np.sum(wts * env * cos, axis=1),
            amp * np.sum(wts * env * -vis * sin, axis=1),
            np.ones(x.shape[0]),
        ]
        return np.stack(cols, axis=1)

    return model, jacobian


def main():
    job = json.load(sys.stdin)
    x = np.asarray(job["x"], dtype=float)
    y = np.asarray(job["y"], dtype=float)
    sigma = np.asarray(job["sigma"], dtype=float)
    model, jacobian = make_model(x, job["fixed"])
    p0 = np.array([job["start"][n] for n in NAMES], dtype=float)

    def fun(p):
        return (y - model(p)) / sigma

    def jac(p):
        return -jacobian(p) / sigma[:, None]

    variant = job.get("variant", "analytic")
    if variant == "analytic":
        # analytic numpy Jacobian, MINPACK's own column scaling
        def fit():
            return least_squares(fun, p0, jac=jac, method="lm", x_scale="jac")
    elif variant == "default":
        # the call as usually written: finite-difference Jacobian, default scaling
        def fit():
            return least_squares(fun, p0, method="lm")
    else:
        raise SystemExit(f"unknown variant {variant!r}")

    fit()  # warm-up
    times = []
    for _ in range(int(job.get("repeats", 10))):
        t0 = time.perf_counter()
        result = fit()
        times.append(time.perf_counter() - t0)
    J = result.jac
    chi2 = float(np.sum(result.fun ** 2))
    dof = x.size - len(NAMES)
    cov = np.linalg.inv(J.T @ J) * chi2 / dof
    out = {
        "values": dict(zip(NAMES, result.x.tolist())),
        "stderr": dict(zip(NAMES, np.sqrt(np.diag(cov)).tolist())),
        "chi2": chi2,
        "nfev": int(result.nfev),
        "status": int(result.status),
        "median_ms": float(np.median(times) * 1000.0),
    }
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
