"""The check of one part: converged peak, critical net section, Kt, handbook comparison, cautions.

A part with several load cases is solved once per mesh level for all of them (fem.convergence); each
case gets a check of its own (peak, section, nominal, Kt, band, handbook, sign-off), and the result of
the part is its governing case's, with every case under `cases`. The governing case is the one with the
smallest margin of its governing design check when the part file has [design], else the one with the
largest converged peak in magnitude.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace

import numpy as np

from ..fem.analysis import Solution
from ..fem.convergence import MIN_LEVELS, Level, Study, converge, richardson
from ..geometry.kinds.base import NetCut, RaiserId, across
from ..geometry.outline import nearest_raiser, plate_polygon
from ..geometry.registry import cuts, outline_size
from ..geometry.spec import SINGLE_CASE, PartSpec, SectionSpec
from .edge_cut import ACROSS_LOAD, EDGE_NORMAL, EdgeCut, edge_cut, gross_spans, uses_edge_cut
from .guards import result_warnings
from .handbook import Match, handbook_matches
from .method_of_sections import SectionResult, section_result, section_results
from .notices import Amount, Notice, notice
from .nominal import NominalSet, critical_cut, edge_nominals, nominal_stresses
from .sections import Cut, ligaments
from .stress_peaks import StressPeaks, stress_peaks
from .signoff import DesignSignOff, FatigueSignOff, with_signoff

EQUILIBRIUM_WARNING = 0.005  # relative mismatch of the section force that earns a warning
ON_RAISER = 0.01  # a peak within this fraction of the width from a raiser's edge belongs to that raiser
COMPETING = 0.8  # raisers whose own peak reaches this fraction of the largest are reported as competing
TOP_PEAKS = 3  # most competing raisers reported

CAUTIONS = (
    "Linear-elastic, small-strain, two-dimensional plane-stress model: no plasticity, buckling, friction, "
    "contact (other than a rigid pin's, when asked for), residual stress, or through-thickness effects.",
    "Loads and supports are idealised (end tractions by beam theory, an end held in x or clamped, pin and "
    "remote loads as stated); real fasteners, welds and fits load the part differently.",
    "The peak is an elastic stress at a point; whether it matters depends on the material, the loading "
    "(static or cyclic) and the governing design code.",
    "This is an engineering aid, not a substitute for the governing design code or for review and "
    "approval by a qualified, licensed engineer.",
)


@dataclass(frozen=True)
class Peak:
    """The governing principal stress: the largest maximum principal stress, or the minimum principal
    stress (negative) when the compressive peak is larger in magnitude; converged estimate and
    finest-mesh value (MPa), where it is (mm) and which raiser it belongs to (None: at no raiser)."""

    stress: float
    fe_stress: float
    location: tuple[float, float]
    feature: RaiserId | None


@dataclass(frozen=True)
class NetSection:
    """The critical section: a cut perpendicular to the load at x (mm) through the peak's raiser (kind
    ACROSS_LOAD), or the cut normal to the edge at the peak (kind EDGE_NORMAL, compare/edge_cut.py).

    ligaments: material intervals along the cut (mm); width and area are their total (mm, mm^2); average
    is the statics normal force over the net area (MPa); fe_force the FE normal force on the cut (N), and
    equilibrium_error its relative difference from statics; gross: the stretches of the outline without
    cut-outs that the cut spans (mm along the cut; EDGE_NORMAL only).
    """

    x: float
    ligaments: tuple[tuple[float, float], ...]
    width: float
    area: float
    average: float
    fe_force: float
    equilibrium_error: float
    cut: Cut
    point: tuple[float, float] = (0.0, 0.0)  # the cut's point and unit normal (a pin's cut follows the pin)
    normal: tuple[float, float] = (1.0, 0.0)
    result: SectionResult | None = None  # the method-of-sections result of this cut (N, V, M vs statics)
    kind: str = ACROSS_LOAD
    gross: tuple[tuple[float, float], ...] = ()


@dataclass(frozen=True)
class KtResult:
    """Kt on the net and gross sections, relative error band, and whether the study converged."""

    net: float
    gross: float
    error: float
    converged: bool


@dataclass(frozen=True)
class RaiserPeak:
    """One raiser's own peak: the largest maximum principal stress on its edge, converged over the mesh
    levels (MPa) with its relative error band, the finest-mesh value, where it is (mm), the net section
    through that raiser and Kt on that section's net and gross nominal stresses."""

    feature: RaiserId
    stress: float
    error: float
    fe_stress: float
    location: tuple[float, float]
    section: NetSection
    kt_net: float
    kt_gross: float


