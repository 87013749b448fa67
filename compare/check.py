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
from ..fem.convergence import Estimate, Level, Study, converge
from ..fem.fastener_groups import bearing_stress
from ..geometry.kinds.base import NetCut, RaiserId, across
from ..geometry.outline import nearest_raiser
from ..geometry.registry import cuts, outline_size
from ..geometry.sharp_corners import ZONE, SharpCorner, sharp_corners
from ..geometry.spec import SINGLE_CASE, PartSpec, SectionSpec
from .edge_cut import ACROSS_LOAD, EDGE_NORMAL, EdgeCut, edge_cut, gross_spans, uses_edge_cut
from .guards import result_warnings
from .handbook import Match, handbook_matches
from .method_of_sections import SectionResult, section_result, section_results
from .notices import Amount, Notice, notice
from .nominal import FASTENER_BEARING, GrossSection, Nominal, NominalSet, critical_cut, edge_nominals, gross_section, nominal_stresses
from .sections import Cut
from .stress_peaks import StressPeaks, stress_peaks
from .case_cycle import part_fatigue
from .joint_result import JointResult, joint_result
from .signoff import DesignSignOff, FatigueSignOff, with_signoff

EQUILIBRIUM_WARNING = 0.005  # relative mismatch of the section force that earns a warning
ON_RAISER = 0.01  # a peak within this fraction of the width from a raiser's edge belongs to that raiser
COMPETING = 0.8  # raisers whose own peak reaches this fraction of the largest are reported as competing
TOP_PEAKS = 3  # most competing raisers reported

CAUTIONS = (  # every check's, after the model's own (general_cautions)
    "Loads and supports are idealised (end tractions by beam theory, an end held in x or clamped, pin and "
    "remote loads as stated); real fasteners, welds and fits load the part differently.",
    "The peak is an elastic stress at a point; whether it matters depends on the material, the loading "
    "(static or cyclic) and the governing design code.",
    "This is an engineering aid, not a substitute for the governing design code or for review and "
    "approval by a qualified, licensed engineer.",
)
STATE_WORDS = {"plane-stress": "plane-stress model (a thin plate: no stress through the thickness)",
               "plane-strain": "plane-strain model (no strain through the thickness: a thick part, or one "
                               "restrained through its thickness)"}


def general_cautions(condition: str = "plane-stress") -> tuple[str, ...]:
    """The cautions every check carries: the model, naming the two-dimensional state it used
    (plate.condition, geometry.spec.STRESS_STATES), then CAUTIONS."""
    state = STATE_WORDS.get(condition, f"{condition} model")
    model = (f"Linear-elastic, small-strain, two-dimensional {state}: no plasticity, buckling, friction, contact "
             "(other than a rigid pin's, when asked for), residual stress, or other through-thickness effects.")
    return (model, *CAUTIONS)


@dataclass(frozen=True)
class Peak:
    """The governing principal stress: the largest maximum principal stress on a free edge, or the
    minimum principal stress (negative) when nothing bears on the part and the compressive peak is larger
    in magnitude; converged estimate and finest-mesh value (MPa), where it is (mm) and which raiser it
    belongs to (None: at no raiser). All of it from one raiser's own sequence of mesh levels (fem.convergence)."""

    stress: float
    fe_stress: float
    location: tuple[float, float]
    feature: RaiserId | None

    @property
    def component(self) -> str:
        """Which principal stress the peak is: "max principal" or "min principal"."""
        return "min principal" if self.stress < 0.0 else "max principal"


