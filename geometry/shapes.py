"""The exact shape of the part: its outline and every cut-out as straight lines and circular arcs (plus
ellipses), shared by the shapely outline (validation, sections), the gmsh model and the mesh grading.

Coordinates in mm, origin at the plate centre, x along the load. Angles of arcs in radians,
counter-clockwise from +x about the arc's centre. Every curved raiser edge of a flat part is concave seen
from the material (holes, slot ends, notch roots, shoulder fillets): the material lies outside its circle.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from .kinds.base import RaiserId

Point = tuple[float, float]


@dataclass(frozen=True)
class Line:
    start: Point
    end: Point

    def reversed(self) -> Line:
        return Line(self.end, self.start)

    def mapped(self, fx: float, fy: float) -> Line:
        return Line((fx * self.start[0], fy * self.start[1]), (fx * self.end[0], fy * self.end[1]))


@dataclass(frozen=True)
class Arc:
    """Circular arc traversed from angle `start` to angle `end` (either sense; |end - start| <= 2 pi)."""

    center: Point
    radius: float
    start: float
    end: float

    def at(self, angle: float) -> Point:
        return (self.center[0] + self.radius * math.cos(angle), self.center[1] + self.radius * math.sin(angle))

    @property
    def first(self) -> Point:
        return self.at(self.start)

    @property
    def last(self) -> Point:
        return self.at(self.end)

    @property
    def span(self) -> float:
        return abs(self.end - self.start)

    @property
    def ccw(self) -> tuple[float, float]:
        """(low, high) angles with low < high."""
        return (min(self.start, self.end), max(self.start, self.end))

    def reversed(self) -> Arc:
        return Arc(self.center, self.radius, self.end, self.start)

    def mapped(self, fx: float, fy: float) -> Arc:
        """Mirror image for fx, fy in {1, -1} (x -> fx x, y -> fy y)."""
        def angle(a: float) -> float:
            c, s = fx * math.cos(a), fy * math.sin(a)
            return math.atan2(s, c)
        a0 = angle(self.start)
        sense = (self.end - self.start) * fx * fy  # a mirror reverses the sense of rotation
        a1 = a0 + math.copysign(self.span, sense)
        return Arc((fx * self.center[0], fy * self.center[1]), self.radius, a0, a1)


Segment = Line | Arc


def segment_points(seg: Segment) -> tuple[Point, Point]:
    return (seg.start, seg.end) if isinstance(seg, Line) else (seg.first, seg.last)


def split_arc(arc: Arc, most: float = 0.5 * math.pi + 1e-9) -> list[Arc]:
    """The arc in equal pieces of at most `most` radians."""
    n = max(1, math.ceil(arc.span / most - 1e-9))
    step = (arc.end - arc.start) / n
    return [Arc(arc.center, arc.radius, arc.start + k * step, arc.start + (k + 1) * step) for k in range(n)]


@dataclass(frozen=True)
class Edge:
    """A piece of the outline: its line or arc, its name (what loads and supports refer to: "held",
    "loaded", "side", "lug end", "shoulder"; a concave raiser edge is named by its RaiserId) and the
    words that name it in a message, in the part file's units ("the side y = 40 mm")."""

    segment: Segment
    name: str | RaiserId
    label: str = ""


@dataclass(frozen=True)
class EllipseShape:
    """Semi-axes major >= minor (mm) and the direction of the major axis (radians from +x)."""

    center: Point
    major: float
    minor: float
    angle: float

    @property
    def tip_radius(self) -> float:
        """Smallest radius of curvature (at the ends of the major axis), mm."""
        return self.minor ** 2 / self.major

    def point(self, t: float, grow: float = 0.0) -> Point:
        """Point at parameter t on the ellipse, or on the confocal ellipse whose major semi-axis is
        larger by `grow` (mm)."""
        a = self.major + grow
        b = math.sqrt(max(a * a - (self.major ** 2 - self.minor ** 2), 0.0))
        x, y = a * math.cos(t), b * math.sin(t)
        c, s = math.cos(self.angle), math.sin(self.angle)
        return (self.center[0] + c * x - s * y, self.center[1] + s * x + c * y)

    def confocal_minor(self, grow: float) -> float:
        a = self.major + grow
        return math.sqrt(max(a * a - (self.major ** 2 - self.minor ** 2), 0.0))


Loop = tuple[Segment, ...] | EllipseShape  # a closed boundary: a chain of lines and arcs, or a whole ellipse


def full_circle(loop: Loop) -> Arc | None:
    """The circle when `loop` is one whole turn of an arc (a round hole), else None."""
    whole = isinstance(loop, tuple) and len(loop) == 1 and isinstance(loop[0], Arc)
    return loop[0] if whole and loop[0].span >= 2.0 * math.pi - 1e-12 else None
