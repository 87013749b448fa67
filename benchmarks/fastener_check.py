"""The whole check of a twelve-bolt plate through its part file ([[fasteners]]), to a 1 % band.

The plate (an invented part): the 420 x 160 x 12 mm steel splice plate of a hoist spreader, held by six
16 mm bolts at its left end (a holding group) and loaded through six 16 mm bolts at its right end by 150 kN
along it, 20 kN across and 1.5 kN m (a loading group): contact at all twelve holes, mesh.tolerance 0.01.
Each run is `stressraiser check PART --json` in a fresh process (the command's own mesh child included),
timed by wall clock, with its peak memory; it prints per mesh level the nodes, the contact passes and the
governing peak, then whether the study converged, its band and the wall time. Runs: the bolts neat in
their holes (clearance 0) and with 0.1 mm diametral clearance (16.1 mm holes). Asserts nothing; the
target (issue 16) is a 1 % band in under 20 s on two cores. Usage:

    python benchmarks/fastener_check.py [--clearances 0 0.1] [--levels 6] [--order 1]
"""

from __future__ import annotations

import argparse
import json
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from measure import machine

HOLD = [(x, y) for x in (-170.0, -130.0) for y in (-50.0, 0.0, 50.0)]
PULL = [(x, y) for x in (130.0, 170.0) for y in (-50.0, 0.0, 50.0)]


def part_text(clearance: float, levels: int, order: int = 1) -> str:
    holes = "".join(f"[[hole]]\ncenter = [{x}, {y}]\ndiameter = {16.0 + clearance}\n" for x, y in HOLD + PULL)
    return (f'title = "spreader splice plate, twelve bolts, clearance {clearance} mm"\n'
            "[plate]\nlength = 420.0\nwidth = 160.0\nthickness = 12.0\n" + holes +
            "[material]\nE = 210000.0\nnu = 0.3\n"
            '[[fasteners]]\nname = "left bolts"\nholes = [1, 2, 3, 4, 5, 6]\ndiameter = 16.0\nshear_planes = 2\n'
            "holds = true\n"
            '[[fasteners]]\nname = "right bolts"\nholes = [7, 8, 9, 10, 11, 12]\ndiameter = 16.0\nshear_planes = 2\n'
            '[load]\n[[load.fasteners]]\ngroup = "right bolts"\nforce = 151327.46\ndirection = [150000.0, 20000.0]\n'
            f"moment = 1.5e6\n[mesh]\ntolerance = 0.01\nmax_levels = {levels}\norder = {order}\n")


def run(clearance: float, levels: int, order: int = 1) -> dict:
    with tempfile.TemporaryDirectory() as tmp:
        part, out = Path(tmp) / "plate.toml", Path(tmp) / "check.json"
        part.write_text(part_text(clearance, levels, order))
        before = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
        clock = time.perf_counter()
        done = subprocess.run([sys.executable, "-m", "stressraiser", "check", str(part), "--json", str(out), "--quiet"],
                              capture_output=True, text=True)
        wall = time.perf_counter() - clock
        peak = max(resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss, before) / 1024.0
        if not out.exists():
            return {"clearance": clearance, "error": done.stderr.strip() or done.stdout.strip(), "wall_s": wall}
        record = json.loads(out.read_text())
    levels_out = [{"nodes": lv["nodes"], "passes": lv["contact_passes"], "peak": lv["peak"],
                   "seconds": None} for lv in record["mesh"]["levels"]]
    return {"clearance": clearance, "order": order, "wall_s": wall, "peak_rss_mb": peak, "converged": record["kt"]["converged"],
            "band": record["kt"]["error"], "peak": record["peak"]["stress"], "feature": record["peak"]["feature"],
            "stop": record["mesh"]["stop_reason"], "levels": levels_out, "exit": done.returncode,
            "passes": record["fasteners"]["contact_passes"]}


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--clearances", type=float, nargs="+", default=[0.0, 0.1])
    parser.add_argument("--levels", type=int, default=6)
    parser.add_argument("--order", type=int, default=1, help="mesh.order: 1 (linear triangles) or 2 (quadratic)")
    args = parser.parse_args()
    print(machine())
    for clearance in args.clearances:
        r = run(clearance, args.levels, args.order)
        if "error" in r:
            print(f"clearance {clearance} mm: failed after {r['wall_s']:.1f} s: {r['error']}")
            continue
        print(f"clearance {clearance} mm, order {args.order}: {'converged' if r['converged'] else 'NOT converged'}, band "
              f"{r['band']:.2%}, peak {r['peak']:.1f} MPa at {r['feature']}, {len(r['levels'])} levels, "
              f"{r['wall_s']:.1f} s wall, peak memory {r['peak_rss_mb']:.0f} MB; contact passes per level "
              f"{r['passes']}")
        for k, lv in enumerate(r["levels"], start=1):
            print(f"  level {k}: {lv['nodes']} nodes, {lv['passes']} passes, peak {lv['peak']:.2f} MPa")
        print(json.dumps(r))


if __name__ == "__main__":
    main()
