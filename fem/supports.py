"""Supports: which DOFs are held."""

from __future__ import annotations

import numpy as np

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec


def held_end_dofs(mesh: Mesh) -> np.ndarray:
    """Hold u_x on every node of the held end and u_y at the held-end node nearest its middle.

    This removes the rigid-body motions without restraining the Poisson contraction of the end.
    """
    held = mesh.edge_nodes("held")
    y = mesh.nodes[held, 1]
    middle = held[np.argmin(np.abs(y - 0.5 * (y.min() + y.max())))]
    return np.unique(np.concatenate([2 * held, [2 * middle + 1]])).astype(np.int64)


def part_supports(spec: PartSpec, mesh: Mesh) -> np.ndarray:
    """Sorted indices of every DOF the part file holds at zero displacement."""
    return held_end_dofs(mesh)
