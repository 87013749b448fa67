"""Which mesh nodes and boundary edges lie on a stretch of the part's boundary (geometry.boundary).

The mesh has a node at each end of every stretch (geometry.meshing splits the boundary there), and gmsh
places boundary nodes on the exact curves, so a node lies on a line or arc to round-off; an edge lies on
it when both its end nodes do (and, on an arc, when its middle lies within the arc's span, so that an edge
across the gap of a nearly closed arc is not taken). Works on the modelled mesh of a symmetric part too:
it takes the share of the stretch the mesh has. Lengths in mm.
"""

from __future__ import annotations

import math

import numpy as np

from ..geometry.mesh import Mesh
from ..geometry.shapes import Arc, Line, Segment

ON_CURVE = 1e-7  # of the mesh's extent: a node this close to a line or arc lies on it


def tolerance(mesh: Mesh) -> float:
    """Distance (mm) within which a mesh node lies on a curve."""
    return ON_CURVE * float(np.ptp(mesh.nodes, axis=0).max())


def on_segment(seg: Segment, points: np.ndarray, tol: float) -> np.ndarray:
    """(k,) bool: which of `points` (k, 2) lie on the line or arc `seg` (ends included, within tol)."""
    if isinstance(seg, Line):
        a, b = np.asarray(seg.start), np.asarray(seg.end)
        d = b - a
        length = float(np.hypot(*d))
        rel = points - a
        along = rel @ d / length
        across = np.abs(rel[:, 0] * d[1] - rel[:, 1] * d[0]) / length
        return (across <= tol) & (along >= -tol) & (along <= length + tol)
    rel = points - np.asarray(seg.center)
    radial = np.abs(np.hypot(rel[:, 0], rel[:, 1]) - seg.radius) <= tol
    return radial & _within_span(seg, rel, tol / seg.radius)


def _within_span(arc: Arc, rel: np.ndarray, slack: float) -> np.ndarray:
    """Whether the directions `rel` (k, 2) from the arc's centre lie within its span (radians of slack)."""
    if arc.span >= 2.0 * math.pi - 1e-12:
        return np.ones(len(rel), dtype=bool)
    sense = 1.0 if arc.end >= arc.start else -1.0
    turn = np.mod(sense * (np.arctan2(rel[:, 1], rel[:, 0]) - arc.start), 2.0 * math.pi)
    return (turn <= arc.span + slack) | (turn >= 2.0 * math.pi - slack)


def segment_edges(mesh: Mesh, seg: Segment, quadratic: bool = False) -> np.ndarray:
    """The boundary edges of `mesh` on `seg`: (k, 2) node pairs, or (k, 3) end-end-middle triples of a
    6-node mesh with `quadratic`."""
    sets = mesh.quadratic_edges if quadratic else mesh.edges
    width = 3 if quadratic else 2
    if not sets:
        return np.zeros((0, width), dtype=np.int32)
    edges = np.vstack([e for e in sets.values() if e.size]) if any(e.size for e in sets.values()) else \
        np.zeros((0, width), dtype=np.int32)
    tol = tolerance(mesh)
    on = on_segment(seg, mesh.nodes, tol)
    keep = np.all(on[edges], axis=1)
    if isinstance(seg, Arc) and keep.any():
        mid = 0.5 * (mesh.nodes[edges[keep, 0]] + mesh.nodes[edges[keep, 1]]) - np.asarray(seg.center)
        keep[np.flatnonzero(keep)] = _within_span(seg, mid, 0.0)
    return edges[keep]


def stretch_edges(mesh: Mesh, pieces, quadratic: bool = False) -> np.ndarray:
    """The boundary edges on any of the stretch's pieces (see `segment_edges`)."""
    found = [segment_edges(mesh, seg, quadratic) for seg in pieces]
    return np.vstack(found) if found else np.zeros((0, 3 if quadratic else 2), dtype=np.int32)


def stretch_nodes(mesh: Mesh, pieces) -> np.ndarray:
    """Sorted node indices of every boundary edge on the stretch's pieces (mid-side nodes included)."""
    edges = [stretch_edges(mesh, pieces)]
    if mesh.quadratic_edges is not None:
        edges.append(stretch_edges(mesh, pieces, quadratic=True))
    return np.unique(np.concatenate([e.ravel() for e in edges])).astype(np.int64)


def on_point(mesh: Mesh, point) -> np.ndarray:
    """(n,) bool: the mesh nodes at `point` (mm), within the tolerance."""
    return np.hypot(*(mesh.nodes - np.asarray(point)).T) <= tolerance(mesh)
