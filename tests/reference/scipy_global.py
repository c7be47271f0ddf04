"""Reference peer for the global fit: scipy.optimize.least_squares (MINPACK Levenberg-Marquardt, method="lm", analytic
Jacobian, tolerances 1e-15) on the same concatenated first-order problem, read as JSON from stdin; standard errors from
s^2 (J^T J)^-1 with s^2 = SSR/dof. Runs on Debian's python3-scipy.

Input: {"form": "arrhenius" | "shared" | "excess", "tref": K (arrhenius), "shared": [names] (shared form),
        "runs": [{"t": [...], "y": [...], "T": K, "B": mol/L (excess)}], "x0": [...]}
Parameter order: the shared ones first (arrhenius: ea, kref; excess: k2), then each run's own (a0, ainf[, k]) in run
order. The excess form is pseudo-first order: k_obs = k2 * [B]0."""
import json
import sys

import numpy as np
from scipy.optimize import least_squares

R = 6.02214076e23 * 1.380649e-23  # J/(mol K), exact since SI 2019
P = ["a0", "ainf", "k"]

def solve(spec, method="lm"):
    """The fit; returns the result dict printed by the script."""
    runs = [(np.asarray(r["t"], float), np.asarray(r["y"], float), r.get("T") if spec["form"] != "excess" else r["B"]) for r in spec["runs"]]
    derived = spec["form"] in ("arrhenius", "excess")
    shared = ["ea", "kref"] if spec["form"] == "arrhenius" else ["k2"] if spec["form"] == "excess" else spec["shared"]
    own = ["a0", "ainf"] if derived else [p for p in P if p not in shared]
    S, O = len(shared), len(own)
    N = sum(len(t) for t, _, _ in runs)
    tref = spec.get("tref")


    def unpack(x, i):
        v = {name: x[S + i * O + j] for j, name in enumerate(own)}
        d = None
        if spec["form"] == "arrhenius":
            u = 1 / runs[i][2] - 1 / tref
            e = np.exp(-x[0] / R * u)
            v["k"] = x[1] * e
            d = (-v["k"] * u / R, e)
        elif spec["form"] == "excess":
            v["k"] = x[0] * runs[i][2]
            d = (runs[i][2],)
        else:
            for j, name in enumerate(shared):
                v[name] = x[j]
        return v, d


    def residuals(x):
        out = []
        for i, (t, y, _) in enumerate(runs):
            v, _ = unpack(x, i)
            out.append(v["ainf"] + (v["a0"] - v["ainf"]) * np.exp(-v["k"] * t) - y)
        return np.concatenate(out)


    def jac(x):
        J = np.zeros((N, len(x)))
        o = 0
        for i, (t, y, _) in enumerate(runs):
            v, d = unpack(x, i)
            e = np.exp(-v["k"] * t)
            cols = {"a0": e, "ainf": 1 - e, "k": -(v["a0"] - v["ainf"]) * t * e}
            rows = slice(o, o + len(t))
            for name, g in cols.items():
                if derived and name == "k":
                    for c, dc in enumerate(d):
                        J[rows, c] = g * dc
                elif name in shared:
                    J[rows, shared.index(name)] += g
                else:
                    J[rows, S + i * O + own.index(name)] = g
            o += len(t)
        return J


    res = least_squares(residuals, np.asarray(spec["x0"], float), jac=jac, method=method, xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=100000)
    J = jac(res.x)
    ssr = float(np.sum(res.fun ** 2))
    dof = N - len(res.x)
    cov = ssr / dof * np.linalg.inv(J.T @ J)
    return {"scipy": __import__("scipy").__version__, "x": res.x.tolist(), "se": np.sqrt(np.diag(cov)).tolist(), "ssr": ssr, "dof": dof, "status": int(res.status)}


if __name__ == "__main__":
    json.dump(solve(json.load(sys.stdin)), sys.stdout)
