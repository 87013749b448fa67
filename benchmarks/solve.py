"""Linear solve: the strategies we ship (fem/solve.py) against scipy's default sparse direct solve
(`spsolve`, SuperLU with its default COLAMD column ordering) on the same systems: the bundled strap
meshed at about 50k, 200k and 800k DOFs, loaded and held as the part file says.

Strategies: "superlu" (SuperLU, symmetric mode, minimum degree on A^T + A: our direct solve below 120k
DOFs and without the optional extra), "pardiso" (oneMKL PARDISO Cholesky, METIS, 2 x 2 block grouping: the
`fast` extra, what "auto" uses above 120k DOFs when installed), "amg-cg" (smoothed-aggregation multigrid CG
to a 1e-10 relative residual: "auto" above 120k DOFs without the extra), "spsolve" (scipy's default). Each runs in its own
process: best-of-n wall and CPU time, peak memory, relative residual, and the largest displacement
difference from the first strategy that ran. Asserts nothing. Usage:

    python benchmarks/solve.py [--sizes 50000 200000 800000] [--methods superlu pardiso amg-cg spsolve]
                               [--repeat 2] [--spsolve-max 250000]
"""

from __future__ import annotations

import argparse
import sys
import tempfile
from pathlib import Path

import numpy as np

from measure import best_of, child_report, in_child, machine, rss_mb

SCRIPT = Path(__file__).resolve()
RESULTS = Path(tempfile.gettempdir()) / "stressraiser-bench"


def system(size: int):
    """(K, f, fixed, nodes) of the bundled strap meshed at about `size` DOFs."""
    from meshes import example_spec, strap_mesh

    from stressraiser.fem.assembly import stiffness_matrix
    from stressraiser.fem.elasticity import constitutive_matrix
    from stressraiser.fem.loads import part_loads
    from stressraiser.fem.supports import part_supports

    spec = example_spec()
    mesh = strap_mesh(size)
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, spec.plate.thickness)
    return K, part_loads(spec, mesh), part_supports(spec, mesh), mesh.nodes


def child(method: str, size: int, repeat: int) -> None:
    import scipy.sparse.linalg as spla

    from stressraiser.fem import solve as solve_module

    K, f, fixed, nodes = system(size)
    free = np.ones(K.shape[0], dtype=bool)
    free[fixed] = False
    if method == "spsolve":
        Kff, ff = K[free][:, free].tocsc(), f[free]
        base = rss_mb()

        def run():
            u = np.zeros(K.shape[0])
            u[free] = spla.spsolve(Kff, ff)
            return u, 0
    else:
        if method == "superlu":
            solve_module.pardiso_available = lambda: False
            solver = "direct"
        elif method == "pardiso":
            if not solve_module.pardiso_available():
                print('{"error": "pypardiso is not installed"}')
                return
            solve_module.LARGE_FROM = 0  # PARDISO at every size measured here
            solver = "direct"
        else:
            solver = "iterative"
        base = rss_mb()

        def run():
            u, report = solve_module.solve_system(K, f, fixed, solver, nodes)
            return u, report.iterations

    wall, cpu, (u, iterations) = best_of(run, repeat)
    residual = float(np.linalg.norm((f - K @ u)[free]) / np.linalg.norm(f[free]))
    np.save(RESULTS / f"u-{method}-{size}.npy", u)
    child_report(wall, cpu, base, dofs=int(free.sum()), residual=residual, iterations=iterations)


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--sizes", type=int, nargs="+", default=[50_000, 200_000, 800_000])
    parser.add_argument("--methods", nargs="+", default=["superlu", "pardiso", "amg-cg", "spsolve"])
    parser.add_argument("--repeat", type=int, default=2)
    parser.add_argument("--spsolve-max", type=int, default=250_000,
                        help="largest size at which scipy's default solve is run (it is slow and memory-hungry)")
    parser.add_argument("--child", nargs=3, metavar=("METHOD", "SIZE", "REPEAT"))
    args = parser.parse_args()
    RESULTS.mkdir(parents=True, exist_ok=True)
    if args.child:
        child(args.child[0], int(args.child[1]), int(args.child[2]))
        return
    print(f"machine: {machine()}")
    print(f"{'DOFs':>8} {'method':>8} {'wall s':>8} {'cpu s':>7} {'peak MB':>8} {'iters':>5} {'residual':>9} "
          f"{'du/umax':>8} {'vs spsolve':>10}")
    for size in args.sizes:
        from meshes import strap_mesh

        strap_mesh(size)
        rows = {}
        for method in args.methods:
            if method == "spsolve" and size > args.spsolve_max:
                continue
            rows[method] = in_child(SCRIPT, method, str(size), str(args.repeat), timeout=3600)
        first = next((m for m, r in rows.items() if "error" not in r), None)
        ref = np.load(RESULTS / f"u-{first}-{size}.npy") if first else None
        base = rows.get("spsolve", {}).get("wall")
        for method, r in rows.items():
            if "error" in r:
                print(f"{size:>8} {method:>8} {r['error']}")
                continue
            u = np.load(RESULTS / f"u-{method}-{size}.npy")
            diff = np.abs(u - ref).max() / np.abs(ref).max()
            speed = f"{base / r['wall']:>9.1f}x" if base else f"{'-':>10}"
            print(f"{r['dofs']:>8} {method:>8} {r['wall']:>8.2f} {r['cpu']:>7.2f} {r['peak_mb']:>8.0f} "
                  f"{r['iterations']:>5} {r['residual']:>9.1e} {diff:>8.1e} {speed}", flush=True)
    print("du/umax: largest displacement difference from the first method listed, over the largest displacement")


if __name__ == "__main__":
    sys.exit(main())
