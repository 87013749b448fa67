"""The von Mises peak of one solve, for the static peak check of a ductile part.

Values in MPa at mesh nodes (recovered nodal stresses; in plane strain the von Mises stress includes
szz = nu (sxx + syy)), locations in mm, for the full part (after a symmetric model is unfolded).

The search covers the nodes the principal-peak search covers (`Solution.searched`: a clamped end's
singular corners are left out). Under a pin it covers only the traction-free boundary: where the pin
bears, and just below its contact, the stress state is the contact's (the part is squeezed between pin
and ligament), which the bearing check (F / (d t) against a bearing allowable) covers; the peak check of a
pin-loaded part is the free-edge peak beside the contact. On a traction-free edge in plane stress the von
Mises stress is the magnitude of the edge's only stress, the tangential one. A cosine pin bears where its
pressure is positive (fem.loads.pin_pressure_at_nodes), a rigid pin at the nodes of the contact it found
(fem.contact.PinContact.points, mirror images included).
"""

from __future__ import annotations

import numpy as np
from scipy.spatial import cKDTree

from ..geometry.registry import outline_size
from ..geometry.spec import PartSpec
from .analysis import Solution
from .loads import pin_pressure_at_nodes

CONTACT_MATCH = 1e-6  # of the plate width: a contact point this close to a node is that node


def bearing_nodes(spec: PartSpec, solution: Solution) -> np.ndarray:
    """(n,) bool: the full part's nodes where a pin presses on its hole (none without a pin)."""
    mesh = solution.mesh
    if spec.load.pin is None:
        return np.zeros(mesh.n_nodes, dtype=bool)
    if solution.contact is None:
        return pin_pressure_at_nodes(spec, mesh) > 0.0
    points = solution.contact.points
    if len(points) == 0:
        return np.zeros(mesh.n_nodes, dtype=bool)
    distance, _ = cKDTree(points).query(mesh.nodes)
    return distance <= CONTACT_MATCH * outline_size(spec)[1]


def von_mises_peak(spec: PartSpec, solution: Solution) -> tuple[float, tuple[float, float]]:
    """(largest nodal von Mises stress in MPa, where it is in mm) over the searched nodes; under a pin, over
    the boundary nodes where the pin does not bear."""
    values = solution.von_mises
    if spec.load.pin is not None:
        free = np.zeros(solution.mesh.n_nodes, dtype=bool)
        free[solution.mesh.boundary_nodes()] = True
        values = np.where(free & ~bearing_nodes(spec, solution), values, -np.inf)
    node = solution.searched(values)
    return float(solution.von_mises[node]), (float(solution.mesh.nodes[node, 0]), float(solution.mesh.nodes[node, 1]))
