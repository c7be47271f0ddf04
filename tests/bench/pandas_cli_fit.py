"""Benchmark peer for `cli fit`: pandas.read_csv of the same CSV, then curve_fit (trf, analytic Jacobian).
Usage: python3 pandas_cli_fit.py FILE"""
import json
import sys
import time

t0 = time.perf_counter()
import numpy as np  # noqa: E402
import pandas as pd  # noqa: E402
from scipy.optimize import curve_fit  # noqa: E402


def model(t, a0, ainf, k):
    return ainf + (a0 - ainf) * np.exp(-k * t)


def jac(t, a0, ainf, k):
    e = np.exp(-k * t)
    return np.column_stack([e, 1 - e, -(a0 - ainf) * t * e])


df = pd.read_csv(sys.argv[1])
t = df.iloc[:, 0].to_numpy(dtype=float)
y = df.iloc[:, 1].to_numpy(dtype=float)
popt, pcov = curve_fit(model, t, y, p0=[y[0], y[-1], 1.0 / (t[-1] - t[0])], jac=jac, method="trf")
print(json.dumps({"k": float(popt[2]), "se": float(np.sqrt(pcov[2, 2])), "seconds": time.perf_counter() - t0}))
