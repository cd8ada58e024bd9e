"""Timing helpers and the description of the machine a run came from."""

from __future__ import annotations

import os
import platform
import statistics
import time


def _timings(fn, repeat):
    """Wall times of ``repeat`` calls of ``fn()`` after one warm-up call [s]."""
    fn()
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return times


def median_seconds(fn, repeat=7):
    """Median wall time of ``fn()`` over ``repeat`` calls, after one warm-up call [s]."""
    return statistics.median(_timings(fn, repeat))


def best_seconds(fn, repeat=7):
    """Least wall time of ``repeat`` calls after a warm-up [s] (the floor of a shared machine's noise)."""
    return min(_timings(fn, repeat))


def median_ratio(numerator, denominator, repeat=15):
    """Median over interleaved rounds of time(numerator)/time(denominator) [1].

    Interleaving keeps slow phases of a shared machine from landing on one
    side only.  Also returns the two median times [s].
    """
    numerator()
    denominator()
    ratios, tops, bottoms = [], [], []
    for _ in range(repeat):
        start = time.perf_counter()
        numerator()
        middle = time.perf_counter()
        denominator()
        end = time.perf_counter()
        tops.append(middle - start)
        bottoms.append(end - middle)
        ratios.append((middle - start) / (end - middle))
    return statistics.median(ratios), statistics.median(tops), statistics.median(bottoms)


def _cpu_model():
    try:
        with open("/proc/cpuinfo", encoding="utf-8") as handle:
            for line in handle:
                if line.startswith("model name"):
                    return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return platform.processor() or "unknown"


def machine():
    """CPU, cores, OS and library versions of this run."""
    import numpy
    import scipy
    return {
        "cpu": _cpu_model(), "cores": os.cpu_count(),
        "usable_cores": len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count(),
        "system": f"{platform.system()} {platform.release()}", "python": platform.python_version(),
        "numpy": numpy.__version__, "scipy": scipy.__version__,
        "date_utc": time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime()),
    }
