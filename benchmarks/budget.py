"""How close the budget estimates in fem/budget.py are: element count before meshing, and peak memory.

    python benchmarks/budget.py            # element counts: bundled examples and synthetic plates
    python benchmarks/budget.py --memory   # also one large solve per size, each in its own process

Prints, for each part and level, the estimated and the actual triangle count and their ratio, and with
--memory the estimated and the measured peak resident memory of one level (mesh, assemble, solve,
recover) in a fresh process.
"""

from __future__ import annotations

import argparse
import resource
import subprocess
import sys
import time
from pathlib import Path

from stressraiser.fem.analysis import solve_part
from stressraiser.fem.budget import estimate_elements, solve_bytes
from stressraiser.fem.solve import choose_method
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import load_part, part_from_dict

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"


def plate(length: float, width: float, holes: list[tuple[float, float, float]]):
    return part_from_dict({
        "plate": {"length": length, "width": width, "thickness": 5.0},
        "hole": [{"center": [x, y], "diameter": d} for x, y, d in holes],
        "material": {"E": 200000.0, "nu": 0.3},
        "load": {"axial": 10000.0},
        "mesh": {"max_elements": 20_000_000},
    })


def synthetic():
    yield "plain 300 x 80", plate(300.0, 80.0, [])
    yield "long 32000 x 80", plate(32000.0, 80.0, [(0.0, 0.0, 20.0)])
    yield "small hole d/W 0.005", plate(300.0, 80.0, [(0.0, 0.0, 0.4)])
    yield "big hole d/W 0.8", plate(300.0, 80.0, [(0.0, 0.0, 64.0)])
    grid = [(-180.0 + 40.0 * i, -80.0 + 40.0 * j, 10.0) for i in range(10) for j in range(5)]
    yield "50 holes", plate(400.0, 200.0, grid)


def elements() -> None:
    print(f"{'part':32s} {'scale':>6s} {'estimate':>10s} {'actual':>10s} {'ratio':>6s}")
    parts = [(p.stem, load_part(p)) for p in sorted(EXAMPLES.glob("*.toml"))] + list(synthetic())
    for name, spec in parts:
        for scale in (1.0, 0.5):
            est = estimate_elements(spec, scale)
            actual = mesh_part(spec, scale).n_elements
            print(f"{name:32s} {scale:6.2f} {est:10.0f} {actual:10d} {actual / est:6.2f}", flush=True)


def memory_child(scale: float) -> None:
    spec = plate(300.0, 80.0, [(0.0, 0.0, 22.0)])
    clock = time.perf_counter()
    mesh = mesh_part(spec, scale)
    solve_part(spec, mesh)
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024.0
    dofs = 2 * mesh.n_nodes
    method = choose_method("auto", dofs)
    est = solve_bytes(dofs, method)
    print(f"{mesh.n_elements:10d} elements, {method}: estimate {est / 1e9:6.2f} GB, measured peak {peak / 1e9:6.2f} GB, "
          f"ratio {peak / est:5.2f} ({time.perf_counter() - clock:.0f} s)", flush=True)


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--memory", action="store_true")
    parser.add_argument("--child", type=float)
    args = parser.parse_args()
    if args.child:
        memory_child(args.child)
        return
    elements()
    if args.memory:
        for scale in (0.2, 0.1, 0.05, 0.035):
            subprocess.run([sys.executable, __file__, "--child", str(scale)], check=True)


if __name__ == "__main__":
    main()
