"""Benchmark peer for `cli ingest`, whole process: pandas.read_csv of the file (Debian's python3-pandas), its SHA-256,
the raw bytes and each column as one float64 BLOB written to SQLite in one transaction.
Usage: python3 pandas_sqlite_ingest.py FILE DBFILE"""
import hashlib
import json
import sqlite3
import sys
import time

t0 = time.perf_counter()
import pandas as pd  # noqa: E402

path, db_file = sys.argv[1], sys.argv[2]
raw = open(path, "rb").read()
sha = hashlib.sha256(raw).hexdigest()
df = pd.read_csv(path)
con = sqlite3.connect(db_file)
con.execute("PRAGMA journal_mode = WAL")
con.execute("CREATE TABLE IF NOT EXISTS raw_files (id INTEGER PRIMARY KEY, sha256 TEXT, bytes BLOB)")
con.execute("CREATE TABLE IF NOT EXISTS series (id INTEGER PRIMARY KEY, name TEXT, t BLOB, y BLOB)")
with con:
    con.execute("INSERT INTO raw_files (sha256, bytes) VALUES (?, ?)", (sha, raw))
    t = df.iloc[:, 0].to_numpy(dtype="<f8")
    for name in df.columns[1:]:
        con.execute("INSERT INTO series (name, t, y) VALUES (?, ?, ?)", (name, t.tobytes(), df[name].to_numpy(dtype="<f8").tobytes()))
con.close()
print(json.dumps({"seconds": time.perf_counter() - t0, "rows": len(df)}))
