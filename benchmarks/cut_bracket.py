"""How long a bracket from a cut file takes to check: about fifty outline pieces and twenty holes, every
raiser converged to a 1 % band.

    python benchmarks/cut_bracket.py [--tolerance 0.01] [--order 1] [--refine-all]

The invented bracket: a 400 x 100 mm, 8 mm plate with rounded outer corners, ten U-shaped recesses in its
top edge (each a concave half circle of 8 mm radius: corners 1..10) and two rows of ten 10 mm holes. It is
written as a DXF (LINE, ARC and CIRCLE entities, millimetres), read through [outline] file, fixed along
its left edge and loaded by a downward force spread over its right edge (a cantilever). Prints the
pieces, raisers and levels, the total wall time of the check and its split: meshing (each level's gmsh
run, in its child process) against the solve (assembly, factorisation and solve, stress recovery), with
the time left to everything else (cuts, statics, the edge-normal sections). `--refine-all` refines every
raiser on every level (fem.convergence.settles off), for comparison. The target is 10 s on two cores;
record the figures in benchmarks/README.md.
"""

from __future__ import annotations

import argparse
import resource
import tempfile
import time
from collections import Counter
from pathlib import Path

import ezdxf

from stressraiser.compare.check import check_part
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import outline_raisers

LENGTH, HEIGHT, THICKNESS, CORNER = 400.0, 100.0, 8.0, 10.0
RECESSES = tuple(30.0 + 34.0 * k for k in range(10))  # left side of each U recess in the top edge (mm)
RECESS_WIDTH, RECESS_DEPTH = 16.0, 20.0
HOLE_ROWS, HOLE_COLUMNS, HOLE_DIAMETER = (25.0, 55.0), tuple(20.0 + 40.0 * k for k in range(10)), 10.0


def write_bracket(path: Path) -> int:
    """Write the bracket's DXF; return its number of outline pieces."""
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.MM
    msp = doc.modelspace()
    r, n = CORNER, 0

    def line(a, b) -> None:
        nonlocal n
        msp.add_line(a, b)
        n += 1

    def arc(c, radius, start, end) -> None:
        nonlocal n
        msp.add_arc(c, radius, start, end)
        n += 1

    arc((r, r), r, 180, 270)
    line((r, 0), (LENGTH - r, 0))
    arc((LENGTH - r, r), r, 270, 360)
    line((LENGTH, r), (LENGTH, HEIGHT - r))
    arc((LENGTH - r, HEIGHT - r), r, 0, 90)
    x = LENGTH - r
    for left in reversed(RECESSES):  # the top edge from right to left, a U recess at each
        right = left + RECESS_WIDTH
        line((x, HEIGHT), (right, HEIGHT))
        line((right, HEIGHT), (right, HEIGHT - RECESS_DEPTH + 0.5 * RECESS_WIDTH))
        arc((left + 0.5 * RECESS_WIDTH, HEIGHT - RECESS_DEPTH + 0.5 * RECESS_WIDTH), 0.5 * RECESS_WIDTH, 180, 360)
        line((left, HEIGHT - RECESS_DEPTH + 0.5 * RECESS_WIDTH), (left, HEIGHT))
        x = left
    line((x, HEIGHT), (r, HEIGHT))
    arc((r, HEIGHT - r), r, 90, 180)
    line((0, HEIGHT - r), (0, r))
    for y in HOLE_ROWS:
        for xc in HOLE_COLUMNS:
            msp.add_circle((xc, y), 0.5 * HOLE_DIAMETER)
    doc.saveas(path)
    return n


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--tolerance", type=float, default=0.01)
    parser.add_argument("--order", type=int, default=1)
    parser.add_argument("--refine-all", action="store_true", help="refine every raiser on every level")
    args = parser.parse_args()
    if args.refine_all:
        from stressraiser.fem import convergence

        convergence.settles = lambda spec: False
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "bracket.dxf"
        pieces = write_bracket(path)
        started = time.perf_counter()
        spec = part_from_dict({
            "title": "benchmark bracket", "plate": {"thickness": THICKNESS}, "outline": {"file": str(path)},
            "material": {"grade": "s355"}, "hold": [{"at": [0.0, 50.0]}],
            "load": {"edge": [{"at": [LENGTH, 50.0], "force": 6000.0, "direction": -90.0}]},
            "mesh": {"tolerance": args.tolerance, "order": args.order}})
        read = time.perf_counter() - started
        result = check_part(spec)
        total = time.perf_counter() - started
    seconds: Counter[str] = Counter()
    for level in result.study.levels:
        seconds.update(level.seconds)
    meshing = seconds.pop("mesh", 0.0)
    solving = sum(seconds.values())
    print(f"bracket: {pieces} outline pieces, {len(spec.holes)} holes, {len(outline_raisers(spec))} corners; "
          f"tolerance {args.tolerance:.1%}, order {args.order}")
    settled = len(result.study.levels[-1].settled)
    print(f"levels: {len(result.study.levels)}, elements {[lv.elements for lv in result.study.levels]}, "
          f"{settled} raisers settled by the last level, "
          f"converged {result.kt.converged} (band {result.study.estimate.error:.2%}), governing {result.study.governing}")
    print(f"Kt(net) {result.kt.net:.3f}, peak {result.peak.stress:.1f} MPa")
    print(f"time: {total:.1f} s in all; reading the part {read:.2f} s, meshing {meshing:.1f} s, "
          f"solving {solving:.1f} s ({', '.join(f'{k} {v:.1f}' for k, v in seconds.most_common())}), "
          f"the rest {total - read - meshing - solving:.1f} s")
    own, children = (resource.getrusage(who).ru_maxrss / 1024.0 for who in (resource.RUSAGE_SELF, resource.RUSAGE_CHILDREN))
    print(f"peak memory: {own:.0f} MB this process, {children:.0f} MB the largest child (the mesher)")


if __name__ == "__main__":
    main()
