"""Geometric checks on a PartSpec: every feature inside the plate, apart from the others, with a real
ligament around it. Each problem raises PartError with one line naming the feature and the limit."""

from __future__ import annotations

import math

import shapely
from shapely.geometry import LineString, Point

from .errors import PartError
from .shapes import half_width_at, lug_end, notch_shapes, outline_path, step_shape
from .spec import PartSpec

# Smallest element the mesher may use, as a fraction of the plate width, and how many such elements a
# ligament must hold. Together they set the thinnest ligament the tool accepts.
FINEST_ELEMENT_FRACTION = 1e-3
ELEMENTS_PER_LIGAMENT = 4
ON_EDGE = 1e-9  # fraction of the width within which a point lies on an edge


def min_ligament(spec: PartSpec) -> float:
    """Thinnest ligament (mm) the mesh can resolve with a few elements across it."""
    return ELEMENTS_PER_LIGAMENT * FINEST_ELEMENT_FRACTION * spec.plate.width


def validate_geometry(spec: PartSpec) -> None:
    """Raise PartError naming the first feature that is malformed, crosses the outline or another
    feature, or leaves too thin a ligament."""
    limit = min_ligament(spec)
    _check_step(spec, limit)
    _check_lug(spec)
    _check_notches(spec)
    for name, gaps in feature_gaps(spec).items():
        for other, gap in gaps.items():
            _check_gap(name, other, gap, limit)


def hole_gaps(spec: PartSpec, n: int) -> dict[str, float]:
    """Clear distance (mm) from hole n (1-based) to each outline edge and to every other feature."""
    return feature_gaps(spec)[f"hole {n}"]


def feature_gaps(spec: PartSpec) -> dict[str, dict[str, float]]:
    """For every raiser, the clear distance (mm) to each outline edge it is not part of and to the other
    raisers that could be nearer than those edges (0 where they cross, touch or overlap). Raisers farther
    than the raiser's nearest edge or raiser are left out: they can be neither its thinnest ligament nor a
    ligament below the limit."""
    from .outline import cutout_regions, plate_polygon

    plate = plate_polygon(spec)
    edges = _outline_edges(spec)
    regions = {name: [p.intersection(plate) if name.startswith("notch") else p for p in polys]
               for name, polys in cutout_regions(spec).items()}
    bounds = {name: tuple(shapely.total_bounds(polys)) for name, polys in regions.items()}
    shape = step_shape(spec)
    fillets = None
    if shape is not None:
        from .outline import segment_coords

        fillets = shapely.union_all([LineString(segment_coords(a)) for a in shape.fillets])
    out: dict[str, dict[str, float]] = {}
    for name, polys in regions.items():
        gaps: dict[str, float] = {}
        own = _own_edges(spec, name)
        for label, line, edge_name in edges:
            if (label, edge_name) in own or edge_name in own:
                continue
            gaps[label] = min(_gap(p, line) for p in polys)
        if not name.startswith("notch") and not all(plate.contains(p) for p in polys):
            nearest = min(edges, key=lambda e: min(p.distance(e[1]) for p in polys))
            gaps[nearest[0]] = 0.0
        _nearby_raisers(spec, name, regions, bounds, gaps)
        if len(polys) == 2:
            gaps["its opposite notch on the other edge"] = polys[0].distance(polys[1])
        if fillets is not None:
            gaps[shape.name] = min(_gap(p, fillets) for p in polys)
        out[name] = gaps
    if shape is not None:
        gaps = {label: fillets.distance(line) for label, line, edge_name in edges
                if edge_name in ("held", "loaded", "lug end")}
        gaps.update({name: out[name][shape.name] for name in regions})
        out[shape.name] = gaps
    return out


def _nearby_raisers(spec: PartSpec, name: str, regions, bounds, gaps: dict[str, float]) -> None:
    """Add to `gaps` the clear distance to every other raiser nearer than the nearest gap found so far,
    nearest bounding box first (a bounding-box gap never exceeds the true gap); two circular holes by
    the exact formula, anything else on the fine polygons."""
    best = min(gaps.values(), default=math.inf)
    polys = regions[name]
    boxes = [(_box_gap(bounds[name], bounds[other]), other) for other in regions if other != name]
    for box_gap, other in sorted(boxes):
        if box_gap > best:
            break
        if name.startswith("hole ") and other.startswith("hole "):
            a, b = spec.holes[int(name[5:]) - 1], spec.holes[int(other[5:]) - 1]
            gap = max(math.dist(a.center, b.center) - a.radius - b.radius, 0.0)
        else:
            gap = min(_gap(p, q) for p in polys for q in regions[other])
        gaps[other] = gap
        best = min(best, gap)


def _box_gap(a: tuple[float, ...], b: tuple[float, ...]) -> float:
    """Distance (mm) between two bounding boxes (xmin, ymin, xmax, ymax)."""
    ax0, ay0, ax1, ay1 = a
    bx0, by0, bx1, by1 = b
    return math.hypot(max(0.0, bx0 - ax1, ax0 - bx1), max(0.0, by0 - ay1, ay0 - by1))


