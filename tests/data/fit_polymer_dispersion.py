"""Fit the one-term Sellmeier formula n^2 = 1 + B l^2 / (l^2 - C) (l in um, C in um^2)
to the measured polymer indices in sultanova2009_polymers.csv.

This is how flatray's PMMA and polycarbonate coefficients (src/media/materials.rs)
were obtained: an unweighted least-squares fit in n, on the data's own footing
(index relative to air, wavelengths as printed). Run with numpy and scipy:

    python3 tests/data/fit_polymer_dispersion.py
"""
import csv
import os

import numpy as np
from scipy.optimize import least_squares

HERE = os.path.dirname(os.path.abspath(__file__))


def load():
    with open(os.path.join(HERE, "sultanova2009_polymers.csv")) as f:
        rows = [r for r in csv.reader(line for line in f if not line.startswith("#"))]
    header, body = rows[0], rows[1:]
    cols = {name: np.array([float(r[i]) for r in body]) for i, name in enumerate(header)}
    return cols["wavelength_nm"] / 1000.0, cols


def model(p, l_um):
    return np.sqrt(1.0 + p[0] * l_um**2 / (l_um**2 - p[1]))


def main():
    l_um, cols = load()
    # d, F, C lines in air, um
    lines = np.array([0.5875618, 0.4861327, 0.6562725])
    for name in ("n_pmma", "n_pc"):
        n = cols[name]
        fit = least_squares(lambda p: model(p, l_um) - n, [1.2, 0.01],
                            xtol=1e-15, ftol=1e-15, gtol=1e-15)
        b, c = fit.x
        res = model(fit.x, l_um) - n
        nd, nf, nc = model(fit.x, lines)
        print(f"{name}: B = {b:.7f}, C = {c:.8f} um^2")
        print(f"  residuals (fit - measured): {np.array2string(res, precision=5)}")
        print(f"  max |residual| = {abs(res).max():.6f}")
        print(f"  n_d = {nd:.6f}, n_F = {nf:.6f}, n_C = {nc:.6f}, V_d = {(nd - 1) / (nf - nc):.2f}")


if __name__ == "__main__":
    main()
