"""Reference peer: internally studentized residuals of a first-order fit, r_i = e_i / (s * sqrt(1 - h_ii)) with
h = diag(J (J^T J)^-1 J^T) at scipy.optimize.curve_fit's solution (trf, analytic Jacobian); and externally studentized
residuals of a straight line (each point against the line through the others). Debian's python3-scipy and numpy."""
import json
import sys

import numpy as np
from scipy.optimize import curve_fit

req = json.load(sys.stdin)
t = np.asarray(req["t"], dtype=float)
y = np.asarray(req["y"], dtype=float)


def model(t, a0, ainf, k):
    return ainf + (a0 - ainf) * np.exp(-k * t)


def jac(t, a0, ainf, k):
    e = np.exp(-k * t)
    return np.column_stack([e, 1 - e, -(a0 - ainf) * t * e])


popt, _ = curve_fit(model, t, y, p0=req["p0"], jac=jac, method="trf", ftol=1e-15, xtol=1e-15, gtol=1e-15)
J = jac(t, *popt)
e = y - model(t, *popt)
s = np.sqrt(e @ e / (len(t) - 3))
h = np.einsum("ij,jk,ik->i", J, np.linalg.inv(J.T @ J), J)
internal = (e / (s * np.sqrt(1 - h))).tolist()

x = np.asarray(req["x"], dtype=float)
v = np.asarray(req["v"], dtype=float)
external = []
for i in range(len(x)):
    keep = np.arange(len(x)) != i
    X = np.column_stack([np.ones(keep.sum()), x[keep]])
    beta, res, *_ = np.linalg.lstsq(X, v[keep], rcond=None)
    r = v[keep] - X @ beta
    s2 = r @ r / (keep.sum() - 2)
    xi = np.array([1.0, x[i]])
    var_mean = s2 * xi @ np.linalg.inv(X.T @ X) @ xi
    external.append(float((v[i] - xi @ beta) / np.sqrt(s2 + var_mean)))
json.dump({"numpy": np.__version__, "scipy": __import__("scipy").__version__, "internal": internal, "external": external}, sys.stdout)
