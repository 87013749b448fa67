"""The largest maximum principal stress on each raiser's own edge: how several raisers compete."""

from __future__ import annotations

import numpy as np

from ..geometry.kinds.base import RaiserId
from .analysis import Solution


def raiser_peaks(solution: Solution) -> dict[RaiserId, tuple[float, tuple[float, float]]]:
    """For every raiser the mesh was graded for (hole 2, notch 1, fillet 1, ...): the largest
    maximum principal stress (MPa) over the nodes of its edge and where it is (mm). Raisers cut away by a
    symmetry plane, or with no edge in the mesh, are left out."""
    mesh = solution.mesh
    out = {}
    for feature in mesh.features:
        if feature.name not in mesh.edges or mesh.edges[feature.name].size == 0:
            continue
        nodes = mesh.edge_nodes(feature.name)
        k = nodes[int(np.argmax(solution.principal[nodes, 0]))]
        out[feature.name] = (float(solution.principal[k, 0]), (float(mesh.nodes[k, 0]), float(mesh.nodes[k, 1])))
    return out
