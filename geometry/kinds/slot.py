"""An obround slot: two semicircular ends joined by straight sides, at any angle.

    [[slot]]
    center = [0.0, 0.0]
    length = 60.0         # mm end to end
    width = 18.0          # mm (twice the end radius)
    angle = 0.0           # degrees from +x to the length axis

Its ends are graded and banded as arcs, its straight sides as strips.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import TYPE_CHECKING, Any, ClassVar

from ..errors import PartError
from ..shapes import Arc, Line, Loop, Point, Segment
from ..units import format_quantity
from .base import (CurvedEdges, NetCut, Oriented, across, describe_oriented, mirror_oriented, opens_onto_no_edge,
                   read_oriented)

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "slot"


@dataclass(frozen=True)
class Slot(Oriented):
    """Obround slot: centre (x, y) in mm, overall length end to end and width (= twice the end radius) in
    mm, angle in degrees from +x to the length axis."""

    KIND: ClassVar[str] = NAME


def read(t: dict[str, Any], where: str, units: str) -> Slot:
    slot = Slot(**read_oriented(t, where, units))
    if slot.length <= slot.width:
        raise PartError(f"{where}.length: {format_quantity(slot.length, 'length', units)} must exceed the width "
                        f"{format_quantity(slot.width, 'length', units)} (the length runs end to end; a slot no longer "
                        "than it is wide is a hole)")
    return slot


@dataclass(frozen=True)
class SlotShape:
    """A slot's closed profile, its two end arcs (counter-clockwise, material outside) and its two straight
    sides with the unit normal pointing into the material."""

    wire: tuple[Segment, ...]
    ends: tuple[Arc, Arc]
    sides: tuple[tuple[Line, Point], tuple[Line, Point]]


def shape(slot: Slot) -> SlotShape:
    r = 0.5 * slot.width
    a = 0.5 * (slot.length - slot.width)
    t = math.radians(slot.angle)
    e, n = (math.cos(t), math.sin(t)), (-math.sin(t), math.cos(t))
    cx, cy = slot.center

    def p(s: float, q: float) -> Point:
        return (cx + s * e[0] + q * n[0], cy + s * e[1] + q * n[1])

    front = Arc(p(a, 0.0), r, t - 0.5 * math.pi, t + 0.5 * math.pi)
    back = Arc(p(-a, 0.0), r, t + 0.5 * math.pi, t + 1.5 * math.pi)
    upper, lower = Line(p(-a, r), p(a, r)), Line(p(a, -r), p(-a, -r))
    wire = (upper, Arc(front.center, r, t + 0.5 * math.pi, t), Arc(front.center, r, t, t - 0.5 * math.pi),
            lower, Arc(back.center, r, t + 1.5 * math.pi, t + math.pi), Arc(back.center, r, t + math.pi, t + 0.5 * math.pi))
    return SlotShape(wire, (front, back), ((upper, n), (lower, (-n[0], -n[1]))))


def loops(spec: PartSpec, slot: Slot) -> tuple[Loop, ...]:
    return (shape(slot).wire,)


mouths = opens_onto_no_edge


def curved(spec: PartSpec, slot: Slot) -> CurvedEdges:
    s = shape(slot)
    return CurvedEdges(arcs=s.ends, strips=s.sides, curvature=0.5 * slot.width)


def cut(spec: PartSpec, slot: Slot) -> NetCut:
    """Across the load through the centre; it reaches half the slot's extent along x."""
    t = math.radians(slot.angle)
    return across(slot.center[0], 0.5 * (slot.length - slot.width) * abs(math.cos(t)) + 0.5 * slot.width)


def mirrored(slot: Slot, plane: str) -> Slot:
    return mirror_oriented(slot, plane)


def check(spec: PartSpec, slot: Slot, where: str) -> None:
    """A slot's own limit (longer than wide) is read with it; the placement checks every raiser gets
    (geometry/validate.py) do the rest."""


def record(slot: Slot) -> dict[str, Any]:
    return asdict(slot)


def describe(slot: Slot, units: str) -> str:
    return describe_oriented(slot, units)
