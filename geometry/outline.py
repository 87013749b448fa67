"""The part as a shapely polygon: used for validation, ligaments and net sections.

Curved edges are represented by fine polygons (chord error below 1e-4 of the radius), which is far
below any tolerance the checks use.
"""

from __future__ import annotations

import shapely
from shapely.geometry import Point, Polygon, box

from .spec import Hole, PartSpec

QUAD_SEGMENTS = 128  # segments per quarter circle: chord error r (1 - cos(pi/512)) ~ 2e-5 r


def plate_polygon(spec: PartSpec) -> Polygon:
    """The plain plate rectangle, centred on the origin."""
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    return box(-half_l, -half_w, half_l, half_w)


def hole_polygon(hole: Hole) -> Polygon:
    """A circular hole as a fine polygon."""
    return Point(hole.center).buffer(hole.radius, quad_segs=QUAD_SEGMENTS)


def part_polygon(spec: PartSpec) -> Polygon:
    """The part's material region: the plate less every cut-out."""
    cutouts = [hole_polygon(h) for h in spec.holes]
    if not cutouts:
        return plate_polygon(spec)
    return plate_polygon(spec).difference(shapely.union_all(cutouts))


def raiser_sections(spec: PartSpec) -> list[tuple[str, float, float]]:
    """Where each raiser's net section lies: (feature name, x of the section, reach in mm).

    A peak within `reach` of a raiser's section x is taken to belong to that section (a hole's
    narrowest section passes through its centre)."""
    return [(f"hole {n}", h.center[0], h.radius) for n, h in enumerate(spec.holes, start=1)]
