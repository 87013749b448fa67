"""The part as a shapely polygon: used for validation, ligaments, net sections and naming the raisers.

Curved edges are represented by fine polygons (chord error about 2e-5 of the radius), which is far below
any tolerance the checks use. The exact lines and arcs come from geometry/shapes.py, the same ones the
gmsh model is built from.
"""

from __future__ import annotations

import math

import numpy as np
import shapely
from shapely import affinity
from shapely.geometry import LineString, Point, Polygon

from .shapes import Line, Segment, ellipse_shape, notch_shapes, outline_path, slot_shape, step_shape
from .spec import Ellipse, Hole, PartSpec, Slot

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


def plate_polygon(spec: PartSpec) -> Polygon:
    """The outline before any cut-out: rectangle, stepped bar and/or rounded lug end."""
    return wire_polygon([e.segment for e in outline_path(spec)])


def hole_polygon(hole: Hole) -> Polygon:
    """A circular hole as a fine polygon."""
    return Point(hole.center).buffer(hole.radius, quad_segs=QUAD_SEGMENTS)


def ellipse_polygon(ellipse: Ellipse) -> Polygon:
    shape = ellipse_shape(ellipse)
    unit = Point(0.0, 0.0).buffer(1.0, quad_segs=QUAD_SEGMENTS)
    scaled = affinity.scale(unit, shape.major, shape.minor, origin=(0.0, 0.0))
    turned = affinity.rotate(scaled, shape.angle, origin=(0.0, 0.0), use_radians=True)
    return affinity.translate(turned, *shape.center)


def slot_polygon(slot: Slot) -> Polygon:
    return wire_polygon(slot_shape(slot).wire)


def cutout_regions(spec: PartSpec) -> dict[str, list[Polygon]]:
    """Every cut-out by feature name ("hole 1", "ellipse 1", "slot 1", "notch 1"); notch regions reach
    beyond the edge they are cut from."""
    out: dict[str, list[Polygon]] = {}
    for n, h in enumerate(spec.holes, start=1):
        out[f"hole {n}"] = [hole_polygon(h)]
    for n, e in enumerate(spec.ellipses, start=1):
        out[f"ellipse {n}"] = [ellipse_polygon(e)]
    for n, s in enumerate(spec.slots, start=1):
        out[f"slot {n}"] = [slot_polygon(s)]
    for n, notch in enumerate(spec.notches, start=1):
        out[f"notch {n}"] = [wire_polygon(s.wire) for s in notch_shapes(spec, notch)]
    return out


def part_polygon(spec: PartSpec) -> Polygon:
    """The part's material region: the outline less every cut-out."""
    cutouts = [p for polys in cutout_regions(spec).values() for p in polys]
    if not cutouts:
        return plate_polygon(spec)
    return plate_polygon(spec).difference(shapely.union_all(cutouts))


def feature_edges(spec: PartSpec) -> dict[str, object]:
    """The boundary of each raiser inside the part (shapely lines): cut-out edges within the outline and
    the step's fillets."""
    outline = plate_polygon(spec)
    edges: dict[str, object] = {}
    for name, polys in cutout_regions(spec).items():
        edges[name] = shapely.union_all([p.boundary.intersection(outline) for p in polys])
    shape = step_shape(spec)
    if shape is not None:
        edges[shape.name] = shapely.union_all([LineString(segment_coords(a)) for a in shape.fillets])
    return edges


def raiser_sections(spec: PartSpec) -> list[tuple[str, float, float]]:
    """Where each raiser's net section lies: (feature name, x of the section, reach in mm).

    A cut-out's narrowest section passes through its centre (a circle, ellipse or slot has its longest
    chord across the load there); a notch's through its axis; a shoulder fillet's where the narrow edge
    begins (the section of width `step.width` that handbooks use). `reach` is half the raiser's extent
    along x: a peak within it belongs to that section."""
    out = [(f"hole {n}", h.center[0], h.radius) for n, h in enumerate(spec.holes, start=1)]
    for n, e in enumerate(spec.ellipses, start=1):
        x0, _, x1, _ = ellipse_polygon(e).bounds
        out.append((f"ellipse {n}", e.center[0], 0.5 * (x1 - x0)))
    for n, s in enumerate(spec.slots, start=1):
        x0, _, x1, _ = slot_polygon(s).bounds
        out.append((f"slot {n}", s.center[0], 0.5 * (x1 - x0)))
    for n, notch in enumerate(spec.notches, start=1):
        shapes = notch_shapes(spec, notch)
        out.append((f"notch {n}", notch.x, shapes[0].mouth if shapes else notch.radius))
    shape = step_shape(spec)
    if shape is not None:
        out.append((shape.name, shape.x_narrow, shape.reach + spec.step.radius))
    return out


def nearest_raiser(spec: PartSpec, location: tuple[float, float], within: float) -> str | None:
    """The raiser whose edge passes within `within` mm of `location` (the nearest one), else None."""
    point = Point(location)
    best, gap = None, within
    for name, edge in feature_edges(spec).items():
        d = edge.distance(point)
        if d <= gap:
            best, gap = name, d
    return best
