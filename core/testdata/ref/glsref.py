#!/usr/bin/env python3
"""Independent reference for rootshift's GLS-based unit-root statistics.

Computes, with plain NumPy least squares (numpy.linalg.lstsq on explicit
design matrices, no code shared with the Go implementation):
  * local-to-unity GLS detrending (Elliott, Rothenberg & Stock 1996, sec. 3):
    a = 1 + cbar/T, cbar = -7 (constant) or -13.5 (constant + trend);
  * the DF-GLS t-ratio with k fixed lags on t = k+2..T (ERS 1996, eq. (6));
  * s2_AR = (SSR/nobs) / (1 - sum gamma)^2 from that regression;
  * P_T = (S(a) - a S(1)) / s2_AR (ERS 1996, eq. (12));
  * MZa, MZt, MSB, MPT (Ng & Perron 2001, eqs. (4)-(6), p. 1524).

Usage: glsref.py DATADIR > glsref.out.csv
DATADIR holds sp500.csv (column "price") and us-employment.csv (column
"nonfarm"), copied from the npm package vega-datasets.
The statistics are computed on the raw levels and on natural logs.
"""
import csv
import os
import sys

import numpy as np


def load(path, column):
    with open(path, newline="") as f:
        return np.array([float(r[column]) for r in csv.DictReader(f)])


def gls_detrend(y, trend):
    T = len(y)
    cbar = -13.5 if trend == "linear" else -7.0
    a = 1.0 + cbar / T
    t = np.arange(1, T + 1, dtype=float)
    z = np.ones((T, 1)) if trend == "constant" else np.column_stack([np.ones(T), t])

    def qd(x, alpha):
        out = x.copy()
        out[1:] = x[1:] - alpha * x[:-1]
        return out

    def reg(alpha):
        ya, za = qd(y, alpha), qd(z, alpha)
        beta, *_ = np.linalg.lstsq(za, ya, rcond=None)
        e = ya - za @ beta
        return beta, float(e @ e)

    beta, s_a = reg(a)
    _, s_1 = reg(1.0)
    return y - z @ beta, a, cbar, s_a, s_1


def dfgls_regression(yd, k):
    T = len(yd)
    dy = np.diff(yd)  # dy[i] = yd[i+1] - yd[i], i.e. Δỹ at t = i+2 (1-based)
    rows = range(k + 2, T + 1)  # 1-based t
    Y = np.array([yd[t - 1] - yd[t - 2] for t in rows])
    X = np.array([[yd[t - 2]] + [dy[t - 2 - i] for i in range(1, k + 1)] for t in rows])
    b, *_ = np.linalg.lstsq(X, Y, rcond=None)
    e = Y - X @ b
    n, p = X.shape
    ssr = float(e @ e)
    s2 = ssr / (n - p)
    cov = s2 * np.linalg.inv(X.T @ X)
    tstat = b[0] / np.sqrt(cov[0, 0])
    s2ar = (ssr / n) / (1.0 - b[1:].sum()) ** 2
    return float(tstat), float(b[0]), n, s2ar


def stats(y, trend, k):
    T = len(y)
    yd, a, cbar, s_a, s_1 = gls_detrend(y, trend)
    tstat, rho, nobs, s2 = dfgls_regression(yd, k)
    pt = (s_a - a * s_1) / s2
    kappa = float((yd[:-1] ** 2).sum()) / T**2
    last = yd[-1] ** 2 / T
    mza = (last - s2) / (2 * kappa)
    msb = np.sqrt(kappa / s2)
    mzt = mza * msb
    if trend == "linear":
        mpt = (cbar**2 * kappa + (1 - cbar) * last) / s2
    else:
        mpt = (cbar**2 * kappa - cbar * last) / s2
    return [T, nobs, tstat, rho, pt, mza, mzt, msb, mpt]


def main():
    d = sys.argv[1]
    series = {
        "sp500": load(os.path.join(d, "sp500.csv"), "price"),
        "nonfarm": load(os.path.join(d, "us-employment.csv"), "nonfarm"),
    }
    w = csv.writer(sys.stdout, lineterminator="\n")
    w.writerow(["series", "transform", "trend", "k", "T", "nobs", "dfgls", "rho", "pt", "mza", "mzt", "msb", "mpt"])
    for name, y in series.items():
        for transform in ("level", "log"):
            x = y if transform == "level" else np.log(y)
            for trend in ("constant", "linear"):
                for k in (0, 1, 4):
                    v = stats(x, trend, k)
                    w.writerow([name, transform, trend, k] + v[:2] + ["%.17g" % u for u in v[2:]])


if __name__ == "__main__":
    main()
