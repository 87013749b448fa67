"""The curved raiser edges the mesh is graded at: their arcs, straight borders and ellipses, the smallest
radius of curvature of each, its thinnest ligament, and the exact distance to its edge as a gmsh MathEval
expression (numbers parenthesised: gmsh's parser rejects "x - -1")."""

from __future__ import annotations

import math
from dataclasses import dataclass

from .kinds.base import CurvedEdges
from .registry import RaiserId, kind_of, named, outline_raisers, outline_size
from .shapes import Arc, EllipseShape, Line, Point
from .spec import PartSpec
from .validate import feature_gaps

PENALTY = 10.0  # slope of the out-of-span penalty in the arc distance (dimensionless)


@dataclass(frozen=True)
class Raiser:
    """One raiser's curved edges (see kinds.base.CurvedEdges) and its thinnest ligament: the clear distance
    (mm) from the raiser to anything else."""

    id: RaiserId
    arcs: tuple[Arc, ...]
    strips: tuple[tuple[Line, Point], ...]
    ellipse: EllipseShape | None
    curvature: float
    ligament: float
    lines: tuple[Line, ...] = ()


def part_raisers(spec: PartSpec) -> list[Raiser]:
    """Every raiser of the part, in a fixed order: spec.raisers (kinds in registry order), then the
    outline's own (a stepped bar's fillets)."""
    gaps = feature_gaps(spec)
    width = outline_size(spec)[1]

    def raiser(rid: RaiserId, edges: CurvedEdges) -> Raiser:
        ligament = min(gaps[rid].values()) if gaps.get(rid) else width
        return Raiser(rid, edges.arcs, edges.strips, edges.ellipse, edges.curvature, ligament, edges.lines)

    out = [raiser(rid, kind_of(item).curved(spec, item)) for rid, item in named(spec)]
    return out + [raiser(r.id, r.curved) for r in outline_raisers(spec)]


def _num(v: float) -> str:
    return f"({v!r})"


def _circle_distance(c: Point, r: float) -> str:
    return f"Fabs(Sqrt((x - {_num(c[0])})^2 + (y - {_num(c[1])})^2) - {_num(r)})"


def _point_distance(p: Point) -> str:
    return f"Sqrt((x - {_num(p[0])})^2 + (y - {_num(p[1])})^2)"


def _arc_distance(arc: Arc) -> str:
    """Distance to a circular arc: to its circle inside the arc's wedge, else to the nearer end. Outside
    the wedge a steep penalty lifts the circle term so that the end distances win."""
    if arc.span >= 2.0 * math.pi - 1e-9:
        return _circle_distance(arc.center, arc.radius)
    lo, hi = arc.ccw
    cx, cy = arc.center
    # signed distances to the two wedge lines (positive inside the wedge)
    s0 = f"({_num(math.cos(lo))} * (y - {_num(cy)}) - {_num(math.sin(lo))} * (x - {_num(cx)}))"
    s1 = f"({_num(math.sin(hi))} * (x - {_num(cx)}) - {_num(math.cos(hi))} * (y - {_num(cy)}))"
    outside = f"Max(0, Max(-{s0}, -{s1}))"
    if hi - lo > math.pi + 1e-9:  # a wedge wider than a half-plane: inside either half-plane
        outside = f"Max(0, Min(-{s0}, -{s1}))"
    on_circle = f"Max({_circle_distance(arc.center, arc.radius)}, {_num(PENALTY)} * {outside})"
    return f"Min({on_circle}, Min({_point_distance(arc.at(lo))}, {_point_distance(arc.at(hi))}))"


def _segment_distance(p0: Point, p1: Point) -> str:
    dx, dy = p1[0] - p0[0], p1[1] - p0[1]
    t = f"Max(0, Min(1, ((x - {_num(p0[0])}) * {_num(dx)} + (y - {_num(p0[1])}) * {_num(dy)}) / {_num(dx * dx + dy * dy)}))"
    return f"Sqrt((x - {_num(p0[0])} - {t} * {_num(dx)})^2 + (y - {_num(p0[1])} - {t} * {_num(dy)})^2)"


def _ellipse_distance(e: EllipseShape) -> str:
    """First-order distance to an ellipse: |f| / |grad f| with f = rho - 1, rho the elliptic radius
    sqrt(X^2/a^2 + Y^2/b^2) in the ellipse's own axes (exact on the ellipse, close nearby)."""
    c, s = math.cos(e.angle), math.sin(e.angle)
    X = f"(({_num(c)}) * (x - {_num(e.center[0])}) + ({_num(s)}) * (y - {_num(e.center[1])}))"
    Y = f"(({_num(-s)}) * (x - {_num(e.center[0])}) + ({_num(c)}) * (y - {_num(e.center[1])}))"
    a2, b2 = e.major ** 2, e.minor ** 2
    rho = f"Sqrt({X}^2 / {_num(a2)} + {Y}^2 / {_num(b2)})"
    grad = f"Sqrt({X}^2 / {_num(a2 * a2)} + {Y}^2 / {_num(b2 * b2)} + {_num(1e-30)})"
    return f"(Fabs({rho} - 1) * {rho} / {grad})"


def distance_expression(raiser: Raiser) -> str:
    """Distance (mm) from (x, y) to the raiser's curved edges, as a gmsh MathEval expression: the least of
    the distances to its arcs, its straight strips and its ellipse."""
    terms = [_arc_distance(a) for a in raiser.arcs]
    terms += [_segment_distance(line.start, line.end) for line, _ in raiser.strips]
    terms += [_segment_distance(line.start, line.end) for line in raiser.lines]
    if raiser.ellipse is not None:
        terms.append(_ellipse_distance(raiser.ellipse))
    expr = terms[0]
    for term in terms[1:]:
        expr = f"Min({expr}, {term})"
    return expr
