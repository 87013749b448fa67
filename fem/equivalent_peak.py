"""The von Mises peak of one solve, for the static peak check of a ductile part.

Values in MPa at mesh nodes (recovered nodal stresses; in plane strain the von Mises stress includes
szz = nu (sxx + syy)), locations in mm, for the full part (after a symmetric model is unfolded).

The search covers the nodes the principal-peak search covers (`Solution.searched`: a clamped end's
singular corners are left out). Under a pin it covers only the traction-free boundary: where the pin
bears, and just below its contact, the stress state is the contact's (the part is squeezed between pin
and ligament), which the bearing check (F / (d t) against a bearing allowable) covers; the peak check of a
pin-loaded part is the free-edge peak beside the contact. On a traction-free edge in plane stress the von
Mises stress is the magnitude of the edge's only stress, the tangential one. A pin bears where its contact
pressure is positive (`Solution.bearing`: the cosine pressure, or the rigid pin's contact found by the
solve, mirror images included).
"""

from __future__ import annotations

import numpy as np

from ..geometry.spec import PartSpec
from .analysis import Solution


def von_mises_peak(spec: PartSpec, solution: Solution) -> tuple[float, tuple[float, float]]:
    """(largest nodal von Mises stress in MPa, where it is in mm) over the searched nodes; under a pin or
    with fastener groups, over the boundary nodes where no pin or fastener bears."""
    values = solution.von_mises
    if spec.load.pin is not None or spec.fasteners:
        free = np.zeros(solution.mesh.n_nodes, dtype=bool)
        free[solution.mesh.boundary_nodes()] = True
        values = np.where(free & ~solution.bearing, values, -np.inf)
    node = solution.searched(values)
    return float(solution.von_mises[node]), (float(solution.mesh.nodes[node, 0]), float(solution.mesh.nodes[node, 1]))
