"""The critical cut of a raiser where the load has no "across the load" direction: the cut normal to the
edge at the peak.

A part held and loaded on its own boundary ([[hold]], [[load.edge]]) has no load axis to cut across. At
the peak (a node on the boundary) the cut runs along the edge's inward normal, so the stress it integrates
on its material is, at the peak, the edge's tangential stress, the one the peak is. Its line may meet the
material several times (a hole, a slot, the part's other edges): the cut is the shortest stretch of that
line, starting from the ligament at the peak, whose ligaments together cut the part in two. A single
ligament that separates the part is the whole cut (a notch's root to the opposite edge); beside a hole it
is both ligaments on either side of the hole (the net section of a hole across a load). The free body is
then the piece of the part on the cut's +normal side (not a half-plane when the cut stops short of the
line's other ligaments), and statics and the method of sections work on it (compare/statics.py).

The hand calculation on that cut is N / A + M s / I from the method-of-sections resultants (statics: N
normal to the cut, M about the centroid of its material), with s the distance from that centroid to the
peak along the cut: the nominal stress in the fibre where the peak is (compare/nominal.py).

Positions along a cut run along d = (-n_y, n_x) from its point (compare/sections.py); here the point is
the peak and d the inward normal, so the cut's material starts at 0 and runs into the part. mm throughout.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely
from shapely.geometry import LineString
from shapely.ops import split

from ..geometry.boundary import boundary_loops, outward_normals, project
from ..geometry.outline import loop_polygon, part_polygon, plate_polygon
from ..geometry.registry import outline_size
from ..geometry.shapes import EllipseShape
from ..geometry.spec import PartSpec
from .sections import ligaments
from .statics import FreeBody

ON_EDGE = 1e-4  # of the plate's width: a peak this close to a boundary piece lies on it
HAIR = 1e-6  # of the part's size: how far the free body's piece is grown to hold its own boundary

ACROSS_LOAD = "across the load"  # the net section handbooks use: a cut across the load through the raiser
EDGE_NORMAL = "normal to the edge at the peak"  # this module's cut


@dataclass(frozen=True)
class EdgeCut:
    """The cut normal to the edge at a peak: its point (the peak, mm), unit normal (the edge's tangent),
    the window (lo, hi) of positions along the line that the cut spans (mm), the free body on the +normal
    side, and the gross window (the same stretch of the line through the outline without cut-outs)."""

    point: tuple[float, float]
    normal: tuple[float, float]
    window: tuple[float, float]
    side: FreeBody
    whole_line: bool


def uses_edge_cut(spec: PartSpec) -> bool:
    """Whether the part's Kt is taken on the cut normal to the edge: it is held or loaded on its own
    boundary ([[hold]] supports, [[load.edge]] loads) or through fastener groups, so no load axis gives a cut
    "across the load"."""
    return bool(spec.support.holds or spec.load.edges or spec.fasteners)


def inward_normal(spec: PartSpec, location: tuple[float, float]) -> tuple[float, float] | None:
    """The unit normal into the material of the boundary at `location` (mm), or None off the boundary."""
    p = np.asarray(location, float)
    best, gap = None, ON_EDGE * outline_size(spec)[1]
    for loop in boundary_loops(spec):
        for piece in loop:
            if piece.segment is None:  # an elliptical hole: the normal of the ellipse
                distance = float(loop_polygon(piece.ellipse).exterior.distance(shapely.Point(p)))
                if distance <= gap:
                    best, gap = _ellipse_normal(piece.ellipse, p), distance
                continue
            distance, _ = project(piece.segment, tuple(p))
            if distance <= gap:
                out = outward_normals(piece.segment, p[None, :])[0]
                best, gap = (-float(out[0]), -float(out[1])), distance
    return best


def _ellipse_normal(e: EllipseShape, p: np.ndarray) -> tuple[float, float]:
    """Unit normal of the ellipse at p, pointing away from its centre (into the material)."""
    c, s = math.cos(e.angle), math.sin(e.angle)
    x, y = p[0] - e.center[0], p[1] - e.center[1]
    X, Y = c * x + s * y, -s * x + c * y
    gX, gY = X / e.major ** 2, Y / e.minor ** 2
    g = np.array([c * gX - s * gY, s * gX + c * gY])
    g /= np.linalg.norm(g)
    return float(g[0]), float(g[1])


def edge_cut(spec: PartSpec, location: tuple[float, float]) -> EdgeCut | None:
    """The cut normal to the edge at the peak `location` (module docstring), or None when the peak is not
    on the boundary."""
    inward = inward_normal(spec, location)
    if inward is None:
        return None
    return cut_through(part_polygon(spec), location, inward, max(outline_size(spec)))


def cut_through(material, location: tuple[float, float], inward: tuple[float, float], size: float) -> EdgeCut | None:
    """The cut of the region `material` (a shapely polygon, mm) from the boundary point `location` along
    the unit `inward` normal: the shortest run of ligaments on that line, from the one at `location`,
    that cuts the region in two; None if the line meets no material."""
    normal = (inward[1], -inward[0])  # d = (-n_y, n_x) is then the inward normal
    spans = ligaments(material, location, normal)
    if not spans:
        return None
    k = int(np.argmin([0.0 if a <= 0.0 <= b else min(abs(a), abs(b)) for a, b in spans]))
    for i, j in _windows(spans, k):
        lo, hi = spans[i][0], spans[j][1]
        pieces = _split(material, location, inward, lo, hi, size)
        if pieces is None:
            continue
        whole = i == 0 and j == len(spans) - 1
        side = FreeBody(None if whole else _plus_piece(pieces, location, inward, normal, spans[k], size))
        return EdgeCut(tuple(map(float, location)), normal, (lo, hi), side, whole)
    return None


def _windows(spans: list[tuple[float, float]], k: int) -> list[tuple[int, int]]:
    """Every run of consecutive ligaments (i..j) that holds ligament k, shortest stretch of line first."""
    runs = [(i, j) for i in range(k + 1) for j in range(k, len(spans))]
    return sorted(runs, key=lambda r: (spans[r[1]][1] - spans[r[0]][0], r))


def _split(material, location, inward, lo: float, hi: float, size: float) -> list | None:
    """The pieces of the part cut along the line from position lo to hi (a hair beyond each end), or None
    when that stretch does not cut the part in two."""
    p0, d = np.asarray(location, float), np.asarray(inward, float)
    reach = 1e-6 * size
    line = LineString([tuple(p0 + (lo - reach) * d), tuple(p0 + (hi + reach) * d)])
    pieces = [p for p in shapely.get_parts(split(material, line)) if p.area > 1e-12 * material.area]
    return pieces if len(pieces) >= 2 else None


def _plus_piece(pieces, location, inward, normal, span, size: float):
    """The piece on the cut's +normal side beside the peak's ligament, grown by a hair."""
    p0 = np.asarray(location, float)
    middle = p0 + 0.5 * (span[0] + span[1]) * np.asarray(inward) + 1e-4 * size * np.asarray(normal)
    point = shapely.Point(middle)
    piece = min(pieces, key=lambda q: q.distance(point))
    return piece.buffer(HAIR * size)


def gross_spans(spec: PartSpec, cut: EdgeCut) -> list[tuple[float, float]]:
    """The stretches of the cut's window through the outline without its cut-outs (mm along the cut)."""
    lo, hi = cut.window
    spans = ligaments(plate_polygon(spec), cut.point, cut.normal)
    return [(max(a, lo), min(b, hi)) for a, b in spans if min(b, hi) > max(a, lo)]
