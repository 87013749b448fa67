"""Hand checks of a bolted or pinned connection: what an engineer computes beside the FE, as pure functions.

Every check names its source (docs/references.md tags) or says it is common practice ([Practice]):

- `equal_shares`: a concentric group on a rigid plate shares its force equally (common practice).
- `elastic_method`: an eccentric group on a rigid plate with equal fasteners: each fastener takes the
  direct share F/n plus the moment share M r / sum r^2 at right angles to its radius from the group's
  centroid, added as vectors ([Shigley] section 8-12, shear joints; common practice).
- `staggered_net_width`, `critical_net_path`: the net width of a staggered pattern along a path, W - sum d +
  sum s^2 / (4 g) ([Cochrane]), and the path that gives the least over all paths through the pattern.
- `simple_connection`: the average-stress checks of a simple connection, fastener shear F/(n pi d^2/4),
  bearing F/(d t) and net-section tension P/(W_net t) (common practice), and `understatement`: how far
  such an average understates the FE peak it stands for.
- `spacing`: edge distance, end distance and pitch in multiples of d. The governing design code sets the
  minima (it alone decides whether a spacing is enough).

Units mm, N, MPa; forces are those of the fasteners on the plate; moments counter-clockwise positive.
These rigid-plate, average-stress methods are the hand calculation the FE is compared with, not a
substitute for it: each is only as good as its idealisation (rigid plate, equal fasteners, uniform stress).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from shapely.geometry import LineString, Point, Polygon

from ..fem.fastener_groups import bearing_stress, shear_stress

PRACTICE = "common practice (docs/references.md [Practice])"
ELASTIC_SOURCE = "docs/references.md [Shigley] section 8-12 (from memory); common practice"
STAGGER_SOURCE = "docs/references.md [Cochrane] (from memory)"
SAME_GAUGE = 1e-9  # of the plate's width: holes closer than this across the load share a gauge line


def equal_shares(force: Sequence[float], count: int) -> np.ndarray:
    """(count, 2) each fastener's force (N) when a concentric group of `count` equal fasteners on a rigid
    plate shares the force (Fx, Fy) equally (common practice)."""
    if count < 1:
        raise ValueError("a group has at least one fastener")
    return np.tile(np.asarray(force, float) / count, (count, 1))


def elastic_method(centres: np.ndarray, force: Sequence[float], moment: float = 0.0,
                   at: Sequence[float] | None = None) -> np.ndarray:
    """(n, 2) each fastener's force (N) on the plate by the elastic method (module docstring).

    centres: (n, 2) fastener centres (mm); force: (Fx, Fy) N the group carries, acting at `at` (mm; the
    centroid when None) with the moment `moment` (N mm, counter-clockwise) about that point. The moment
    about the centroid c, M_c = moment + (at - c) x F, is shared as M_c (-r_y, r_x) / sum |r|^2 with r the
    radius from c: the forces sum to F and their moments about c to M_c."""
    centres = np.asarray(centres, float)
    F = np.asarray(force, float)
    c = centres.mean(axis=0)
    arm = np.zeros(2) if at is None else np.asarray(at, float) - c
    m_c = moment + arm[0] * F[1] - arm[1] * F[0]
    r = centres - c
    polar = float(np.sum(r ** 2))
    if polar == 0.0:
        if m_c != 0.0:
            raise ValueError("a single fastener (or fasteners at one point) carries no moment")
        return equal_shares(F, len(centres))
    return F / len(centres) + m_c * np.column_stack([-r[:, 1], r[:, 0]]) / polar


@dataclass(frozen=True)
class NetPath:
    """A path across a pattern of holes: the holes it passes, in order across the load (indices into
    the pattern), and its net width (mm) W - sum d + sum s^2 / (4 g)."""

    holes: tuple[int, ...]
    width: float


def _along_across(centres: np.ndarray, along: Sequence[float]) -> tuple[np.ndarray, np.ndarray]:
    """Each centre's coordinate along the load and across it (mm)."""
    a = np.asarray(along, float) / np.hypot(*along)
    return centres @ a, centres @ np.array([-a[1], a[0]])


def staggered_net_width(width: float, centres: np.ndarray, diameters: Sequence[float], path: Sequence[int],
                        along: Sequence[float] = (1.0, 0.0)) -> float:
    """Net width (mm) of a plate `width` wide along a path through the holes `path` (indices, in order
    across the load): the width less every hole's deduction diameter on the path, plus s^2 / (4 g) for each
    pair of consecutive holes, s their spacing along the load and g their gauge across it ([Cochrane]).

    diameters: the holes' deduction diameters (mm; a design code may add an allowance to the hole's
    size). Raises ValueError for consecutive holes on one gauge line (g = 0: no such path)."""
    s_along, s_across = _along_across(np.asarray(centres, float), along)
    d = np.asarray(diameters, float)
    path = list(path)
    net = width - float(d[path].sum())
    for i, j in zip(path, path[1:]):
        g = abs(s_across[j] - s_across[i])
        if g <= SAME_GAUGE * width:
            raise ValueError(f"holes {i} and {j} lie on one gauge line: a path crosses it at one of them")
        net += (s_along[j] - s_along[i]) ** 2 / (4.0 * g)
    return net


