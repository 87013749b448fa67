"""A window: a rectangular cut-out with rounded corners (an access or inspection opening), at any angle,
anywhere in the plate.

    [[window]]
    center = [0.0, 0.0]
    length = 60.0         # mm along its own axis, end to end
    width = 30.0          # mm across it
    radius = 6.0          # corner radius; less than half the width and half the length
    angle = 0.0           # degrees from +x to the length axis

Its four corner arcs are graded and banded by the corner radius (where the peak sits), its straight sides
as strips; its net section is the cut across the load through its centre. No handbook case is built in.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import TYPE_CHECKING, Any, ClassVar

from ..errors import PartError
from ..readers import positive
from ..shapes import Arc, Line, Loop, Point, Segment
from ..units import format_quantity
from .base import (CurvedEdges, NetCut, Oriented, across, describe_oriented, mirror_oriented, opens_onto_no_edge,
                   read_oriented)

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "window"


@dataclass(frozen=True)
class Window(Oriented):
    """Rounded-rectangular cut-out: centre (x, y) in mm, length along its own axis and width across it (mm),
    angle in degrees from +x to the length axis, and the radius of its four corners (mm)."""

    KIND: ClassVar[str] = NAME
    radius: float


def read(t: dict[str, Any], where: str, units: str) -> Window:
    window = Window(**read_oriented(t, where, units, ("radius",)), radius=positive(t, "radius", where, "length", units))
    if not 2.0 * window.radius < min(window.length, window.width):
        raise PartError(f"{where}.radius: {format_quantity(window.radius, 'length', units)} must be less than half "
                        f"the width and half the length ({format_quantity(0.5 * min(window.length, window.width), 'length', units)}); "
                        "a window rounded that far is a slot or a hole")
    return window


@dataclass(frozen=True)
class WindowShape:
    """A window's closed profile (counter-clockwise: side, corner, side, ...), its four corner arcs
    (counter-clockwise angles, material outside) and its four sides with their unit normals into the
    material."""

    wire: tuple[Segment, ...]
    corners: tuple[Arc, ...]
    sides: tuple[tuple[Line, Point], ...]


def shape(window: Window) -> WindowShape:
    r = window.radius
    a, b = 0.5 * window.length - r, 0.5 * window.width - r  # half distances between the corner centres
    t = math.radians(window.angle)
    e, n = (math.cos(t), math.sin(t)), (-math.sin(t), math.cos(t))
    cx, cy = window.center

    def p(s: float, q: float) -> Point:
        return (cx + s * e[0] + q * n[0], cy + s * e[1] + q * n[1])

    wire: list[Segment] = []
    corners, sides = [], []
    # going round counter-clockwise from the -n side: each side, then the corner after it
    for k, (su, qu, normal) in enumerate((((-a, a), (-b - r, -b - r), (-n[0], -n[1])), ((a + r, a + r), (-b, b), e),
                                          ((a, -a), (b + r, b + r), n), ((-a - r, -a - r), (b, -b), (-e[0], -e[1])))):
        side = Line(p(su[0], qu[0]), p(su[1], qu[1]))
        corner = (a, -b) if k == 0 else (a, b) if k == 1 else (-a, b) if k == 2 else (-a, -b)
        start = t + (k - 1) * 0.5 * math.pi
        arc = Arc(p(*corner), r, start, start + 0.5 * math.pi)
        wire += [side, arc]
        corners.append(arc)
        sides.append((side, normal))
    return WindowShape(tuple(wire), tuple(corners), tuple(sides))


def loops(spec: PartSpec, window: Window) -> tuple[Loop, ...]:
    return (shape(window).wire,)


mouths = opens_onto_no_edge


def curved(spec: PartSpec, window: Window) -> CurvedEdges:
    s = shape(window)
    return CurvedEdges(arcs=s.corners, strips=s.sides, curvature=window.radius)


def cut(spec: PartSpec, window: Window) -> NetCut:
    """Across the load through the centre; it reaches half the window's extent along x."""
    t, r = math.radians(window.angle), window.radius
    half = (0.5 * window.length - r) * abs(math.cos(t)) + (0.5 * window.width - r) * abs(math.sin(t)) + r
    return across(window.center[0], half)


def mirrored(window: Window, plane: str) -> Window:
    return mirror_oriented(window, plane)


def check(spec: PartSpec, window: Window, where: str) -> None:
    """A window's own limit (corners smaller than its half width and half length) is read with it; the
    placement checks every raiser gets (geometry/validate.py) do the rest."""


def record(window: Window) -> dict[str, Any]:
    return asdict(window)


def describe(window: Window, units: str) -> str:
    return f"{describe_oriented(window, units)}, corner radius {format_quantity(window.radius, 'length', units)}"
