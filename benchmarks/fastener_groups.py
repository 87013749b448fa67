"""Fastener-group contact (fem/fastener_groups.py) on a twelve-bolt plate, level by level.

The plate: a 420 x 160 x 12 mm steel splice plate of a hoist spreader (an invented part), held by six fitted
16 mm bolts at its left end (neat fit) and loaded through six 16 mm bolts in 16.3 mm holes at its right end
(0.3 mm clearance) by 150 kN along it, 20 kN across and 1.5 kN m: contact at all twelve holes. Each mesh
level (element sizes shrinking by sqrt(2), as fem.convergence does) runs in its own process and reports:
nodes and DOFs, the active-set passes from the holes' loaded halves (cold) and from the previous level's
contact arcs (warm, as the convergence loop would start it), the contact solve's wall time in all and per
pass, one plain linear solve of the same plate (held at its left end, pulled at its right: a factorisation
of the same size) as the reference in the same run, peak memory, and the most loaded fastener's share and
the group statics. Asserts nothing. Usage:

    python benchmarks/fastener_groups.py [--levels 5] [--repeat 2]
"""

from __future__ import annotations

import argparse
import json
import math
import sys
import time
from pathlib import Path

import numpy as np

from measure import best_of, child_report, in_child, machine, rss_mb

SCRIPT = Path(__file__).resolve()
HOLD = [(x, y) for x in (-170.0, -130.0) for y in (-50.0, 0.0, 50.0)]
PULL = [(x, y) for x in (130.0, 170.0) for y in (-50.0, 0.0, 50.0)]
LOAD = (150000.0, 20000.0, 1.5e6)  # N, N, N mm on the plate through the right-hand group


def part():
    from stressraiser.geometry.kinds.hole import Hole
    from stressraiser.geometry.spec import Load, Material, PartSpec, Plate

    holes = tuple(Hole(c, 16.0) for c in HOLD) + tuple(Hole(c, 16.3) for c in PULL)
    return PartSpec("spreader splice plate", Plate(420.0, 160.0, 12.0), Material(210000.0, 0.3), Load(), raisers=holes)


def groups(spec):
    from stressraiser.fem.fastener_groups import Fastener, FastenerGroup, group_holes

    return [FastenerGroup("left bolts", group_holes(spec.holes, range(1, 7)), Fastener(16.0, shear_planes=2)),
            FastenerGroup("right bolts", group_holes(spec.holes, range(7, 13)), Fastener(16.0, 0.3, shear_planes=2),
                          LOAD)]


def child(scale: float, repeat: int, start: str) -> None:
    from stressraiser.fem.assembly import stiffness_matrix
    from stressraiser.fem.elasticity import constitutive_matrix
    from stressraiser.fem.fastener_groups import solve_fastener_groups
    from stressraiser.fem.loads import edge_forces, uniform_end_traction
    from stressraiser.fem.solve import solve_system
    from stressraiser.fem.supports import held_end_dofs
    from stressraiser.geometry.meshing import mesh_part

    spec = part()
    clock = time.perf_counter()
    mesh = mesh_part(spec, scale)
    meshed = time.perf_counter() - clock
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, spec.plate.thickness)
    f = np.zeros(2 * mesh.n_nodes)
    none = np.zeros(0, dtype=np.int64)
    arcs = json.loads(start) if start != "none" else None
    baseline = rss_mb()

    def contact(warm):
        return solve_fastener_groups(K, f, none, mesh, groups(spec), spec.plate.thickness,
                                     start=[[tuple(a) for a in arc] for arc in arcs] if warm else None)

    cold_wall, cold_cpu, cold = best_of(lambda: contact(False), repeat)
    warm_wall, _, warm = best_of(lambda: contact(True), repeat) if arcs else (math.nan, math.nan, None)
    end = mesh.edges["loaded"]
    pull = edge_forces(mesh.nodes, end, uniform_end_traction(mesh.nodes, end, LOAD[0], spec.plate.thickness),
                       spec.plate.thickness)
    plain_wall, _, _ = best_of(lambda: solve_system(K, pull, held_end_dofs(mesh), "auto", mesh.nodes), repeat)
    loaded = cold.groups[1]
    statics = max(float(np.linalg.norm(loaded.force - LOAD[:2]) / math.hypot(*LOAD[:2])),
                  abs(loaded.moment - LOAD[2]) / (math.hypot(*LOAD[:2]) * 50.0 + abs(LOAD[2])))
    shares = [r.share for r in cold.fasteners]
    child_report(cold_wall, cold_cpu, baseline, nodes=mesh.n_nodes, dofs=2 * mesh.n_nodes, mesh_s=meshed,
                 passes=cold.passes, warm_passes=warm.passes if warm else None, warm_wall=warm_wall,
                 plain_wall=plain_wall, method=cold.report.method, statics=statics,
                 top_share=max(shares[6:]), top_hold=max(shares[:6]),
                 arcs=[list(r.arcs) for r in cold.fasteners])


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--levels", type=int, default=5)
    parser.add_argument("--repeat", type=int, default=2)
    parser.add_argument("--child", nargs=3)
    args = parser.parse_args()
    if args.child:
        scale, repeat, start = args.child
        child(float(scale), int(repeat), start)
        return
    print(machine())
    print("twelve-bolt splice plate: six fitted bolts hold it, six with 0.3 mm clearance load it (contact at 12 holes)")
    print(f"{'scale':>6} {'nodes':>7} {'DOFs':>8} {'passes':>6} {'warm':>5} {'contact s':>9} {'per pass s':>10} "
          f"{'warm s':>7} {'plain s':>8} {'pass/plain':>10} {'peak MB':>8} {'top share':>9} {'change':>7} "
          f"{'statics':>8}")
    start, previous = "none", None
    for level in range(args.levels):
        scale = 1.0 / math.sqrt(2.0) ** level
        out = in_child(SCRIPT, f"{scale!r}", str(args.repeat), start)
        if "error" in out:
            print(f"{scale:6.3f} failed: {out['error']}")
            break
        change = (out["top_share"] / previous - 1.0) if previous else math.nan
        per_pass = out["wall"] / out["passes"]
        print(f"{scale:6.3f} {out['nodes']:7d} {out['dofs']:8d} {out['passes']:6d} {out['warm_passes'] or '-':>5} "
              f"{out['wall']:9.3f} {per_pass:10.3f} {out['warm_wall']:7.3f} {out['plain_wall']:8.3f} "
              f"{per_pass / out['plain_wall']:10.2f} {out['peak_mb']:8.0f} {out['top_share']:9.4f} "
              f"{change:+7.2%} {out['statics']:8.1e}")
        start, previous = json.dumps(out["arcs"]), out["top_share"]
    sys.stdout.flush()


if __name__ == "__main__":
    main()
