"""Supports: which DOFs are held at zero displacement.

- Held end (x = -L/2), "x" (default): every node held in x (free to contract); one node near the middle
  held in y against rigid-body motion (the transverse load reaches the held end as a traction, see
  fem/loads.py). "clamped": every node held in x and y.
- Symmetry planes: every node on the plane x = 0 held in x, on y = 0 held in y (rollers).
- A remote stress state, or the plane x = 0 taking the held end's place: only what rigid-body motion
  needs, at single nodes.
"""

from __future__ import annotations

import numpy as np

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec


def held_end_dofs(mesh: Mesh) -> np.ndarray:
    """Hold u_x on every node of the held end and u_y at the held-end node nearest its middle.

    This removes the rigid-body motions without restraining the Poisson contraction of the end.
    """
    held = mesh.edge_nodes("held")
    return np.unique(np.concatenate([2 * held, [2 * _nearest(mesh, held, 1, 0.0) + 1]])).astype(np.int64)


def part_supports(spec: PartSpec, mesh: Mesh) -> np.ndarray:
    """Sorted indices of every DOF the part file holds at zero displacement."""
    planes = spec.support.symmetry
    fixed = [2 * mesh.edge_nodes(f"symmetry {p}") + (0 if p == "x" else 1) for p in planes]
    half_l = 0.5 * spec.plate.length
    if spec.load.remote is not None:
        if not planes:
            held, loaded = mesh.edge_nodes("held"), mesh.edge_nodes("loaded")
            a, b = _nearest(mesh, held, 1, 0.0), _nearest(mesh, loaded, 1, 0.0)
            fixed.append(np.array([2 * a, 2 * a + 1, 2 * b + 1]))
        elif planes == ("y",):
            fixed.append(np.array([2 * _nearest(mesh, mesh.edge_nodes("symmetry y"), 0, -half_l)]))
        elif planes == ("x",):
            fixed.append(np.array([2 * _nearest(mesh, mesh.edge_nodes("symmetry x"), 1, 0.0) + 1]))
    elif "x" in planes:
        if "y" not in planes:
            fixed.append(np.array([2 * _nearest(mesh, mesh.edge_nodes("symmetry x"), 1, 0.0) + 1]))
    elif spec.support.held == "clamped":
        held = mesh.edge_nodes("held")
        fixed.append(np.concatenate([2 * held, 2 * held + 1]))
    elif "y" in planes:
        fixed.append(2 * mesh.edge_nodes("held"))
    else:
        fixed.append(held_end_dofs(mesh))
    return np.unique(np.concatenate(fixed)).astype(np.int64)


def _nearest(mesh: Mesh, nodes: np.ndarray, axis: int, value: float) -> int:
    """The node of `nodes` whose coordinate `axis` (0 = x, 1 = y) is nearest `value`."""
    return int(nodes[np.argmin(np.abs(mesh.nodes[nodes, axis] - value))])


CLAMP_ZONE = 0.1  # of the clamped end's width: radius around its corners left out of the peak search


def singular_zone(spec: PartSpec, mesh: Mesh) -> np.ndarray | None:
    """(n,) bool: nodes within CLAMP_ZONE x the end's width of a clamped end's corners, or None.

    Where a clamped edge (fixed in x and y) meets a free edge, the idealised support restrains the Poisson
    contraction and the elastic stress is singular: the FE value there grows without bound as the mesh is
    refined and says nothing about the part. The peak search skips those corners (Saint-Venant: the
    support's idealisation only disturbs its neighbourhood)."""
    if spec.support.held != "clamped" or "held" not in mesh.edges or spec.load.remote is not None:
        return None
    edges = mesh.edges["held"]
    ids, counts = np.unique(edges, return_counts=True)
    corners = mesh.nodes[ids[counts == 1]]  # the ends of the held edge's chain(s)
    if corners.size == 0:
        return None
    held = mesh.nodes[ids]
    radius = CLAMP_ZONE * float(np.ptp(held[:, 1]) if np.ptp(held[:, 1]) > 0 else np.ptp(held[:, 0]))
    distance = np.min(np.linalg.norm(mesh.nodes[:, None, :] - corners[None, :, :], axis=2), axis=1)
    return distance < radius
