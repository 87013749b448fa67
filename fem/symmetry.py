"""Unfold a half or quarter model into the full part by mirroring it across its symmetry planes.

Mirroring in the plane x = 0 maps (x, y) -> (-x, y), displacements (ux, uy) -> (-ux, uy) and stresses
(sxx, syy, txy) -> (sxx, syy, -txy); the plane y = 0 likewise with y. Nodes on the plane are shared,
the triangles of the image are re-ordered to stay counter-clockwise, and the image of each named edge
takes the name of the mirror feature (the edges on the plane become interior and are dropped). Support
reactions on the plane are internal forces of the full part and are dropped; a shared node's reaction
along the plane counts twice (both halves press on it).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from ..geometry.kinds.base import RaiserId
from ..geometry.mesh import EdgeName, Mesh
from ..geometry.spec import PartSpec
from ..geometry.symmetry import mirror_names, symmetry_tolerance


@dataclass(frozen=True)
class Fields:
    """The arrays that follow the mesh: displacement (2n,), element stress (m, 3), nodal stress (n, 3),
    nodal reactions (2n,) and a pin's contact pressure at the nodes (n,), MPa."""

    mesh: Mesh
    displacement: np.ndarray
    element_stress: np.ndarray
    nodal_stress: np.ndarray
    reactions: np.ndarray
    pressure: np.ndarray


def unfold(spec: PartSpec, fields: Fields) -> Fields:
    """The fields of the full part from those of the model on the positive side of spec's planes."""
    for plane in spec.support.symmetry:
        fields = _mirror(spec, fields, plane)
    return fields


def _mirror(spec: PartSpec, f: Fields, plane: str) -> Fields:
    axis = 0 if plane == "x" else 1
    mesh, on = f.mesh, on_plane_nodes(spec, f.mesh, plane)
    flip = np.array([-1.0, 1.0]) if axis == 0 else np.array([1.0, -1.0])
    full = replace(mirror_mesh(spec, mesh, plane), features=mesh.features)  # a half model reports the raisers it modelled
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
        pressure=np.concatenate([f.pressure, f.pressure[~on]]),
    )


def on_plane_nodes(spec: PartSpec, mesh: Mesh, plane: str) -> np.ndarray:
    """(n,) bool: the nodes on the plane x = 0 ("x") or y = 0 ("y")."""
    return np.abs(mesh.nodes[:, 0 if plane == "x" else 1]) <= symmetry_tolerance(spec)


def mirror_mesh(spec: PartSpec, mesh: Mesh, plane: str) -> Mesh:
    """The mesh of the whole part from the mesh of its positive side of `plane`, "x" or "y": the nodes on
    the plane are shared, the image's triangles re-ordered to stay counter-clockwise, each named edge's
    image named after the mirror raiser (the edge on the plane becomes interior and is dropped), and each
    raiser's mirror image added to the features. Image nodes follow the mesh's own, in order."""
    axis = 0 if plane == "x" else 1
    n = mesh.n_nodes
    on = on_plane_nodes(spec, mesh, plane)
    image = np.arange(n)
    image[~on] = n + np.arange(int((~on).sum()))
    flip = np.array([-1.0, 1.0]) if axis == 0 else np.array([1.0, -1.0])
    nodes = np.vstack([mesh.nodes, mesh.nodes[~on] * flip])
    triangles = np.vstack([mesh.triangles, image[mesh.triangles][:, [0, 2, 1]]]).astype(np.int32)
    names = _image_names(spec, mesh, plane)
    cut = f"symmetry {plane}"
    edges: dict[EdgeName, list[np.ndarray]] = {}
    for name, e in mesh.edges.items():
        if name != cut:
            edges.setdefault(name, []).append(e)
            edges.setdefault(names[name], []).append(image[e][:, ::-1])
    quadratic = quadratic_edges = None
    if mesh.quadratic is not None:  # 6-node triangles: corners reversed, mid-sides of the reversed edges
        quadratic = np.vstack([mesh.quadratic, image[mesh.quadratic][:, [0, 2, 1, 5, 4, 3]]]).astype(np.int32)
    if mesh.quadratic_edges is not None:
        quadratic_edges = {}
        for name, e in mesh.quadratic_edges.items():
            if name != cut:
                quadratic_edges.setdefault(name, []).append(e)
                quadratic_edges.setdefault(names[name], []).append(image[e][:, [1, 0, 2]])
        quadratic_edges = {k: np.vstack(v).astype(np.int32) for k, v in quadratic_edges.items()}
    known = {f.name for f in mesh.features}
    images = tuple(replace(f, name=names[f.name]) for f in mesh.features if names.get(f.name, f.name) not in known)
    return Mesh(nodes, triangles, {k: np.vstack(v).astype(np.int32) for k, v in edges.items()},
                mesh.features + images, quadratic, quadratic_edges)


def _image_names(spec: PartSpec, mesh: Mesh, plane: str) -> dict[EdgeName, EdgeName]:
    """Name of the mirror image of each named edge: a raiser's is its mirror raiser (each kind says how it
    mirrors: geometry.symmetry.mirror_names), an outline edge's keeps its name ("side", "held", ...)."""
    raisers = mirror_names(spec, plane) or {}
    return {name: raisers.get(name, name) if isinstance(name, RaiserId) else name for name in mesh.edges}
