"""An elliptical through-hole at any angle.

    [[ellipse]]
    center = [0.0, 0.0]
    length = 24.0         # mm along its own axis
    width = 10.0          # mm across it
    angle = 60.0          # degrees from +x to the length axis

Its edge is graded by its smallest radius of curvature, b^2 / a at the ends of the major axis.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import TYPE_CHECKING, Any, ClassVar

from ..shapes import EllipseShape, Loop
from .base import (CurvedEdges, NetCut, Oriented, across, describe_oriented, mirror_oriented, opens_onto_no_edge,
                   read_oriented)

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "ellipse"


@dataclass(frozen=True)
class Ellipse(Oriented):
    """Elliptical through-hole: centre (x, y) in mm, full length along its own axis and full width across
    it (mm), and angle in degrees, counter-clockwise from +x to the length axis."""

    KIND: ClassVar[str] = NAME


def read(t: dict[str, Any], where: str, units: str) -> Ellipse:
    return Ellipse(**read_oriented(t, where, units))


def shape(ellipse: Ellipse) -> EllipseShape:
    """Semi-axes major >= minor and the major axis's direction."""
    t = math.radians(ellipse.angle)
    if ellipse.length >= ellipse.width:
        return EllipseShape(ellipse.center, 0.5 * ellipse.length, 0.5 * ellipse.width, t)
    return EllipseShape(ellipse.center, 0.5 * ellipse.width, 0.5 * ellipse.length, t + 0.5 * math.pi)


def loops(spec: PartSpec, ellipse: Ellipse) -> tuple[Loop, ...]:
    return (shape(ellipse),)


mouths = opens_onto_no_edge


def curved(spec: PartSpec, ellipse: Ellipse) -> CurvedEdges:
    e = shape(ellipse)
    return CurvedEdges(ellipse=e, curvature=e.tip_radius)


def cut(spec: PartSpec, ellipse: Ellipse) -> NetCut:
    """Across the load through the centre; it reaches half the ellipse's extent along x."""
    e = shape(ellipse)
    return across(ellipse.center[0], math.hypot(e.major * math.cos(e.angle), e.minor * math.sin(e.angle)))


def mirrored(ellipse: Ellipse, plane: str) -> Ellipse:
    return mirror_oriented(ellipse, plane)


def check(spec: PartSpec, ellipse: Ellipse, where: str) -> None:
    """An ellipse has no limits of its own beyond the placement checks every raiser gets
    (geometry/validate.py) and the smallest resolvable radius of curvature (geometry/resolution.py)."""


def record(ellipse: Ellipse) -> dict[str, Any]:
    return asdict(ellipse)


def describe(ellipse: Ellipse, units: str) -> str:
    return describe_oriented(ellipse, units)