@dataclass(frozen=True)
class CheckResult:
    spec: PartSpec
    study: Study
    solution: Solution
    peak: Peak
    net_section: NetSection
    gross_average: float
    kt: KtResult
    handbook: tuple[Match, ...]
    cautions: tuple[str, ...]
    warnings: tuple[Notice, ...]  # numbers in them keep their kind (compare/notices.py)
    design: DesignSignOff | None = None  # when the part file has a [design] table (compare.signoff)
    fatigue: FatigueSignOff | None = None  # when the part file has a [fatigue] table
    nominal: NominalSet | None = None  # every nominal stress of the load and which one each Kt uses
    stresses: StressPeaks | None = None  # peaks of principal, von Mises and Tresca stress (finest mesh)
    sections: tuple[SectionResult, ...] = ()  # the cuts the part file or command line asked for
    peaks: tuple[RaiserPeak, ...] = ()  # the competing raisers' peaks, largest first (see raiser_peaks)
    case: str = SINGLE_CASE  # the name of the load case this result is for
    cases: tuple[CheckResult, ...] = ()  # with several load cases: every case's result (this one among them)

    @property
    def every_case(self) -> tuple[CheckResult, ...]:
        """Every load case's result: `cases`, or this one alone."""
        return self.cases or (self,)

    def case_named(self, name: str) -> CheckResult:
        """The result of the load case called `name` (KeyError if the part has none)."""
        for result in self.every_case:
            if result.case == name:
                return result
        raise KeyError(name)


def check_part(spec: PartSpec, report: Callable[[Level], None] | None = None) -> CheckResult:
    """Run the convergence study of every load case and check each; the governing case's result, with
    every case's under `cases` when there are several (module docstring)."""
    studies, solutions = converge(spec, report)
    results = tuple(check_case(spec.for_case(case), study, solution, case.name)
                    for case, study, solution in zip(spec.load_cases, studies, solutions))
    if len(results) == 1:
        return results[0]
    cautions = tuple(dict.fromkeys(c for r in results for c in r.cautions))  # every case's, in order
    return replace(results[governing_case(results)], cases=results, cautions=cautions)


def governing_case(results: tuple[CheckResult, ...]) -> int:
    """Index of the governing case: the smallest margin of the governing design check when every result
    has one, else the largest converged peak in magnitude (the first on a tie)."""
    if all(r.design is not None for r in results):
        return int(np.argmin([design_margin(r.design) for r in results]))
    return int(np.argmax([abs(r.peak.stress) for r in results]))


def design_margin(design: DesignSignOff) -> float:
    """The margin that decides a design check: its governing line's (the hand check for a ductile part, the
    peak for a brittle one), or a pin's bearing when that is smaller (compare/design.py)."""
    check = design.check
    line = check.peak if check.governing_check == "peak" else check.hand
    return min([line.margin] + ([check.bearing.margin] if check.bearing is not None else []))


def check_case(spec: PartSpec, study: Study, solution: Solution, name: str = SINGLE_CASE) -> CheckResult:
    """Compare one load case's converged peak with the hand calculation on its critical section."""
    mesh = solution.mesh
    node = solution.peak_node()
    location = (float(mesh.nodes[node, 0]), float(mesh.nodes[node, 1]))
    feature, cut = _owning_raiser(spec, location)
    peak = Peak(study.estimate.value, solution.peak_stress(), location, feature)
    section = critical_section(spec, solution, location, cut)
    nominal = section_nominals(spec, peak.stress, section)
    gross = nominal.gross.stress
    kt = KtResult(_kt(peak.stress, nominal.net.stress), _kt(peak.stress, gross), study.estimate.error, study.converged)
    cuts = section_results(spec, solution)
    matches = tuple(handbook_matches(spec))
    return with_signoff(CheckResult(spec, study, solution, peak, section, gross, kt, matches,
                                    _cautions(spec), tuple(_warnings(study, section) + _section_warnings(cuts)
                                                           + result_warnings(spec, study, solution, peak, section, kt)),
                                    nominal=nominal, stresses=stress_peaks(solution), sections=cuts,
                                    peaks=raiser_peaks(spec, study, solution, matches), case=name))


