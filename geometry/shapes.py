"""The exact shape of the part: its outline and every cut-out as straight lines and circular arcs (plus
ellipses), shared by the shapely outline (validation, sections), the gmsh model and the mesh grading.

Coordinates in mm, origin at the plate centre, x along the load. Angles of arcs in radians,
counter-clockwise from +x about the arc's centre. Every curved raiser edge of a flat part is concave seen
from the material (holes, slot ends, notch roots, shoulder fillets): the material lies outside its circle.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .spec import Ellipse, Notch, PartSpec, Slot

Point = tuple[float, float]
NOTCH_MARGIN = 0.05  # the notch cut-out reaches this fraction of the width beyond the edge (clean booleans)


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
    """A named piece of the outline: "held", "loaded", "side", "lug end", "shoulder at x = X" or
    "fillet at x = X"."""

    segment: Segment
    name: str


# --- shoulder step -------------------------------------------------------------------------------------

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
    name: str


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
    return StepShape(hw, hn, c, step.x + sense * c, (top, bottom), sense, f"fillet at x = {step.x:g}")


def half_width_at(spec: PartSpec, x: float) -> float | None:
    """Half the plate's width at x on a straight edge (mm); None inside a step's fillet zone."""
    shape = step_shape(spec)
    if shape is None:
        return 0.5 * spec.plate.width
    x0, x1 = sorted((spec.step.x, shape.x_narrow))
    if x < x0:
        return shape.wide if shape.sense > 0 else shape.narrow
    if x > x1:
        return shape.narrow if shape.sense > 0 else shape.wide
    return None


def end_half_width(spec: PartSpec, end: str) -> float:
    """Half the width (mm) of the "held" (x = -length/2) or "loaded" (x = +length/2) end."""
    x = 0.5 * spec.plate.length * (1.0 if end == "loaded" else -1.0)
    half = half_width_at(spec, x)
    return 0.5 * spec.plate.width if half is None else half


def lug_end(spec: PartSpec) -> tuple[str, Point, float] | None:
    """("held" or "loaded", centre, radius) of the lug's rounded end, or None."""
    if spec.lug is None:
        return None
    hole = spec.holes[spec.lug.hole - 1]
    end = "held" if hole.center[0] < 0.0 else "loaded"
    x_end = -0.5 * spec.plate.length if end == "held" else 0.5 * spec.plate.length
    half = half_width_at(spec, x_end)
    return end, (x_end + (half if end == "held" else -half), 0.0), half


def outline_path(spec: PartSpec) -> list[Edge]:
    """The outer boundary as a closed counter-clockwise chain of named lines and arcs (material on the
    left): bottom edge left to right, loaded end, top edge right to left, held end."""
    half_l = 0.5 * spec.plate.length
    lug = lug_end(spec)
    x_left = lug[1][0] if lug and lug[0] == "held" else -half_l
    x_right = lug[1][0] if lug and lug[0] == "loaded" else half_l
    top = _top_chain(spec, x_left, x_right)
    bottom = [Edge(e.segment.mapped(1, -1), e.name) for e in top]
    path = list(bottom)
    right_y = segment_points(top[-1].segment)[1][1]
    left_y = segment_points(top[0].segment)[0][1]
    if lug and lug[0] == "loaded":
        centre, rad = lug[1], lug[2]
        path += [Edge(Arc(centre, rad, -0.5 * math.pi, 0.0), "lug end"), Edge(Arc(centre, rad, 0.0, 0.5 * math.pi), "lug end")]
    else:
        path.append(Edge(Line((half_l, -right_y), (half_l, right_y)), "loaded"))
    path += [Edge(e.segment.reversed(), e.name) for e in reversed(top)]
    if lug and lug[0] == "held":
        centre, rad = lug[1], lug[2]
        path += [Edge(Arc(centre, rad, 0.5 * math.pi, math.pi), "lug end"), Edge(Arc(centre, rad, math.pi, 1.5 * math.pi), "lug end")]
    else:
        path.append(Edge(Line((-half_l, left_y), (-half_l, -left_y)), "held"))
    return path


