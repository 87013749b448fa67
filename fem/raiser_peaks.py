"""The peak principal stress on each raiser's own edge, and on the rest of the outline: the candidates for
the governing peak, each converged on its own sequence of mesh levels (fem.convergence).

Where a pin or fastener presses on a hole's edge the compression there is bearing, reported on its own
(`bearing_peak`); the hole's candidate is its free edge, where the tensile hoop peak that cracks a lug is.
"""

from __future__ import annotations

import numpy as np
from scipy.spatial import cKDTree

from ..geometry.kinds.base import RaiserId
from .analysis import Solution

OUTLINE = "outline"  # the candidate of the part's own edges away from every raiser (sides, ends)

RaiserName = RaiserId | str  # a raiser's name, or OUTLINE
Peaks = dict[RaiserName, tuple[float, tuple[float, float]]]  # by raiser, and OUTLINE


def raiser_peaks(solution: Solution, compressive: bool = False) -> Peaks:
    """For every raiser the mesh was graded for (hole 2, notch 1, fillet 1, ...): the largest
    maximum principal stress (MPa) over the free nodes of its edge and where it is (mm); with `compressive`
    the most negative minimum principal stress instead. The key OUTLINE holds the same over the part's
    other boundary nodes farther from every raiser's edge than its smallest radius of curvature: nearer,
    the outline's stress is the raiser's own field (a node beside a fillet's end tends, as the mesh
    refines, to the fillet's value there), which that raiser's candidate already holds. Nodes where a pin bears and nodes the peak search skips (a clamped end's
    singular corners) are left out; so are raisers cut away by a symmetry plane or with no edge in the mesh."""
    mesh = solution.mesh
    column = 1 if compressive else 0
    searched = ~solution.bearing
    if solution.excluded is not None:
        searched &= ~solution.excluded
    out: Peaks = {}
    edges, radii = [], []
    for feature in mesh.features:
        if feature.name not in mesh.edges or mesh.edges[feature.name].size == 0:
            continue
        nodes = mesh.edge_nodes(feature.name)
        edges.append(nodes)
        radii.append(np.full(nodes.size, feature.radius))
        _add(out, feature.name, solution, nodes[searched[nodes]], column)
    rest = mesh.boundary_nodes()
    rest = rest[searched[rest]]
    if edges:  # the outline's nodes within a raiser's radius of its edge belong to that raiser's field
        distance, nearest = cKDTree(mesh.nodes[np.concatenate(edges)]).query(mesh.nodes[rest])
        rest = rest[distance >= np.concatenate(radii)[nearest]]
    _add(out, OUTLINE, solution, rest, column)
    return out


def _add(out: Peaks, name: str, solution: Solution, nodes: np.ndarray, column: int) -> None:
    if nodes.size == 0:
        return
    values = solution.principal[nodes, column]
    k = nodes[int(np.argmin(values) if column else np.argmax(values))]
    out[name] = (float(solution.principal[k, column]), (float(solution.mesh.nodes[k, 0]), float(solution.mesh.nodes[k, 1])))


def zone_peaks(solution: Solution, zones: tuple[tuple[tuple[float, float], float], ...]) -> tuple[float, ...]:
    """The principal stress of the largest magnitude (MPa, signed) among the nodes within each zone (centre,
    radius in mm): a sharp inside corner's peak on this mesh, which grows under refinement
    (geometry/sharp_corners.py)."""
    nodes = solution.mesh.nodes
    out = []
    for centre, radius in zones:
        inside = np.hypot(nodes[:, 0] - centre[0], nodes[:, 1] - centre[1]) <= radius
        if not inside.any():
            out.append(float("nan"))
            continue
        high, low = float(solution.principal[inside, 0].max()), float(solution.principal[inside, 1].min())
        out.append(high if high >= -low else low)
    return tuple(out)


def bearing_peak(solution: Solution) -> float | None:
    """The largest contact pressure a pin exerts on its hole's edge (MPa, >= 0); None where nothing bears."""
    if solution.pressure is None or not solution.bearing.any():
        return None
    return float(solution.pressure.max())
