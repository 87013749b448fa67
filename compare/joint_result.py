"""Per fastener and per hole: the results of a part's fastener groups, and the hand checks beside them.

For every group of the part file ([[fasteners]]) and every fastener in it (mm, N, MPa; forces are the
fasteners' forces on the part):

- force and direction, share of the group's load (|F| over the sum of |F| in the group), bearing
  F / (d t) and average fastener shear F / (n pi d^2 / 4) (common practice), from the FE's sharing;
- the bypass load: the plate's load passing the hole. On the cut through the hole's centre normal to its
  fastener's force (the fastener bears on the side its force points to, so the cut carries the load coming
  to the hole; for a concentric group the cut is normal to the group's load), statics gives the normal
  force N; less the forces along the cut's normal of every fastener
  the cut crosses, shared equally by the holes it crosses, it is the load going by (common practice: the
  bearing-bypass split of joint analysis);
- the hole's converged tensile peak on its free edge (fem.convergence, each hole its own candidate) and
  Kt on the net section (N / A_net on that cut) and on the bearing nominal (the group's mean bearing
  F / (d t));
- edge distance and pitch in multiples of d (compare.joint_checks.spacing); the governing design code sets
  the minima.

The hand checks beside the FE (compare.joint_checks): the group's sharing by equal shares (a concentric
load) or by the elastic method (an eccentric one), each fastener's hand force against the FE's; the
critical net path across the group's load by the s^2 / (4 g) rule ([Cochrane]) beside the hole where the FE
puts the group's largest tensile peak; and the average-stress checks of a simple connection (fastener
shear, bearing, net-section tension on that path's net width) with how far each understates the FE peak it
stands for (the most loaded fastener's shear, the peak contact pressure at the group's holes, the tensile
peak at its holes).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely

from ..fem.analysis import Solution
from ..fem.convergence import Study
from ..fem.fastener_part import PartFasteners, mean_bearing
from ..geometry.kinds.hole import named as named_hole
from ..geometry.outline import part_polygon, plate_polygon
from ..geometry.spec import PartSpec, SectionSpec
from .joint_checks import (ELASTIC_SOURCE, PRACTICE, STAGGER_SOURCE, Understatement, critical_net_path,
                           elastic_method, simple_connection, spacing, understatement)
from .method_of_sections import section_result

CONCENTRIC = 1e-9  # of F times the group's radius: a moment about the centroid below this is none
ROUND_OFF = 1e-9  # of the cut's force: a bypass below this is statics' round-off of none
SPACING_CAUTION = ("Edge distance and pitch in multiples of d: the governing design code sets the minima and "
                   "alone decides whether a spacing is enough.")


@dataclass(frozen=True)
class FastenerRow:
    """One fastener and its hole (mm, N, MPa, degrees).

    hole: the hole's number; force: (2,) the fastener's force on the part and magnitude; direction: its
    angle from +x; share: of the group's load; bearing, shear: F / (d t), F / (n pi d^2 / 4); bypass: the
    load passing the hole (module docstring); net: N / A_net on the cut through the hole (both None for an
    eccentric group: its fasteners' forces turn, and no one cut is the load's path); peak, peak_error:
    the hole's converged tensile peak and its band (None when the study has no estimate for it); kt_net,
    kt_bearing: peak over net and over the group's mean bearing; edge, pitch: over d; hand: the hand
    method's force (2,) on this fastener; arc: contact (first, last) degrees from the seat; peak_pressure:
    the largest contact pressure on the finest mesh."""

    hole: int
    force: np.ndarray
    magnitude: float
    direction: float
    share: float
    bearing: float
    shear: float
    bypass: float | None
    net: float | None
    peak: float | None
    peak_error: float | None
    kt_net: float | None
    kt_bearing: float | None
    edge: float
    pitch: float
    hand: np.ndarray
    arc: tuple[float, float]
    peak_pressure: float


@dataclass(frozen=True)
class GroupRows:
    """One group: its name, whether it holds, its load or reaction (Fx, Fy N, Mz N mm about its reference
    point), the FE fasteners' resultant and moment there and the relative statics error, the group's mean
    bearing, the hand method's name and source, its fasteners, the average-stress checks with how far
    each understates the FE peak it stands for, and its critical net path by the s^2 / (4 g) rule."""

    name: str
    holds: bool
    load: tuple[float, float, float]
    resultant: tuple[float, float, float]
    statics_error: float
    mean_bearing: float
    hand_method: str
    hand_source: str
    fasteners: tuple[FastenerRow, ...]
    averages: tuple[Understatement, ...]
    diameter: float
    clearance: float
    shear_planes: int
    stiffness: float
    stiffness_source: str
    net_path: NetPathRow | None = None


@dataclass(frozen=True)
class JointResult:
    """Every fastener group of a checked load case, and the contact passes per mesh level."""

    groups: tuple[GroupRows, ...]
    passes: tuple[int | None, ...]
    cautions: tuple[str, ...] = (SPACING_CAUTION,)


def joint_result(spec: PartSpec, study: Study, solution: Solution) -> JointResult | None:
    """The fastener groups' rows of one load case (module docstring), or None without groups."""
    groups: PartFasteners | None = solution.fasteners
    if groups is None:
        return None
    from ..fem.fastener_part import part_groups

    models = part_groups(spec)
    t = spec.plate.thickness
    outline = part_polygon(spec)
    exterior = type(outline)(outline.exterior)
    rows = []
    for index, (g, model, fe) in enumerate(zip(spec.fasteners, models, groups.groups)):
        mine = groups.of_group(index)
        centres = np.array([spec.holes[h - 1].center for h in g.holes], float)
        ref = np.asarray(model.point)
        if g.holds:
            load = _reaction(fe, mine)
        else:
            load = model.load
        arms = centres - ref
        forces = np.array([f.force for f in mine])
        total = forces.sum(axis=0)
        moment = float(np.sum(arms[:, 0] * forces[:, 1] - arms[:, 1] * forces[:, 0]))
        radius = float(np.sqrt(np.mean(np.sum((centres - centres.mean(axis=0)) ** 2, axis=1))))
        scale = math.hypot(load[0], load[1]) + (abs(load[2]) / radius if radius > 0.0 else 0.0)
        error = max(math.hypot(total[0] - load[0], total[1] - load[1]),
                    abs(moment - load[2]) / radius if radius > 0.0 else 0.0) / scale if scale > 0.0 else 0.0
        hand = elastic_method(centres, load[:2], load[2], tuple(ref))
        a = ref - centres.mean(axis=0)
        centroid_moment = load[2] + a[0] * load[1] - a[1] * load[0]
        concentric = len(g.holes) == 1 or abs(centroid_moment) <= CONCENTRIC * math.hypot(*load[:2]) * max(radius, 1.0)
        method = ("equal shares (a concentric load on a rigid plate)" if concentric
                  else "elastic method (direct share plus M r / sum r^2 on a rigid plate)")
        resultant = np.asarray(load[:2], float)  # the group's force on the part: its load, or a holding group's reaction
        directions = [math.degrees(math.atan2(f.force[1], f.force[0])) for f in mine]
        spaced = spacing(centres, g.diameter, exterior, directions)
        bearing_mean = mean_bearing(spec, index, groups)
        fasteners = []
        for k, (number, f) in enumerate(zip(g.holes, mine)):
            size = float(np.linalg.norm(f.force))
            net, bypass = _net_and_bypass(spec, solution, number, resultant, groups) if concentric else (None, None)
            estimate = study.estimates.get(named_hole(number))
            peak = None if estimate is None else float(estimate.value)
            fasteners.append(FastenerRow(
                number, f.force.copy(), size, directions[k], f.share, f.bearing, f.shear, bypass, net,
                peak, None if estimate is None else float(estimate.error),
                None if peak is None or not net else abs(peak / net),
                None if peak is None or bearing_mean == 0.0 else abs(peak / bearing_mean),
                spaced[k].edge, spaced[k].pitch, hand[k], f.arc, f.peak_pressure))
        size = math.hypot(load[0], load[1])
        along = resultant / size if size > 0.0 else np.array([1.0, 0.0])
        path = net_path(spec, g, fasteners, along, exterior)
        averages = _averages(g, fasteners, size, t, path)
        fastener = model.fastener
        rows.append(GroupRows(g.name, g.holds, tuple(float(v) for v in load),
                              (float(total[0]), float(total[1]), moment), error, bearing_mean,
                              method, PRACTICE if concentric else ELASTIC_SOURCE, tuple(fasteners), averages,
                              fastener.diameter, fastener.clearance, fastener.shear_planes, fastener.stiffness,
                              fastener.stiffness_source, path))
    return JointResult(tuple(rows), tuple(lv.passes for lv in study.levels))


