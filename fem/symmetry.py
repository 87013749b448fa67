"""Unfold a half or quarter model into the full part by mirroring it across its symmetry planes.

Mirroring in the plane x = 0 maps (x, y) -> (-x, y), displacements (ux, uy) -> (-ux, uy) and stresses
(sxx, syy, txy) -> (sxx, syy, -txy); the plane y = 0 likewise with y. Nodes on the plane are shared,
the triangles of the image are re-ordered to stay counter-clockwise, and the image of each named edge
takes the name of the mirror feature (the edges on the plane become interior and are dropped). Support
reactions on the plane are internal forces of the full part and are dropped; a shared node's reaction
along the plane counts twice (both halves press on it).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..geometry.kinds.base import RaiserId
from ..geometry.mesh import EdgeName, Mesh
from ..geometry.spec import PartSpec
from ..geometry.symmetry import mirror_names, symmetry_tolerance


@dataclass(frozen=True)
class Fields:
    """The arrays that follow the mesh: displacement (2n,), element stress (m, 3), nodal stress (n, 3)
    and nodal reactions (2n,)."""

    mesh: Mesh
    displacement: np.ndarray
    element_stress: np.ndarray
    nodal_stress: np.ndarray
    reactions: np.ndarray


def unfold(spec: PartSpec, fields: Fields) -> Fields:
    """The fields of the full part from those of the model on the positive side of spec's planes."""
    for plane in spec.support.symmetry:
        fields = _mirror(spec, fields, plane)
    return fields


def _mirror(spec: PartSpec, f: Fields, plane: str) -> Fields:
    axis = 0 if plane == "x" else 1
    mesh = f.mesh
    n = mesh.n_nodes
    on = np.abs(mesh.nodes[:, axis]) <= symmetry_tolerance(spec)
    image = np.arange(n)
    image[~on] = n + np.arange(int((~on).sum()))
    flip = np.array([-1.0, 1.0]) if axis == 0 else np.array([1.0, -1.0])

    nodes = np.vstack([mesh.nodes, mesh.nodes[~on] * flip])
    triangles = np.vstack([mesh.triangles, image[mesh.triangles][:, [0, 2, 1]]]).astype(np.int32)
    names = _image_names(spec, mesh, plane)
    edges: dict[EdgeName, list[np.ndarray]] = {}
    for name, e in mesh.edges.items():
        if name == f"symmetry {plane}":
            continue
        edges.setdefault(name, []).append(e)
        edges.setdefault(names[name], []).append(image[e][:, ::-1])
    quadratic = quadratic_edges = None
    if mesh.quadratic is not None:  # 6-node triangles: corners reversed, mid-sides of the reversed edges
        quadratic = np.vstack([mesh.quadratic, image[mesh.quadratic][:, [0, 2, 1, 5, 4, 3]]]).astype(np.int32)
    if mesh.quadratic_edges is not None:
        quadratic_edges = {}
        for name, e in mesh.quadratic_edges.items():
            if name != f"symmetry {plane}":
                quadratic_edges.setdefault(name, []).append(e)
                quadratic_edges.setdefault(names[name], []).append(image[e][:, [1, 0, 2]])
        quadratic_edges = {k: np.vstack(v).astype(np.int32) for k, v in quadratic_edges.items()}
    full = Mesh(nodes, triangles, {k: np.vstack(v).astype(np.int32) for k, v in edges.items()}, mesh.features,
                quadratic, quadratic_edges)

    u = f.displacement.reshape(-1, 2)
    shear_flip = np.array([1.0, 1.0, -1.0])
    r = f.reactions.reshape(-1, 2).copy()
    r[on, axis] = 0.0  # the plane's rollers: internal in the full part
    r_shared = r.copy()
    r_shared[on] *= 2.0  # a node on the plane gathers both halves
    return Fields(
        mesh=full,
        displacement=np.vstack([u, u[~on] * flip]).ravel(),
        element_stress=np.vstack([f.element_stress, f.element_stress * shear_flip]),
        nodal_stress=np.vstack([f.nodal_stress, f.nodal_stress[~on] * shear_flip]),
        reactions=np.vstack([r_shared, r[~on] * flip]).ravel(),
    )


def _image_names(spec: PartSpec, mesh: Mesh, plane: str) -> dict[EdgeName, EdgeName]:
    """Name of the mirror image of each named edge: a raiser's is its mirror raiser (each kind says how it
    mirrors: geometry.symmetry.mirror_names), an outline edge's keeps its name ("side", "held", ...)."""
    raisers = mirror_names(spec, plane) or {}
    return {name: raisers.get(name, name) if isinstance(name, RaiserId) else name for name in mesh.edges}
