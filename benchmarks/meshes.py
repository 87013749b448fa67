"""Benchmark meshes: the bundled winch strap meshed near-uniformly fine at a requested DOF count.

The meshes come from the project's own mesher (graded bands at the hole, the far-field size shrunk with
the raiser size so the DOF count grows as 1/scale^2) and are cached as .npz files in the system temporary
folder, because meshing 800k DOFs takes most of a minute and every benchmark reuses them.
"""

from __future__ import annotations

import math
import tempfile
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
EXAMPLE = HERE.parent / "examples" / "winch_strap.toml"
CACHE = Path(tempfile.gettempdir()) / "stressraiser-bench"
DOFS_AT_UNIT = 900.0  # DOFs of the strap at scale 1 with a scaled far field: DOFs ~ DOFS_AT_UNIT / scale^2


def example_spec():
    from stressraiser.geometry.partfile import load_part

    return load_part(EXAMPLE)


def strap_mesh(target_dofs: int):
    """A Mesh of the bundled example with about `target_dofs` degrees of freedom (cached)."""
    from stressraiser.geometry.mesh import Mesh
    from stressraiser.geometry.meshing import Sizing, mesh_part

    scale = math.sqrt(DOFS_AT_UNIT / target_dofs)
    CACHE.mkdir(parents=True, exist_ok=True)
    path = CACHE / f"strap-{target_dofs}.npz"
    if path.exists():
        data = np.load(path)
        edges = {k[5:]: data[k] for k in data.files if k.startswith("edge:")}
        return Mesh(data["nodes"], data["triangles"], edges, ())
    spec = example_spec()
    mesh = mesh_part(spec, scale, Sizing(far_fraction=0.15 * scale))
    if abs(2 * mesh.n_nodes / target_dofs - 1.0) > 0.08:  # the raiser-size floor bends the 1/scale^2 law
        scale *= math.sqrt(2 * mesh.n_nodes / target_dofs)
        mesh = mesh_part(spec, scale, Sizing(far_fraction=0.15 * scale))
    np.savez(path, nodes=mesh.nodes, triangles=mesh.triangles, **{f"edge:{k}": v for k, v in mesh.edges.items()})
    return mesh
