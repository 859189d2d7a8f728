"""Speed of `rootshift test --json --tests za --shift level+slope --lags 4`
against a hand-written per-candidate NumPy least-squares loop, measured in
the same run (issue "The CLI as fast as its engine").

The input is 40 random walks of length 1,000 (NumPy default_rng, seed
20261303, values written with six decimals). The command is run --runs
times on the whole file (process start, reading, the search, the JSON
output); its time per series is the fastest run's wall time over 40, and
its CPU time per series the mean over the runs. The NumPy loop estimates, for
every candidate break TB in the command's range, the regression of Zivot &
Andrews (1992), eq. (3) (model C), written in differences,

    dy_t = c + b t + theta DU_t + gamma DT_t + (alpha-1) y_{t-1}
           + sum_{j=1..4} c_j dy_{t-j} + e_t,   t = 6..T,

with numpy.linalg.lstsq on the explicit design matrix and the standard
error of alpha-1 from inv(X'X), and keeps the smallest t-ratio. It runs on
the first --numpy series; its statistics and break dates must equal the
command's (relative 1e-9, same date), so both compute the same thing.

Usage: python3 scripts/bench-za.py --bin ./rootshift [--runs 10] [--numpy 4]
(scripts/bench-za.sh builds the command and finds a python3 with NumPy).
"""
import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time

import numpy as np

SERIES, LENGTH, SEED, LAGS = 40, 1000, 20261303, 4


def write_input(path):
    rng = np.random.default_rng(SEED)
    x = np.cumsum(rng.standard_normal((LENGTH, SERIES)), axis=0)
    with open(path, "w") as f:
        f.write(",".join("s%02d" % i for i in range(SERIES)) + "\n")
        for row in x:
            f.write(",".join("%.6f" % v for v in row) + "\n")


def za_numpy(y, k=LAGS, trim=0.15):
    T = len(y)
    t = np.arange(1, T + 1, dtype=float)
    dy = np.diff(y, prepend=np.nan)  # dy[i] = y_{i+1} - y_i in 1-based t = i+1
    rows = np.arange(k + 1, T)  # t = k+2..T as 0-based indices
    tt, dep = t[rows], dy[rows]
    ylag = y[rows - 1]
    lags = [dy[rows - j] for j in range(1, k + 1)]
    lo = max(int(np.ceil(trim * T - 1e-9)), 2, k + 2)
    hi = min(int(np.floor((1 - trim) * T + 1e-9)), T - 2)
    best = (np.inf, -1)
    for tb in range(lo, hi + 1):
        du = (tt > tb).astype(float)
        X = np.column_stack([np.ones_like(tt), tt, du, (tt - tb) * du, ylag] + lags)
        coef, ssr, _, _ = np.linalg.lstsq(X, dep, rcond=None)
        s2 = ssr[0] / (X.shape[0] - X.shape[1])
        tstat = coef[4] / np.sqrt(s2 * np.linalg.inv(X.T @ X)[4, 4])
        if tstat < best[0]:
            best = (tstat, tb)
    return best


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--bin", required=True)
    ap.add_argument("--runs", type=int, default=10)
    ap.add_argument("--numpy", type=int, default=4)
    a = ap.parse_args()
    tmp = tempfile.mkdtemp()
    data = os.path.join(tmp, "rw40.csv")
    write_input(data)
    cmd = [a.bin, "test", "--json", "--tests", "za", "--shift", "level+slope", "--lags", str(LAGS), data]
    walls, out = [], None
    ru0 = resource.getrusage(resource.RUSAGE_CHILDREN)
    for _ in range(a.runs):
        t0 = time.perf_counter()
        out = subprocess.run(cmd, check=True, capture_output=True).stdout
        walls.append(time.perf_counter() - t0)
    ru1 = resource.getrusage(resource.RUSAGE_CHILDREN)
    cli_cpu = (ru1.ru_utime + ru1.ru_stime - ru0.ru_utime - ru0.ru_stime) / a.runs / SERIES
    cli_wall = min(walls) / SERIES
    doc = json.loads(out)
    got = [(s["results"][0]["statistic"], s["results"][0]["breaks"][0]["index"]) for s in doc["series"]]

    y = np.loadtxt(data, delimiter=",", skiprows=1)
    c0, t0 = time.process_time(), time.perf_counter()
    ref = [za_numpy(y[:, j]) for j in range(a.numpy)]
    np_wall = (time.perf_counter() - t0) / a.numpy
    np_cpu = (time.process_time() - c0) / a.numpy
    bad = 0
    for j, (stat, tb) in enumerate(ref):
        if tb != got[j][1] or abs(stat - got[j][0]) > 1e-9 * abs(stat):
            print("series %d: NumPy %.15g at TB=%d, rootshift %.15g at TB=%d" % (j, stat, tb, got[j][0], got[j][1]))
            bad += 1
    print("input: %d random walks of length %d (seed %d), %d cores; NumPy %s" % (SERIES, LENGTH, SEED, os.cpu_count(), np.__version__))
    print("rootshift: %.3f ms per series wall (fastest of %d runs), %.3f ms CPU" % (cli_wall * 1e3, a.runs, cli_cpu * 1e3))
    print("NumPy per-candidate lstsq loop: %.1f ms per series wall, %.1f ms CPU (%d series)" % (np_wall * 1e3, np_cpu * 1e3, a.numpy))
    print("ratio: %.0fx (wall), %.0fx (CPU); statistics and dates %s" % (np_wall / cli_wall, np_cpu / cli_cpu,
          "agree" if bad == 0 else "DIFFER in %d series" % bad))
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
