"""Supports: which DOFs are held at zero displacement.

- Held end (x = -L/2), "x" (default): every node held in x (free to contract); one node near the middle
  held in y against rigid-body motion (the transverse load reaches the held end as a traction, see
  fem/loads.py). "clamped": every node held in x and y.
- Symmetry planes: every node on the plane x = 0 held in x, on y = 0 held in y (rollers).
- A remote stress state, or the plane x = 0 taking the held end's place: only what rigid-body motion
  needs, at single nodes.
- [[hold]] supports on stretches of the boundary (instead of the held end): "fixed" holds both DOFs of
  every node on the stretch; "roller" holds the displacement along the edge's normal at each node (a node
  where two roller pieces of different normals meet is fixed). A normal along x or y holds that DOF; any
  other is a skew roller, imposed by turning the node's DOFs into its (tangent, normal) frame
  (`skew_transform`). Pin holds are contact constraints (fem/contact.py), not held DOFs.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp

from ..geometry.boundary import boundary_loops, outward_normals, segment_points, stretch
from ..geometry.mesh import Mesh
from ..geometry.sharp_corners import sharp_corners
from ..geometry.registry import outline_size
from ..geometry.spec import NO_HELD_END, PartSpec
from .stretches import segment_edges, stretch_nodes

PARALLEL = 1e-9  # |n1 x n2| below which two roller normals at a node are the same direction
AXIS = 1e-12  # a roller normal whose other component is below this is along x or y


@dataclass(frozen=True)
class Supports:
    """Every support of the part on one (modelled) mesh.

    fixed: sorted DOF indices held at zero (held end, symmetry planes, rigid-body points, fixed holds and
    rollers along x or y); skew_nodes (k,) and skew_normals (k, 2): nodes held only along a normal not
    along x or y (unit vectors); edges: (m, 2) boundary edges of the [[hold]] stretches (not traction-free);
    fixed_nodes: nodes of fixed holds (their corners with free edges keep the patch-recovered stress)."""

    fixed: np.ndarray
    skew_nodes: np.ndarray
    skew_normals: np.ndarray
    edges: np.ndarray
    fixed_nodes: np.ndarray


def held_end_dofs(mesh: Mesh) -> np.ndarray:
    """Hold u_x on every node of the held end and u_y at the held-end node nearest its middle.

    This removes the rigid-body motions without restraining the Poisson contraction of the end.
    """
    held = mesh.edge_nodes("held")
    return np.unique(np.concatenate([2 * held, [2 * _nearest(mesh, held, 1, 0.0) + 1]])).astype(np.int64)


def support_set(spec: PartSpec, mesh: Mesh) -> Supports:
    """Every support of the part on `mesh` (see Supports)."""
    fixed = [part_supports(spec, mesh)]
    roller_nodes, roller_normals, edges, fixed_nodes = [], [], [], []
    for hold in spec.support.holds:
        if hold.pin is not None:
            continue
        for seg in stretch(spec, hold.where).pieces:
            on = segment_edges(mesh, seg)
            edges.append(on)
            nodes = stretch_nodes(mesh, (seg,))
            if hold.mode == "fixed":
                fixed_nodes.append(nodes)
            else:
                roller_nodes.append(nodes)
                roller_normals.append(outward_normals(seg, mesh.nodes[nodes]))
    held = np.concatenate(fixed_nodes) if fixed_nodes else np.zeros(0, dtype=np.int64)
    skew_nodes, skew_normals = np.zeros(0, dtype=np.int64), np.zeros((0, 2))
    if roller_nodes:
        dofs, both, skew_nodes, skew_normals = _rollers(np.concatenate(roller_nodes), np.vstack(roller_normals))
        fixed.append(dofs)
        held = np.concatenate([held, both])
    fixed.append(np.concatenate([2 * held, 2 * held + 1]))
    fixed = np.unique(np.concatenate(fixed)).astype(np.int64)
    loose = ~np.isin(2 * skew_nodes, fixed) & ~np.isin(2 * skew_nodes + 1, fixed)
    return Supports(fixed, skew_nodes[loose], skew_normals[loose],
                    np.vstack(edges) if edges else np.zeros((0, 2), dtype=np.int32),
                    np.unique(np.concatenate(fixed_nodes)) if fixed_nodes else np.zeros(0, dtype=np.int64))


def _rollers(nodes: np.ndarray, normals: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Roller constraints by node: (DOFs held along x or y, nodes held in both directions, skew nodes,
    their unit normals)."""
    unique, first, inverse = np.unique(nodes, return_index=True, return_inverse=True)
    reference = normals[first]
    cross = np.abs(normals[:, 0] * reference[inverse, 1] - normals[:, 1] * reference[inverse, 0])
    turned = np.zeros(unique.size)
    np.maximum.at(turned, inverse, cross)
    both = unique[turned > PARALLEL]
    one, n = unique[turned <= PARALLEL], reference[turned <= PARALLEL]
    along_x, along_y = np.abs(n[:, 1]) <= AXIS, np.abs(n[:, 0]) <= AXIS
    dofs = np.concatenate([2 * one[along_x], 2 * one[along_y] + 1])
    skew = ~(along_x | along_y)
    return dofs, both, one[skew], n[skew]