def _net_and_bypass(spec: PartSpec, solution: Solution, number: int, along: np.ndarray,
                    groups: PartFasteners) -> tuple[float | None, float | None]:
    """(N / A_net MPa, bypass N) on the cut through hole `number`'s centre normal to `along` (its fastener's
    force, or for a concentric group the group's load); the holes the cut crosses share the bypass. (None,
    None) when that line leaves the part and enters it again (a drawn outline's arm or tab): no one straight
    cut is then the hole's net section, and a nominal on it would not be the hand calculation's."""
    size = float(np.linalg.norm(along))
    if size == 0.0:
        return 0.0, 0.0
    n = np.asarray(along, float) / size
    centre = spec.holes[number - 1].center
    if not _one_run(spec, centre, n):
        return None, None
    result = section_result(spec, solution, SectionSpec(tuple(centre), (float(n[0]), float(n[1])),
                                                        f"through {named_hole(number)}"))
    N = result.statics.normal_force
    on_cut = []
    for f in groups.fasteners:
        c = np.asarray(f.hole.center) - np.asarray(centre)
        if abs(c @ n) < 0.5 * f.hole.diameter:
            on_cut.append(float(f.force @ n))
    bypass = (N - sum(on_cut)) / max(len(on_cut), 1)
    if abs(bypass) <= ROUND_OFF * max(abs(N), sum(abs(v) for v in on_cut)):
        bypass = 0.0  # statics to round-off: no load passes an end hole
    return (N / result.area if result.area > 0.0 else 0.0), float(bypass)