@dataclass(frozen=True)
class Bearing:
    """Where a pin bears: its peak contact pressure (MPa: the estimate over the mesh levels when resolved to
    the mesh tolerance, else the finest level's), the finest level's, the relative band, whether it is
    resolved, and the bearing stress P / (d t) (MPa).
    The cosine pressure is prescribed (exact, p0 = 4 P / (pi d t)); a rigid pin's comes out of the solve."""

    pressure: float
    fe_pressure: float
    error: float
    resolved: bool
    prescribed: bool
    bearing_stress: float

    @property
    def ratio(self) -> float:
        """Peak contact pressure over the bearing stress P / (d t)."""
        return self.pressure / self.bearing_stress if self.bearing_stress else float("inf")


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
    bearing: Bearing | None = None  # a pin's contact pressure against P / (d t), where a pin bears
    gross: GrossSection | None = None  # the gross section Kt(gross) is referred to (compare.nominal.gross_section)
    joints: JointResult | None = None  # the fastener groups per fastener and per hole (compare.joint_result)
    sharp_corners: tuple[SharpCornerResult, ...] = ()  # every sharp inside corner and its zone's peaks

    @property
    def understatement(self) -> float | None:
        """How far the net-section average understates the governing peak, 1 - average / peak (a fraction
        below 1); None when the two differ in sign or either is zero (no average of the peak's sign)."""
        return understatement(self.net_section.average, self.peak.stress)

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


@dataclass(frozen=True)
class SharpCornerResult:
    """A sharp inside corner (geometry/sharp_corners.py) and the evidence that its peak is no Kt: the
    largest maximum principal stress in its zone on every mesh level (MPa), beside the governing peak."""

    corner: SharpCorner
    peaks: tuple[float, ...]
    governing: float

    @property
    def growth(self) -> float:
        """The zone's peak on the finest level over that on the coarsest (above 1: it grows)."""
        return self.peaks[-1] / self.peaks[0] if self.peaks and self.peaks[0] != 0.0 else float("nan")

    @property
    def exceeds(self) -> bool:
        """Whether the zone's peak on the finest level exceeds the governing peak: the part cannot be judged
        until the corner has a radius."""
        return bool(self.peaks) and abs(self.peaks[-1]) > abs(self.governing)


def sharp_corner_results(spec: PartSpec, study: Study, governing: float) -> tuple[SharpCornerResult, ...]:
    """Every sharp inside corner with its zone's peak on each level of the study."""
    return tuple(SharpCornerResult(corner, tuple(lv.sharp[k] for lv in study.levels if len(lv.sharp) > k), governing)
                 for k, corner in enumerate(sharp_corners(spec)))


def understatement(average: float, peak: float) -> float | None:
    """1 - average / peak for an average and a peak of one sign (MPa), else None."""
    if average == 0.0 or peak == 0.0 or (average > 0.0) != (peak > 0.0):
        return None
    return 1.0 - average / peak


def check_part(spec: PartSpec, report: Callable[[Level], None] | None = None) -> CheckResult:
    """Run the convergence study of every load case and check each; the governing case's result, with
    every case's under `cases` when there are several (module docstring)."""
    # a handbook case that describes one raiser (the middle hole of a row) is compared with that raiser's
    # own peak: the study converges it too
    required = {m.recognised.raiser for m in handbook_matches(spec) if m.recognised.raiser}
    studies, solutions = converge(spec, report, required)
    results = tuple(check_case(spec.for_case(case), study, solution, case.name)
                    for case, study, solution in zip(spec.load_cases, studies, solutions))
    if len(results) == 1:
        return results[0]
    cautions = tuple(dict.fromkeys(c for r in results for c in r.cautions))  # every case's, in order
    return replace(results[governing_case(results)], cases=results, cautions=cautions, fatigue=part_fatigue(results))


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
    """Compare one load case's governing raiser's converged peak with the hand calculation on its own
    critical section."""
    finest = study.levels[-1]  # its peak and location are the governing candidate's own (fem.convergence)
    feature, cut = _candidate_section(spec, study.governing, finest.location)
    head, nominal, gross = _raiser_result(spec, solution, feature, cut, study.estimate, finest.peak, finest.location)
    peak = Peak(head.stress, head.fe_stress, head.location, feature)
    section = head.section
    kt = KtResult(head.kt_net, head.kt_gross, study.estimate.error, study.converged)
    cuts = section_results(spec, solution)
    matches = tuple(handbook_matches(spec))
    return with_signoff(CheckResult(spec, study, solution, peak, section, nominal.gross.stress, kt, matches,
                                    _cautions(spec), tuple(_warnings(study, section, spec.mesh.tolerance)
                                                           + _section_warnings(cuts)
                                                           + result_warnings(spec, study, solution, peak, section, kt)),
                                    nominal=nominal, stresses=stress_peaks(solution), sections=cuts,
                                    peaks=raiser_peaks(spec, study, solution, matches, head), case=name,
                                    bearing=bearing_result(spec, study), gross=gross,
                                    joints=joint_result(spec, study, solution),
                                    sharp_corners=sharp_corner_results(spec, study, head.stress)))


