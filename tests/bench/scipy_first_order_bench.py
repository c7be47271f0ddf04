"""Benchmark peer: scipy.optimize.curve_fit (trf, analytic Jacobian) on first-order traces stored as float64 files.
Prints JSON {n: median_seconds}. Debian's python3-scipy."""
import json
import statistics
import sys
import time

import numpy as np
from scipy.optimize import curve_fit


def model(t, a0, ainf, k):
    return ainf + (a0 - ainf) * np.exp(-k * t)


def jac(t, a0, ainf, k):
    e = np.exp(-k * t)
    return np.column_stack([e, 1 - e, -(a0 - ainf) * t * e])


spec = json.load(sys.stdin)
out = {}
for case in spec["cases"]:
    t = np.fromfile(case["t"], dtype="<f8")
    y = np.fromfile(case["y"], dtype="<f8")
    times = []
    for _ in range(20 if case["n"] <= 10_000 else 1):  # warm-up, as the Node side does
        curve_fit(model, t, y, p0=case["p0"], jac=jac, method="trf")
    for _ in range(case["repeats"]):
        t0 = time.perf_counter()
        popt, pcov = curve_fit(model, t, y, p0=case["p0"], jac=jac, method="trf")
        times.append(time.perf_counter() - t0)
    out[str(case["n"])] = {"median_s": statistics.median(times), "k": float(popt[2])}
json.dump(out, sys.stdout)