def critical_net_path(width: float, centres: np.ndarray, diameters: Sequence[float],
                      along: Sequence[float] = (1.0, 0.0)) -> NetPath:
    """The path across the plate with the least net width over all paths through the pattern (each
    passing any holes in order across the load, one per gauge line), by the s^2 / (4 g) rule
    ([Cochrane]); the plain gross section when no path through holes is narrower.

    A shortest path over the holes sorted across the load: best[j] is the least of -d_j alone, or
    best[i] - d_j + s_ij^2 / (4 g_ij) over every hole i on an earlier gauge line."""
    centres = np.asarray(centres, float)
    d = np.asarray(diameters, float)
    s_along, s_across = _along_across(centres, along)
    order = np.argsort(s_across, kind="stable")
    best = np.zeros(len(order))
    before = np.full(len(order), -1)
    for rank, j in enumerate(order):
        best[j], before[j] = -d[j], -1
        for i in order[:rank]:
            g = s_across[j] - s_across[i]
            if g <= SAME_GAUGE * width:
                continue
            value = best[i] - d[j] + (s_along[j] - s_along[i]) ** 2 / (4.0 * g)
            if value < best[j]:
                best[j], before[j] = value, i
    if len(order) == 0 or best.min() >= 0.0:
        return NetPath((), float(width))
    j = int(np.argmin(best))
    path = [j]
    while before[path[-1]] >= 0:
        path.append(int(before[path[-1]]))
    return NetPath(tuple(reversed(path)), float(width + best[j]))


@dataclass(frozen=True)
class AverageStress:
    """One average-stress check: its name, the stress (MPa), the formula in words and its source."""

    name: str
    stress: float
    formula: str
    source: str


def simple_connection(force: float, count: int, diameter: float, shear_planes: int, thickness: float,
                      net_width: float) -> tuple[AverageStress, AverageStress, AverageStress]:
    """The average-stress checks of a simple connection carrying `force` (N) through `count` equal
    fasteners of diameter d (mm) sharing it equally, each sheared on `shear_planes` planes, in a plate
    `thickness` thick whose net width on the critical path is `net_width` (mm): fastener shear
    F / (n pi d^2 / 4), bearing F / (d t) with F = force / count, and net-section tension
    force / (net_width t) (common practice)."""
    each = force / count
    return (
        AverageStress("fastener shear", shear_stress(each, diameter, shear_planes),
                      "F / (n pi d^2 / 4), F the force per fastener, n its shear planes", PRACTICE),
        AverageStress("bearing", bearing_stress(each, diameter, thickness),
                      "F / (d t): the force per fastener over its projected area", PRACTICE),
        AverageStress("net-section tension", force / (net_width * thickness),
                      "P / (W_net t) on the critical path", PRACTICE),
    )


@dataclass(frozen=True)
class Understatement:
    """How far an average stress understates the FE peak it stands for (MPa): ratio = peak / average
    (the Kt on that average) and short = 1 - average / peak (the fraction of the peak the average
    misses; negative when the average is the larger)."""

    check: AverageStress
    peak: float
    peak_what: str
    ratio: float
    short: float

    def words(self, stress_text: Callable[[float], str] = lambda v: f"{v:.4g} MPa") -> str:
        """The statement in words, stresses written by `stress_text` (e.g. in the part file's units)."""
        verb = "understates" if self.short > 0.0 else "overstates"
        return (f"the {self.check.name} average {stress_text(self.check.stress)} {verb} the FE {self.peak_what} "
                f"{stress_text(self.peak)} by {abs(self.short):.0%} (the peak is {self.ratio:.3g} x the average)")


def understatement(check: AverageStress, peak: float, peak_what: str) -> Understatement:
    """How far `check`'s average understates the FE `peak` (MPa) that it stands for, described as
    `peak_what` (e.g. "peak contact pressure", "tensile peak at hole 2"); magnitudes are compared."""
    average, top = abs(check.stress), abs(peak)
    if average == 0.0 or top == 0.0:
        raise ValueError("an understatement needs a non-zero average and peak")
    return Understatement(check, peak, peak_what, top / average, 1.0 - average / top)


@dataclass(frozen=True)
class Spacing:
    """A fastener's spacing in multiples of its diameter d: edge (its centre to the nearest point of the
    part's outer edge), end (its centre to the edge along the direction its force pushes the plate) and
    pitch (its centre to the nearest other fastener's; inf for a single fastener)."""

    edge: float
    end: float
    pitch: float


def spacing(centres: np.ndarray, diameter: float, outline: Polygon,
            directions: Sequence[float] | None = None) -> tuple[Spacing, ...]:
    """Each fastener's edge distance, end distance and pitch over d (see Spacing); `outline` is the part's
    outer boundary (a shapely Polygon, holes ignored) and `directions` the direction (degrees from +x) each
    fastener's force pushes the plate (None: end distance along +x). The governing design code sets the
    minima (common practice: roughly 1.5-2 d to an edge and 2.5-3 d pitch, from memory; check the code)."""
    centres = np.asarray(centres, float)
    ring = outline.exterior
    size = 2.0 * max(outline.bounds[2] - outline.bounds[0], outline.bounds[3] - outline.bounds[1])
    far = np.linalg.norm(centres[:, None] - centres[None], axis=2) + np.diag(np.full(len(centres), np.inf))
    angles = np.radians(np.zeros(len(centres)) if directions is None else np.asarray(directions, float))
    out = []
    for k, (x, y) in enumerate(centres):
        ray = LineString([(x, y), (x + size * np.cos(angles[k]), y + size * np.sin(angles[k]))])
        hits = ray.intersection(ring)
        end = Point(x, y).distance(hits) if not hits.is_empty else np.inf
        out.append(Spacing(ring.distance(Point(x, y)) / diameter, end / diameter, float(far[k].min()) / diameter))
    return tuple(out)