def _candidate_section(spec: PartSpec, name: RaiserId | str,
                       location: tuple[float, float]) -> tuple[RaiserId | None, NetCut]:
    """The raiser a governing candidate names and its net-section cut; for the outline's own candidate,
    the raiser whose zone holds the peak, or none (`_owning_raiser`)."""
    sections = cuts(spec)
    if name in sections:
        return name, sections[name]  # type: ignore[return-value]
    return _owning_raiser(spec, location)


def _raiser_result(spec: PartSpec, solution: Solution, feature: RaiserId | None, cut: NetCut, estimate: Estimate,
                   fe_stress: float, location: tuple[float, float]) -> tuple[RaiserPeak, NominalSet, GrossSection | None]:
    """One raiser's converged peak on its own critical section, nominals and Kt: the same numbers for the
    headline and for every competing raiser. The gross section is the raiser's handbook's on a cut across
    the load (compare.nominal.gross_section); None on a cut normal to the edge (its own gross stretch)."""
    section = critical_section(spec, solution, location, cut)
    gross = None if section.kind == EDGE_NORMAL else gross_section(spec, feature, section.point, section.normal)
    nominal = bearing_led(solution, feature, estimate.value, section_nominals(spec, estimate.value, section, gross))
    result = RaiserPeak(feature, estimate.value, estimate.error, fe_stress, location, section,
                        _kt(estimate.value, nominal.net.stress), _kt(estimate.value, nominal.gross.stress))
    return result, nominal, gross


def bearing_led(solution: Solution, feature: RaiserId | None, peak: float, nominal: NominalSet) -> NominalSet:
    """At a hole where a fastener of a group bears and statics puts no load across the cut through the peak
    (a nil nominal: an end hole, a holding bolt at the edge of a flange), Kt is taken on that fastener's own
    bearing stress F / (d t), the nominal of pin and lug practice; the cut's nominals follow it in `all`.
    Any other nominal set is returned as it is."""
    if nominal.net.stress != 0.0 or feature is None or solution.fasteners is None:
        return nominal
    bearing = next((f.bearing for f in solution.fasteners.fasteners if f.hole.edge == feature and f.bearing > 0.0),
                   None)
    if bearing is None:
        return nominal
    own = Nominal(FASTENER_BEARING, f"bearing of the fastener in {feature}", "F / (d t) of that fastener", bearing,
                  abs(peak) / bearing)
    return NominalSet(own, own, (own,) + nominal.all)


def bearing_result(spec: PartSpec, study: Study) -> Bearing | None:
    """The pin's peak contact pressure against the bearing stress P / (d t), where a loading pin bears."""
    pin = spec.load.pin
    if pin is None or study.bearing is None:
        return None
    bearing = bearing_stress(pin.force, spec.holes[pin.hole - 1].diameter, spec.plate.thickness)
    fe = study.levels[-1].bearing or 0.0
    if pin.contact == "cosine":  # prescribed: p0 = 4 P / (pi d t) on every mesh
        return Bearing(fe, fe, 0.0, True, True, bearing)
    est = study.bearing
    resolved = est.error <= spec.mesh.tolerance
    # unresolved (the contact arc's edge still moves with the mesh): the finest level's value, not an extrapolation
    return Bearing(est.value if resolved else fe, fe, est.error, resolved, False, bearing)


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