def _one_run(spec: PartSpec, centre, n: np.ndarray) -> bool:
    """Whether the line through `centre` normal to `n` crosses the part's material in one run, broken only
    by its cut-outs (holes, slots, windows: gaps inside the outline), never by the air outside it."""
    from .sections import ligaments

    spans = ligaments(part_polygon(spec), (float(centre[0]), float(centre[1])), (float(n[0]), float(n[1])))
    outline = plate_polygon(spec)
    d = np.array([-n[1], n[0]])
    gaps = [np.asarray(centre, float) + 0.5 * (a[1] + b[0]) * d for a, b in zip(spans, spans[1:])]
    return all(outline.contains(shapely.Point(*p)) for p in gaps)


@dataclass(frozen=True)
class NetPathRow:
    """The group's critical net path by the s^2 / (4 g) rule ([Cochrane]) across its load: the holes on it
    (numbers, in order across the load), its net width and the plate's gross width on the line through the
    group's centroid (mm), and the hole of the group's largest FE tensile peak (None without peaks)."""

    holes: tuple[int, ...]
    width: float
    gross: float
    fe_hole: int | None
    source: str = STAGGER_SOURCE

    @property
    def fe_on_path(self) -> bool:
        return self.fe_hole is not None and self.fe_hole in self.holes


def net_path(spec: PartSpec, g, rows: list[FastenerRow], along: np.ndarray, exterior) -> NetPathRow:
    """The group's critical net path across `along` (a unit vector: the group's load) and the FE's hole."""
    centres = np.array([spec.holes[h - 1].center for h in g.holes], float)
    d_holes = [spec.holes[h - 1].diameter for h in g.holes]
    width = _width_across(exterior, centres.mean(axis=0), along)
    path = critical_net_path(width, centres, d_holes, tuple(along))
    peaks = [(r.peak, r.hole) for r in rows if r.peak is not None]
    return NetPathRow(tuple(g.holes[i] for i in path.holes), path.width, width, max(peaks)[1] if peaks else None)


def _reaction(fe, mine) -> tuple[float, float, float]:
    """A holding group's reaction (force x, force y, moment about its point); a force that is statics'
    round-off of the forces its fasteners carry (below ROUND_OFF of their sum: a group that takes a pure
    moment) is none, so that it neither sets a load direction nor divides the simple connection's averages."""
    carried = float(sum(np.linalg.norm(f.force) for f in mine))
    fx, fy = float(fe.force[0]), float(fe.force[1])
    if math.hypot(fx, fy) <= ROUND_OFF * carried:
        fx, fy = 0.0, 0.0
    return (fx, fy, float(fe.moment))


def _averages(g, rows: list[FastenerRow], force: float, t: float, path: NetPathRow) -> tuple[Understatement, ...]:
    """The simple connection's average stresses and how far each understates the FE peak it stands for."""
    if force == 0.0:
        return ()
    checks = simple_connection(force, len(g.holes), g.diameter, g.shear_planes, t, path.width)
    out = []
    fe_shear = max(r.shear for r in rows)
    out.append(understatement(checks[0], fe_shear, "shear of the most loaded fastener (FE sharing)"))
    pressure = max(r.peak_pressure for r in rows)
    if pressure > 0.0:
        out.append(understatement(checks[1], pressure, "peak contact pressure at the group's holes (finest mesh)"))
    peaks = [r.peak for r in rows if r.peak is not None and r.peak > 0.0]
    if peaks:
        out.append(understatement(checks[2], max(peaks), "tensile peak at the group's holes"))
    return tuple(out)


def _width_across(exterior, point: np.ndarray, along: np.ndarray) -> float:
    """The outline's width (mm) along the line through `point` normal to `along`: the one stretch of the
    outline that holds `point` (a drawn outline's line may cross another arm beyond the air; that arm does
    not carry this group's load)."""
    from .sections import ligaments

    spans = ligaments(exterior, (float(point[0]), float(point[1])), (float(along[0]), float(along[1])))
    if not spans:
        return 0.0
    a, b = min(spans, key=lambda s: 0.0 if s[0] <= 0.0 <= s[1] else min(abs(s[0]), abs(s[1])))
    return float(b - a)