def _top_chain(spec: PartSpec, x_left: float, x_right: float) -> list[Edge]:
    """The +y edge from left to right: sides, and a step's shoulder face and fillet."""
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
        chain.append(Edge(Line((xs, shape.wide), wide_point), f"shoulder at x = {step.x:g}"))
    chain.append(Edge(fillet, shape.name))
    chain.append(Edge(Line(narrow_point, (hi, shape.narrow)), "side"))
    if shape.sense < 0:
        chain = [Edge(e.segment.mapped(-1, 1).reversed(), e.name) for e in reversed(chain)]
    return chain


# --- notches ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class NotchShape:
    """One notch on one edge: its closed cut-out profile (reaching beyond the edge), its root arc (global,
    counter-clockwise), the half width of its mouth on the edge (mm) and the edge's y."""

    wire: tuple[Segment, ...]
    root: Arc
    mouth: float
    edge_y: float


def notch_mouth(notch: Notch) -> float:
    """Half the width of the notch's mouth on the edge (mm)."""
    h, r = notch.depth, notch.radius
    if notch.shape == "V":
        half = math.radians(0.5 * notch.angle)
        return r * math.cos(half) + (h - r + r * math.sin(half)) * math.tan(half)
    return r if h >= r else math.sqrt(r * r - (r - h) ** 2)


def notch_shapes(spec: PartSpec, notch: Notch) -> list[NotchShape]:
    """The notch's cut-outs, one per edge it is on (half width taken at the notch's x)."""
    half = half_width_at(spec, notch.x)
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
        out.append(NotchShape(tuple(segs), root, notch_mouth(notch), edge_y))
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


# --- slots and ellipses ----------------------------------------------------------------------------------

@dataclass(frozen=True)
class SlotShape:
    """A slot's closed profile, its two end arcs (counter-clockwise, material outside) and its two straight
    sides with the unit normal pointing into the material."""

    wire: tuple[Segment, ...]
    ends: tuple[Arc, Arc]
    sides: tuple[tuple[Line, Point], tuple[Line, Point]]


def slot_shape(slot: Slot) -> SlotShape:
    r = 0.5 * slot.width
    a = 0.5 * (slot.length - slot.width)
    t = math.radians(slot.angle)
    e, n = (math.cos(t), math.sin(t)), (-math.sin(t), math.cos(t))
    cx, cy = slot.center

    def p(s: float, q: float) -> Point:
        return (cx + s * e[0] + q * n[0], cy + s * e[1] + q * n[1])

    front = Arc(p(a, 0.0), r, t - 0.5 * math.pi, t + 0.5 * math.pi)
    back = Arc(p(-a, 0.0), r, t + 0.5 * math.pi, t + 1.5 * math.pi)
    upper, lower = Line(p(-a, r), p(a, r)), Line(p(a, -r), p(-a, -r))
    wire = (upper, Arc(front.center, r, t + 0.5 * math.pi, t), Arc(front.center, r, t, t - 0.5 * math.pi),
            lower, Arc(back.center, r, t + 1.5 * math.pi, t + math.pi), Arc(back.center, r, t + math.pi, t + 0.5 * math.pi))
    return SlotShape(wire, (front, back), ((upper, n), (lower, (-n[0], -n[1]))))


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


def ellipse_shape(ellipse: Ellipse) -> EllipseShape:
    t = math.radians(ellipse.angle)
    if ellipse.length >= ellipse.width:
        return EllipseShape(ellipse.center, 0.5 * ellipse.length, 0.5 * ellipse.width, t)
    return EllipseShape(ellipse.center, 0.5 * ellipse.width, 0.5 * ellipse.length, t + 0.5 * math.pi)
