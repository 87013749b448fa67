"""Edge notches on the bar's long edges: on the top (+y) edge, the bottom edge, or both (an opposite
pair, one raiser).

    [[notch]]
    x = -60.0             # the notch's axis (mm)
    side = "both"         # "top", "bottom" or "both"
    shape = "U"           # "U" (depth, radius), "V" (depth, radius, angle) or "semicircle" (radius)
    depth = 6.0           # edge to the bottom of the root; a U shallower than its radius is a circular arc
    radius = 3.0          # root radius
    angle = 60.0          # V only: the opening angle between the flanks (degrees)

A notch is cut from the edge it opens onto: its cut-out reaches NOTCH_MARGIN of the width beyond the edge
(clean booleans), its root arc is graded and banded, and its net section is the cut across the bar
through its axis. It needs a straight long edge of the bar outline (geometry/kinds/bar.py) at its x.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import TYPE_CHECKING, Any, ClassVar

from ..errors import PartError
from ..readers import choice, known, number, positive
from ..shapes import Arc, Line, Loop, Point, Segment
from ..units import format_quantity
from . import bar, stepped
from .base import CurvedEdges, NetCut, across

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "notch"
SHAPES = ("U", "V", "semicircle")
SIDES = ("top", "bottom", "both")  # top is the long edge at +y
NOTCH_MARGIN = 0.05  # the cut-out reaches this fraction of the width beyond the edge
# A U notch whose depth is within this fraction of its radius, but not equal to it, has either flanks a
# sliver long or a root arc that meets the edge almost along its own radius: either way the band's end
# line runs a sliver away from the edge and the mesher makes degenerate triangles there (seen up to 1 %
# below and 0.2 % above the radius; tests/test_pipeline_findings.py)
NEAR_SEMICIRCLE = 0.03


@dataclass(frozen=True)
class Notch:
    """Edge notch on a long edge (or a pair, one on each edge): axis at x (mm), depth from the edge to the
    bottom of the root (mm), root radius (mm) and, for a V, the opening angle between its flanks (degrees).
    A semicircular notch has depth = radius. A U notch shallower than its radius is a circular arc of that
    radius cut to that depth."""

    KIND: ClassVar[str] = NAME
    x: float
    side: str
    shape: str
    depth: float
    radius: float
    angle: float = 0.0


def read(t: dict[str, Any], where: str, units: str) -> Notch:
    shape = choice(t, "shape", where, SHAPES)
    keys = {"x", "side", "shape", "radius"} | ({"depth"} if shape != "semicircle" else set()) | (
        {"angle"} if shape == "V" else set())
    if shape == "semicircle" and "depth" in t:
        raise PartError(f"{where}.depth: a semicircular notch is as deep as its radius; give the radius only")
    if shape != "V" and "angle" in t:
        raise PartError(f"{where}.angle: only a V notch has an opening angle")
    known(t, keys, where)
    radius = positive(t, "radius", where, "length", units)
    depth = radius if shape == "semicircle" else positive(t, "depth", where, "length", units)
    angle = 0.0
    if shape == "V":
        angle = number(t, "angle", where)
        if not 0.0 < angle < 180.0:
            raise PartError(f"{where}.angle: {angle:g} degrees is outside the allowed range 0 < angle < 180")
    return Notch(x=number(t, "x", where, "length", units), side=choice(t, "side", where, SIDES),
                 shape=shape, depth=depth, radius=radius, angle=angle)


@dataclass(frozen=True)
class NotchShape:
    """One notch on one edge: its closed cut-out profile (reaching beyond the edge), its root arc (global,
    counter-clockwise), the half width of its mouth on the edge (mm) and the edge's y."""

    wire: tuple[Segment, ...]
    root: Arc
    mouth: float
    edge_y: float


def mouth_half_width(notch: Notch) -> float:
    """Half the width of the notch's mouth on the edge (mm)."""
    h, r = notch.depth, notch.radius
    if notch.shape == "V":
        half = math.radians(0.5 * notch.angle)
        return r * math.cos(half) + (h - r + r * math.sin(half)) * math.tan(half)
    return r if h >= r else math.sqrt(r * r - (r - h) ** 2)


def shapes(spec: PartSpec, notch: Notch) -> list[NotchShape]:
    """The notch's cut-outs, one per edge it is on (half width taken at the notch's x); none on a fillet."""
    half = bar.half_width_at(spec, notch.x)
    if half is None:
        return []
    margin = NOTCH_MARGIN * spec.plate.width
    sides = ("top", "bottom") if notch.side == "both" else (notch.side,)
    out = []
    for side in sides:
        wire, (lo, hi) = _local_notch(notch, margin)
        fy = -1.0 if side == "top" else 1.0  # local v (into the material) -> global y
        edge_y = half if side == "top" else -half

        def to_global(p: Point) -> Point:
            return (notch.x + p[0], edge_y + fy * p[1])

        segs: list[Segment] = []
        for seg in wire:
            if isinstance(seg, Line):
                segs.append(Line(to_global(seg.start), to_global(seg.end)))
            else:
                segs.append(Arc(to_global(seg.center), seg.radius, fy * seg.start, fy * seg.end))
        centre = to_global((0.0, notch.depth - notch.radius))
        root = Arc(centre, notch.radius, *sorted((fy * lo, fy * hi)))
        out.append(NotchShape(tuple(segs), root, mouth_half_width(notch), edge_y))
    return out