def critical_section(spec: PartSpec, solution: Solution, location: tuple[float, float], cut: NetCut) -> NetSection:
    """The critical section through a peak at `location`: the cut normal to the edge there for a part held
    or loaded on its own boundary (compare/edge_cut.py), else (or when the peak is not on the boundary)
    the raiser's net section `cut`."""
    if uses_edge_cut(spec):
        normal = edge_cut(spec, location)
        if normal is not None:
            return edge_section(spec, solution, normal)
    return net_section(spec, solution, cut)


def edge_section(spec: PartSpec, solution: Solution, cut: EdgeCut) -> NetSection:
    """The cut normal to the edge at a peak as a NetSection: its ligaments within the window, statics on
    its free body, the FE resultants across it."""
    label = "cut normal to the edge at the peak"
    result = section_result(spec, solution, SectionSpec(cut.point, cut.normal, label), cut.window, cut.side)
    width = sum(b - a for a, b in result.ligaments)
    error = result.normal_error if result.normal_error is not None else 0.0
    average = result.statics.normal_force / result.area if result.area else 0.0
    return NetSection(cut.point[0], result.ligaments, width, result.area, average, result.fe_normal_force, error,
                      result.cut, cut.point, cut.normal, result, EDGE_NORMAL, tuple(gross_spans(spec, cut)))


def section_nominals(spec: PartSpec, peak: float, section: NetSection) -> NominalSet:
    """The nominal stresses of a critical section: the load's handbook nominals on a cut across the load,
    N / A + M s / I at the peak on a cut normal to the edge (compare/nominal.py)."""
    if section.kind == EDGE_NORMAL:
        return edge_nominals(spec, peak, section.result, section.gross)
    return nominal_stresses(spec, peak, section.result, _gross_width(spec, section))


def net_section(spec: PartSpec, solution: Solution, cut: NetCut) -> NetSection:
    """The critical net section (a raiser's cut, or through a pin's hole across the pin's line): exact
    ligaments, the average normal stress statics requires (N / A), and the FE equilibrium error
    (compare.method_of_sections: relative to the section's largest force scale)."""
    point, normal = critical_cut(spec, cut)
    result = section_result(spec, solution, SectionSpec(point, normal, "critical net section"))
    width = sum(b - a for a, b in result.ligaments)
    error = result.normal_error if result.normal_error is not None else 0.0
    average = result.statics.normal_force / result.area if result.area else 0.0
    return NetSection(point[0], result.ligaments, width, result.area, average, result.fe_normal_force,
                      error, result.cut, point, normal, result)


def _gross_width(spec: PartSpec, section: NetSection) -> float:
    """The plate's width along the critical cut (mm): the gross section."""
    spans = ligaments(plate_polygon(spec), section.point, section.normal)
    return sum(b - a for a, b in spans)


def _kt(peak: float, nominal: float) -> float:
    """|peak| / |nominal|; infinite when the nominal stress vanishes on the section."""
    return abs(peak / nominal) if nominal != 0.0 else float("inf")


def _cautions(spec: PartSpec) -> tuple[str, ...]:
    extra = []
    if spec.load.pin is not None and spec.load.pin.contact == "rigid":
        extra.append("The pin is idealised as rigid and frictionless, in contact with the hole's edge over the arc "
                     "the solve finds for the stated clearance; the peak rises with the clearance, and friction, pin "
                     "bending and the pin's own stiffness change the real contact and the peak.")
    elif spec.load.pin is not None:
        extra.append("The pin is idealised as rigid and frictionless, bearing on half the hole with a cosine "
                     "pressure (common practice); clearance, friction and pin bending change the real contact "
                     "and the peak.")
    if spec.support.held == "clamped":
        extra.append("A clamped end is an idealised support: where it meets a free edge the elastic stress is "
                     "singular, so the peak search leaves out a zone of 10 % of the end's width around those "
                     "corners; the real stress there depends on how the part is actually held.")
    if spec.support.symmetry:
        extra.append("A symmetric model assumes the real part, its loads and its supports are symmetric "
                     "about the declared planes; results are reported for the full part.")
    if any(h.where is not None for h in spec.support.holds):
        extra.append("Supports on the part's edges are idealised as rigid: a fixed stretch holds both displacements, "
                     "a roller the one normal to its edge. Where a fixed stretch ends, and where a roller or an edge "
                     "force ends inside an edge, the elastic stress is singular: the peak search leaves out 10 % of "
                     "the stretch's length around those ends, and the real stress there depends on how the part is "
                     "actually held and loaded.")
    if any(h.pin is not None for h in spec.support.holds):
        extra.append("A pin hold is a rigid, frictionless pin that fits its hole and is fixed in space; clearance, "
                     "friction and the pin's and its mounting's own stiffness change where and how hard the part "
                     "bears on it.")
    if spec.load.edges:
        extra.append("Loads on the part's edges are spread as stated (a uniform traction over the stretch, or a "
                     "uniform pressure); whatever applies them in service distributes them differently near where "
                     "it bears.")
    return CAUTIONS + tuple(extra)


