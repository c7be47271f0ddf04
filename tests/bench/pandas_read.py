"""Benchmark peer: pandas.read_csv of the same file (Debian's python3-pandas). Prints JSON with seconds, the RSS before
the read (pandas imported) and the peak RSS."""
import json
import resource
import sys
import time

import pandas as pd


def rss_mb():
    with open("/proc/self/statm") as f:
        return int(f.read().split()[1]) * resource.getpagesize() / 1048576


rss_before = rss_mb()
t0 = time.perf_counter()
df = pd.read_csv(sys.argv[1])
seconds = time.perf_counter() - t0
print(json.dumps({"seconds": seconds, "rows": len(df), "rss_before_mb": rss_before, "max_rss_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
