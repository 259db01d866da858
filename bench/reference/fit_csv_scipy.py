"""Reference for B9: one B1 fit from a CSV file by a fresh Python process.

Usage: python3 fit_csv_scipy.py DATA.csv
DATA.csv: header line, then position (m), intensity (counts). Fits B1's finite-width two-slit
model (bench/reference/two_slit_scipy.py) with scipy.optimize.least_squares(method="lm") from
B1's start, wavelength, distance and pixel width fixed, sigma = sqrt(max(y, 1)); prints the values.
"""
import os
import sys

import numpy as np
from scipy.optimize import least_squares

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from two_slit_scipy import NAMES, make_model  # noqa: E402

START = {"amplitude": 18000, "background": 100, "center": 0.30e-3, "separation": 0.497e-3,
         "width": 0.110e-3, "visibility": 0.70, "phase": 0.0}
FIXED = {"wavelength": 632.8e-9, "distance": 1.0, "pixelWidth": 5.5e-6}


def main():
    x, y = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1, unpack=True)
    sigma = np.sqrt(np.maximum(y, 1.0))
    model, _jacobian = make_model(x, FIXED)
    result = least_squares(lambda p: (y - model(p)) / sigma, np.array([START[n] for n in NAMES]), method="lm")
    for name, value in zip(NAMES, result.x):
        print(f"{name} {value:.9g}")
    sys.exit(0 if result.success else 1)


if __name__ == "__main__":
    main()
