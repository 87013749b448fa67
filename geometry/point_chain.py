"""A closed boundary drawn by points in the part file (the [outline] and every [[cutout]]), read into the
same exact loops a cut file gives (geometry/cutloops.py `CutLoops`), through the same chaining and refusals.

    points = [[0, 0], [120, 0],                       # a straight piece to each plain point
              {to = [140, 20], radius = 20, turn = "left"},    # an arc of that radius (the shorter one)
              {to = [140, 60], bulge = 0.4142},        # an arc by its bulge: tan(quarter of the turned angle),
                                                       # positive turning left (counter-clockwise)
              {to = [100, 60], center = [120, 60], turn = "right"}]   # an arc about a centre

The first entry is the start point; each later one draws a piece from the point before it; the chain is
closed by a straight piece from the last point back to the first (none when the last point is the first).
Lengths are in the part file's unit system, or strings with their own unit ("1.5 in").
"""

from __future__ import annotations

import math
from typing import Any

from .cutloops import GAP_TOLERANCE, CutLoops, DrawingUnits, Piece, cut_loops, segment_length
from .errors import PartError
from .readers import known, number, point, positive, shown
from .shapes import Arc, Line, Point, Segment
from .units import from_internal, unit_label

TURNS = ("left", "right")  # left: counter-clockwise, right: clockwise
SOURCE = "the part file's unit system"
MOST_POINTS = 10_000


def drawing_units(units: str) -> DrawingUnits:
    """The part file's length unit as a drawing unit (for places in messages)."""
    return DrawingUnits(unit_label("length", units), 1.0 / float(from_internal(1.0, "length", units)))


def read_points(t: dict[str, Any], where: str, units: str) -> CutLoops:
    """The closed chain t["points"] (module docstring) as exact loops in mm: one loop, counter-clockwise
    (`CutLoops.outline`). PartError naming `where.points` and the entry for anything malformed, and the
    chaining refusals (a zero-length piece, a piece drawn twice, a chain that crosses itself)."""
    items = t.get("points")
    key = f"{where}.points"
    if not isinstance(items, list) or not 2 <= len(items) <= MOST_POINTS:
        raise PartError(f"{key}: must be a list of 2 to {MOST_POINTS} entries: a start point [x, y], then points and "
                        f"arcs {{to = [x, y], ...}}; got {shown(items)}")
    start = _point(items[0], f"{key}[1]", units)
    pieces: list[Piece] = []
    here = start
    for k, item in enumerate(items[1:], start=2):
        name = f"{key}[{k}]"
        if isinstance(item, dict):
            to, seg = _arc(item, here, name, units)
        else:
            to = _point(item, name, units)
            seg = Line(here, to)
        pieces.append(Piece(seg, name))
        here = to
    if math.dist(here, start) > 0.0:
        pieces.append(Piece(Line(here, start), f"{key} (the closing line back to the first point)"))
    return cut_loops(pieces, drawing_units(units), SOURCE, GAP_TOLERANCE, GAP_TOLERANCE)


def _point(value: Any, name: str, units: str) -> Point:
    if not isinstance(value, list) or len(value) != 2:
        raise PartError(f"{name}: must be a point [x, y] or an arc {{to = [x, y], bulge | radius | center = ...}}; "
                        f"got {shown(value)}")
    return point({"p": value}, "p", name, units)


def _arc(t: dict[str, Any], here: Point, name: str, units: str) -> tuple[Point, Segment]:
    """The end point and the arc of an arc entry."""
    known(t, {"to", "bulge", "radius", "center", "turn"}, name)
    given = [k for k in ("bulge", "radius", "center") if k in t]
    if len(given) != 1:
        raise PartError(f"{name}: give exactly one of bulge, radius or center for an arc; got "
                        f"{', '.join(given) or 'none'}")
    to = point(t, "to", name, units)
    chord = math.dist(here, to)
    if chord <= GAP_TOLERANCE:
        raise PartError(f"{name}.to: the arc ends where it starts; draw a whole circle as a [[hole]] or as two arcs")
    if given[0] == "bulge":
        if "turn" in t:
            raise PartError(f"{name}.turn: a bulge gives its own turn (its sign: positive turns left); remove turn")
        bulge = number(t, "bulge", name)
        if bulge == 0.0:
            raise PartError(f"{name}.bulge: 0 is a straight piece; write the point [x, y] instead")
        return to, _from_bulge(here, to, bulge)
    turn = t.get("turn")
    if turn not in TURNS:
        raise PartError(f"{name}.turn: {'missing' if turn is None else shown(turn)} is not allowed; use left "
                        "(counter-clockwise) or right (clockwise)")
    sense = 1.0 if turn == "left" else -1.0
    if given[0] == "radius":
        radius = positive(t, "radius", name, "length", units)
        if radius < 0.5 * chord * (1.0 - 1e-12):
            from .units import format_quantity

            raise PartError(f"{name}.radius: {format_quantity(radius, 'length', units)} is less than half the "
                            f"distance between the arc's ends ({format_quantity(0.5 * chord, 'length', units)})")
        half = 0.5 * chord
        rise = math.sqrt(max(radius * radius - half * half, 0.0))
        mx, my = 0.5 * (here[0] + to[0]), 0.5 * (here[1] + to[1])
        ux, uy = (to[0] - here[0]) / chord, (to[1] - here[1]) / chord
        # the shorter arc: its centre lies on the side it turns towards
        center = (mx - sense * rise * uy, my + sense * rise * ux)
        return to, _about(center, here, to, sense)
    center = point(t, "center", name, units)
    r0, r1 = math.dist(center, here), math.dist(center, to)
    if abs(r0 - r1) > GAP_TOLERANCE or r0 <= GAP_TOLERANCE:
        from .units import format_quantity

        raise PartError(f"{name}.center: the arc's ends lie {format_quantity(r0, 'length', units)} and "
                        f"{format_quantity(r1, 'length', units)} from it; they must be equally far")
    return to, _about(center, here, to, sense)


def _about(center: Point, a: Point, b: Point, sense: float) -> Arc:
    """The arc about `center` from a to b turning counter-clockwise (sense 1) or clockwise (-1); its radius
    the mean of the two ends' distances."""
    radius = 0.5 * (math.dist(center, a) + math.dist(center, b))
    t0 = math.atan2(a[1] - center[1], a[0] - center[0])
    t1 = math.atan2(b[1] - center[1], b[0] - center[0])
    turned = (sense * (t1 - t0)) % (2.0 * math.pi)
    return Arc(center, radius, t0, t0 + sense * turned)


def _from_bulge(a: Point, b: Point, bulge: float) -> Arc:
    """The arc from a to b of bulge tan(theta / 4), theta the angle turned (positive: counter-clockwise)."""
    theta = 4.0 * math.atan(bulge)
    chord = math.dist(a, b)
    radius = chord / (2.0 * abs(math.sin(0.5 * theta)))
    mx, my = 0.5 * (a[0] + b[0]), 0.5 * (a[1] + b[1])
    ux, uy = (b[0] - a[0]) / chord, (b[1] - a[1]) / chord
    # signed distance of the centre from the chord's middle, to the left of a -> b
    offset = 0.5 * chord / math.tan(0.5 * theta)
    center = (mx - uy * offset, my + ux * offset)
    return _about(center, a, b, math.copysign(1.0, bulge))


def loop_length(loop: tuple[Segment, ...]) -> float:
    """Total length (mm) of a closed chain."""
    return float(sum(segment_length(s) for s in loop))
