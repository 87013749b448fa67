"""Mesh-convergence study of the peak stress: each candidate peak on its own sequence, Roache's GCI.

The part is solved on a sequence of meshes whose raiser element sizes all shrink by LEVEL_RATIO per
level. Every raiser's own edge peak, and the peak on the rest of the outline (fem.raiser_peaks), is a
candidate with its own sequence of values over the levels; each is estimated on its own (`richardson`),
never mixed with another raiser's values. The governing candidate is the one with the largest estimate;
the study has converged when every candidate whose band reaches the governing value meets the tolerance,
and it refines while any such candidate does not.

The estimate follows P. J. Roache's practice for the grid convergence index (docs/references.md [Roache],
[Oberkampf-Roy]). From the last three values f1, f2, f3 (coarse to fine) the observed order is
p = ln((f2 - f1) / (f3 - f2)) / ln(ratio). The factor of safety is 1.25 only when the sequence converges
monotonically (the changes over the last four levels keep their sign and shrink) and p lies within
ORDER_TOLERANCE of the formal order of the recovered peak (FORMAL_ORDER); the value is then extrapolated
with p. Otherwise the factor is 3 and the order used is p held to [0.5, formal]. The band is
Fs |f3 - f2| / (ratio^p - 1) relative to the estimate, and never narrower than the last change |f3 - f2|.
A sequence whose last two changes differ in sign, or do not shrink, keeps its finest value with a band
of 3 times its larger last change.

Formal order of the recovered peak (benchmarks/README.md, "Formal order"): quadratic triangles 2, by
theory (the stress of a degree-k element converges as h^k; docs/references.md [Zienkiewicz-Taylor]) and
confirmed by measurement; linear triangles 1.5, by measurement on the layered edge bands (theory only
brackets it: a constant-strain triangle's stress is first order, the recovered edge stress gains up to
one order by superconvergence).
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Collection
from dataclasses import dataclass, field, replace

import numpy as np

from ..geometry.far_field import far_zones
from ..geometry.mesh import Mesh
from ..geometry.mesh_process import MeshProcess
from ..geometry.meshing import mesh_part
from ..geometry.sharp_corners import sharp_corners
from ..geometry.spec import PartSpec
from ..geometry.symmetry import mirror_symmetric
from .analysis import Solution, solve_cases
from .budget import BudgetError, check_first_level, level_over_budget
from .equivalent_peak import von_mises_peak
from .guards import check_fields
from .raiser_peaks import OUTLINE, Peaks, RaiserName, bearing_peak, raiser_peaks, zone_peaks
from .solve import RoundOffError
from .symmetry import mirror_mesh

LEVEL_RATIO = math.sqrt(2.0)  # element size ratio between successive levels
FIRST_SCALE = 1.0  # element-size scale of the coarsest level
MIN_LEVELS = 3
SAFETY = 1.25  # Roache's factor of safety: monotone convergence at about the formal order
SAFETY_UNSURE = 3.0  # Roache's factor when the order departs from the formal one or convergence is not monotone
FORMAL_ORDER = {1: 1.5, 2: 2.0}  # formal order of the recovered peak by element order (see above)
ORDER_TOLERANCE = 0.25  # relative departure of the observed order from the formal one still taken as "at it"
LOWEST_ORDER = 0.5  # the smallest order an extrapolation uses
TIE = 1e-9  # relative: candidates this close are equal (mirror images solved on a mirror-symmetric mesh)
MONOTONE_CHANGES = 3  # how many of the last level-to-level changes must keep their sign and shrink


@dataclass(frozen=True)
class Level:
    """One mesh of the study: scale, size, peak (MPa) and where it is (mm), and stage times (s).

    peak / location: the governing candidate's own peak on this level (rewritten once the study knows
    which candidate governs, so that the levels show one raiser's sequence). raisers: every candidate's
    peak of the governing sign on this level (fem.raiser_peaks; "outline" for the rest of the part's edges);
    compression: the same of the minimum principal stress. compressive: whether the compressive peak
    governed this level (Solution.compressive_governs). bearing: the largest pin contact pressure (MPa),
    None where nothing bears.
    """

    scale: float
    nodes: int
    elements: int
    peak: float
    location: tuple[float, float]
    seconds: dict[str, float]
    raisers: Peaks = field(default_factory=dict)
    solver: str = ""  # the method that solved this level's system: "pardiso", "superlu" or "amg-cg" (fem.solve)
    compression: Peaks = field(default_factory=dict)
    compressive: bool = False
    bearing: float | None = None
    von_mises: tuple[float, tuple[float, float]] | None = None  # von Mises peak and where (fem.equivalent_peak)
    passes: int | None = None  # the contact solve's active-set passes on this level (pins, fastener groups), or None
    sharp: tuple[float, ...] = ()  # the peak in each sharp inside corner's zone (geometry.sharp_corners), MPa
    settled: frozenset = frozenset()  # candidates not refined on this level (`settle`): left out of their sequences


@dataclass(frozen=True)
class Estimate:
    """Converged value with its relative error band and how it was obtained.

    method: "richardson" (monotone convergence, extrapolated), "bounded" (one sign but the changes do
    not shrink: finest value, widened band), "oscillating" (the changes change sign: finest value, band
    from the spread), "two levels" / "single level" (too few levels). order: the observed order (None
    when not computed); safety: Roache's factor of safety used (1.25 or 3); used_order: the order the
    extrapolation and the band used (the observed one, or with Fs 3 that held to [0.5, formal]).
    """

    value: float
    error: float
    order: float | None
    method: str
    safety: float = SAFETY_UNSURE
    used_order: float | None = None

    @property
    def extrapolated(self) -> bool:
        """True when the value is extrapolated beyond the finest level (Richardson)."""
        return self.method == "richardson"


@dataclass(frozen=True)
class Study:
    """The levels solved, the governing estimate, whether it met the tolerance, and why the study stopped.

    governing: the candidate whose estimate governs (a raiser's name, or "outline"); estimates: every
    candidate's own estimate; compressive: the minimum principal stress governs (nothing bears on the part
    and the compression is larger); bearing: the estimate of the pin's peak contact pressure, if a pin bears.
    """

    levels: tuple[Level, ...]
    estimate: Estimate
    converged: bool
    stop_reason: str
    governing: str = ""
    estimates: dict[str, Estimate] = field(default_factory=dict)
    compressive: bool = False
    bearing: Estimate | None = None


def richardson(values: list[float] | np.ndarray, formal: float = FORMAL_ORDER[1],
               ratio: float = LEVEL_RATIO) -> Estimate:
    """Estimate the limit of a sequence refined by `ratio` per step (at least three values) whose formal
    order of convergence is `formal`, with Roache's grid convergence index as the relative band."""
    values = [float(v) for v in values]
    f3 = values[-1]
    changes = np.diff(values[-(MONOTONE_CHANGES + 1):])
    e21, e32 = float(changes[-2]), float(changes[-1])
    size = max(abs(f3), 1e-300)
    if not changes.any():
        return Estimate(f3, 0.0, None, "richardson", SAFETY)
    if e21 * e32 <= 0.0:
        return Estimate(f3, SAFETY_UNSURE * max(abs(e21), abs(e32)) / size, None, "oscillating")
    if abs(e32) >= abs(e21):
        return Estimate(f3, SAFETY_UNSURE * abs(e32) / size, None, "bounded")
    p = math.log(abs(e21 / e32)) / math.log(ratio)
    monotone = bool(np.all(changes * e32 > 0.0) and np.all(np.abs(changes[1:]) < np.abs(changes[:-1])))
    if monotone and abs(p - formal) <= ORDER_TOLERANCE * formal:
        safety, used = SAFETY, p
    else:
        safety, used = SAFETY_UNSURE, min(max(p, LOWEST_ORDER), formal)
    gain = ratio ** used - 1.0
    value = f3 + e32 / gain
    return Estimate(value, max(safety / gain, 1.0) * abs(e32) / max(abs(value), 1e-300), p, "richardson", safety,
                    used)


def sequence_estimate(values: list[float], formal: float = FORMAL_ORDER[1]) -> Estimate:
    """The converged estimate of a value recorded on every level (coarse to fine), whose formal order is
    `formal`: Roache's GCI from three or more levels, else the finest value with a band of three times the
    one change (two levels) or an unknown band (one)."""
    if len(values) >= MIN_LEVELS:
        return richardson(values, formal)
    if len(values) < 2:
        return Estimate(values[-1], math.inf, None, "single level")
    return Estimate(values[-1], SAFETY_UNSURE * abs(values[-1] - values[-2]) / max(abs(values[-1]), 1e-300),
                    None, "two levels")


@dataclass(frozen=True)
class Assessment:
    """Which candidate governs the levels so far, every candidate's estimate, and whether the study has
    converged (every candidate whose band reaches the governing value meets the tolerance)."""

    governing: str
    estimates: dict[str, Estimate]
    compressive: bool
    converged: bool


def assess(levels: list[Level] | tuple[Level, ...], tolerance: float, formal: float,
           required: Collection[RaiserName] = ()) -> Assessment:
    """Estimate every candidate on its own sequence and pick the governing one. The sign (tensile or
    compressive) is the finest level's; a candidate's sequence is its values on the levels that have it.
    Converged: every candidate whose band reaches the governing value, and every `required` one the levels
    have (a raiser a handbook case describes), meets the tolerance."""
    compressive = levels[-1].compressive
    sign = -1.0 if compressive else 1.0
    estimates = {}
    for name in _peaks(levels[-1], compressive):
        series = [_peaks(lv, compressive)[name][0] for lv in levels
                  if name in _peaks(lv, compressive) and name not in lv.settled]
        estimates[name] = sequence_estimate(series, formal)
    if not estimates:  # no edge node left to search (every one bears or is skipped): the global peak
        estimates[OUTLINE] = sequence_estimate([lv.peak for lv in levels], formal)
    top = max(sign * e.value for e in estimates.values())
    # the first of equal candidates (mirror images on a mirrored mesh agree to round-off): a stable choice
    governing = next(n for n, e in estimates.items() if sign * e.value >= top - TIE * abs(top))
    reaching = [n for n, e in estimates.items() if sign * e.value * (1.0 + e.error) >= top or n in required]
    converged = len(levels) >= MIN_LEVELS and refined(levels) and all(estimates[n].error <= tolerance
                                                                       for n in reaching)
    return Assessment(governing, estimates, compressive, converged)


SETTLE_MARGIN = 0.05  # a candidate settles when its upper band lies this far below the governing lower band
SETTLE_AFTER = 2  # levels solved before any candidate may settle (two give a band of three times the change)


def settle(cases: list[list[Level]], tolerance: float, formal: float, required: Collection[RaiserName] = ()
           ) -> set[RaiserName]:
    """The raisers that can no longer govern in any load case: each one's upper band (its estimate widened by
    its error, at least `tolerance`) lies SETTLE_MARGIN below the governing candidate's lower band (likewise
    widened) in every case. The study stops refining them (a drawn outline's many holes and corners, most of
    which never come near the peak); their estimates stay those of the levels they were refined on. The
    outline's own candidate and `required` raisers never settle. With two levels a band is three times the
    change between them (`sequence_estimate`), wide enough that only raisers far below the peak settle."""
    out: set[RaiserName] | None = None
    for levels in cases:
        found = assess(levels, tolerance, formal, required)
        sign = -1.0 if found.compressive else 1.0
        top = found.estimates[found.governing]
        lower = sign * top.value * (1.0 - max(top.error, tolerance))
        these = {name for name, e in found.estimates.items()
                 if name != OUTLINE and name not in required and name != found.governing
                 and sign * e.value * (1.0 + max(e.error, tolerance)) < (1.0 - SETTLE_MARGIN) * lower}
        out = these if out is None else out & these
    return out or set()


def _peaks(level: Level, compressive: bool) -> Peaks:
    return level.compression if compressive else level.raisers


def converge(spec: PartSpec, report: Callable[[Level], None] | None = None, required: Collection[RaiserName] = ()
             ) -> tuple[tuple[Study, ...], tuple[Solution, ...]]:
    """Solve on finer and finer meshes until, in every load case, every candidate peak whose band reaches
    that case's governing value, and every `required` raiser's, has an estimated error below
    spec.mesh.tolerance (see `assess`).

    Every case is solved on the same meshes (one stiffness per level, fem.analysis.solve_cases) and
    followed over the same levels: each has its own candidates, governing raiser and estimate. Stops
    unconverged at spec.mesh.max_levels levels, or when the next level would exceed spec.mesh.max_elements.
    Returns one study and the finest solution per case, in the order of spec.load_cases. `report` sees each
    level of the case with the largest peak on it. Each level is meshed in a child process
    (geometry/mesh_process.py): an interrupt stops gmsh at once, and a crash in it is a MeshError.
    """
    with MeshProcess() as mesher:
        return _study(spec, report, lambda part, scale: mesh_level(part, scale, mesher.mesh), required)


def _study(spec: PartSpec, report: Callable[[Level], None] | None, mesher: Callable[[PartSpec, float], Mesh],
           required: Collection[RaiserName]) -> tuple[tuple[Study, ...], tuple[Solution, ...]]:
    cases = [spec.for_case(case) for case in spec.load_cases]
    levels: list[list[Level]] = [[] for _ in cases]
    solutions: tuple[Solution, ...] = ()
    scale = FIRST_SCALE
    stop = ""
    formal = FORMAL_ORDER[spec.mesh.order]
    check_first_level(spec, scale)  # refuse a hopeless coarsest mesh before gmsh spends minutes on it
    settled: dict[RaiserName, float] = {}  # raisers no longer refined, with the scale their grading keeps
    while True:
        clock = time.perf_counter()
        meshed_part = replace(spec, mesh=replace(spec.mesh, settled=tuple(settled.items()))) if settled else spec
        mesh = mesher(meshed_part, scale)
        meshed = time.perf_counter() - clock
        stop = level_over_budget(spec, mesh.n_elements, first=not levels[0])
        if stop:
            break
        try:
            solved = solve_cases(spec, mesh, _contact_starts(solutions))
        except (BudgetError, RoundOffError) as exc:  # memory or round-off: keep the levels solved so far, if any
            if not levels[0]:
                raise
            stop = str(exc)
            break
        for solution in solved:
            check_fields(solution.displacement, solution.nodal_stress)
        solutions = solved
        for case, solution, case_levels in zip(cases, solutions, levels):
            case_levels.append(replace(measure_level(case, solution, mesh, scale, {"mesh": meshed, **solution.seconds}),
                                       settled=frozenset(settled)))
        if report is not None:
            report(max((lv[-1] for lv in levels), key=lambda lv: abs(lv.peak)))
        if len(levels[0]) >= MIN_LEVELS and all(assess(case, spec.mesh.tolerance, formal, required).converged
                                                 for case in levels):
            return tuple(finish(case, spec, "tolerance met", required) for case in levels), solutions
        if len(levels[0]) >= spec.mesh.max_levels:
            stop = f"reached the most levels allowed (mesh.max_levels = {spec.mesh.max_levels})"
            break
        if _next_elements(levels[0]) > spec.mesh.max_elements:
            stop = f"the next level would exceed mesh.max_elements = {spec.mesh.max_elements}"
            break
        if settles(spec) and len(levels[0]) >= SETTLE_AFTER:
            for name in settle(levels, spec.mesh.tolerance, formal, required) - set(settled):
                settled[name] = scale  # its grading stays as on this level
        scale /= LEVEL_RATIO
    studies = [finish(case, spec, stop, required) for case in levels]
    return tuple(replace(s, stop_reason="tolerance met") if s.converged and len(cases) > 1 else s
                 for s in studies), solutions


def mesh_level(spec: PartSpec, scale: float, mesh: Callable[[PartSpec, float], Mesh] = mesh_part) -> Mesh:
    """The part's mesh at `scale`, mirror-symmetric about the centre line y = 0 where the part's shape is
    (geometry.symmetry.mirror_symmetric) and no symmetry plane is declared: the half y >= 0 is meshed and
    mirrored (fem.symmetry.mirror_mesh), so that mirror-image raisers (two holes across the centre line, a
    shoulder's two fillets) see mirror-image meshes and, under a symmetric load, equal peaks on every level.
    The whole part is then solved as one. Meshed whole: a part with holds or edge loads (the mesh is split
    at their stretches' ends, which a mirrored half would not have on its mirrored side) and a long plate
    with far zones (geometry.far_field: meshed in pieces across its whole width). `mesh` meshes a part at
    a scale (geometry.meshing.mesh_part, or the child process of geometry/mesh_process.py)."""
    if spec.support.symmetry or spec.support.holds or any(case.load.edges for case in spec.load_cases) \
            or far_zones(spec) or not mirror_symmetric(spec, "y"):
        return mesh(spec, scale)
    half = replace(spec, support=replace(spec.support, symmetry=("y",)))
    return mirror_mesh(half, mesh(half, scale), "y")


def settles(spec: PartSpec) -> bool:
    """Whether the study stops refining raisers that cannot govern: on a drawn outline (geometry/kinds/
    drawn.py), whose many holes and corners would otherwise all be refined to the finest level."""
    return spec.outline != "bar"


def measure_level(spec: PartSpec, solution: Solution, modelled: Mesh, scale: float, seconds: dict[str, float]) -> Level:
    """The level record of one solve on the `modelled` mesh (a half or quarter of the part with symmetry
    planes): the global peak (until the study rewrites it), every candidate's peak of both signs, the sign
    that governs, the von Mises peak and the pin's peak contact pressure."""
    node = solution.peak_node()
    full = solution.mesh.nodes
    return Level(scale=scale, nodes=modelled.n_nodes, elements=modelled.n_elements, peak=solution.peak_stress(),
                 location=(float(full[node, 0]), float(full[node, 1])),  # full part
                 seconds=seconds, raisers=raiser_peaks(solution),
                 solver=solution.solver.method if solution.solver is not None else "",
                 von_mises=von_mises_peak(spec, solution), compression=raiser_peaks(solution, compressive=True),
                 compressive=solution.compressive_governs(), bearing=bearing_peak(solution),
                 passes=contact_passes(solution),
                 sharp=zone_peaks(solution, tuple((c.point, c.zone) for c in sharp_corners(spec))))


def contact_passes(solution: Solution) -> int | None:
    """The active-set passes of the level's contact solve (fastener groups, a rigid pin), or None."""
    if solution.fasteners is not None:
        return solution.fasteners.passes
    if solution.contact is not None:
        return solution.contact.passes
    return None


def refined(levels: list[Level] | tuple[Level, ...]) -> bool:
    """Whether each of the last MIN_LEVELS levels has more elements than the one before: levels that repeat
    a mesh repeat its peak, and an estimate from them would call any peak converged."""
    last = levels[-MIN_LEVELS:]
    return all(b.elements > a.elements for a, b in zip(last, last[1:]))


def finish(levels: list[Level], spec: PartSpec, stop: str, required: Collection[RaiserName] = ()) -> Study:
    """The study of the levels solved: the governing candidate's estimate, its own peak on every level
    (Level.peak / location, and Level.raisers of the governing sign), and the pin's bearing estimate."""
    formal = FORMAL_ORDER[spec.mesh.order]
    found = assess(levels, spec.mesh.tolerance, formal, required)
    name, compressive = found.governing, found.compressive
    own = []
    for lv in levels:
        peaks = _peaks(lv, compressive)
        peak, location = peaks.get(name, (lv.peak, lv.location))
        own.append(replace(lv, peak=peak, location=location, raisers=peaks))
    pressures = [lv.bearing for lv in levels if lv.bearing is not None]
    bearing = sequence_estimate(pressures, formal) if len(pressures) == len(levels) and pressures else None
    return Study(tuple(own), found.estimates[name], found.converged, stop, name, found.estimates, compressive,
                 bearing)


def _contact_starts(solutions: tuple[Solution, ...]) -> list | None:
    """Per case, the contact arcs of its fasteners (a rigid loading pin, pin holds) on the previous level:
    the next level's first active sets (fem.contact); None on the first level."""
    if not solutions:
        return None
    return [s.contact_arcs for s in solutions]


def _next_elements(levels: list[Level]) -> float:
    """Predicted triangle count of the next level from the growth seen so far."""
    if len(levels) < 2:
        return levels[-1].elements * LEVEL_RATIO ** 2
    return levels[-1].elements * levels[-1].elements / levels[-2].elements
