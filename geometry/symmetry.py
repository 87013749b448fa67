"""Mirror planes of a symmetric part: the region that is meshed, which raiser mirrors which (each kind
says how it mirrors, geometry/kinds/*.py `mirrored`), and the names of the cut edges.

A plane "x" is the plane x = 0 and "y" the plane y = 0 (the part's centre lines). With planes declared,
only the part on their positive side is meshed; the cut edges are named "symmetry x" / "symmetry y"
and carry rollers (the displacement normal to the plane is zero, the shear traction is zero).
"""

from __future__ import annotations

import math

import shapely
from shapely import affinity

from .kinds.base import RaiserId
from .kinds.hole import named as named_hole
from .outline import cutout_regions, loop_polygon, part_polygon
from .registry import kind_of, named, outline_bounds, outline_of, outline_raisers, outline_size
from .spec import PartSpec

TOLERANCE_FRACTION = 1e-6  # of the outline's larger extent: how close counts as "on the plane"
MATCH_FRACTION = 1e-4  # of the outline's larger extent: how far a raiser may lie from another's mirror image


def symmetry_tolerance(spec: PartSpec) -> float:
    """Distance (mm) within which a point counts as lying on a plane or two centres as coinciding."""
    return TOLERANCE_FRACTION * max(outline_size(spec))


def mirror_names(spec: PartSpec, plane: str) -> dict[RaiserId, RaiserId] | None:
    """For each raiser the raiser that is its mirror image in `plane` (itself when the plane cuts it into
    two mirror halves): the raiser of the same kind whose region coincides with its kind's mirror image
    of it (an outline's raisers: as the outline says). None when some raiser has no mirror image."""
    regions = {rid: shapely.union_all(polys) for rid, polys in cutout_regions(spec).items()}
    tolerance = MATCH_FRACTION * max(outline_size(spec))

    def coincide(a, b) -> bool:  # bounding boxes first: cheap, and they tell non-overlapping raisers apart
        return (max(abs(u - v) for u, v in zip(a.bounds, b.bounds)) <= tolerance
                and a.hausdorff_distance(b) <= tolerance)

    items = dict(named(spec))
    out: dict[RaiserId, RaiserId] = {}
    for rid, item in named(spec):
        kind = kind_of(item)
        mirrored = kind.mirrored(item, plane)
        image = shapely.union_all([loop_polygon(loop) for loop in kind.loops(spec, mirrored)])
        match = next((other for other in regions if other.kind == rid.kind and coincide(image, regions[other])
                      and same_axis(mirrored, items[other])), None)
        if match is None:
            return None
        out[rid] = match
    for raiser in outline_raisers(spec):
        image = outline_of(spec).mirrored(spec, raiser.id, plane)
        if image is None:
            return None
        out[raiser.id] = image
    return out


def same_axis(a, b) -> bool:
    """Whether two raisers of one kind have the same axis direction (to 1e-6 degrees, modulo a half turn),
    when their kind has one: a round ellipse or a square window turned a little coincides with its mirror
    image as a region, but its mesh (the band's quarters start on its axis) does not mirror, and a half
    model cut along the plane would slice those quarters into slivers."""
    angle_a, angle_b = getattr(a, "angle", None), getattr(b, "angle", None)
    if angle_a is None or angle_b is None:
        return True
    return abs((angle_a - angle_b + 90.0) % 180.0 - 90.0) <= 1e-6


def mirror_symmetric(spec: PartSpec, plane: str) -> bool:
    """True when the part's shape is its own mirror image in `plane`: the outline with every cut-out, notch,
    step and lug (to a 1e-5 share of its area), and every raiser mirrored by one of its own kind (or centred
    on the plane). Loads are not looked at."""
    outline = part_polygon(spec)
    image = affinity.scale(outline, -1.0 if plane == "x" else 1.0, -1.0 if plane == "y" else 1.0, origin=(0, 0))
    return outline.symmetric_difference(image).area <= 1e-5 * outline.area and mirror_names(spec, plane) is not None


def mirror_hole(spec: PartSpec, number: int, plane: str) -> int:
    """The number of the hole that mirrors hole `number` in `plane` (a symmetric part has one)."""
    return mirror_names(spec, plane)[named_hole(number)].number


def modelled_box(spec: PartSpec) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) in mm of the region that is meshed: the plate, cut at each plane."""
    x0, y0, x1, y1 = outline_bounds(spec)
    planes = spec.support.symmetry
    return (0.0 if "x" in planes else x0, 0.0 if "y" in planes else y0, x1, y1)


def on_plane(spec: PartSpec, x: float, y: float) -> str | None:
    """The edge name "symmetry x" / "symmetry y" when (x, y) lies on a declared plane, else None."""
    tol = symmetry_tolerance(spec)
    for plane, coordinate in (("x", x), ("y", y)):
        if plane in spec.support.symmetry and abs(coordinate) <= tol:
            return f"symmetry {plane}"
    return None


def kept_quarters(spec: PartSpec, center: tuple[float, float], radius: float) -> int:
    """How many of the four quarter-turns around `center` (split at 0, 90, 180, 270 degrees) lie in the
    meshed region, judged at their middle direction at distance `radius` (mm)."""
    x0, y0, x1, y1 = modelled_box(spec)
    tol = symmetry_tolerance(spec)
    kept = 0
    for k in range(4):
        a = 0.25 * math.pi * (2 * k + 1)
        x, y = center[0] + radius * math.cos(a), center[1] + radius * math.sin(a)
        kept += x0 - tol <= x <= x1 + tol and y0 - tol <= y <= y1 + tol
    return kept
