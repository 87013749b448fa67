"""Accuracy per second: Kt error against the published value versus DOFs and wall time, for our meshes
graded at the raiser and for uniform meshes, with linear (order 1) and quadratic (order 2) triangles.

Part: the bundled winch strap (central hole, d/W = 0.275, axial load). Published value: the curve fit of
Pilkey & Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chart 4.1 (docs/references.md):
Ktn = 2 + 0.284 (1 - x) - 0.600 (1 - x)^2 + 1.32 (1 - x)^3, x = d/W. Kt of one mesh is its peak (largest
maximum principal stress, no extrapolation) over the net-section average. The time of one mesh is meshing
plus solve_part (assemble, solve, recover), best of n. Then the whole converged check (Richardson over
levels) is timed for each order. Asserts nothing. Usage:

    python benchmarks/accuracy_per_second.py [--repeat 2] [--target 0.005]
"""

from __future__ import annotations

import argparse
import dataclasses
import sys

from measure import best_of, machine
from meshes import example_spec

GRADED_SCALES = (2.0, 1.41, 1.0, 0.71, 0.5, 0.35, 0.25, 0.18)
UNIFORM_SIZES = {1: (4.0, 2.8, 2.0, 1.4, 1.0, 0.7, 0.5),  # element size (mm) by order
                 2: (8.0, 5.6, 4.0, 2.8, 2.0, 1.4, 1.0)}


def peterson_net(x: float) -> float:
    """Ktn of a central hole in a finite-width strip (Pilkey & Pilkey 2008, chart 4.1 fit)."""
    y = 1.0 - x
    return 2.0 + 0.284 * y - 0.600 * y * y + 1.32 * y ** 3


def with_order(spec, order: int):
    return dataclasses.replace(spec, mesh=dataclasses.replace(spec.mesh, order=order))


def uniform_sizing(spec, h: float):
    """A Sizing that meshes the whole part with elements of size h (no layered band, no grading)."""
    from stressraiser.geometry.meshing import Sizing

    r = spec.holes[0].radius
    return Sizing(edge_fraction=h / r, ligament_share=1e9, growth=0.0, far_fraction=h / spec.plate.width, layers=0)


def one_mesh(spec, scale: float, sizing, repeat: int) -> tuple[int, float, float, float]:
    """(DOFs, wall s, cpu s, Kt net) of one mesh: meshing plus one solve."""
    from stressraiser.fem.analysis import solve_part
    from stressraiser.geometry.meshing import mesh_part

    def run():
        mesh = mesh_part(spec, scale, sizing) if sizing is not None else mesh_part(spec, scale)
        return mesh, solve_part(spec, mesh)

    wall, cpu, (mesh, solution) = best_of(run, repeat)
    net = spec.load.axial / ((spec.plate.width - spec.holes[0].diameter) * spec.plate.thickness)
    return 2 * mesh.n_nodes, wall, cpu, solution.peak_stress() / net


def family(name: str, spec, runs, repeat: int, reference: float, target: float) -> None:
    print(f"\n{name}")
    print(f"{'parameter':>9} {'DOFs':>8} {'wall s':>7} {'cpu s':>7} {'Kt net':>8} {'error':>8}")
    rows = []
    for label, scale, sizing in runs:
        dofs, wall, cpu, kt = one_mesh(spec, scale, sizing, repeat)
        rows.append((dofs, wall, kt / reference - 1.0))
        print(f"{label:>9} {dofs:>8} {wall:>7.3f} {cpu:>7.3f} {kt:>8.4f} {kt / reference - 1.0:>+8.3%}", flush=True)
    # the first mesh from which every finer one stays within the target
    within = [i for i in range(len(rows)) if all(abs(e) < target for _, _, e in rows[i:])]
    if within:
        dofs, wall, err = rows[within[0]]
        print(f"  -> within {target:.1%} from {dofs} DOFs, {wall:.3f} s ({err:+.3%})")
    else:
        print(f"  -> never within {target:.1%} on these meshes")


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--repeat", type=int, default=2)
    parser.add_argument("--target", type=float, default=0.005)
    parser.add_argument("--skip-uniform", action="store_true")
    args = parser.parse_args()
    from stressraiser.compare.check import check_part
    from stressraiser.geometry.quadratic import QUADRATIC_SIZE

    spec = example_spec()
    x = spec.holes[0].diameter / spec.plate.width
    reference = peterson_net(x)
    print(f"machine: {machine()}")
    print(f"part: bundled winch strap, d/W = {x:.3f}; Peterson chart 4.1 fit Ktn = {reference:.4f}")
    for order in (1, 2):
        s = with_order(spec, order)
        family(f"graded mesh, order {order} (mesh scale)", s, [(f"{g:g}", g, None) for g in GRADED_SCALES],
               args.repeat, reference, args.target)
    if not args.skip_uniform:
        for order in (1, 2):
            s = with_order(spec, order)
            scale = 1.0 if order == 1 else 1.0 / QUADRATIC_SIZE  # sizes below are literal element sizes
            family(f"uniform mesh, order {order} (element size mm)", s,
                   [(f"{h:g}", scale, uniform_sizing(spec, h)) for h in UNIFORM_SIZES[order]], args.repeat, reference, args.target)
    print("\nconverged check (levels refined by sqrt 2, Richardson extrapolation), in-process:")
    print(f"{'order':>5} {'levels':>6} {'finest DOFs':>11} {'wall s':>7} {'Kt net':>8} {'band':>7} {'error':>8}")
    for order in (1, 2):
        s = with_order(spec, order)
        wall, _, result = best_of(lambda: check_part(s), args.repeat)
        lv = result.study.levels
        print(f"{order:>5} {len(lv):>6} {2 * lv[-1].nodes:>11} {wall:>7.3f} {result.kt.net:>8.4f} "
              f"{result.kt.error:>7.2%} {result.kt.net / reference - 1.0:>+8.3%}", flush=True)


if __name__ == "__main__":
    sys.exit(main())
