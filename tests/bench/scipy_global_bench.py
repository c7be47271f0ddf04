"""Benchmark peer for the global fit: scipy.optimize.least_squares on the same concatenated problem (the reference
script's model and analytic Jacobian), method "lm" (MINPACK) and "trf". Reads {"spec": ..., "repeats": n} on stdin,
prints {"lm": median_seconds, "trf": median_seconds, "ea": ...}. Debian's python3-scipy."""
import json
import os
import statistics
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "reference"))
from scipy_global import solve  # noqa: E402

job = json.load(sys.stdin)
out = {}
for method in ("lm", "trf"):
    times = []
    for _ in range(job["repeats"]):
        t0 = time.perf_counter()
        r = solve(job["spec"], method)
        times.append(time.perf_counter() - t0)
    out[method] = statistics.median(times)
    out[method + "_ea"] = r["x"][0]
json.dump(out, sys.stdout)
