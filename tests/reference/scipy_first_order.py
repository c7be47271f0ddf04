"""Reference peer for the engine's differential test: scipy.optimize.curve_fit (trf, analytic Jacobian, tight
tolerances) on first-order traces read as JSON from stdin. Runs on Debian's python3-scipy."""
import json
import sys

import numpy as np
from scipy.optimize import curve_fit


def model(t, a0, ainf, k):
    return ainf + (a0 - ainf) * np.exp(-k * t)


def jac(t, a0, ainf, k):
    e = np.exp(-k * t)
    return np.column_stack([e, 1 - e, -(a0 - ainf) * t * e])


out = []
for trace in json.load(sys.stdin):
    t = np.asarray(trace["t"], dtype=float)
    y = np.asarray(trace["y"], dtype=float)
    popt, pcov = curve_fit(model, t, y, p0=trace["p0"], jac=jac, method="trf", ftol=1e-15, xtol=1e-15, gtol=1e-15, max_nfev=20000)
    out.append({"params": popt.tolist(), "se": np.sqrt(np.diag(pcov)).tolist()})
json.dump({"scipy": __import__("scipy").__version__, "fits": out}, sys.stdout)
