"""Global stiffness assembly: ours (node-block CST assembly, fem/assembly.py) against scikit-fem's vector P1
linear-elasticity form on the same meshes (the bundled strap at about 50k, 200k and 800k DOFs).

Prints, per mesh: best-of-n wall and CPU time of each, their ratio, the peak memory each needs (own process
per measurement), and the largest entry difference of the two matrices relative to the largest entry (the
same matrix to round-off). scikit-fem's time includes building its mesh and basis, which it needs for the
matrix; its `asm` call alone is shown too. Asserts nothing. Usage:

    python benchmarks/assembly.py [--sizes 50000 200000 800000] [--repeat 3]
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

import numpy as np

from measure import best_of, child_report, in_child, machine, rss_mb

SCRIPT = Path(__file__).resolve()
E, NU, THICKNESS = 210000.0, 0.3, 10.0


def _ours(nodes, tris):
    from stressraiser.fem.assembly import stiffness_matrix
    from stressraiser.fem.elasticity import plane_stress_matrix

    return stiffness_matrix(nodes, tris, plane_stress_matrix(E, NU), THICKNESS)


def _theirs(nodes, tris, split=False):
    import skfem
    from skfem.models.elasticity import lame_parameters, linear_elasticity

    basis = skfem.Basis(skfem.MeshTri(nodes.T.copy(), tris.T.copy()), skfem.ElementVector(skfem.ElementTriP1()))
    lam, mu = lame_parameters(E, NU)
    form = linear_elasticity(2 * lam * mu / (lam + 2 * mu), mu)  # plane-stress lambda
    if split:
        return basis, form
    return THICKNESS * skfem.asm(form, basis)


def child(kind: str, size: int, repeat: int) -> None:
    from meshes import strap_mesh

    mesh = strap_mesh(size)
    base = rss_mb()
    if kind == "ours":
        wall, cpu, _ = best_of(lambda: _ours(mesh.nodes, mesh.triangles), repeat)
    elif kind == "skfem":
        wall, cpu, _ = best_of(lambda: _theirs(mesh.nodes, mesh.triangles), repeat)
    else:  # skfem-asm: the asm call alone, basis built beforehand
        import skfem

        basis, form = _theirs(mesh.nodes, mesh.triangles, split=True)
        base = rss_mb()
        wall, cpu, _ = best_of(lambda: skfem.asm(form, basis), repeat)
    child_report(wall, cpu, base, dofs=2 * mesh.n_nodes)


def difference(size: int) -> float:
    """Largest |K_ours - K_skfem| entry over the largest |K| entry, scikit-fem's DOFs reordered to ours."""
    from meshes import strap_mesh

    mesh = strap_mesh(size)
    ours = _ours(mesh.nodes, mesh.triangles)
    basis, _ = _theirs(mesh.nodes, mesh.triangles, split=True)
    theirs = _theirs(mesh.nodes, mesh.triangles)
    order = np.empty(theirs.shape[0], dtype=np.int64)
    order[0::2], order[1::2] = basis.nodal_dofs[0], basis.nodal_dofs[1]
    return float(abs(ours - theirs[order][:, order]).max() / abs(ours).max())


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--sizes", type=int, nargs="+", default=[50_000, 200_000, 800_000])
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--child", nargs=3, metavar=("KIND", "SIZE", "REPEAT"))
    args = parser.parse_args()
    if args.child:
        child(args.child[0], int(args.child[1]), int(args.child[2]))
        return
    print(f"machine: {machine()}")
    print(f"{'DOFs':>8} {'ours s':>8} {'(cpu)':>7} {'skfem s':>8} {'(cpu)':>7} {'asm s':>7} {'ratio':>6} "
          f"{'ours MB':>8} {'skfem MB':>8} {'max diff':>9}")
    for size in args.sizes:
        from meshes import strap_mesh

        strap_mesh(size)  # mesh once, cached, before any timing
        r = {k: in_child(SCRIPT, k, str(size), str(args.repeat)) for k in ("ours", "skfem", "skfem-asm")}
        if any("error" in v for v in r.values()):
            print(f"{size:>8} failed: {[v.get('error') for v in r.values()]}")
            continue
        diff = difference(size)
        o, s, a = r["ours"], r["skfem"], r["skfem-asm"]
        print(f"{o['dofs']:>8} {o['wall']:>8.3f} {o['cpu']:>7.3f} {s['wall']:>8.3f} {s['cpu']:>7.3f} {a['wall']:>7.3f} "
              f"{s['wall'] / o['wall']:>5.1f}x {o['peak_mb']:>8.0f} {s['peak_mb']:>8.0f} {diff:>9.1e}", flush=True)
    print("ratio = scikit-fem (mesh + basis + asm) wall time / ours; memory = growth of peak RSS in a fresh process")


if __name__ == "__main__":
    sys.exit(main())
