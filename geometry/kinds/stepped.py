"""A shoulder step of the bar outline: the width changes from plate.width to a narrow width through two
shoulder fillets, symmetric about the centre line.

    [step]
    x = 20.0              # where the fillets start on the wide side (mm)
    width = 40.0          # the narrow width (mm)
    radius = 6.0          # fillet radius; one larger than the step meets the wide edge at an angle
    narrow = "loaded"     # which end is narrow: "loaded" (default) or "held"

The two fillets are raisers of the outline, named ("fillet", 1) on the +y edge and ("fillet", 2) on the
-y edge, each graded, banded and converged on its own; their net section is where the fillets meet the
narrow edge (the section of width `step.width` that handbooks use).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ..errors import PartError
from ..readers import choice, known, number, positive, table
from ..shapes import Arc, Edge, Line
from ..units import format_quantity
from .base import CurvedEdges, OutlineRaiser, RaiserId, across

if TYPE_CHECKING:
    from ..spec import PartSpec

TABLE = "step"
FILLET = "fillet"  # the kind of the fillets' RaiserIds
TOP, BOTTOM = RaiserId(FILLET, 1), RaiserId(FILLET, 2)
NARROW_ENDS = ("loaded", "held")
CLEAR_OF = ("held", "loaded", "lug end")  # outline edges a fillet must keep a ligament to
# A fillet a little larger than the step meets the wide edge at a small angle, so its band's end line runs a
# sliver from the edge and the mesher made degenerate triangles there (seen at 1.3 % larger); as for a U
# notch near its radius (kinds/notch.py NEAR_SEMICIRCLE). A fillet a little smaller leaves a shoulder face,
# held to the ligament limit instead.
NEAR_STEP = 0.03


@dataclass(frozen=True)
class Step:
    """A shoulder step in width, symmetric about the centre line: the width changes from plate.width to the
    narrow `width` (mm) through shoulder fillets of `radius` (mm) that start at x (mm); `narrow` says which
    end is narrow. A fillet no larger than the step height h = (plate.width - width)/2 meets a square shoulder
    face; a larger one is tangent to the narrow edge and meets the wide edge at an angle."""

    x: float
    width: float
    radius: float
    narrow: str = "loaded"


def read(data: dict[str, Any], units: str, plate_width: float) -> Step | None:
    """The [step] table, or None when the part file has none."""
    if TABLE not in data:
        return None
    t = table(data, TABLE)
    known(t, {"x", "width", "radius", "narrow"}, TABLE)
    width = positive(t, "width", TABLE, "length", units)
    if width >= plate_width:
        raise PartError(f"step.width: the narrow width {format_quantity(width, 'length', units)} must be less than "
                        f"plate.width {format_quantity(plate_width, 'length', units)}")
    return Step(x=number(t, "x", TABLE, "length", units), width=width,
                radius=positive(t, "radius", TABLE, "length", units),
                narrow=choice(t, "narrow", TABLE, NARROW_ENDS, "loaded"))


@dataclass(frozen=True)
class StepShape:
    """Derived geometry of a step: half widths (mm), the fillet's length along x (mm), the x where the
    narrow edge starts (the critical section), the top and bottom fillet arcs, and the sign of x pointing
    from the wide to the narrow part."""

    wide: float
    narrow: float
    reach: float
    x_narrow: float
    fillets: tuple[Arc, Arc]
    sense: int


def step_shape(spec: PartSpec) -> StepShape | None:
    step = spec.step
    if step is None:
        return None
    hw, hn, r = 0.5 * spec.plate.width, 0.5 * step.width, step.radius
    h = hw - hn
    c = r if r <= h else math.sqrt(max(2.0 * r * h - h * h, 0.0))
    sense = 1 if step.narrow == "loaded" else -1
    wide_angle = -math.pi + (math.asin((r - h) / r) if r > h else 0.0)
    # top fillet in the frame where the narrow part is at +x: from the wide end to the narrow tangent point
    top = Arc((sense * step.x + c, hn + r), r, wide_angle, -0.5 * math.pi)
    if sense < 0:
        top = top.mapped(-1, 1)
    bottom = top.mapped(1, -1)
    return StepShape(hw, hn, c, step.x + sense * c, (top, bottom), sense)


def fillet_zone(spec: PartSpec) -> tuple[float, float] | None:
    """(x0, x1): where the fillets run along x (mm), None without a step."""
    shape = step_shape(spec)
    return None if shape is None else tuple(sorted((spec.step.x, shape.x_narrow)))  # type: ignore[return-value]


def half_width_at(spec: PartSpec, x: float) -> float | None:
    """Half the bar's width at x on a straight edge (mm); None inside a step's fillet zone."""
    shape = step_shape(spec)
    if shape is None:
        return 0.5 * spec.plate.width
    x0, x1 = fillet_zone(spec)
    if x < x0:
        return shape.wide if shape.sense > 0 else shape.narrow
    if x > x1:
        return shape.narrow if shape.sense > 0 else shape.wide
    return None


def top_chain(spec: PartSpec, x_left: float, x_right: float) -> list[Edge]:
    """The +y edge from x_left to x_right: sides, and a step's shoulder face and fillet."""
    shape = step_shape(spec)
    if shape is None:
        hw = 0.5 * spec.plate.width
        return [Edge(Line((x_left, hw), (x_right, hw)), "side")]
    step = spec.step
    # build with the narrow part at +x, then mirror if the narrow part is at the held end
    xs = shape.sense * step.x
    lo, hi = (x_left, x_right) if shape.sense > 0 else (-x_right, -x_left)
    fillet = shape.fillets[0] if shape.sense > 0 else shape.fillets[0].mapped(-1, 1)
    wide_point, narrow_point = fillet.first, fillet.last
    chain = [Edge(Line((lo, shape.wide), (xs, shape.wide)), "side")]
    if wide_point[1] < shape.wide - 1e-12 * shape.wide and abs(wide_point[0] - xs) < 1e-9 * shape.wide:
        chain.append(Edge(Line((xs, shape.wide), wide_point), "shoulder",
                          f"the shoulder at x = {format_quantity(step.x, 'length', spec.units)}"))
    chain.append(Edge(fillet, TOP, f"the {TOP}"))
    chain.append(Edge(Line(narrow_point, (hi, shape.narrow)), "side"))
    if shape.sense < 0:
        chain = [Edge(e.segment.mapped(-1, 1).reversed(), e.name, e.label) for e in reversed(chain)]
    return chain