def section_nominals(spec: PartSpec, peak: float, section: NetSection, gross: GrossSection | None = None) -> NominalSet:
    """The nominal stresses of a critical section: the load's handbook nominals on a cut across the load
    (the gross ones on `gross`, by default the plate's width along the cut), N / A + M s / I at the peak on
    a cut normal to the edge (compare/nominal.py)."""
    if section.kind == EDGE_NORMAL:
        return edge_nominals(spec, peak, section.result, section.gross)
    return nominal_stresses(spec, peak, section.result,
                            gross or gross_section(spec, None, section.point, section.normal))


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
    if spec.fasteners:
        extra.append("Each fastener of a group is a rigid, frictionless pin in its hole (with the stated clearance) "
                     "joined to a rigid connecting member by its stated stiffness; friction of a preloaded joint, "
                     "fastener bending, the other member's own flexibility and hole-to-hole fit differences change "
                     "the sharing and the peaks. A holding group's member is fixed in space.")
    corners = sharp_corners(spec)
    if corners:
        extra.append(f"The part has {len(corners)} sharp inside corner(s) (no radius): the elastic stress there is "
                     f"unbounded, so the peak search leaves out a zone of {ZONE:.0%} of the shorter adjoining piece "
                     "around each and no Kt is given for it; give each corner a radius to judge it.")
    if spec.load.edges:
        extra.append("Loads on the part's edges are spread as stated (a uniform traction over the stretch, or a "
                     "uniform pressure); whatever applies them in service distributes them differently near where "
                     "it bears.")
    return general_cautions(spec.plate.condition) + tuple(extra)


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


def raiser_peaks(spec: PartSpec, study: Study, solution: Solution, matches: tuple[Match, ...] = (),
                 governing: RaiserPeak | None = None) -> tuple[RaiserPeak, ...]:
    """The raisers whose own peaks compete: the governing raiser first, then every raiser whose converged
    edge peak reaches COMPETING of the governing one in magnitude, at most TOP_PEAKS in all, largest first,
    and any raiser a handbook match describes (the middle hole of a row); each with its own estimate
    (fem.convergence: every raiser converged on its own sequence), the net section through it, its
    average and Kt."""
    finest = study.levels[-1].raisers
    sections = cuts(spec)
    estimates = {n: e for n, e in study.estimates.items() if n in sections and n in finest}
    if not estimates:
        return ()
    size = {n: abs(e.value) for n, e in estimates.items()}
    top = max(size.values())
    ranked = sorted((n for n in size if size[n] >= COMPETING * top), key=lambda n: -size[n])
    if governing is not None and governing.feature in estimates:
        ranked = [governing.feature] + [n for n in ranked if n != governing.feature]
    chosen = ranked[:TOP_PEAKS]
    chosen += [m.recognised.raiser for m in matches if m.recognised.raiser in estimates and m.recognised.raiser not in chosen]
    out = []
    for name in chosen:
        if governing is not None and name == governing.feature:
            out.append(governing)
            continue
        value, location = finest[name]
        out.append(_raiser_result(spec, solution, name, sections[name], estimates[name], value, location)[0])
    return tuple(out)


def _warnings(study: Study, section: NetSection, tolerance: float) -> list[Notice]:
    out = []
    if not study.converged:
        out.append(notice(f"the peak did not converge to the requested tolerance ({study.stop_reason}); "
                          f"estimated error {study.estimate.error:.2%}" + _unconverged_rivals(study, tolerance)))
    if abs(section.equilibrium_error) > EQUILIBRIUM_WARNING:
        out.append(notice("the FE normal force on the net section differs from statics by "
                          f"{section.equilibrium_error:+.2%}; the mesh may be too coarse"))
    return out


def _unconverged_rivals(study: Study, tolerance: float) -> str:
    """Names of the other candidates whose band reaches the governing value but not the tolerance."""
    top = abs(study.estimate.value)
    rivals = [n for n, e in study.estimates.items()
              if n != study.governing and abs(e.value) * (1.0 + e.error) >= top and e.error > tolerance]
    return f"; not yet converged beside it: {', '.join(str(n) for n in rivals)}" if rivals else ""