def _section_warnings(cuts: tuple[SectionResult, ...]) -> list[Notice]:
    return [notice("section ", Amount(c.point, "cut", label=c.label), ": the FE resultants differ from statics "
                   f"by up to {c.worst_error:.2%}; the mesh may be too coarse there") for c in cuts
            if c.worst_error is not None and c.worst_error > EQUILIBRIUM_WARNING]


def _owning_raiser(spec: PartSpec, location: tuple[float, float]) -> tuple[RaiserId | None, NetCut]:
    """The raiser whose edge the peak lies on (the nearest edge within ON_RAISER of the width), else the
    raiser whose section zone holds the peak (nearest section first), else none. Returns the raiser's name
    (None for none) and the cut of its net section (for none, the cut across the load through the peak)."""
    sections = cuts(spec)
    near = nearest_raiser(spec, location, ON_RAISER * outline_size(spec)[1])
    if near is not None:
        return near, sections[near]
    best: tuple[RaiserId | None, NetCut, float] = (None, across(location[0], 0.0), np.inf)
    for name, cut in sections.items():
        gap = abs((location[0] - cut.point[0]) * cut.normal[0] + (location[1] - cut.point[1]) * cut.normal[1])
        if gap <= cut.reach and gap < best[2]:
            best = (name, cut, gap)
    return best[0], best[1]


def raiser_peaks(spec: PartSpec, study: Study, solution: Solution,
                 matches: tuple[Match, ...] = ()) -> tuple[RaiserPeak, ...]:
    """The raisers whose own peaks compete: every raiser whose converged edge peak is at least
    COMPETING of the largest, at most TOP_PEAKS of them, largest first, and any raiser a handbook match
    describes (the middle hole of a row); each with the net section through it, its average and Kt. A
    raiser's peak is extrapolated over the levels like the overall peak."""
    finest = study.levels[-1].raisers
    if not finest:
        return ()
    estimates = {}
    for name in finest:
        series = [lv.raisers[name][0] for lv in study.levels if name in lv.raisers]
        estimates[name] = richardson(series) if len(series) >= MIN_LEVELS else None
    value = {n: (e.value if e is not None else finest[n][0]) for n, e in estimates.items()}
    top = max(value.values())
    chosen = sorted((n for n in value if value[n] >= COMPETING * top), key=lambda n: -value[n])[:TOP_PEAKS]
    chosen += [m.recognised.raiser for m in matches if m.recognised.raiser in value and m.recognised.raiser not in chosen]
    sections = cuts(spec)
    out = []
    for name in chosen:
        section = critical_section(spec, solution, finest[name][1], sections.get(name, across(finest[name][1][0], 0.0)))
        nominal = section_nominals(spec, value[name], section)
        error = estimates[name].error if estimates[name] is not None else float("inf")
        out.append(RaiserPeak(name, value[name], error, finest[name][0], finest[name][1], section,
                              _kt(value[name], nominal.net.stress), _kt(value[name], nominal.gross.stress)))
    return tuple(out)


def _warnings(study: Study, section: NetSection) -> list[Notice]:
    out = []
    if not study.converged:
        out.append(notice(f"the peak did not converge to the requested tolerance ({study.stop_reason}); "
                          f"estimated error {study.estimate.error:.2%}"))
    if abs(section.equilibrium_error) > EQUILIBRIUM_WARNING:
        out.append(notice("the FE normal force on the net section differs from statics by "
                          f"{section.equilibrium_error:+.2%}; the mesh may be too coarse"))
    return out
