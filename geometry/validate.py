"""Geometric checks on a PartSpec: every raiser on the part, inside the outline (or cut from an edge it
opens onto), apart from the others, with a real ligament around it. Each problem raises PartError with
one line naming the raiser and the limit.

The checks run in this order: the outline kind's own (geometry/kinds/bar.py: the step's fillets fit, the
lug's pin hole is at its centre), each raiser kind's own (geometry/kinds/*.py: a notch on an edge it cuts),
every raiser on the plate, then the clear distance from each raiser to the outline's edges and to the
other raisers."""

from __future__ import annotations

import math

import shapely
from shapely.geometry import LineString, Point

from .errors import PartError
from .outline import cutout_regions, plate_polygon, segment_coords
from .registry import RaiserId, kind_of, named, outline_of, outline_raisers, outline_size
from .shapes import full_circle
from .spec import PartSpec
from .units import format_quantity

# Smallest element the mesher may use, as a fraction of the plate width, and how many such elements a
# ligament must hold. Together they set the thinnest ligament the tool accepts.
FINEST_ELEMENT_FRACTION = 1e-3
ELEMENTS_PER_LIGAMENT = 4
ON_EDGE = 1e-9  # fraction of the width within which a point lies on an edge


def min_ligament(spec: PartSpec) -> float:
    """Thinnest ligament (mm) the mesh can resolve with a few elements across it."""
    return ELEMENTS_PER_LIGAMENT * FINEST_ELEMENT_FRACTION * outline_size(spec)[1]


def validate_geometry(spec: PartSpec) -> None:
    """Raise PartError naming the first raiser that is malformed, off the plate, crosses the outline or
    another raiser, or leaves too thin a ligament."""
    limit = min_ligament(spec)
    outline_of(spec).check(spec, limit)
    for rid, item in named(spec):
        kind_of(item).check(spec, item, str(rid))
    plate = plate_polygon(spec)
    for rid, polys in cutout_regions(spec).items():
        if not any(plate.intersects(p) for p in polys):
            raise PartError(f"{rid}: lies off the plate, wholly outside its outline; move it onto the part")
    for name, gaps in feature_gaps(spec).items():
        for other, gap in gaps.items():
            _check_gap(name, other, gap, limit, spec.units)


def feature_gaps(spec: PartSpec) -> dict[RaiserId, dict[str, float]]:
    """For every raiser, the clear distance (mm) to each outline edge it is not cut from and to the other
    raisers that could be nearer than those edges (0 where they cross, touch or overlap), keyed by their
    names in words ("the side y = 40 mm", "hole 2"). Raisers farther than the raiser's nearest edge or raiser
    are left out: they can be neither its thinnest ligament nor a ligament below the limit."""
    plate = plate_polygon(spec)
    tolerance = ON_EDGE * outline_size(spec)[1]
    edges = [(e.label, LineString(segment_coords(e.segment)), e.name) for e in outline_of(spec).path(spec)
             if not isinstance(e.name, RaiserId)]  # the outline's own raisers are measured as raisers
    mouths = {rid: kind_of(item).mouths(spec, item) for rid, item in named(spec)}
    regions = {name: [p.intersection(plate) if mouths[name] else p for p in polys]
               for name, polys in cutout_regions(spec).items()}
    circles = {name: full_circle(loops[0]) if len(loops) == 1 else None
               for name, loops in ((rid, kind_of(item).loops(spec, item)) for rid, item in named(spec))}
    bounds = {name: tuple(shapely.total_bounds(polys)) for name, polys in regions.items()}
    fillets = {r.id: (shapely.union_all([LineString(segment_coords(a)) for a in r.curved.arcs]), r.clear_of)
               for r in outline_raisers(spec)}
    out: dict[RaiserId, dict[str, float]] = {}
    for name, polys in regions.items():
        gaps: dict[str, float] = {}
        own = {label for label, line, _ in edges for mouth in mouths[name] if line.distance(Point(mouth)) <= tolerance}
        for label, line, _ in edges:
            if label not in own:
                gaps[label] = min(_gap(p, line) for p in polys)
        if not mouths[name] and not all(plate.contains(p) for p in polys):
            nearest = min(edges, key=lambda e: min(p.distance(e[1]) for p in polys))
            gaps[nearest[0]] = 0.0
        _nearby_raisers(name, regions, bounds, circles, gaps)
        if len(polys) == 2:
            gaps[f"its opposite {name.kind} on the other edge"] = polys[0].distance(polys[1])
        for fillet, (line, _) in fillets.items():
            gaps[str(fillet)] = min(_gap(p, line) for p in polys)
        out[name] = gaps
    for fillet, (line, clear_of) in fillets.items():
        gaps = {label: line.distance(edge) for label, edge, edge_name in edges if edge_name in clear_of}
        # the fillet opposite: their clear distance is the narrow width, which the fillet's band must fit in
        gaps.update({str(other): line.distance(other_line) for other, (other_line, _) in fillets.items()
                     if other != fillet})
        gaps.update({str(name): out[name][str(fillet)] for name in regions})
        out[fillet] = gaps
    return out


def _nearby_raisers(name: RaiserId, regions, bounds, circles, gaps: dict[str, float]) -> None:
    """Add to `gaps` the clear distance to every other raiser nearer than the nearest gap found so far,
    nearest bounding box first (a bounding-box gap never exceeds the true gap); two round holes by the
    exact formula, anything else on the fine polygons."""
    best = min(gaps.values(), default=math.inf)
    polys = regions[name]
    boxes = [(_box_gap(bounds[name], bounds[other]), other) for other in regions if other != name]
    for box_gap, other in sorted(boxes):
        if box_gap > best:
            break
        a, b = circles[name], circles[other]
        if a is not None and b is not None:
            gap = max(math.dist(a.center, b.center) - a.radius - b.radius, 0.0)
        else:
            gap = min(_gap(p, q) for p in polys for q in regions[other])
        gaps[str(other)] = gap
        best = min(best, gap)


def _box_gap(a: tuple[float, ...], b: tuple[float, ...]) -> float:
    """Distance (mm) between two bounding boxes (xmin, ymin, xmax, ymax)."""
    ax0, ay0, ax1, ay1 = a
    bx0, by0, bx1, by1 = b
    return math.hypot(max(0.0, bx0 - ax1, ax0 - bx1), max(0.0, by0 - ay1, ay0 - by1))


def _gap(a, b) -> float:
    return 0.0 if a.intersects(b) else float(a.distance(b))


def _check_gap(feature: RaiserId, other: str, gap: float, limit: float, units: str) -> None:
    """Refuse a gap (mm) that is closed or thinner than `limit` (mm); the message in the part file's `units`."""
    if gap <= 0.0:
        raise PartError(f"{feature}: crosses or touches {other}; move it or make it smaller")
    if gap < limit:
        raise PartError(
            f"{feature}: ligament to {other} is {format_quantity(gap, 'length', units, 3)}; at least "
            f"{format_quantity(limit, 'length', units, 3)} is needed ({ELEMENTS_PER_LIGAMENT} elements of the finest "
            "allowed size)"
        )
