"""The bar outline: a straight flat bar, `plate.length` along x (the load) and `plate.width` across, its
origin at the centre; the left end (x = -length/2) is the held end and the right end the loaded one. Its
long edges may change width at a shoulder step (geometry/kinds/stepped.py, [step]) and its loaded end may
be rounded about a pin hole (geometry/kinds/lug_end.py, [lug]); the two combine.

Everything that speaks of ends, sides and half widths is bar-specific and lives here (and in those two
modules); code that only needs a size scale asks `geometry.registry.outline_size`.
"""

from __future__ import annotations

from dataclasses import asdict
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from pathlib import Path

from ..shapes import Edge, Line, Segment, segment_points
from ..units import format_quantity
from . import lug_end, stepped
from .base import OutlineRaiser, RaiserId

if TYPE_CHECKING:
    from ..spec import PartSpec

NAME = "bar"
TABLES = (stepped.TABLE, lug_end.TABLE)
ENDS = ("held", "loaded")


def read(data: dict[str, Any], spec: PartSpec, base: Path | None = None) -> dict[str, Any]:
    """The [step] and [lug] tables as PartSpec fields."""
    return {"step": stepped.read(data, spec.units, spec.plate.width),
            "lug": lug_end.read(data, len(spec.holes))}


def long_edges(spec: PartSpec) -> tuple[float, float]:
    """(x_left, x_right): where the long edges run along x (mm): from end to end, or to the centre of a
    lug's rounded end."""
    half_l = 0.5 * spec.plate.length
    lug = lug_end.lug_end(spec)
    x_left = lug.center[0] if lug and lug.end == "held" else -half_l
    x_right = lug.center[0] if lug and lug.end == "loaded" else half_l
    return x_left, x_right


def path(spec: PartSpec) -> tuple[Edge, ...]:
    """The outer boundary as a closed counter-clockwise chain of named lines and arcs (material on the
    left): bottom edge left to right, loaded end, top edge right to left, held end."""
    half_l, units = 0.5 * spec.plate.length, spec.units
    lug = lug_end.lug_end(spec)
    top = stepped.top_chain(spec, *long_edges(spec))
    chain = [_edge(e.segment.mapped(1, -1), _image(e.name), e.label, units) for e in top]
    right_y = segment_points(top[-1].segment)[1][1]
    left_y = segment_points(top[0].segment)[0][1]
    if lug and lug.end == "loaded":
        chain += lug_end.end_arcs(lug)
    else:
        chain.append(Edge(Line((half_l, -right_y), (half_l, right_y)), "loaded",
                          f"the loaded end x = {format_quantity(half_l, 'length', units)}"))
    chain += [_edge(e.segment.reversed(), e.name, e.label, units) for e in reversed(top)]
    if lug and lug.end == "held":
        chain += lug_end.end_arcs(lug)
    else:
        chain.append(Edge(Line((-half_l, left_y), (-half_l, -left_y)), "held",
                          f"the held end x = {format_quantity(-half_l, 'length', units)}"))
    return tuple(chain)


def _image(name: str | RaiserId) -> str | RaiserId:
    """The name of an edge's mirror image in y = 0 (a fillet's is the other fillet)."""
    return stepped.mirrored(name, "y") if isinstance(name, RaiserId) else name


def _edge(segment: Segment, name: str | RaiserId, label: str, units: str) -> Edge:
    """An edge of the long sides, labelled for messages in the part file's `units` ("the side y = 40 mm",
    "the fillet 1")."""
    if name == "side":
        label = f"the side y = {format_quantity(segment_points(segment)[0][1], 'length', units)}"
    elif isinstance(name, RaiserId):
        label = f"the {name}"
    return Edge(segment, name, label)


def raisers(spec: PartSpec) -> tuple[OutlineRaiser, ...]:
    return stepped.raisers(spec)


def mirrored(spec: PartSpec, raiser: RaiserId, plane: str) -> RaiserId | None:
    return stepped.mirrored(raiser, plane)


def features(spec: PartSpec) -> tuple[str, ...]:
    """"step" and "lug" when the bar has them."""
    return tuple(name for name, value in ((stepped.TABLE, spec.step), (lug_end.TABLE, spec.lug)) if value is not None)


def size(spec: PartSpec) -> tuple[float, float]:
    return spec.plate.length, spec.plate.width


def bounds(spec: PartSpec) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) in mm: the bar is centred on the origin."""
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    return -half_l, -half_w, half_l, half_w


def half_width_at(spec: PartSpec, x: float) -> float | None:
    """Half the bar's width at x on a straight long edge (mm); None inside a step's fillet zone."""
    return stepped.half_width_at(spec, x)


def end_half_width(spec: PartSpec, end: str) -> float:
    """Half the width (mm) of the "held" (x = -length/2) or "loaded" (x = +length/2) end."""
    x = 0.5 * spec.plate.length * (1.0 if end == "loaded" else -1.0)
    half = stepped.half_width_at(spec, x)
    return 0.5 * spec.plate.width if half is None else half


def straight_held_end(spec: PartSpec) -> bool:
    """True unless the held end is a lug held by its pin, which takes any transverse force at its bearing
    point instead."""
    lug = lug_end.lug_end(spec)
    return lug is None or lug.end != "held"


def rectangular(spec: PartSpec) -> bool:
    """A plain rectangle: no step, no lug end."""
    return not features(spec)


def check(spec: PartSpec, limit: float) -> None:
    stepped.check(spec, limit, *long_edges(spec))
    lug_end.check(spec)


def record(spec: PartSpec) -> dict[str, Any]:
    """The [step] and [lug] tables as given (mm), only those the part has."""
    return {key: asdict(value) for key, value in ((stepped.TABLE, spec.step), (lug_end.TABLE, spec.lug))
            if value is not None}
