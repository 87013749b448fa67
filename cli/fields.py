"""The finest-mesh fields of a check as a VTU file (VTK unstructured grid) for any VTK-based viewer.

Point data (one value per node): "displacement" (mm, 3 components, z = 0), "stress_xx", "stress_yy",
"stress_xy" (recovered nodal stresses, MPa), "principal_max", "principal_min" (MPa, in-plane principal
stresses s1 >= s2), "von_mises" (MPa). Cell data (one value per triangle): "element_stress_xx",
"element_stress_yy", "element_stress_xy" (the constant stress of each triangle, MPa),
"element_principal_max" and "element_von_mises" (MPa; in plane strain von Mises includes
szz = nu (sxx + syy)). Points are (x, y, 0) in mm. Tension is positive.
"""

from __future__ import annotations

import tempfile
from pathlib import Path

import numpy as np

from ..fem.analysis import Solution
from ..fem.recovery import principal_stresses, von_mises
from ..geometry.spec import PartSpec
from .files import write_atomic

POINT_FIELDS = ("displacement", "stress_xx", "stress_yy", "stress_xy", "principal_max", "principal_min", "von_mises")
CELL_FIELDS = ("element_stress_xx", "element_stress_yy", "element_stress_xy", "element_principal_max",
               "element_von_mises")


def field_mesh(spec: PartSpec, solution: Solution):
    """A meshio.Mesh of the solution's mesh with its displacement and stress fields."""
    import meshio

    mesh = solution.mesh
    n = mesh.n_nodes
    points = np.column_stack([mesh.nodes, np.zeros(n)])
    u = np.asarray(solution.displacement, dtype=float).reshape(n, 2)
    s = solution.nodal_stress
    e = solution.element_stress
    point_data = {
        "displacement": np.column_stack([u, np.zeros(n)]),
        "stress_xx": s[:, 0].copy(),
        "stress_yy": s[:, 1].copy(),
        "stress_xy": s[:, 2].copy(),
        "principal_max": solution.principal[:, 0].copy(),
        "principal_min": solution.principal[:, 1].copy(),
        "von_mises": np.asarray(solution.von_mises, dtype=float).copy(),
    }
    szz = spec.material.nu * (e[:, 0] + e[:, 1]) if spec.plate.condition == "plane-strain" else 0.0
    cell_data = {
        "element_stress_xx": [e[:, 0].copy()],
        "element_stress_yy": [e[:, 1].copy()],
        "element_stress_xy": [e[:, 2].copy()],
        "element_principal_max": [principal_stresses(e)[:, 0]],
        "element_von_mises": [von_mises(e, szz)],
    }
    return meshio.Mesh(points, [("triangle", np.asarray(mesh.triangles, dtype=np.int64))],
                       point_data=point_data, cell_data=cell_data)


def vtu_bytes(spec: PartSpec, solution: Solution) -> bytes:
    """The solution as the bytes of a binary, zlib-compressed VTU file."""
    import meshio

    with tempfile.TemporaryDirectory(prefix="stressraiser-vtu-") as tmp:
        path = Path(tmp) / "part.vtu"
        meshio.write(path, field_mesh(spec, solution), file_format="vtu")
        return path.read_bytes()


def write_vtu(path: str | Path, spec: PartSpec, solution: Solution) -> None:
    """Write the solution's fields to a VTU file at `path`, whole or not at all."""
    write_atomic(path, vtu_bytes(spec, solution))
