"""Reference for B7: the paper fit figure drawn by matplotlib (Debian python3-matplotlib).

Usage: python3 fit_figure_matplotlib.py DATA.csv OUT_BASE
DATA.csv columns: x (m), y (counts), model (counts), residual ((y - f)/sigma).
Draws data points, the model curve and a normalised residual panel sharing the position axis,
85 mm x 70 mm at 8 pt, and writes OUT_BASE.svg, OUT_BASE.pdf and OUT_BASE.png (600 dpi).
"""
import sys

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402


def main():
    data_file, base = sys.argv[1], sys.argv[2]
    x, y, model, resid = np.loadtxt(data_file, delimiter=",", skiprows=1, unpack=True)
    xmm = x * 1e3
    plt.rcParams.update({"font.size": 8, "axes.linewidth": 0.75})
    mm = 1 / 25.4
    fig, (top, bottom) = plt.subplots(2, 1, sharex=True, figsize=(85 * mm, 70 * mm),
                                      gridspec_kw={"height_ratios": [0.7, 0.22], "hspace": 0.08})
    top.plot(xmm, y / 1e3, linestyle="none", marker="o", markersize=1.0, color="#7a7a7a", label="data")
    top.plot(xmm, model / 1e3, color="#143d73", linewidth=1.2, label="two-slit fit")
    top.set_ylabel("Intensity $I$ ($10^3$ counts)")
    top.set_ylim(bottom=0)
    top.legend(loc="lower left", bbox_to_anchor=(0, 1.0), ncol=2, frameon=False)
    bottom.plot(xmm, resid, linestyle="none", marker="o", markersize=1.0, color="#2b2b2b")
    bottom.axhline(0, color="#7a7a7a", linewidth=0.75)
    limit = max(3, np.ceil(np.nanmax(np.abs(resid)) * 1.1))
    bottom.set_ylim(-limit, limit)
    bottom.set_ylabel("$(I-f)/\\sigma$")
    bottom.set_xlabel("Position $x$ (mm)")
    for ext in ("svg", "pdf"):
        fig.savefig(f"{base}.{ext}", bbox_inches="tight")
    fig.savefig(f"{base}.png", dpi=600, bbox_inches="tight")


if __name__ == "__main__":
    main()
