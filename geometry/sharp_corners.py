"""Sharp inside corners: where two pieces of the boundary meet at a re-entrant angle with no radius.

At such a corner the elastic stress is unbounded (Williams' corner singularity: it grows as r^(lambda-1)
with lambda < 1 for any inside angle above 180 degrees, docs/references.md [Williams]), so the FE peak
there grows with every refinement and is no Kt. Each one is found on the exact boundary (the pieces of
geometry/boundary.py, material on the left: a vertex where the boundary turns clockwise by more than
SHARP_TURN), the peak search leaves out a zone of ZONE x the shorter adjoining piece around it
(fem/supports.py `singular_zone`), and the check reports the zone's peak on every level as the evidence
(compare/check.py `SharpCornerResult`).

The bar's own kinds have none (a notch's root, a step's fillet and a window's corners are radii, a slot's
ends half circles): only a drawn outline and drawn cut-outs are searched.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .kinds.base import RaiserId
from .shapes import Line, Point, Segment, segment_points
from .spec import PartSpec

SHARP_TURN = math.radians(1.0)  # a clockwise turn (material on the left) above this is a sharp inside corner
ZONE = 0.05  # of the shorter adjoining piece: the radius of the zone left out of the peak search


@dataclass(frozen=True)
class SharpCorner:
    """A sharp inside corner: where it is (mm), the radius of the zone around it left out of the peak search
    (mm), what it is on ("the outline", "cutout 1") and the material's angle there (degrees, above 180)."""

    point: Point
    zone: float
    on: str
    angle: float


def _tangent(seg: Segment, at_end: bool) -> tuple[float, float]:
    """The unit direction of travel at a piece's start or end."""
    if isinstance(seg, Line):
        dx, dy = seg.end[0] - seg.start[0], seg.end[1] - seg.start[1]
        n = math.hypot(dx, dy)
        return dx / n, dy / n
    angle = seg.end if at_end else seg.start
    sense = 1.0 if seg.end > seg.start else -1.0
    return -sense * math.sin(angle), sense * math.cos(angle)


def _length(seg: Segment) -> float:
    return math.dist(seg.start, seg.end) if isinstance(seg, Line) else seg.radius * seg.span


def searched(spec: PartSpec) -> bool:
    """Whether the part can have sharp inside corners: a drawn outline or a drawn cut-out."""
    return spec.outline != "bar" or any(r.KIND == "cutout" for r in spec.raisers)


def sharp_corners(spec: PartSpec) -> tuple[SharpCorner, ...]:
    """Every sharp inside corner of the part, the outline's first, each loop in its walking order."""
    if not searched(spec):
        return ()
    from .boundary import boundary_loops

    out = []
    for loop in boundary_loops(spec):
        if any(p.segment is None for p in loop) or len(loop) < 2:
            continue
        for a, b in zip(loop, loop[1:] + loop[:1]):
            ta, tb = _tangent(a.segment, True), _tangent(b.segment, False)
            turn = math.atan2(ta[0] * tb[1] - ta[1] * tb[0], ta[0] * tb[0] + ta[1] * tb[1])
            if turn >= -SHARP_TURN:
                continue
            on = "the outline" if a.loop == 0 else str(a.name) if isinstance(a.name, RaiserId) else a.label
            point = segment_points(a.segment)[1]
            zone = ZONE * min(_length(a.segment), _length(b.segment))
            out.append(SharpCorner((float(point[0]), float(point[1])), zone, on, 180.0 - math.degrees(turn)))
    return tuple(out)
