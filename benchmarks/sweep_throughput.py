"""Cases per second of a sweep on the local pool, with 2 worker processes and with 1.

A 40-case sweep of the central-hole plate (hole diameter 10 ... 60 mm in a 100 mm plate) runs through the
`stressraiser sweep` command, whole (pool start, checks, log, tables, plot), once per worker count. Prints
the figures and the ratio; asserts nothing about time. Also reports whether both runs gave identical
numbers (each case is independent of the order and the worker it ran on).

Usage:
    python benchmarks/sweep_throughput.py [--cases 40] [--tolerance 0.01] [--workers 2 1]
"""

from __future__ import annotations

import argparse
import contextlib
import json
import os
import platform
import tempfile
import time
from pathlib import Path

PLATE = """title = "throughput plate"
[plate]
length = 600.0
width = 100.0
thickness = 10.0
[[hole]]
center = [0.0, 0.0]
diameter = 20.0
[material]
E = 210000.0
nu = 0.3
[load]
axial = 100000.0
[mesh]
tolerance = {tolerance}
"""


def run_sweep(part: Path, out: Path, cases: int, workers: int) -> tuple[float, list[dict]]:
    from stressraiser.cli.main import main

    start = time.perf_counter()
    with open(os.devnull, "w") as quiet, contextlib.redirect_stdout(quiet), contextlib.redirect_stderr(quiet):
        code = main(["sweep", str(part), "--vary", f"hole.1.diameter=10:60:{cases}", "--out", str(out),
                     "--workers", str(workers)])
    seconds = time.perf_counter() - start
    if code != 0:
        raise SystemExit(f"the sweep with {workers} worker(s) ended with exit code {code}")
    return seconds, json.loads((out / "sweep.json").read_text())["rows"]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--cases", type=int, default=40)
    parser.add_argument("--tolerance", type=float, default=0.01, help="mesh.tolerance of every case")
    parser.add_argument("--workers", type=int, nargs="+", default=[2, 1])
    args = parser.parse_args()

    print(f"python {platform.python_version()}, {os.cpu_count()} cores, load average "
          f"{', '.join(f'{x:.2f}' for x in os.getloadavg())} (other work on the machine slows both runs)")
    print(f"sweep: {args.cases} cases, central hole d/W 0.10 ... 0.60, mesh.tolerance {args.tolerance}")
    results = {}
    with tempfile.TemporaryDirectory() as tmp:
        part = Path(tmp) / "plate.toml"
        part.write_text(PLATE.format(tolerance=args.tolerance))
        for workers in args.workers:
            seconds, rows = run_sweep(part, Path(tmp) / f"w{workers}", args.cases, workers)
            busy = sum(r["seconds"] for r in rows)
            results[workers] = (seconds, rows)
            worst = max(abs(r["handbook_difference"]) for r in rows)
            print(f"{workers} worker(s): {seconds:7.2f} s wall, {args.cases / seconds:6.2f} cases/s; "
                  f"time inside the checks {busy:.2f} s ({busy / args.cases:.2f} s per case); "
                  f"largest |FE / Peterson chart 4.1 - 1| {worst:.2%}")
    if len(results) >= 2:
        (w1, (s1, r1)), (w2, (s2, r2)) = sorted(results.items())[:2]
        print(f"speed-up of {w2} workers over {w1}: {s1 / s2:.2f}x")
        same = all({k: v for k, v in a.items() if k != "seconds"} == {k: v for k, v in b.items() if k != "seconds"}
                   for a, b in zip(r1, r2))
        print(f"identical numbers with {w1} and {w2} workers: {'yes' if same else 'NO'}")


if __name__ == "__main__":
    main()
