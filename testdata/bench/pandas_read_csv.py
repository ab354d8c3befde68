"""Side-by-side reference for the log-reduction benchmark (documented helper,
not part of the tool or its tests).

    go test ./methods/logs -run XXX -bench ReadLog -benchtime 1x      # writes the log
    go test ./methods/height -run XXX -bench ReduceLog -benchtime 5x   # the reduction in process, MB/s
    /usr/bin/python3 testdata/bench/pandas_read_csv.py /tmp/liftfuse-bench-1khz-30min.csv
    /usr/bin/python3 testdata/bench/pandas_read_csv.py --once /tmp/liftfuse-bench-1khz-30min.csv

The log is the benchmark's own 1 kHz, 30-minute, 8-column file. The script
prints the best of three pandas.read_csv throughputs (Debian's
python3-pandas); with --once it reads the file once, so that a whole
process (start-up and import included) can be timed side by side with
'liftfuse reduce' on testdata/bench/campaign-1khz.yaml (/usr/bin/time -v).
"""
import sys, time, os
import pandas as pd
args = sys.argv[1:]
once = "--once" in args
name = [a for a in args if a != "--once"][0]
size = os.path.getsize(name)
best = 1e9
for _ in range(1 if once else 3):
    t = time.perf_counter()
    df = pd.read_csv(name)
    dt = time.perf_counter() - t
    best = min(best, dt)
print(f"pandas {pd.__version__} read_csv: {best:.3f} s, {size/best/1e6:.1f} MB/s ({len(df)} rows)")
