#!/usr/bin/env python3
# bench-first-frame.py — benchmark (not a test): time from the start of the
# `quaver --demo` process to its first drawn frame of the 3D view, as the
# app itself reports it (QV_REPORT_FIRST_FRAME=quit: the time since the
# process started, from /proc, printed at the first GLArea render, then the
# app quits). Runs it N times; prints every figure, the best and the median.
# Target from the issue: <= 1 s. Exits 0 whenever it could run.
# SPDX-License-Identifier: GPL-3.0-or-later
import os, re, statistics, subprocess, sys

quaver, runs = sys.argv[1], int(sys.argv[2]) if len(sys.argv) > 2 else 5
env = dict(os.environ, QV_REPORT_FIRST_FRAME='quit')
times = []
for i in range(runs):
    p = subprocess.run([quaver, '--demo'], env=env, capture_output=True, text=True, timeout=120)
    m = re.search(r'first frame ([0-9.]+) s', p.stderr)
    if not m:
        print(f'run {i + 1}: no first-frame report (exit {p.returncode})\n{p.stderr}')
        continue
    times.append(float(m.group(1)))
    print(f'run {i + 1}: first frame {times[-1]:.3f} s after process start')
if times:
    print(f'first frame: best {min(times):.3f} s, median {statistics.median(times):.3f} s '
          f'over {len(times)} runs (target <= 1 s)')