def _local_notch(notch: Notch, margin: float) -> tuple[list[Segment], tuple[float, float]]:
    """Cut-out profile in the notch's frame (u along the edge, v into the material, edge at v = 0) and the
    root arc's angle range in that frame. Arcs pass through the root bottom (angle pi/2) as two pieces."""
    h, r = notch.depth, notch.radius
    c = (0.0, h - r)
    if notch.shape == "V":
        half = math.radians(0.5 * notch.angle)
        lo, hi = half, math.pi - half
        t_right = (r * math.cos(half), h - r + r * math.sin(half))
        reach = (t_right[1] + margin) / math.cos(half)
        e_right = (t_right[0] + reach * math.sin(half), -margin)
        e_left, t_left = (-e_right[0], e_right[1]), (-t_right[0], t_right[1])
        wire = [Line(e_left, t_left), Arc(c, r, hi, 0.5 * math.pi), Arc(c, r, 0.5 * math.pi, lo),
                Line(t_right, e_right), Line(e_right, e_left)]
        return wire, (lo, hi)
    if h >= r:
        lo, hi = 0.0, math.pi
        left, right = (-r, h - r), (r, h - r)
        wire = [Line((-r, -margin), left), Arc(c, r, hi, 0.5 * math.pi), Arc(c, r, 0.5 * math.pi, lo),
                Line(right, (r, -margin)), Line((r, -margin), (-r, -margin))]
        return wire, (lo, hi)
    lo = math.asin((r - h) / r)
    hi = math.pi - lo
    m = math.sqrt(r * r - (r - h) ** 2)
    wire = [Line((-m, -margin), (-m, 0.0)), Arc(c, r, hi, 0.5 * math.pi), Arc(c, r, 0.5 * math.pi, lo),
            Line((m, 0.0), (m, -margin)), Line((m, -margin), (-m, -margin))]
    return wire, (lo, hi)


def loops(spec: PartSpec, notch: Notch) -> tuple[Loop, ...]:
    return tuple(s.wire for s in shapes(spec, notch))


def mouths(spec: PartSpec, notch: Notch) -> tuple[Point, ...]:
    """The middle of the mouth on each edge the notch is cut from."""
    return tuple((notch.x, s.edge_y) for s in shapes(spec, notch))


def curved(spec: PartSpec, notch: Notch) -> CurvedEdges:
    """The root arc of each cut-out as its two halves, either side of the notch's axis: the cut-out's wire
    is split there, so each band piece must end there too (a V opening 90 degrees or more, or a shallow U,
    has a root arc of a quarter turn or less, which one band piece would otherwise span: a five-cornered
    patch that gmsh cannot mesh transfinite)."""
    arcs = []
    for s in shapes(spec, notch):
        middle = 0.5 * (s.root.start + s.root.end)
        arcs += [Arc(s.root.center, s.root.radius, s.root.start, middle),
                 Arc(s.root.center, s.root.radius, middle, s.root.end)]
    return CurvedEdges(arcs=tuple(arcs), curvature=notch.radius)


def cut(spec: PartSpec, notch: Notch) -> NetCut:
    """Across the bar through the notch's axis; it reaches half the mouth's width."""
    return across(notch.x, mouth_half_width(notch))


def mirrored(notch: Notch, plane: str) -> Notch:
    """In x = 0 the axis moves to -x; in y = 0 a notch on the top edge goes to the bottom (a pair stays)."""
    if plane == "x":
        return Notch(-notch.x, notch.side, notch.shape, notch.depth, notch.radius, notch.angle)
    side = {"top": "bottom", "bottom": "top"}.get(notch.side, notch.side)
    return Notch(notch.x, side, notch.shape, notch.depth, notch.radius, notch.angle)


def check(spec: PartSpec, notch: Notch, where: str) -> None:
    """On a straight long edge of the bar (not off its ends, not on a shoulder fillet), shallower than half
    the width there; a V at least as deep as its root radius."""
    x_left, x_right = bar.long_edges(spec)
    if not x_left < notch.x < x_right:
        units = spec.units
        raise PartError(f"{where}.x: {format_quantity(notch.x, 'length', units)} lies off the plate, whose long "
                        f"edges run from x = {format_quantity(x_left, 'length', units)} to "
                        f"{format_quantity(x_right, 'length', units)}; put the notch on an edge it cuts")
    def length(value: float) -> str:
        return format_quantity(value, "length", spec.units)

    half = bar.half_width_at(spec, notch.x)
    if half is None:
        lo, hi = stepped.fillet_zone(spec)
        raise PartError(f"{where}.x: x = {length(notch.x)} lies on the step's shoulder fillet (x = {length(lo)} to "
                        f"{length(hi)}); put the notch on a straight edge")
    if notch.depth >= half:
        raise PartError(f"{where}.depth: {length(notch.depth)} is not less than half the width at x = "
                        f"{length(notch.x)} ({length(half)})")
    near = abs(notch.depth - notch.radius) / notch.radius
    if notch.shape == "U" and 1e-12 < near < NEAR_SEMICIRCLE:
        raise PartError(f"{where}.depth: {length(notch.depth)} is within {near:.2%} of the radius "
                        f"{length(notch.radius)}; give the radius as the depth (a semicircle) or a depth that "
                        f"differs from it by at least {NEAR_SEMICIRCLE:.0%}")
    if notch.shape == "V" and notch.depth < notch.radius:
        raise PartError(f"{where}.depth: a V notch must be at least as deep as its root radius "
                        f"({length(notch.radius)}); got {length(notch.depth)}")


def record(notch: Notch) -> dict[str, Any]:
    return asdict(notch)


def describe(notch: Notch, units: str) -> str:
    opening = f" opening {notch.angle:g}°," if notch.shape == "V" else ""
    edges = "both edges" if notch.side == "both" else f"the {notch.side} edge"
    return (f"{notch.shape} {format_quantity(notch.depth, 'length', units)} deep, root radius "
            f"{format_quantity(notch.radius, 'length', units)},{opening} on {edges} at x = "
            f"{format_quantity(notch.x, 'length', units)}")
