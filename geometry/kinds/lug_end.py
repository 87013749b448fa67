"""A lug end of the bar outline: the loaded end rounded about the pin hole, radius half the end's width.

    [lug]
    hole = 1              # the [[hole]] that takes the pin; it must sit half a width from the loaded end

A lug is pulled through its pin ([load.pin] with the same hole) and held at the far end.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ..errors import PartError
from ..readers import known, table
from ..shapes import Arc, Edge, Point
from ..units import format_point, format_quantity
from .hole import named
from .stepped import half_width_at

if TYPE_CHECKING:
    from ..spec import PartSpec

TABLE = "lug"
EDGE = "lug end"  # the name of the rounded end's two arcs


@dataclass(frozen=True)
class Lug:
    """A lug: the loaded end is a semicircle of half the end's width centred on hole `hole` (1-based), which
    takes the pin; the part is loaded through the pin ([load.pin]) and held at the far end."""

    hole: int


def read(data: dict[str, Any], holes: int) -> Lug | None:
    """The [lug] table (given the number of holes the part has), or None when the part file has none."""
    if TABLE not in data:
        return None
    t = table(data, TABLE)
    known(t, {"hole"}, TABLE)
    n = t.get("hole")
    if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= max(holes, 1) or holes == 0:
        allowed = f"1 to {holes}" if holes else "a [[hole]] to take the pin, which this part file does not have"
        raise PartError(f"lug.hole: must be the number of the [[hole]] that takes the pin ({allowed}); got {n!r}")
    return Lug(hole=n)


@dataclass(frozen=True)
class LugEnd:
    """Where the rounded end is: which end ("held" or "loaded"), its centre (mm) and radius (mm)."""

    end: str
    center: Point
    radius: float


def lug_end(spec: PartSpec) -> LugEnd | None:
    """The lug's rounded end, or None without a lug: at the end nearer its pin hole, centred half that end's
    width inside it."""
    if spec.lug is None:
        return None
    hole = spec.holes[spec.lug.hole - 1]
    end = "held" if hole.center[0] < 0.0 else "loaded"
    x_end = -0.5 * spec.plate.length if end == "held" else 0.5 * spec.plate.length
    half = half_width_at(spec, x_end)
    return LugEnd(end, (x_end + (half if end == "held" else -half), 0.0), half)


def end_arcs(lug: LugEnd) -> list[Edge]:
    """The rounded end as two quarter arcs, counter-clockwise along the outline."""
    start = -0.5 * math.pi if lug.end == "loaded" else 0.5 * math.pi
    label = "the lug's rounded end"
    return [Edge(Arc(lug.center, lug.radius, start, start + 0.5 * math.pi), EDGE, label),
            Edge(Arc(lug.center, lug.radius, start + 0.5 * math.pi, start + math.pi), EDGE, label)]


def check(spec: PartSpec) -> None:
    """The pin hole sits where the rounded end is centred, and the load suits the lug's end."""
    lug = lug_end(spec)
    if lug is None:
        return
    n, units = spec.lug.hole, spec.units
    hole = spec.holes[n - 1]
    if lug.end == "held":
        raise PartError(f"lug.hole: the lug is the loaded end, pulled through its pin against the held end; "
                        f"{named(n)} must be near x = +{format_quantity(0.5 * spec.plate.length, 'length', units)}")
    if math.dist(hole.center, lug.center) > 1e-6 * spec.plate.width:
        raise PartError(f"lug.hole: {named(n)} takes the pin, so its centre must be at "
                        f"{format_point(lug.center, units)}, half the width "
                        f"({format_quantity(lug.radius, 'length', units)}) from the {lug.end} end; got "
                        f"{format_point(hole.center, units)}")
    held = any(h.pin == n for h in spec.support.holds) or any(n in g.holes for g in spec.fasteners)
    for case in spec.load_cases:
        pin = case.load.pin
        if not held and (pin is None or pin.hole != n):
            raise PartError(f"lug: a lug is loaded through its pin; give [load.pin] with hole = {n} (the far end "
                            f"is held and carries the reaction), hold it with a [[hold]] pin = {n}, or put the hole "
                            "in a [[fasteners]] group")
