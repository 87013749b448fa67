"""A cut-out of any shape: a closed chain of lines and arcs drawn by points (geometry/point_chain.py), or
an inner loop of a cut file that is not a round hole (geometry/kinds/drawn.py).

    [[cutout]]
    points = [[-20, -10], [20, -10], {to = [20, 10], bulge = 1.0}, [-20, 10]]

Its concave arcs (the material outside their circle) are where its peak is: the mesh is graded and banded
there by their smallest radius; its straight sides are graded (no layers: two sides may meet at a sharp
corner, geometry/sharp_corners.py). Its net section is the cut across the load through its centroid.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, ClassVar

from ..readers import known
from ..shapes import Arc, Line, Loop, Segment
from ..units import format_point, format_quantity
from .base import CurvedEdges, NetCut, across, opens_onto_no_edge

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "cutout"
SHARP_GRADING = 0.1  # of its shortest piece: the grading radius of a cut-out with no concave arc


@dataclass(frozen=True)
class Cutout:
    """A drawn cut-out: its closed chain of lines and arcs (mm), counter-clockwise round the hole it
    leaves, and where it was drawn ("cutout 1.points", or the cut file's pieces)."""

    KIND: ClassVar[str] = NAME
    wire: tuple[Segment, ...]
    drawn: str = "points"


def read(t: dict[str, Any], where: str, units: str) -> Cutout:
    from ..point_chain import read_points

    known(t, {"points"}, where)
    return Cutout(read_points(t, where, units).outline, "points")


def loops(spec: PartSpec, item: Cutout) -> tuple[Loop, ...]:
    return (item.wire,)


mouths = opens_onto_no_edge


def concave_arcs(wire: tuple[Segment, ...]) -> tuple[Arc, ...]:
    """The arcs of a counter-clockwise cut-out wire that the material lies outside of (those turning
    counter-clockwise round the hole), with counter-clockwise angles."""
    return tuple(s for s in wire if isinstance(s, Arc) and s.end > s.start)


def curved(spec: PartSpec, item: Cutout) -> CurvedEdges:
    from ..cutloops import segment_length

    arcs = concave_arcs(item.wire)
    lines = tuple(s for s in item.wire if isinstance(s, Line))
    radius = min((a.radius for a in arcs), default=SHARP_GRADING * min(segment_length(s) for s in item.wire))
    return CurvedEdges(arcs=arcs, curvature=radius, lines=lines)


def bounds(item: Cutout) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) of the cut-out (mm)."""
    from ..outline import wire_polygon

    return tuple(float(v) for v in wire_polygon(item.wire).bounds)  # type: ignore[return-value]


def cut(spec: PartSpec, item: Cutout) -> NetCut:
    """Across the load through its centroid; it reaches to its farther side along x."""
    from ..outline import wire_polygon

    region = wire_polygon(item.wire)
    cx = float(region.centroid.x)
    x0, _, x1, _ = region.bounds
    return across(cx, max(cx - x0, x1 - cx))


def mirrored(item: Cutout, plane: str) -> Cutout:
    fx, fy = (-1.0, 1.0) if plane == "x" else (1.0, -1.0)
    return Cutout(tuple(s.mapped(fx, fy).reversed() for s in reversed(item.wire)), item.drawn)


def check(spec: PartSpec, item: Cutout, where: str) -> None:
    """Its chain was checked as it was read (closed, simple, no zero-length piece); the placement checks
    every raiser gets (geometry/validate.py) do the rest."""


def record(item: Cutout) -> dict[str, Any]:
    x0, y0, x1, y1 = bounds(item)
    return {"drawn": item.drawn, "pieces": len(item.wire), "bounds": [x0, y0, x1, y1]}


def describe(item: Cutout, units: str) -> str:
    x0, y0, x1, y1 = bounds(item)
    return (f"drawn, {len(item.wire)} pieces, {format_quantity(x1 - x0, 'length', units)} × "
            f"{format_quantity(y1 - y0, 'length', units)} from {format_point((x0, y0), units)}")
