"""Consistent nodal forces for tractions on boundary edges of linear triangles."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec

Traction = Callable[[np.ndarray], np.ndarray]  # (k, 2) points in mm -> (k, 2) traction in MPa


def edge_lengths(nodes: np.ndarray, edges: np.ndarray) -> np.ndarray:
    """Lengths (mm) of boundary edges given as (k, 2) node pairs."""
    return np.linalg.norm(nodes[edges[:, 1]] - nodes[edges[:, 0]], axis=1)


def edge_forces(nodes: np.ndarray, edges: np.ndarray, traction: Traction, thickness: float) -> np.ndarray:
    """Global force vector (2n,) in N for a traction varying linearly along each edge.

    With end tractions ta, tb on an edge of length L: fa = t L (2 ta + tb) / 6, fb = t L (ta + 2 tb) / 6,
    the exact work-equivalent (consistent) forces for a linear traction on a linear edge.
    """
    a, b = edges[:, 0], edges[:, 1]
    ta, tb = traction(nodes[a]), traction(nodes[b])
    w = (thickness * edge_lengths(nodes, edges) / 6.0)[:, None]
    fa, fb = w * (2.0 * ta + tb), w * (ta + 2.0 * tb)
    f = np.zeros(2 * nodes.shape[0])
    for comp in (0, 1):
        f += np.bincount(2 * a + comp, weights=fa[:, comp], minlength=f.size)
        f += np.bincount(2 * b + comp, weights=fb[:, comp], minlength=f.size)
    return f


def uniform_end_traction(nodes: np.ndarray, edges: np.ndarray, force: float, thickness: float) -> Traction:
    """Uniform normal traction (MPa) along x that sums to `force` (N) over the edge set."""
    stress = force / (thickness * edge_lengths(nodes, edges).sum())
    return lambda p: np.column_stack([np.full(len(p), stress), np.zeros(len(p))])


def part_loads(spec: PartSpec, mesh: Mesh) -> np.ndarray:
    """Global force vector (2n,) in N of every load the part file applies."""
    t = spec.plate.thickness
    loaded = mesh.edges["loaded"]
    return edge_forces(mesh.nodes, loaded, uniform_end_traction(mesh.nodes, loaded, spec.load.axial, t), t)