def skew_transform(n_dofs: int, nodes: np.ndarray, normals: np.ndarray) -> sp.csr_matrix:
    """(N, N) orthogonal T with u = T q: identity except at the skew roller nodes, whose DOF pair holds
    (slip along the edge, displacement along the normal); the second is then held at zero."""
    t = np.column_stack([-normals[:, 1], normals[:, 0]])
    keep = np.ones(n_dofs, dtype=bool)
    keep[2 * nodes] = keep[2 * nodes + 1] = False
    identity = np.flatnonzero(keep)
    rows = [identity, 2 * nodes, 2 * nodes, 2 * nodes + 1, 2 * nodes + 1]
    cols = [identity, 2 * nodes, 2 * nodes + 1, 2 * nodes, 2 * nodes + 1]
    vals = [np.ones(identity.size), t[:, 0], normals[:, 0], t[:, 1], normals[:, 1]]
    return sp.csr_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(n_dofs, n_dofs))


def part_supports(spec: PartSpec, mesh: Mesh) -> np.ndarray:
    """Sorted indices of every DOF the held end, the symmetry planes and the rigid-body points hold at
    zero displacement ([[hold]] supports: `support_set`)."""
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
        if "y" not in planes and spec.support.held != NO_HELD_END:
            fixed.append(np.array([2 * _nearest(mesh, mesh.edge_nodes("symmetry x"), 1, 0.0) + 1]))
    elif spec.support.held == NO_HELD_END:
        pass
    elif spec.support.held == "clamped":
        held = mesh.edge_nodes("held")
        fixed.append(np.concatenate([2 * held, 2 * held + 1]))
    elif "y" in planes:
        fixed.append(2 * mesh.edge_nodes("held"))
    else:
        fixed.append(held_end_dofs(mesh))
    return np.unique(np.concatenate(fixed)).astype(np.int64) if fixed else np.zeros(0, dtype=np.int64)


def _nearest(mesh: Mesh, nodes: np.ndarray, axis: int, value: float) -> int:
    """The node of `nodes` whose coordinate `axis` (0 = x, 1 = y) is nearest `value`."""
    return int(nodes[np.argmin(np.abs(mesh.nodes[nodes, axis] - value))])


CLAMP_ZONE = 0.1  # of the clamped end's width: radius around its corners left out of the peak search
SUPPORT_ZONE = 0.1  # of a stretch's length: radius around its singular ends left out of the peak search


def singular_zone(spec: PartSpec, mesh: Mesh) -> np.ndarray | None:
    """(n,) bool: nodes near a support's or load's singular points, or None when there are none.

    Where a clamped edge (fixed in x and y) meets a free edge, the idealised support restrains the Poisson
    contraction and the elastic stress is singular: the FE value there grows without bound as the mesh is
    refined and says nothing about the part. The same holds at the ends of a fixed [[hold]], and where a
    roller hold or an edge force ends inside a line or arc (a support or a shear traction that stops
    abruptly). The peak search skips CLAMP_ZONE x the end's width around a clamped end's corners and
    SUPPORT_ZONE x the stretch's length around those ends (Saint-Venant: the support's idealisation only
    disturbs its neighbourhood). A pressure's ends leave the stress bounded and are not skipped. Sharp inside
    corners of the geometry (geometry/sharp_corners.py) are skipped within their stated zones."""
    points, radii = [], []
    if spec.support.held == "clamped" and "held" in mesh.edges and spec.load.remote is None:
        edges = mesh.edges["held"]
        ids, counts = np.unique(edges, return_counts=True)
        corners = mesh.nodes[ids[counts == 1]]  # the ends of the held edge's chain(s)
        held = mesh.nodes[ids]
        radius = CLAMP_ZONE * float(np.ptp(held[:, 1]) if np.ptp(held[:, 1]) > 0 else np.ptp(held[:, 0]))
        points += [tuple(c) for c in corners]
        radii += [radius] * len(corners)
    for where, every_end in _singular_stretches(spec):
        picked = stretch(spec, where)
        ends = picked.ends if every_end else [e for e in picked.ends if not _at_vertex(spec, e)]
        points += list(ends)
        radii += [SUPPORT_ZONE * picked.length] * len(ends)
    for corner in sharp_corners(spec):  # a sharp inside corner: the same, for the geometry's own singularity
        points.append(corner.point)
        radii.append(corner.zone)
    if not points:
        return None
    gaps = np.linalg.norm(mesh.nodes[:, None, :] - np.asarray(points)[None, :, :], axis=2)
    return np.any(gaps < np.asarray(radii)[None, :], axis=1)


def _singular_stretches(spec: PartSpec):
    """(pick, every end singular?) of the holds and of spec.load's edge forces."""
    for hold in spec.support.holds:
        if hold.where is not None:
            yield hold.where, hold.mode == "fixed"
    for edge in spec.load.edges:
        if edge.pressure == 0.0:
            yield edge.where, False


def _at_vertex(spec: PartSpec, point) -> bool:
    """Whether a point is a corner of the boundary (where one line or arc meets the next)."""
    tol = 1e-9 * max(outline_size(spec))
    return any(math.dist(point, segment_points(p.segment)[0]) <= tol
               for loop in boundary_loops(spec) for p in loop if p.segment is not None)
