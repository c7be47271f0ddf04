"""Benchmark peer: pandas.read_csv of the same file (Debian's python3-pandas). Prints JSON with seconds and peak RSS."""
import json
import resource
import sys
import time

import pandas as pd

t0 = time.perf_counter()
df = pd.read_csv(sys.argv[1])
seconds = time.perf_counter() - t0
print(json.dumps({"seconds": seconds, "rows": len(df), "max_rss_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
