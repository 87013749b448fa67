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

A pin hold ([[hold]] pin = N) is a one-fastener group that holds the part: a rigid, neat-fit, frictionless
pin whose member is fixed in space. Its contact forces are support reactions; the contact arc comes out
of the solve. The loading pin and every pin hold of a load case are solved together (`solve_contact`).
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
from .fastener_part import PartFasteners, part_fasteners, part_groups

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


@dataclass(frozen=True)
class HeldPin:
    """A pin hold's contact after the solve (mm, N, MPa, degrees): its hole, the pin's force on the part
    (2,) N (the support's reaction), each contiguous stretch of contact (first, last) from the direction it
    was seated in (fem.fastener_groups), its peak contact pressure, the passes and the penetration left."""

    hole: int
    force: np.ndarray
    arcs: tuple[tuple[float, float], ...]
    seat: float
    peak_pressure: float
    passes: int
    penetration: float

    @property
    def arc(self) -> tuple[float, float]:
        """(first, last) angle of the contact from the seat (degrees), (0, 0) for none."""
        return (self.arcs[0][0], self.arcs[-1][1]) if self.arcs else (0.0, 0.0)


def rigid_pin(spec: PartSpec) -> bool:
    """True when the part is loaded through a rigid-contact pin."""
    return spec.load.pin is not None and spec.load.pin.contact == "rigid"


def held_pin_groups(spec: PartSpec) -> tuple[FastenerGroup, ...]:
    """Each pin hold as a one-fastener group that holds the part (its member fixed): a rigid, neat-fit pin."""
    return tuple(FastenerGroup(hold.key, group_holes(spec.holes, [hold.pin]),
                               Fastener(spec.holes[hold.pin - 1].diameter, 0.0))
                 for hold in spec.support.holds if hold.pin is not None)


def pin_groups(spec: PartSpec) -> tuple[FastenerGroup, ...]:
    """The pins of spec.load's case as one-fastener groups: its rigid loading pin first, then every pin hold."""
    return ((pin_group(spec),) if rigid_pin(spec) else ()) + held_pin_groups(spec)


def contact_groups(spec: PartSpec) -> tuple[FastenerGroup, ...]:
    """The fastener groups of spec.load's case: the pins (`pin_groups`), then the part file's fastener
    groups (fem.fastener_part)."""
    return pin_groups(spec) + part_groups(spec)


def part_fastener_results(solved: GroupsSolve, spec: PartSpec, mesh: Mesh) -> PartFasteners | None:
    """The part file's fastener groups out of the case's contact solve (fem.fastener_part.PartFasteners), or
    None when the part has none."""
    return part_fasteners(solved, mesh, len(pin_groups(spec)), contact_groups(spec)) if spec.fasteners else None


def has_contact(spec: PartSpec) -> bool:
    """True when solving the case needs the contact iteration: a rigid loading pin, any pin hold or any
    fastener group."""
    return bool(contact_groups(spec))


def solve_contact(K: sp.spmatrix, f: np.ndarray, fixed: np.ndarray, spec: PartSpec, mesh: Mesh,
                  start=None) -> GroupsSolve:
    """Displacements of the part with its loading pin and pin holds in contact (fem.fastener_groups).
    start: per fastener (in contact_groups order), a coarser mesh's contact arcs, or None."""
    return solve_fastener_groups(K, f, fixed, mesh, contact_groups(spec), spec.plate.thickness,
                                 spec.support.symmetry, symmetry_tolerance(spec), spec.mesh.solver, start)


def group_forces(solved: GroupsSolve, spec: PartSpec, holding: bool) -> np.ndarray:
    """(2n,) the contact forces on the part of the holding groups (`holding`) or of the loading pin."""
    groups = contact_groups(spec)
    fastener_holds = np.array([groups[f.group].holding for f in solved.fasteners], dtype=bool)
    mine = fastener_holds[solved.contact.fastener] == holding
    nodes = solved.contact.nodes[mine]
    out = np.zeros_like(solved.forces)
    out[2 * nodes], out[2 * nodes + 1] = solved.forces[2 * nodes], solved.forces[2 * nodes + 1]
    return out


def held_pins(solved: GroupsSolve, spec: PartSpec) -> tuple[HeldPin, ...]:
    """The contact of every pin hold (fem.fastener_groups results, whole fasteners)."""
    groups = pin_groups(spec)
    out = []
    for f in solved.fasteners:
        if f.group < len(groups) and groups[f.group].holding:
            number = next(h.pin for h in spec.support.holds if h.key == groups[f.group].name)
            out.append(HeldPin(number, f.force.copy(), f.arcs, f.seat, f.peak_pressure, solved.passes, f.penetration))
    return tuple(out)


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
    / thickness on the holes of the pin and the pin holds, zero elsewhere (for the exact edge state,
    fem.recovery)."""
    return fastener_contact_pressure(mesh, solved.contact, solved.normal_force, contact_groups(spec),
                                     spec.plate.thickness)


def full_part_contact(spec: PartSpec, mesh: Mesh, solved: GroupsSolve, pressure: np.ndarray) -> PinContact:
    """The loading pin's contact on the full part: the modelled contact forces with their mirror images (a
    node on a plane gathers both halves, as the plane's reactions do: fem.symmetry), and its arc. The pin
    is the first fastener of the solve (fem.contact.contact_groups)."""
    on = solved.active & (solved.contact.fastener == 0)
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
    fastener = solved.fasteners[0]
    own_nodes = solved.contact.nodes[solved.contact.fastener == 0]
    return PinContact(pin.clearance, points, forces, arc, solved.passes,
                      (float(fastener.displacement[0]), float(fastener.displacement[1])),
                      fastener.penetration, float(pressure[own_nodes].max()))
