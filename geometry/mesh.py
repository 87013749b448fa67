"""The mesh handed from geometry to fem: plain arrays and named boundary edge sets."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .kinds.base import RaiserId

EdgeName = str | RaiserId  # an outline edge ("held", "side", "symmetry y", ...) or a raiser's edge


@dataclass(frozen=True)
class Feature:
    """A stress raiser the mesh resolves: its name, the smallest radius of curvature of its edge (mm) and
    the mesh size used at that edge (mm)."""

    name: RaiserId
    radius: float
    edge_size: float


@dataclass(frozen=True)
class Mesh:
    """Linear triangles.

    nodes: (n, 2) float64 coordinates in mm.
    triangles: (m, 3) int32 node indices, counter-clockwise.
    edges: boundary edge sets by name ("held", "loaded", "side", RaiserId("hole", 1), ...), each (k, 2) int32.
    features: the raisers this mesh was graded for.
    quadratic: for a mesh of quadratic (6-node) triangles, their (m, 6) int32 nodes: corners
        counter-clockwise, then the mid-side nodes of edges 1-2, 2-3, 3-1 (on the curved boundary where
        the edge lies on it); `triangles` then holds the four straight sub-triangles of each (corner,
        corner, corner, centre order: see geometry/quadratic.py) and `edges` the two halves of each
        boundary edge, so that every consumer of linear triangles works unchanged. None for a linear mesh.
    quadratic_edges: the 3-node boundary edges by name, each (k, 3) int32 (end, end, middle), or None.
    """

    nodes: np.ndarray
    triangles: np.ndarray
    edges: dict[EdgeName, np.ndarray]
    features: tuple[Feature, ...]
    quadratic: np.ndarray | None = None
    quadratic_edges: dict[EdgeName, np.ndarray] | None = None

    @property
    def order(self) -> int:
        """1 for linear triangles, 2 for quadratic ones."""
        return 1 if self.quadratic is None else 2

    @property
    def n_nodes(self) -> int:
        return int(self.nodes.shape[0])

    @property
    def n_elements(self) -> int:
        return int(self.triangles.shape[0])

    def edge_nodes(self, name: EdgeName) -> np.ndarray:
        """Sorted unique node indices on the named boundary edge set."""
        return np.unique(self.edges[name])

    def boundary_nodes(self) -> np.ndarray:
        """Sorted unique node indices on any boundary edge."""
        return np.unique(np.concatenate([e.ravel() for e in self.edges.values()]))
