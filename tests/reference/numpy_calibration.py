# Reference for calibration lines: weighted least squares by numpy.linalg.lstsq on the sqrt(w)-scaled design, the
# covariance s^2 (X'WX)^-1 with s^2 = SSR_w / (n - p), and Mandel's quadratic-term F test with scipy.stats.f.
import json, sys
import numpy as np
from scipy import stats
import scipy

def line(x, y, w, origin):
    cols = [x] if origin else [np.ones_like(x), x]
    X = np.column_stack(cols) * np.sqrt(w)[:, None]
    b = y * np.sqrt(w)
    coef, *_ = np.linalg.lstsq(X, b, rcond=None)
    r = b - X @ coef
    ssr = float(r @ r)
    dof = len(x) - X.shape[1]
    cov = ssr / dof * np.linalg.inv(X.T @ X)
    return coef, cov, ssr, dof

out = []
for case in json.load(sys.stdin):
    x = np.array(case["x"], float); y = np.array(case["y"], float); w = np.array(case["w"], float)
    origin = case["origin"]
    coef, cov, ssr, dof = line(x, y, w, origin)
    slope = coef[0] if origin else coef[1]
    se_slope = np.sqrt(cov[0, 0] if origin else cov[1, 1])
    res = {"slope": float(slope), "se_slope": float(se_slope), "residual_sd": float(np.sqrt(ssr / dof)), "ssr": ssr}
    if not origin:
        res["intercept"] = float(coef[0]); res["se_intercept"] = float(np.sqrt(cov[0, 0]))
    cols = [x, x**2] if origin else [np.ones_like(x), x, x**2]
    Xq = np.column_stack(cols) * np.sqrt(w)[:, None]
    bq = y * np.sqrt(w)
    cq, *_ = np.linalg.lstsq(Xq, bq, rcond=None)
    rq = bq - Xq @ cq
    ssr_q = float(rq @ rq); dof_q = len(x) - Xq.shape[1]
    f = (ssr - ssr_q) / (dof - dof_q) / (ssr_q / dof_q)
    res["mandel_f"] = float(f); res["mandel_p"] = float(stats.f.sf(f, dof - dof_q, dof_q))
    out.append(res)
print(json.dumps({"scipy": scipy.__version__, "numpy": np.__version__, "cases": out}))
