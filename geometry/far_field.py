"""Far zones of a long bar: stretches of plain strap where the element size may grow along the length.

Far from every raiser, end and cut, the field of a plate is the beam solution (Saint-Venant's principle,
docs/references.md [Practice]): a uniform stress under an axial load, a linear one under a moment, and
the resultants on every cut follow from statics alone, since every load case of a part (an end load
reacted at the held end, a pin load, a self-equilibrated remote state) is statically determinate. A
coarse mesh there passes those resultants on exactly (nodal equilibrium), and the distribution it gets
wrong decays within about a width of where the mesh is fine again. So the mesh keeps the part's ordinary
far-field size within `reach` widths of everything whose stress is read:

- every raiser (the x extent of its edge),
- both ends (loads, supports, a clamped end's corners), and a symmetry plane across the length (x = 0),
- every section cut (its x extent across the part),
- every stretch of the boundary a [[hold]] or a [[load.edge]] of any load case acts on (its x extent),

and between those near zones, in the far zones, lets the size grow linearly with the distance from the
nearest near zone (slope `growth`) up to `largest` times the part's narrowest width. A part with no far
zone (every bundled example; a plate up to 8 widths long, or 16 with a raiser half way) is meshed exactly
as before; only the bar outline has far zones (geometry/kinds/bar.py: a straight strap along x). The
constants are measured in benchmarks/long_plates.py: the Kt of a hole half way along a plate 60 widths
long, under an axial force, a moment and an end shear, moved by at most 0.24 % (within every band) while
the finest mesh held 1.5 to 5 times fewer elements, and a plate 10,000 widths long meshes in about a
second.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from shapely.geometry import box

from .boundary import boundary_picks, stretch
from .kinds import bar
from .outline import feature_edges, part_polygon
from .registry import outline_size
from .spec import PartSpec
from .symmetry import modelled_box


@dataclass(frozen=True)
class FarGrading:
    """How the element size grows in a far zone (dimensionless).

    reach:   near zones extend this many widths (the part's narrowest) beyond every raiser, end and cut.
    growth:  increase of element size per unit distance along x into a far zone.
    largest: the size stops growing at this multiple of the narrowest width.
    piece:   a far zone is cut across into pieces at most this many of its largest elements long (`far_cuts`).
    shortest: a stretch shorter than this many narrowest widths is no far zone: the size would grow there
             by at most growth x shortest / 2 widths, which saves little, and short parts keep their meshes.
    """

    reach: float = 2.0
    growth: float = 0.3
    largest: float = 1.0
    piece: float = 100.0
    shortest: float = 4.0


def narrowest_width(spec: PartSpec) -> float:
    """The narrowest width of the bar away from raisers (mm): a step's narrow part, else the bar's width."""
    width = outline_size(spec)[1]
    return min(width, spec.step.width) if spec.step is not None else width


def far_zones(spec: PartSpec, grading: FarGrading = FarGrading()) -> tuple[tuple[float, float], ...]:
    """The far zones (x_start, x_end) in mm, in order along x, of the meshed region: what lies more than
    `reach` widths from every raiser, end, symmetry plane and section cut. Empty for a short part, and
    for an outline other than the bar."""
    if spec.outline != bar.NAME:
        return ()
    x0, _, x1, _ = modelled_box(spec)
    margin = grading.reach * narrowest_width(spec)
    near = [(x0, x0), (x1, x1)]
    for edge in feature_edges(spec).values():
        if not edge.is_empty:
            lo, _, hi, _ = edge.bounds
            near.append((lo, hi))
    near += [_cut_extent(spec, s.point, s.normal) for s in spec.sections]
    near += [_stretch_extent(spec, pick) for pick in boundary_picks(spec)]
    near.sort()
    zones = []
    reached = near[0][1] + margin
    for lo, hi in near[1:]:
        if lo - margin > reached:
            zones.append((reached, lo - margin))
        reached = max(reached, hi + margin)
    return tuple(z for z in zones if z[1] - z[0] >= grading.shortest * narrowest_width(spec))


def _stretch_extent(spec: PartSpec, pick) -> tuple[float, float]:
    """(x_min, x_max) in mm of a picked stretch of the boundary."""
    x = stretch(spec, pick).samples()[:, 0]
    return float(x.min()), float(x.max())


def far_cuts(spec: PartSpec, grading: FarGrading = FarGrading()) -> tuple[float, ...]:
    """x (mm) of straight lines across the part that cut each far zone into equal pieces at most `piece`
    of its largest elements long (100 widths). gmsh's 2-D mesher slows down faster than the length of one thin surface grows
    (a 10,000 x 1 mm strip at a 1 mm size: 20 s for 40,000 triangles in one piece, 0.4 s in 100 pieces,
    measured), so a long plate is meshed piece by piece; the pieces share their nodes along the cuts."""
    longest = grading.piece * grading.largest * narrowest_width(spec)
    cuts = []
    for a, b in far_zones(spec, grading):
        count = math.ceil((b - a) / longest)
        cuts += [a + (b - a) * k / count for k in range(1, count)]
    return tuple(cuts)


def across_cut(spec: PartSpec, x: float) -> tuple[tuple[float, float], tuple[float, float]]:
    """The ends (mm) of the straight line across the bar at x, from edge to edge (x in a far zone, where
    the long edges are straight)."""
    half = bar.half_width_at(spec, x)
    return (x, -half), (x, half)


def _cut_extent(spec: PartSpec, point: tuple[float, float], normal: tuple[float, float]) -> tuple[float, float]:
    """The x extent (mm) of a straight cut through the point with the given unit normal, across the bar
    (|y| <= width / 2); the whole length for a cut along x."""
    length, width = outline_size(spec)
    half_l, half_w = 0.5 * length, 0.5 * width
    tx, ty = -normal[1], normal[0]  # along the cut
    if abs(ty) < 1e-12:
        return (-half_l, half_l)
    ends = [point[0] + tx * (y - point[1]) / ty for y in (-half_w, half_w)]
    return (max(min(ends), -half_l), min(max(ends), half_l))


def grown_size_expression(spec: PartSpec, far: float, grading: FarGrading = FarGrading()) -> str:
    """The largest element size (mm) as a gmsh MathEval expression in x: `far` in the near zones, growing
    by `growth` per mm into each far zone, at most `largest` narrowest widths (and never below `far`).
    Exactly repr(far) when the part has no far zone, so a short part's mesh does not change."""
    zones = far_zones(spec, grading)
    if not zones:
        return repr(far)
    into = " + ".join(f"Max(0, Min(x - ({a!r}), ({b!r}) - x))" for a, b in zones)
    cap = max(far, grading.largest * narrowest_width(spec))
    return f"Min({cap!r}, {far!r} + {grading.growth!r} * ({into}))"


def far_zone_triangles(spec: PartSpec, far: float, grading: FarGrading = FarGrading()) -> tuple[float, float]:
    """(area in mm^2, integral of 1 / h^2) over the far zones, with h the grown size; for the element
    estimate of fem/budget.py, which counts the rest of the part at size `far`. In a zone of length G the
    size grows from both ends, h(s) = min(cap, far + g s) for s up to G / 2, so each half holds
    width * [(1/far - 1/h_top) / g + (G/2 - s_cap) / cap^2] (s_cap: where h reaches the cap)."""
    cap = max(far, grading.largest * narrowest_width(spec))
    g = grading.growth
    material = part_polygon(spec)
    width = outline_size(spec)[1]
    area = count = 0.0
    for a, b in far_zones(spec, grading):
        zone_area = material.intersection(box(a, -width, b, width)).area
        mean_width = zone_area / (b - a)
        half = 0.5 * (b - a)
        s_cap = min(half, (cap - far) / g) if g > 0 else half
        top = far + g * s_cap
        per_half = ((1.0 / far - 1.0 / top) / g if g > 0 else s_cap / far ** 2) + (half - s_cap) / cap ** 2
        area += zone_area
        count += 2.0 * mean_width * per_half
    return area, count
