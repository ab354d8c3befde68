"""Side-by-side reference for the log-reduction benchmark (documented helper,
not part of the tool or its tests).

    go test ./methods/height -run XXX -bench ReduceLog -benchtime 5x   # writes the log, prints MB/s
    /usr/bin/python3 testdata/bench/pandas_read_csv.py /tmp/liftfuse-bench-1khz-30min.csv

The log is the benchmark's own 1 kHz, 30-minute, 8-column file; the script
prints the best of three pandas.read_csv throughputs (Debian's python3-pandas).
"""
import sys, time, os
import pandas as pd
name = sys.argv[1]
size = os.path.getsize(name)
best = 1e9
for _ in range(3):
    t = time.perf_counter()
    df = pd.read_csv(name)
    dt = time.perf_counter() - t
    best = min(best, dt)
print(f"pandas {pd.__version__} read_csv: {best:.3f} s, {size/best/1e6:.1f} MB/s ({len(df)} rows)")
