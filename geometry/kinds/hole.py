"""A circular through-hole anywhere in the plate: off the centre line, near an edge, in rows.

    [[hole]]
    center = [60.0, 30.0]   # mm
    diameter = 11.0         # mm

Pins ([load.pin]) and lugs ([lug]) refer to holes by their number (`named`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, ClassVar

from ..readers import known, point, positive
from ..shapes import Arc, Loop
from ..units import format_point, format_quantity
from .base import CurvedEdges, NetCut, RaiserId, across, mirror_point, opens_onto_no_edge

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "hole"


@dataclass(frozen=True)
class Hole:
    """Circular through-hole: centre (x, y) in mm and diameter in mm."""

    KIND: ClassVar[str] = NAME
    center: tuple[float, float]
    diameter: float

    @property
    def radius(self) -> float:
        return 0.5 * self.diameter


def named(number: int) -> RaiserId:
    """The name of hole `number` (1-based), as a pin or a lug gives it."""
    return RaiserId(NAME, number)


def read(t: dict[str, Any], where: str, units: str) -> Hole:
    known(t, {"center", "diameter"}, where)
    return Hole(center=point(t, "center", where, units), diameter=positive(t, "diameter", where, "length", units))


def circle(hole: Hole) -> Arc:
    """The hole's edge: one whole turn counter-clockwise from +x."""
    return Arc(hole.center, hole.radius, 0.0, 2.0 * math.pi)


def loops(spec: PartSpec, hole: Hole) -> tuple[Loop, ...]:
    return ((circle(hole),),)


mouths = opens_onto_no_edge


def curved(spec: PartSpec, hole: Hole) -> CurvedEdges:
    return CurvedEdges(arcs=(circle(hole),), curvature=hole.radius)


def cut(spec: PartSpec, hole: Hole) -> NetCut:
    """Across the load through the centre, where the hole's chord across the load is longest."""
    return across(hole.center[0], hole.radius)


def mirrored(hole: Hole, plane: str) -> Hole:
    return Hole(mirror_point(hole.center, plane), hole.diameter)


def check(spec: PartSpec, hole: Hole, where: str) -> None:
    """A round hole has no limits of its own: the placement checks every raiser gets (inside the outline,
    clear of its edges and of the other raisers, geometry/validate.py) are all it needs."""


def record(hole: Hole) -> dict[str, Any]:
    return {"center": list(hole.center), "diameter": hole.diameter}


def describe(hole: Hole, units: str) -> str:
    return f"Ø{format_quantity(hole.diameter, 'length', units)}, centre {format_point(hole.center, units)}"