def _gap(a, b) -> float:
    return 0.0 if a.intersects(b) else float(a.distance(b))


def _outline_edges(spec: PartSpec) -> list[tuple[str, LineString, str]]:
    """(label for messages, line, outline name) of every outline edge."""
    from .outline import segment_coords

    out = []
    for edge in outline_path(spec):
        coords = segment_coords(edge.segment)
        x0, y0 = coords[0]
        if edge.name == "held":
            label = f"the held end x = {x0:g}"
        elif edge.name == "loaded":
            label = f"the loaded end x = {x0:g}"
        elif edge.name == "side":
            label = f"the side y = {y0:g}"
        elif edge.name == "lug end":
            label = "the lug's rounded end"
        else:
            label = f"the {edge.name}"
        out.append((label, LineString(coords), edge.name))
    return out


def _own_edges(spec: PartSpec, name: str) -> set:
    """Outline edges a notch is cut from (by label and name): the sides through its mouth."""
    if not name.startswith("notch"):
        return set()
    notch = spec.notches[int(name.split()[1]) - 1]
    own = set()
    for shape in notch_shapes(spec, notch):
        mouth = Point(notch.x, shape.edge_y)
        for label, line, edge_name in _outline_edges(spec):
            if edge_name == "side" and line.distance(mouth) <= ON_EDGE * spec.plate.width:
                own.add((label, edge_name))
    return own


def _check_gap(feature: str, other: str, gap: float, limit: float) -> None:
    if gap <= 0.0:
        raise PartError(f"{feature}: crosses or touches {other}; move it or make it smaller")
    if gap < limit:
        raise PartError(
            f"{feature}: ligament to {other} is {gap:.3g} mm; at least {limit:.3g} mm is needed "
            f"({ELEMENTS_PER_LIGAMENT} elements of the finest allowed size)"
        )


def _check_notches(spec: PartSpec) -> None:
    """Each notch on a straight edge, shallower than half the width there."""
    for n, notch in enumerate(spec.notches, start=1):
        half = half_width_at(spec, notch.x)
        if half is None:
            shape = step_shape(spec)
            lo, hi = sorted((spec.step.x, shape.x_narrow))
            raise PartError(f"notch {n}.x: x = {notch.x:g} lies on the step's shoulder fillet (x = {lo:g} to "
                            f"{hi:g}); put the notch on a straight edge")
        if notch.depth >= half:
            raise PartError(f"notch {n}.depth: {notch.depth:g} mm is not less than half the width at x = "
                            f"{notch.x:g} ({half:g} mm)")
        if notch.shape == "V" and notch.depth < notch.radius:
            raise PartError(f"notch {n}.depth: a V notch must be at least as deep as its root radius "
                            f"({notch.radius:g} mm); got {notch.depth:g} mm")


def _check_step(spec: PartSpec, limit: float) -> None:
    """The fillets fit between the plate's ends with a ligament to spare."""
    shape = step_shape(spec)
    if shape is None:
        return
    half_l = 0.5 * spec.plate.length
    step = spec.step
    narrow_end = half_l if shape.sense > 0 else -half_l
    wide_end = -narrow_end
    lug = lug_end(spec)
    if lug is not None and shape.sense > 0:  # the lug rounds the narrow (loaded) end off at its centre
        narrow_end = lug[1][0]
    room = (narrow_end - shape.x_narrow) * shape.sense
    if room < limit:
        raise PartError(f"step.radius: a {step.radius:g} mm fillet from x = {step.x:g} reaches x = "
                        f"{shape.x_narrow:g}, which leaves {max(room, 0.0):.3g} mm of narrow part before the "
                        f"{step.narrow} end; at least {limit:.3g} mm is needed (a smaller radius or step.x)")
    wide = (step.x - wide_end) * shape.sense
    if lug is not None and shape.sense < 0:  # the lug rounds the wide (loaded) end off at its centre
        wide = lug[1][0] - step.x
    if wide < limit:
        raise PartError(f"step.x: {step.x:g} leaves {max(wide, 0.0):.3g} mm of wide part; at least "
                        f"{limit:.3g} mm is needed")


def _check_lug(spec: PartSpec) -> None:
    """The pin hole sits where the rounded end is centred, and the load suits the lug's end."""
    lug = lug_end(spec)
    if lug is None:
        return
    end, centre, half = lug
    n = spec.lug.hole
    hole = spec.holes[n - 1]
    if end == "held":
        raise PartError(f"lug.hole: the lug is the loaded end, pulled through its pin against the held end; "
                        f"hole {n} must be near x = +{0.5 * spec.plate.length:g}")
    if math.dist(hole.center, centre) > 1e-6 * spec.plate.width:
        raise PartError(f"lug.hole: hole {n} takes the pin, so its centre must be at ({centre[0]:g}, 0), half "
                        f"the width ({half:g} mm) from the {end} end; got ({hole.center[0]:g}, {hole.center[1]:g})")
    pin = getattr(spec.load, "pin", None)
    if pin is None or pin.hole != n:
        raise PartError(f"lug: a lug is loaded through its pin; give [load.pin] with hole = {n} (the far end "
                        "is held and carries the reaction)")
