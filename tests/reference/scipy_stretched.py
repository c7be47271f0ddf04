"""Reference peer: scipy.optimize.curve_fit (trf, analytic Jacobian with its t = 0 limits, tight tolerances) of a
stretched exponential y = a*exp(-(k*t)**beta) + c on traces read as JSON from stdin. Debian's python3-scipy."""
import json
import sys

import numpy as np
from scipy.optimize import curve_fit


def model(t, a, beta, c, k):
    return a * np.exp(-((k * t) ** beta)) + c


def jac(t, a, beta, c, k):
    kt = k * t
    p = kt ** beta
    e = np.exp(-p)
    logkt = np.where(kt > 0, np.log(np.where(kt > 0, kt, 1.0)), 0.0)
    return np.column_stack([e, -a * e * p * logkt, np.ones_like(t), np.where(t > 0, -a * e * beta * p / k, 0.0)])


out = []
for trace in json.load(sys.stdin):
    t = np.asarray(trace["t"], dtype=float)
    y = np.asarray(trace["y"], dtype=float)
    popt, pcov = curve_fit(model, t, y, p0=trace["p0"], jac=jac, method="trf", ftol=1e-15, xtol=1e-15, gtol=1e-15, max_nfev=20000)
    out.append({"params": popt.tolist(), "se": np.sqrt(np.diag(pcov)).tolist()})
json.dump({"scipy": __import__("scipy").__version__, "fits": out}, sys.stdout)
