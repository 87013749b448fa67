"""Shared measuring helpers for the benchmark scripts: best-of-n timing and peak memory in a fresh process.

Timing: the machine is shared (2 cores, other jobs running), so every figure is the minimum over repeats,
with the process CPU time beside the wall time (CPU time is less disturbed by other jobs, though not
immune: they share caches and memory bandwidth). Ratios are always taken between measurements of the same
run. Memory: each measurement runs in its own Python process; its figure is the process's peak resident
set (getrusage ru_maxrss) less its resident set after loading its inputs, which counts the
memory of compiled libraries (SuperLU, CHOLMOD) that tracemalloc cannot see.
"""

from __future__ import annotations

import json
import os
import platform
import resource
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

HERE = Path(__file__).resolve().parent


def machine() -> str:
    """One line naming the machine and the library versions that matter for the figures."""
    import numpy
    import scipy

    cpu = "unknown CPU"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    return (f"{cpu}, {os.cpu_count()} cores, {platform.system()} {platform.machine()}, Python "
            f"{platform.python_version()}, numpy {numpy.__version__}, scipy {scipy.__version__}; "
            f"load average {load:.1f} at start")


def best_of(fn: Callable[[], object], repeat: int) -> tuple[float, float, object]:
    """(minimum wall s, minimum CPU s, last result) over `repeat` calls."""
    wall, cpu, out = float("inf"), float("inf"), None
    for _ in range(repeat):
        w, c = time.perf_counter(), time.process_time()
        out = fn()
        wall, cpu = min(wall, time.perf_counter() - w), min(cpu, time.process_time() - c)
    return wall, cpu, out


def peak_rss_mb() -> float:
    """Peak resident set of this process so far (MB)."""
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def rss_mb() -> float:
    """Current resident set of this process (MB), the baseline a measurement's peak is taken above."""
    try:
        for line in Path("/proc/self/status").read_text().splitlines():
            if line.startswith("VmRSS:"):
                return float(line.split()[1]) / 1024.0
    except OSError:
        pass
    return peak_rss_mb()


def in_child(script: Path, *args: str, timeout: float = 1800.0) -> dict:
    """Run `python script --child args...` in a fresh process and return the JSON it prints last."""
    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join(filter(None, [str(HERE), env.get("PYTHONPATH", "")]))
    done = subprocess.run([sys.executable, str(script), "--child", *args], capture_output=True, text=True,
                          timeout=timeout, env=env)
    if done.returncode != 0:
        return {"error": (done.stderr.strip().splitlines() or ["failed"])[-1]}
    return json.loads(done.stdout.strip().splitlines()[-1])


def child_report(wall: float, cpu: float, baseline_mb: float, **extra) -> None:
    """Print one child measurement as JSON (the parent reads the last line)."""
    print(json.dumps({"wall": wall, "cpu": cpu, "peak_mb": peak_rss_mb() - baseline_mb, **extra}))
