#!/usr/bin/env python3
"""Independent reference for rootshift's ADF, Phillips-Perron and KPSS statistics.

Written directly from the papers' formulas with NumPy least squares (Debian
python3-numpy), sharing no code with the Go implementation:

  ADF  (Dickey & Fuller 1979; Said & Dickey 1984 eq. 1.2):
       dy_t = det_t'd + rho y_{t-1} + sum_{i=1..k} g_i dy_{t-i} + e_t, t = k+2..T,
       det: none / 1 / (1, t) with t = 1..T the observation number.
  PP   (Phillips & Perron 1988), regression above with k = 0, n = T-1,
       g0 = SSR/n, s2 = SSR/(n-K), lambda2 = Bartlett long-run variance with
       weights 1 - j/(l+1) and autocovariances divided by n;
       Z(alpha) = n rho - 0.5 (n^2 se^2 / s2)(lambda2 - g0),
       Z(t) = sqrt(g0/lambda2) t - 0.5 (lambda2 - g0)/sqrt(lambda2) n se / sqrt(s2).
  KPSS (Kwiatkowski et al. 1992 eqs. 8-10): e = OLS residuals on 1 or (1, t),
       S_t partial sums, eta = sum S_t^2 / (T^2 s2(l)).

Data: testdata/sp500.csv (column price) and testdata/us-employment.csv
(column nonfarm), from the vega-datasets npm package; levels and natural logs.

Usage: dfref.py [DATA_DIR] > dfref.json
"""
import csv
import json
import os
import sys

import numpy as np


def load(path, col):
    with open(path, newline="") as f:
        return np.array([float(r[col]) for r in csv.DictReader(f)], dtype=float)


def ols(X, y):
    coef, *_ = np.linalg.lstsq(X, y, rcond=None)
    resid = y - X @ coef
    n, k = X.shape
    ssr = float(resid @ resid)
    s2 = ssr / (n - k)
    cov = s2 * np.linalg.inv(X.T @ X)
    return coef, np.sqrt(np.diag(cov)), resid, ssr, s2


def df_design(y, trend, k):
    T = len(y)
    t = np.arange(k + 2, T + 1)  # 1-based observation numbers used
    dy = y[t - 1] - y[t - 2]
    cols = [y[t - 2]]
    for i in range(1, k + 1):
        cols.append(y[t - 1 - i] - y[t - 2 - i])
    if trend in ("constant", "linear"):
        cols.append(np.ones(len(t)))
    if trend == "linear":
        cols.append(t.astype(float))
    return np.column_stack(cols), dy


def adf(y, trend, k):
    X, dy = df_design(y, trend, k)
    coef, se, resid, ssr, s2 = ols(X, dy)
    return {"stat": coef[0] / se[0], "rho": coef[0], "nobs": len(dy)}


def bartlett_lrv(u, l):
    n = len(u)
    v = float(u @ u) / n
    for j in range(1, l + 1):
        v += 2 * (1 - j / (l + 1)) * float(u[j:] @ u[:-j]) / n
    return v


def pp(y, trend, l):
    X, dy = df_design(y, trend, 0)
    coef, se, resid, ssr, s2 = ols(X, dy)
    n = len(dy)
    g0 = ssr / n
    lam2 = bartlett_lrv(resid, l)
    rho, s = coef[0], se[0]
    za = n * rho - 0.5 * (n * n * s * s / s2) * (lam2 - g0)
    zt = np.sqrt(g0 / lam2) * (rho / s) - 0.5 * (lam2 - g0) / np.sqrt(lam2) * n * s / np.sqrt(s2)
    return {"zt": zt, "za": za, "nobs": n}


def kpss(y, trend, l):
    T = len(y)
    cols = [np.ones(T)]
    if trend == "linear":
        cols.append(np.arange(1, T + 1, dtype=float))
    X = np.column_stack(cols)
    coef, *_ = np.linalg.lstsq(X, y, rcond=None)
    e = y - X @ coef
    S = np.cumsum(e)
    return {"eta": float(S @ S) / (T * T * bartlett_lrv(e, l))}


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    data = sys.argv[1] if len(sys.argv) > 1 else os.path.join(here, "..", "..", "..", "testdata")
    series = {
        "sp500": load(os.path.join(data, "sp500.csv"), "price"),
        "nonfarm": load(os.path.join(data, "us-employment.csv"), "nonfarm"),
    }
    out = []
    for name, raw in series.items():
        for transform in ("level", "log"):
            y = raw if transform == "level" else np.log(raw)
            for trend in ("none", "constant", "linear"):
                for k in (0, 1, 2, 4, 8):
                    r = adf(y, trend, k)
                    out.append(dict(test="adf", series=name, transform=transform, trend=trend, lags=k, **r))
                for l in (0, 2, 4):
                    r = pp(y, trend, l)
                    out.append(dict(test="pp", series=name, transform=transform, trend=trend, bandwidth=l, **r))
            for trend in ("constant", "linear"):
                for l in range(0, 9):
                    r = kpss(y, trend, l)
                    out.append(dict(test="kpss", series=name, transform=transform, trend=trend, bandwidth=l, **r))
    for r in out:
        for key, v in list(r.items()):
            if isinstance(v, (np.floating, float)):
                r[key] = float(v)
            elif isinstance(v, np.integer):
                r[key] = int(v)
    json.dump({"generator": "core/testdata/ref/dfref.py", "numpy": np.__version__, "results": out}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
