"""The part as a shapely polygon: used for validation, ligaments, net sections and naming the raisers.

Curved edges are represented by fine polygons (chord error about 2e-5 of the radius), which is far below
any tolerance the checks use. The exact lines, arcs and ellipses come from the outline kind and each
raiser kind (geometry/registry.py), the same ones the gmsh model is built from.
"""

from __future__ import annotations

import math

import numpy as np
import shapely
from shapely import affinity
from shapely.geometry import LineString, Point, Polygon

from .registry import RaiserId, kind_of, named, outline_of, outline_raisers
from .shapes import EllipseShape, Line, Loop, Segment, full_circle
from .spec import PartSpec

QUAD_SEGMENTS = 128  # segments per quarter circle: chord error r (1 - cos(pi/512)) ~ 2e-5 r


def segment_coords(seg: Segment) -> np.ndarray:
    """(k, 2) points along a line or arc, from its start to its end, ends included."""
    if isinstance(seg, Line):
        return np.array([seg.start, seg.end])
    n = max(2, math.ceil(seg.span / (0.5 * math.pi) * QUAD_SEGMENTS))
    a = np.linspace(seg.start, seg.end, n + 1)
    return np.column_stack([seg.center[0] + seg.radius * np.cos(a), seg.center[1] + seg.radius * np.sin(a)])


def wire_polygon(wire: tuple[Segment, ...] | list[Segment]) -> Polygon:
    """The polygon bounded by a closed chain of segments."""
    pts = np.concatenate([segment_coords(s)[:-1] for s in wire])
    return Polygon(pts).buffer(0)


def loop_polygon(loop: Loop) -> Polygon:
    """The region a closed loop bounds: a circle, an ellipse, or a chain of lines and arcs."""
    circle = full_circle(loop)
    if circle is not None:
        return Point(circle.center).buffer(circle.radius, quad_segs=QUAD_SEGMENTS)
    if isinstance(loop, EllipseShape):
        unit = Point(0.0, 0.0).buffer(1.0, quad_segs=QUAD_SEGMENTS)
        scaled = affinity.scale(unit, loop.major, loop.minor, origin=(0.0, 0.0))
        turned = affinity.rotate(scaled, loop.angle, origin=(0.0, 0.0), use_radians=True)
        return affinity.translate(turned, *loop.center)
    return wire_polygon(loop)


def plate_polygon(spec: PartSpec) -> Polygon:
    """The outline before any cut-out."""
    return wire_polygon([e.segment for e in outline_of(spec).path(spec)])


def cutout_regions(spec: PartSpec) -> dict[RaiserId, list[Polygon]]:
    """Every raiser's cut-out regions by name; an edge raiser's (a notch's) reach beyond the edge."""
    return {rid: [loop_polygon(loop) for loop in kind_of(item).loops(spec, item)] for rid, item in named(spec)}


def part_polygon(spec: PartSpec) -> Polygon:
    """The part's material region: the outline less every cut-out."""
    cutouts = [p for polys in cutout_regions(spec).values() for p in polys]
    if not cutouts:
        return plate_polygon(spec)
    return plate_polygon(spec).difference(shapely.union_all(cutouts))


def feature_edges(spec: PartSpec) -> dict[RaiserId, object]:
    """The boundary of each raiser inside the part (shapely lines): cut-out edges within the outline, and
    the outline's own raiser edges (fillets)."""
    outline = plate_polygon(spec)
    edges: dict[RaiserId, object] = {}
    for name, polys in cutout_regions(spec).items():
        edges[name] = shapely.union_all([p.boundary.intersection(outline) for p in polys])
    for raiser in outline_raisers(spec):
        edges[raiser.id] = shapely.union_all([LineString(segment_coords(a)) for a in raiser.curved.arcs])
    return edges


def nearest_raiser(spec: PartSpec, location: tuple[float, float], within: float) -> RaiserId | None:
    """The raiser whose edge passes within `within` mm of `location` (the nearest one), else None."""
    point = Point(location)
    best, gap = None, within
    for name, edge in feature_edges(spec).items():
        d = edge.distance(point)
        if d <= gap:
            best, gap = name, d
    return best
