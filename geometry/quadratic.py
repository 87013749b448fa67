"""Quadratic (6-node) triangles from gmsh's second-order mesh, and their straight sub-triangles.

gmsh elevates the linear mesh with `setOrder(2)`: each triangle gains a node at the middle of each edge,
placed on the exact curve where the edge lies on the part's boundary (a hole's arc), so the elements'
edges there are curved. gmsh orders a 6-node triangle (type 9) as the three corners, then the middles
of edges 1-2, 2-3 and 3-1; a 3-node line (type 8) as its two ends, then its middle.

Every quadratic triangle is also split into four straight sub-triangles through its mid-side nodes,

    (c1, m12, m31), (m12, c2, m23), (m31, m23, c3), (m12, m23, m31),

and every 3-node boundary edge into its two halves, so that code written for linear triangles (stress
recovery, cuts, plots, exports) works on a quadratic mesh unchanged. The three corner sub-triangles'
centroids are the points of the 3-point triangle rule at (1/6, 1/6), (2/3, 1/6), (1/6, 2/3), and the
centre one's is the element centroid (see fem/quadratic.py).
"""

from __future__ import annotations

import gmsh
import numpy as np

from .errors import MeshError

# Element size of quadratic triangles relative to linear ones at the same mesh scale: on the bundled
# strap, 6-node triangles twice the size put the first level's peak within 0.1 % of the converged value
# (benchmarks/accuracy_per_second.py), so the study starts there and needs no finer levels.
QUADRATIC_SIZE = 2.0
TRIANGLE6 = 9  # gmsh element type of the 6-node triangle
LINE3 = 8  # gmsh element type of the 3-node line
SUB_TRIANGLES = np.array([[0, 3, 5], [3, 1, 4], [5, 4, 2], [3, 4, 5]])  # local nodes of the four pieces
SUB_EDGES = np.array([[0, 2], [2, 1]])  # local nodes of the two halves of a 3-node edge


def elevate_and_extract(curves: dict[str, list[int]]) -> tuple[np.ndarray, np.ndarray, dict[str, np.ndarray]]:
    """Raise the current gmsh mesh to second order and read it: nodes (n, 2), 6-node triangles (m, 6)
    counter-clockwise, and the 3-node boundary edges (k, 3) of each named group of curves. Nodes no
    triangle uses are dropped."""
    gmsh.model.mesh.setOrder(2)
    tags, coords, _ = gmsh.model.mesh.getNodes()
    index = np.full(int(tags.max()) + 1, -1, dtype=np.int64)
    index[tags.astype(np.int64)] = np.arange(tags.size)
    nodes = coords.reshape(-1, 3)[:, :2].copy()
    types, _, elem_nodes = gmsh.model.mesh.getElements(2)
    if any(t != TRIANGLE6 for t in types):
        raise MeshError(f"gmsh produced element types {list(types)}; 6-node triangles were expected")
    tri6 = index[np.concatenate(elem_nodes).astype(np.int64)].reshape(-1, 6)
    edges = {}
    for name, tags_ in curves.items():
        lines = [gmsh.model.mesh.getElements(1, t) for t in tags_]
        flat = np.concatenate([nodes_[0] for kinds, _, nodes_ in lines if len(nodes_) and kinds[0] == LINE3])
        edges[name] = index[flat.astype(np.int64)].reshape(-1, 3)
    used = np.unique(tri6)
    renumber = np.full(nodes.shape[0], -1, dtype=np.int64)
    renumber[used] = np.arange(used.size)
    tri6 = renumber[tri6].astype(np.int32)
    edges = {k: renumber[v].astype(np.int32) for k, v in edges.items()}
    nodes = nodes[used]
    return nodes, counter_clockwise6(nodes, tri6), edges


def counter_clockwise6(nodes: np.ndarray, tri6: np.ndarray) -> np.ndarray:
    """6-node triangles with their corners counter-clockwise (swapping corners 2, 3 and the middles of
    edges 1-2 and 3-1 where needed)."""
    p = nodes[tri6[:, :3]]
    area2 = (p[:, 1, 0] - p[:, 0, 0]) * (p[:, 2, 1] - p[:, 0, 1]) - (p[:, 2, 0] - p[:, 0, 0]) * (p[:, 1, 1] - p[:, 0, 1])
    out = tri6.copy()
    flip = area2 < 0
    out[flip] = out[flip][:, [0, 2, 1, 5, 4, 3]]
    return out


def sub_triangles(tri6: np.ndarray) -> np.ndarray:
    """(4m, 3) straight sub-triangles of (m, 6) quadratic triangles; rows 4e .. 4e + 3 belong to element e,
    in the order of SUB_TRIANGLES."""
    return tri6[:, SUB_TRIANGLES].reshape(-1, 3).astype(np.int32)


def sub_edges(edges3: np.ndarray) -> np.ndarray:
    """(2k, 2) halves of (k, 3) boundary edges (end, end, middle)."""
    return edges3[:, SUB_EDGES].reshape(-1, 2).astype(np.int32)
