"""Run one command and print its wall time (process start included) and peak resident memory.

Usage: python3 scripts/bench/measure.py CMD [ARGS...]
Prints one JSON object: wallMs, maxRssBytes, status, stdoutBytes, stdout (first 200 kB).
The clock starts just before the child is created and stops when it has exited; the peak memory
is the child's own (getrusage of waited-for children, Linux reports kilobytes).
"""
import json
import resource
import subprocess
import sys
import time

t0 = time.perf_counter()
r = subprocess.run(sys.argv[1:], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
wall = (time.perf_counter() - t0) * 1000
rss = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss * 1024
out = r.stdout.decode("utf-8", "replace")
print(json.dumps({"wallMs": wall, "maxRssBytes": rss, "status": r.returncode,
                  "stdoutBytes": len(r.stdout), "stdout": out[:200000],
                  "stderr": r.stderr.decode("utf-8", "replace")[:2000]}))