def raisers(spec: PartSpec) -> tuple[OutlineRaiser, ...]:
    """The two fillets (top, then bottom), each a raiser with its own arc and the narrow section."""
    shape = step_shape(spec)
    if shape is None:
        return ()
    cut = across(shape.x_narrow, shape.reach + spec.step.radius)
    return tuple(OutlineRaiser(name, CurvedEdges(arcs=(Arc(a.center, a.radius, *a.ccw),), curvature=spec.step.radius),
                               cut, CLEAR_OF) for name, a in zip((TOP, BOTTOM), shape.fillets))


def mirrored(raiser: RaiserId, plane: str) -> RaiserId | None:
    """The fillets mirror each other in the plane y = 0; no step is symmetric about x = 0."""
    if plane != "y":
        return None
    return {TOP: BOTTOM, BOTTOM: TOP}.get(raiser)


def check(spec: PartSpec, limit: float, x_left: float, x_right: float) -> None:
    """The fillets fit between the ends of the long edges (x_left, x_right: mm) with a ligament to spare."""
    shape = step_shape(spec)
    if shape is None:
        return
    step = spec.step

    def length(value: float, digits: int = 4) -> str:
        return format_quantity(value, "length", spec.units, digits)

    narrow_end, wide_end = (x_right, x_left) if shape.sense > 0 else (x_left, x_right)
    room = (narrow_end - shape.x_narrow) * shape.sense
    if room < limit:
        raise PartError(f"step.radius: a {length(step.radius)} fillet from x = {length(step.x)} reaches x = "
                        f"{length(shape.x_narrow)}, which leaves {length(max(room, 0.0), 3)} of narrow part before "
                        f"the {step.narrow} end; at least {length(limit, 3)} is needed (a smaller radius or step.x)")
    face = shape.wide - shape.narrow - step.radius  # the shoulder face left beside a fillet below the step
    if 1e-12 * shape.wide < face < limit:  # as top_chain: a face shorter than that is none
        raise PartError(f"step.radius: a {length(step.radius)} fillet under a {length(shape.wide - shape.narrow)} "
                        f"step leaves a shoulder face of {length(face, 3)}; at least {length(limit, 3)} is needed, or "
                        f"a radius equal to the step (no face) or larger")
    over = (step.radius - (shape.wide - shape.narrow)) / step.radius  # a fillet larger than the step
    if 1e-12 < over < NEAR_STEP:
        raise PartError(f"step.radius: a {length(step.radius)} fillet is within {over:.2%} of the "
                        f"{length(shape.wide - shape.narrow)} step; give the step as the radius (a quarter circle) "
                        f"or a radius that differs from it by at least {NEAR_STEP:.0%}")
    wide = (step.x - wide_end) * shape.sense
    if wide < limit:
        raise PartError(f"step.x: {length(step.x)} leaves {length(max(wide, 0.0), 3)} of wide part; at least "
                        f"{length(limit, 3)} is needed")
