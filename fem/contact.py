"""The part file's rigid pin ([load.pin] with contact = "rigid") as a one-fastener group (fem/fastener_groups.py).

The pin is a rigid, frictionless body of diameter d - c in its hole of diameter d (c the diametral
clearance, >= 0), seated against the side of the hole facing its direction phi, carrying its force P along
phi into the part through a member that translates only (a frictionless pin carries no moment). The
contact, its exact constraints and the active-set iteration are those of every fastener group; this
module only states the pin as a group and gathers the contact of the full part for the results.

A symmetric model holds the part of the pin on its side of the planes: P/2 with the plane y = 0 (the
pin's centre lies on it: the group is its own mirror image), the whole pin with the plane x = 0 (the pin's
hole lies on the side x > 0 and its mirror image carries the mirrored pin). `PinContact` describes the full
part.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec
from ..geometry.symmetry import symmetry_tolerance
from .fastener_groups import Fastener, FastenerGroup, GroupsSolve, group_holes, solve_fastener_groups
from .fastener_groups import contact_pressure as fastener_contact_pressure

PIN_GROUP = "the rigid pin"  # how messages name the pin's group


@dataclass(frozen=True)
class PinContact:
    """A rigid pin's contact after the solve, for the full part (mm, N, MPa, degrees).

    clearance: the pin's diametral clearance (mm).
    points: (m, 2) hole-edge nodes the pin presses on, with every mirror image; forces: (m, 2) the pin's
      force on the part at each (N; radial, pushing the material away from the hole's centre).
    arc: (first, last) angle of the contact around the pin's hole, from the pin's direction,
      counter-clockwise (degrees).
    passes: active-set passes (solves) the last mesh took.
    pin_displacement: the modelled pin's translation (mm).
    penetration: the largest penetration of the pin into the hole's edge left at any node (mm; >= 0).
    peak_pressure: the largest contact pressure, node force / tributary length / thickness (MPa).
    """

    clearance: float
    points: np.ndarray
    forces: np.ndarray
    arc: tuple[float, float]
    passes: int
    pin_displacement: tuple[float, float]
    penetration: float
    peak_pressure: float


def rigid_pin(spec: PartSpec) -> bool:
    """True when the part is loaded through a rigid-contact pin."""
    return spec.load.pin is not None and spec.load.pin.contact == "rigid"


def pin_group(spec: PartSpec) -> FastenerGroup:
    """The part's rigid pin as a one-fastener group carrying the pin force P along its direction."""
    pin = spec.load.pin
    (hole,) = group_holes(spec.holes, [pin.hole])
    force = (pin.force * math.cos(pin.angle), pin.force * math.sin(pin.angle), 0.0)
    return FastenerGroup(PIN_GROUP, (hole,), Fastener(hole.diameter - pin.clearance, pin.clearance), force,
                         seats=(pin.direction,))


def solve_pin_contact(K: sp.spmatrix, f: np.ndarray, fixed: np.ndarray, spec: PartSpec, mesh: Mesh,
                      start: tuple[float, float] | None = None) -> GroupsSolve:
    """Displacements of the part with its rigid pin in contact (fem.fastener_groups).

    K: (2n, 2n) stiffness (N/mm); f: (2n,) the other applied forces (N); fixed: held DOFs; start: the
    contact arc (degrees from the pin's direction) to take as the first active set, or None for the
    loaded half. Raises SolverError when the contact does not settle or cannot hold the pin."""
    return solve_fastener_groups(K, f, fixed, mesh, (pin_group(spec),), spec.plate.thickness,
                                 spec.support.symmetry, symmetry_tolerance(spec), spec.mesh.solver,
                                 None if start is None else ((start,),))


def contact_pressure(mesh: Mesh, solved: GroupsSolve, spec: PartSpec) -> np.ndarray:
    """(n,) contact pressure (MPa, >= 0) at each node of the modelled mesh: node force / tributary length
    / thickness on the pin's hole, zero elsewhere (for the exact edge state, fem.recovery)."""
    return fastener_contact_pressure(mesh, solved.contact, solved.normal_force, (pin_group(spec),),
                                     spec.plate.thickness)


def full_part_contact(spec: PartSpec, mesh: Mesh, solved: GroupsSolve, pressure: np.ndarray) -> PinContact:
    """The contact of the full part: the modelled contact forces with their mirror images (a node on a
    plane gathers both halves, as the plane's reactions do: fem.symmetry), and its arc."""
    on = solved.active
    points = mesh.nodes[solved.contact.nodes[on]]
    forces = solved.normal_force[on, None] * solved.contact.normal[on]
    tol = symmetry_tolerance(spec)
    for plane in spec.support.symmetry:
        axis = 0 if plane == "x" else 1
        flip = np.array([-1.0, 1.0]) if axis == 0 else np.array([1.0, -1.0])
        at_plane = np.abs(points[:, axis]) <= tol
        forces = forces.copy()
        forces[at_plane, axis] = 0.0
        forces[at_plane] *= 2.0
        points = np.vstack([points, points[~at_plane] * flip])
        forces = np.vstack([forces, forces[~at_plane] * flip])
    pin = spec.load.pin
    hole = spec.holes[pin.hole - 1]
    rel = points - np.asarray(hole.center)
    own = np.linalg.norm(rel, axis=1) <= 1.5 * hole.radius  # the pin's own hole, not a mirror image's
    angles = np.degrees(np.angle(np.exp(1j * (np.arctan2(rel[own, 1], rel[own, 0]) - pin.angle))))
    arc = (float(angles.min()), float(angles.max())) if angles.size else (0.0, 0.0)
    (fastener,) = solved.fasteners
    return PinContact(pin.clearance, points, forces, arc, solved.passes,
                      (float(fastener.displacement[0]), float(fastener.displacement[1])),
                      fastener.penetration, float(pressure.max()))
