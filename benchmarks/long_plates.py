"""Long plates: what the far-zone grading (geometry/far_field.py) costs in accuracy, and what it saves.

1. Accuracy. A strap 60 widths long (W = 20 mm, t = 2 mm) with a hole (d = 4 mm, centre W/4 off the axis,
   on the side a positive moment stretches) half way along, under an
   axial force, an end moment and an end shear, checked with the far zones meshed at the part's ordinary
   far-field size ("none": no far zone) and with several gradings (reach in widths, growth per unit
   length, largest size in widths). Reference: the same part without far zones. By Saint-Venant's
   principle (docs/references.md [Practice]) and because every load case is statically determinate, the
   hole's Kt must not move beyond its band.
2. Cost. The same hole in straps 6 to 10,000 widths long under the shipped grading, and a plain
   10,000 x 1 mm strap: finest-level elements, levels, whole-check time, Kt (the short strap's is the
   reference for the long ones).
3. Slenderness under bending. The same hole in straps 60 to 10,000 widths long under an end shear (a
   cantilever): the largest round-off amplification ||K|| ||u|| / ||f|| of any level's solve (fem/solve.py
   refuses a solve above AMPLIFICATION_LIMIT and the study keeps the levels before it), the levels kept,
   Kt against the 60-width strap, and why the study stopped.

Asserts nothing. Usage:

    python benchmarks/long_plates.py [--accuracy] [--cost] [--slender]
"""

from __future__ import annotations

import argparse
import time
from contextlib import contextmanager

from measure import machine

W, T, D, Y = 20.0, 2.0, 4.0, 5.0  # strap width and thickness, hole diameter and its offset from the axis (mm)


def strap(length_widths: float, load: dict, hole: bool = True, width: float = W, thickness: float = T):
    from stressraiser.geometry.partfile import part_from_dict

    data = {
        "plate": {"length": length_widths * width, "width": width, "thickness": thickness},
        "material": {"E": 210000.0, "nu": 0.3},
        "load": load,
        "mesh": {"tolerance": 0.01},
    }
    if hole:
        data["hole"] = [{"center": [0.0, Y], "diameter": D}]
    return part_from_dict(data)


LOADS = {
    "axial": {"axial": 10000.0},
    "bending": {"bending": 2.0e5},
    "end shear": {"shear": 200.0},
}


@contextmanager
def grading(far):
    """Run checks with the far zones graded by `far` (a FarGrading), for this benchmark only."""
    import stressraiser.fem.convergence as convergence
    from stressraiser.geometry.meshing import Sizing

    original = convergence.mesh_part
    convergence.mesh_part = lambda spec, scale: original(spec, scale, Sizing(far_grading=far))
    try:
        yield
    finally:
        convergence.mesh_part = original


def timed_check(spec):
    from stressraiser.compare.check import check_part

    clock = time.perf_counter()
    result = check_part(spec)
    return result, time.perf_counter() - clock


def accuracy() -> None:
    from stressraiser.geometry.far_field import FarGrading

    variants = {
        "none": FarGrading(reach=1e9),
        "shipped (2, 0.3, 1)": FarGrading(),
        "reach 1 (1, 0.3, 1)": FarGrading(reach=1.0),
        "faster (2, 0.6, 1)": FarGrading(growth=0.6),
        "larger (2, 0.3, 2)": FarGrading(largest=2.0),
    }
    print("\n1. Kt of a hole d = 0.2 W, W/4 off the axis, half way along a strap 60 widths long, by far-zone grading")
    print(f"{'load':10s} {'grading':22s} {'Kt net':>8s} {'band':>7s} {'vs none':>8s} {'in band':>7s} "
          f"{'elements':>9s} {'equil.':>8s} {'seconds':>8s}")
    for load_name, load in LOADS.items():
        spec = strap(60.0, load)
        reference = None
        for name, far in variants.items():
            with grading(far):
                result, seconds = timed_check(spec)
            kt, band = result.kt.net, result.kt.error
            if reference is None:
                reference = (kt, band)
            change = kt / reference[0] - 1.0
            inside = abs(change) <= max(band, reference[1])
            print(f"{load_name:10s} {name:22s} {kt:8.4f} {band:7.2%} {change:+8.3%} {str(inside):>7s} "
                  f"{result.study.levels[-1].elements:9d} {result.net_section.equilibrium_error:+8.3%} "
                  f"{seconds:8.2f}", flush=True)


def cost() -> None:
    print("\n2. Whole check, shipped grading: the same hole in straps of growing length, "
          "axial load")
    print(f"{'length':>16s} {'levels':>6s} {'elements':>9s} {'Kt net':>8s} {'band':>7s} {'vs 6 W':>8s} "
          f"{'seconds':>8s}")
    reference = None
    for widths in (6.0, 60.0, 600.0, 1000.0, 10000.0):
        result, seconds = timed_check(strap(widths, LOADS["axial"]))
        kt = result.kt.net
        reference = kt if reference is None else reference
        print(f"{widths:9.0f} widths {len(result.study.levels):6d} {result.study.levels[-1].elements:9d} "
              f"{kt:8.4f} {result.kt.error:7.2%} {kt / reference - 1.0:+8.3%} {seconds:8.2f}", flush=True)
    spec = strap(10000.0, {"axial": 100.0}, hole=False, width=1.0, thickness=1.0)
    result, seconds = timed_check(spec)
    print(f"plain 10000 x 1 mm strap: {len(result.study.levels)} levels, {result.study.levels[-1].elements} "
          f"elements, peak {result.peak.stress:.2f} MPa (P/A = 100.00 MPa), {seconds:.2f} s", flush=True)


@contextmanager
def amplifications(found: list[float]):
    """Record the round-off amplification of every solve, for this benchmark only."""
    import stressraiser.fem.solve as solve

    original = solve.solve_errors

    def recorded(*args):
        backward, amplification = original(*args)
        found.append(amplification)
        return backward, amplification

    solve.solve_errors = recorded
    try:
        yield
    finally:
        solve.solve_errors = original


def slender() -> None:
    from stressraiser.fem.solve import SolverError

    print("\n3. The same hole in straps of growing length under an end shear (a cantilever)")
    print(f"{'length':>14s} {'largest amplification':>21s} {'levels':>6s} {'Kt net':>8s} {'band':>7s} "
          f"{'vs 60 W':>8s}  stop")
    reference = None
    for widths in (60.0, 600.0, 1000.0, 2000.0, 4000.0, 10000.0):
        found: list[float] = []
        with amplifications(found):
            try:
                result, _ = timed_check(strap(widths, LOADS["end shear"]))
            except SolverError as exc:
                print(f"{widths:7.0f} widths {max(found, default=0.0):21.2e}  refused: {str(exc)[:60]}...")
                continue
        kt = result.kt.net
        reference = kt if reference is None else reference
        print(f"{widths:7.0f} widths {max(found):21.2e} {len(result.study.levels):6d} {kt:8.4f} "
              f"{result.kt.error:7.2%} {kt / reference - 1.0:+8.3%}  {result.study.stop_reason[:60]}", flush=True)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--accuracy", action="store_true", help="only the accuracy table")
    parser.add_argument("--cost", action="store_true", help="only the cost table")
    parser.add_argument("--slender", action="store_true", help="only the slenderness table")
    args = parser.parse_args()
    print(machine())
    tables = {"accuracy": accuracy, "cost": cost, "slender": slender}
    for name, table in tables.items():
        if getattr(args, name) or not any(getattr(args, n) for n in tables):
            table()


if __name__ == "__main__":
    main()
