"""Wall time of the whole `stressraiser check` process on a bundled example, and of each stage.

Prints figures only; asserts nothing about time. Usage:
    python benchmarks/check_stages.py [examples/winch_strap.toml] [--repeat 5]
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent


def whole_process(part: Path, repeat: int) -> tuple[list[float], dict]:
    """Time the console command end to end (interpreter start, imports, meshing, solving, output)."""
    times, record = [], {}
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "r.json"
        for _ in range(repeat):
            start = time.perf_counter()
            subprocess.run([sys.executable, "-m", "stressraiser", "check", str(part), "--json", str(out), "--quiet"],
                           check=True, capture_output=True)
            times.append(time.perf_counter() - start)
        record = json.loads(out.read_text())
    return times, record


def stages(part: Path) -> list[dict]:
    """Per-level stage times measured in-process."""
    from stressraiser.compare.check import check_part
    from stressraiser.geometry.partfile import load_part

    result = check_part(load_part(part))
    return [dict(nodes=lv.nodes, elements=lv.elements, dofs=2 * lv.nodes, peak=lv.peak, **lv.seconds)
            for lv in result.study.levels]


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("part", nargs="?", default=str(HERE.parent / "examples" / "winch_strap.toml"))
    parser.add_argument("--repeat", type=int, default=5)
    args = parser.parse_args()
    part = Path(args.part)
    print(f"machine: {platform.machine()} {os.cpu_count()} cores, Python {platform.python_version()}")
    times, record = whole_process(part, args.repeat)
    print(f"part: {part.name}")
    print(f"whole check process: median {statistics.median(times):.2f} s, min {min(times):.2f} s over {len(times)} runs")
    rows = stages(part)
    print(f"{'level':>5} {'DOFs':>8} {'elements':>9} {'mesh s':>7} {'assemble s':>10} {'solve s':>8} {'recover s':>9} {'peak MPa':>9}")
    for i, r in enumerate(rows, 1):
        print(f"{i:>5} {r['dofs']:>8} {r['elements']:>9} {r['mesh']:>7.3f} {r['assemble']:>10.3f} {r['solve']:>8.3f} "
              f"{r['recover']:>9.3f} {r['peak']:>9.2f}")
    totals = {k: sum(r[k] for r in rows) for k in ("mesh", "assemble", "solve", "recover")}
    print("stage totals: " + ", ".join(f"{k} {v:.3f} s" for k, v in totals.items()))
    kt = record["kt"]
    print(f"Kt net {kt['net']:.4f} ± {kt['error']:.2%} (converged: {kt['converged']}), levels {len(rows)}")
    if record["handbook"]:
        hb = record["handbook"]
        print(f"handbook {hb['case']}: Kt net {hb['kt_net']:.4f}; FE differs by {kt['net'] / hb['kt_net'] - 1:+.3%}")


if __name__ == "__main__":
    main()
