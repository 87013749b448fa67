"""The sign-off of one checked part: the static design check and the fatigue screen, for every load kind.

Wires the part file's [design] and [fatigue] tables (geometry.spec.DesignSpec, FatigueSpec) to the
converged FE numbers of a CheckResult (mm, N, MPa):

- the hand check uses the load's own nominal on the critical section (compare.nominal: axial N / A_net,
  bending |M| c / I_net, combined the extreme-fibre N / A + M s / I, a pin's net tension P / A_net beside
  its hole) or, under a remote stress, the remote state's equivalent stress by the material's criterion;
- the peak check uses the converged peaks by both criteria: the largest principal stress (the check's own
  peak, `CheckResult.peak`) and the von Mises peak, extrapolated over the same mesh levels
  (fem.equivalent_peak records it on every level); a ductile part is judged by von Mises, a brittle one
  by the principal stress; under a pin both are free-edge peaks and the contact is the bearing check's;
- a pin's bearing F / (d t) is checked against the bearing strength over the factor on yield;
- the required thickness of each check comes from t x actual / allowable (compare.design);
- the fatigue screen takes the notch's nominal and elastic peak under the load case the cycle scales,
  scales them to the cycle's two extremes (linear elasticity; `scaled_cycle`) and screens the two states
  (`notch_screen`); a cycle between two solved load cases builds its two states in compare/case_cycle.py
  and screens them the same way. The notch root radius comes from the mesh feature that carries the peak
  (its smallest radius of curvature; a hole's radius).

Each result carries a `basis`: the assumptions and where every input came from, in words without
numbers that depend on units, so the same lines serve the terminal, the JSON and the HTML report;
`material_basis` says where the material values came from (once per report).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

import numpy as np

from ..fem.convergence import FORMAL_ORDER, Estimate, sequence_estimate
from ..fem.recovery import von_mises
from ..geometry.kinds.base import RaiserId
from ..geometry.spec import BEARING_FACTOR, SINGLE_CASE, DesignSpec, FatigueSpec, PartSpec
from .design import HandStress, DesignCheck, design_check
from .fatigue import FatigueScreen, NotchCycle, fatigue_screen, scaled_cycle
from .local_strain import CyclicCurve
from .nominal import FASTENER_BEARING

if TYPE_CHECKING:
    from .check import CheckResult

CODE_CAUTION = (
    "Allowable = strength / factor of safety, margin = allowable / actual - 1 and required area = load / "
    "allowable follow common practice; the governing design code may define allowables, load factors and "
    "net sections differently, and it governs. This check does not replace that code or review and "
    "approval by a qualified, licensed engineer."
)
FATIGUE_CODE_CAUTION = (
    "Where a fatigue design code applies (detail categories, design S-N curves, partial factors), it "
    "governs; this screen does not replace it or review and approval by a qualified, licensed engineer."
)
NOT_CHECKED = (
    "Not checked here: buckling, shear tear-out and block shear, welds, bolted joints and fastener load "
    "sharing, and bearing at any hole other than a [load.pin]'s."
)
NOT_CHECKED_JOINT = (
    "Not checked here: buckling, shear tear-out and block shear, welds, the other members of the joint, "
    "preload, slip and fatigue of the fasteners themselves; the fasteners' sharing is the FE's with the stated "
    "stiffness and clearance."
)
TABLE_VALUES = (
    "The built-in table gives recalled specified minimums (from memory, see `stressraiser materials`); "
    "check them against the governing specification and the mill certificate."
)
HAND_BASIS = {
    "axial": "Hand check: the axial force over the net area of the critical section through the raiser carrying "
             "the peak, taken as uniform, as a hand calculation does.",
    "bending": "Hand check: the bending stress |M| c / I of the critical net section about its own centroid, M the "
               "statics moment there (beam theory: plane sections, stress linear across the section).",
    "combined": "Hand check: the larger extreme-fibre stress N / A + M s / I of the critical net section (beam "
                "theory, axial and bending superposed); the shear force's own stress is not included.",
    "pin": "Hand check: the pin's force over the net area of the cut through its hole across its line of action "
           "(net tension beside the hole, taken as uniform); the bearing check takes the force over the pin's "
           "projected area d t. Shear tear-out, hoop tension and dishing of a lug end are not checked.",
    "remote": "Hand check: the remote (far-field) stress state as given, by the material's criterion (von Mises of "
              "sx, sy, txy for a ductile metal, the largest principal stress in magnitude for a brittle one): the "
              "plate away from its raisers.",
    "boundary": "Hand check: N / A + M s / I at the peak on the cut normal to the edge there, N and M from the "
                "statics of the free body the cut separates under the loads on the part's boundary (beam theory "
                "across the cut).",
    "fasteners": "Hand check: N / A + M s / I at the peak on the cut normal to the edge there (the load reaching "
                 "that cut through the fastener groups, taken as beam theory spreads it); each fastener's bearing "
                 "F / (d t) and, with design.fastener_shear_strength, its average shear F / (n pi d^2 / 4) are "
                 "checked on their own (the fastener rows). The fasteners' forces are the FE's sharing, not equal "
                 "shares.",
}
HAND_LABELS = {"axial": "net-section average", "bending": "net-section bending stress",
               "combined": "net-section extreme-fibre stress", "pin": "net-section average beside the pin",
               "boundary": "cut at the peak, N / A + M s / I", "fasteners": "cut at the peak, N / A + M s / I"}


@dataclass(frozen=True)
class DesignSignOff:
    """The static design check of one part and the assumptions behind it.

    von_mises:          the converged von Mises peak's estimate (value MPa, relative band, method).
    von_mises_location: where the finest level's von Mises peak is (mm).
    """

    check: DesignCheck
    von_mises: Estimate
    von_mises_location: tuple[float, float]
    basis: tuple[str, ...]


@dataclass(frozen=True)
class OtherNotch:
    """Another point a cycle between two load cases was screened at (compare/case_cycle.py): the raiser
    (None: at no raiser), where (mm), the case whose converged peak is there, and its screen's modified
    Goodman factor, verdict and first-cycle yield flag."""

    feature: RaiserId | None
    location: tuple[float, float]
    case: str
    n_f: float
    passes: bool
    first_cycle_yield: bool


@dataclass(frozen=True)
class WiderRange:
    """A point of a cycle between two load cases where the elastic stress range on the finest mesh is wider
    than at the notches screened and neither case has its peak, so it is not screened (compare/case_cycle.py):
    the raiser (None: at no raiser), where (mm), and its range over the widest screened notch's (infinite when
    the screened notches see no range)."""

    feature: RaiserId | None
    location: tuple[float, float]
    ratio: float


@dataclass(frozen=True)
class FatigueSignOff:
    """The fatigue screen of one part.

    min_fraction, max_fraction: the cycle's extremes as multiples of the load case `max_case` (== `min_case`)
                 it scales; None for a cycle between two load cases.
    forces:      the cycle's (min, max) force in N when that load is one force (axial, or a pin), else None.
    feature:     the raiser carrying the notch's peak, whose radius is the notch root radius (None: at no raiser).
    basis:       the assumptions and where the inputs came from.
    min_case, max_case: the load cases of the cycle's two extremes (the same case for a scaled cycle).
    notch_case:  the case whose converged peak is the notch screened; location: where it is (mm).
    ratio:       a cycle between two cases: the other case's stress over the notch case's at the notch, along
                 the notch case's principal direction there, on the finest mesh (None for a scaled cycle).
    others:      the other points a cycle between two cases was screened at (the other case's peak).
    wider:       a point of a cycle between two cases with a wider elastic stress range, not screened.
    """

    screen: FatigueScreen
    min_fraction: float | None
    max_fraction: float | None
    forces: tuple[float, float] | None
    feature: RaiserId | None
    basis: tuple[str, ...]
    min_case: str = SINGLE_CASE
    max_case: str = SINGLE_CASE
    notch_case: str = SINGLE_CASE
    location: tuple[float, float] | None = None
    ratio: float | None = None
    others: tuple[OtherNotch, ...] = ()
    wider: WiderRange | None = None

    @property
    def between_cases(self) -> bool:
        """Whether the cycle runs between two load cases (else it scales one)."""
        return self.min_case != self.max_case


def with_signoff(result: CheckResult) -> CheckResult:
    """`result` with its design check and fatigue screen filled in where the part file asks for them."""
    return replace(result, design=design_signoff(result), fatigue=fatigue_signoff(result))


def _kt_for_signoff(result: CheckResult) -> tuple[float, tuple[str, ...]]:
    """Kt_net for the sign-off (at least 1: a plain bar has no concentration) and a note if clamped."""
    kt = result.kt.net
    if kt >= 1.0:
        return kt, ()
    return 1.0, (f"The FE Kt_net {kt:.4f} is below 1 (no concentration within the error band); 1 is used.",)


def _band(result: CheckResult) -> str:
    error = result.kt.error
    if not math.isfinite(error):
        return "The peak has no error band (too few mesh levels): treat small margins with care."
    state = "converged" if result.kt.converged else "NOT converged"
    return (f"The peak (largest principal stress) is the FE estimate extrapolated over the mesh levels ({state}, error band "
            f"±{error:.2%}); a margin smaller than the band is not resolved.")


def _stated(key: str, defaults: tuple[str, ...]) -> str:
    return "default" if key in defaults else "as given"


def material_basis(spec: PartSpec) -> tuple[str, ...]:
    """Where the material values come from, and the caution that goes with table values."""
    m = spec.material
    name = f"table grade {m.grade}" if m.grade else "properties given in the part file"
    lines = [f"Material: {name} ({m.family or 'family not given'}); source: {m.source}."]
    if m.grade:
        lines.append(TABLE_VALUES)
    return tuple(lines)


def hand_stress(result: CheckResult) -> HandStress:
    """The stress the hand check uses: the load's own net-section nominal (magnitude, MPa), or under a
    remote load the remote state's equivalent stress by the material's criterion (compare.design)."""
    spec = result.spec
    kind = spec.load.kind
    if kind == "remote":
        r = spec.load.remote
        if spec.design is not None and spec.design.behaviour == "brittle":
            value = max(abs(v) for v in r.principal)
            return HandStress("remote-stress", "remote stress", "largest remote principal stress in magnitude", value, False)
        szz = spec.material.nu * (r.sx + r.sy) if spec.plate.condition == "plane-strain" else 0.0
        value = float(von_mises(np.array([[r.sx, r.sy, r.txy]]), szz)[0])
        return HandStress("remote-stress", "remote stress", "von Mises of the remote sx, sy, txy", value, False)
    # the cut's own nominal, also where Kt is taken on a fastener's bearing (compare.check.bearing_led): the
    # bearing has its own line against the bearing strength
    nominal = next(n for n in result.nominal.all if n.key != FASTENER_BEARING)
    return HandStress("net-section", HAND_LABELS[kind], nominal.formula, abs(nominal.stress))


def von_mises_peak(result: CheckResult) -> tuple[Estimate, tuple[float, float]]:
    """The von Mises peak extrapolated over the study's levels the way the principal peak is
    (fem.convergence.sequence_estimate), and where the finest level has it (mm)."""
    levels = [lv.von_mises for lv in result.study.levels if lv.von_mises is not None]
    if not levels:
        finest = result.stresses.von_mises
        return Estimate(finest.value, math.inf, None, "single level"), finest.location
    return sequence_estimate([v for v, _ in levels], FORMAL_ORDER[result.spec.mesh.order]), levels[-1][1]


def bearing_stress(result: CheckResult) -> float | None:
    """A pin's bearing stress F / (d t) in MPa (compare.nominal's "bearing"), or the most loaded fastener's of
    the part's fastener groups, or None without either."""
    if result.joints is not None:
        return max(f.bearing for g in result.joints.groups for f in g.fasteners)
    return next((n.stress for n in result.nominal.all if n.key == "bearing"), None) if result.spec.load.pin else None


def fastener_shear(result: CheckResult) -> float | None:
    """The most loaded fastener's average shear F / (n pi d^2 / 4) (MPa) when [design] gives the fasteners'
    shear strength, else None."""
    if result.joints is None or result.spec.design.fastener_shear_strength is None:
        return None
    return max(f.shear for g in result.joints.groups for f in g.fasteners)


def design_signoff(result: CheckResult) -> DesignSignOff | None:
    """The static design check, or None when the part file has no [design] table."""
    spec, design = result.spec, result.spec.design
    if design is None:
        return None
    m, kind = spec.material, spec.load.kind
    kt, kt_note = _kt_for_signoff(result)
    vm, vm_location = von_mises_peak(result)
    bearing = bearing_stress(result)
    bearing_strength = None
    if bearing is not None:
        bearing_strength = design.bearing_strength or BEARING_FACTOR * m.yield_strength
    check = design_check(
        hand=hand_stress(result),
        peak_von_mises_mpa=abs(vm.value),
        peak_principal_mpa=abs(result.peak.stress),
        kt_net=kt,
        thickness_mm=spec.plate.thickness,
        net_width_mm=None if kind == "remote" else result.net_section.width,
        yield_mpa=m.yield_strength,
        ultimate_mpa=m.ultimate if design.ultimate_factor is not None else None,
        fos_yield=design.yield_factor,
        fos_ultimate=design.ultimate_factor,
        ductile=design.behaviour == "ductile",
        load_kind=kind,
        bearing_mpa=bearing,
        bearing_strength_mpa=bearing_strength,
        bearing_label="pin bearing stress" if result.joints is None else "fastener bearing stress, the most loaded",
        fastener_shear_mpa=fastener_shear(result),
        fastener_shear_strength_mpa=design.fastener_shear_strength if result.joints is not None else None,
    )
    ultimate = ("not checked (no design.ultimate_factor)" if design.ultimate_factor is None
                else f"{design.ultimate_factor:g} on ultimate (as given)")
    basis = [
        f"Factor of safety {design.yield_factor:g} on yield ({_stated('yield_factor', design.defaults)}); "
        f"{ultimate}.",
        f"Behaviour: {design.behaviour} ({design.behaviour_basis}); the peak is judged by the "
        f"{check.peak_criterion} criterion.",
        f"Static {kind} load; critical section through {_where(result.peak.feature)}. {HAND_BASIS[kind]}",
        _peak_basis(result, vm),
        _band(result),
        *kt_note,
    ]
    if not vm.error <= spec.mesh.tolerance:
        basis.append("The von Mises peak's band is wider than the target error mesh.tolerance (it is extrapolated over "
                     "the levels the principal peak needed): treat a von Mises margin inside that band with care.")
    if bearing is not None:
        basis.append(_bearing_basis(design, result.joints is not None))
    if spec.load.pin is not None and spec.load.pin.contact == "rigid" and spec.load.pin.clearance > 0.0:
        basis.append("With a clearance the rigid pin's contact depends on the load level and the plate's stiffness: "
                     "the required thicknesses, which take every stress as inversely proportional to the thickness, "
                     "are estimates; check the chosen thickness again.")
    basis += [NOT_CHECKED_JOINT if result.joints is not None else NOT_CHECKED, CODE_CAUTION]
    return DesignSignOff(check, vm, vm_location, tuple(basis))


def _peak_basis(result: CheckResult, vm: Estimate) -> str:
    band = f"band ±{vm.error:.2%}" if math.isfinite(vm.error) else "no band"
    pin = (" Under a pin or fastener both are free-edge peaks: the contact's own stresses are the bearing check's."
           if result.spec.load.pin is not None or result.spec.fasteners else "")
    return ("Peak check: the converged largest principal stress (in magnitude) and the von Mises peak, extrapolated "
            f"over the same mesh levels ({vm.method}, {band}); von Mises is the criterion for ductile metals, the "
            "largest principal stress for brittle materials (docs/references.md [Criteria])." + pin)


def _bearing_basis(design: DesignSpec, fasteners: bool = False) -> str:
    if design.bearing_strength is not None:
        strength = "the bearing strength as given in [design]"
    else:
        strength = (f"the default bearing strength {BEARING_FACTOR:g} x yield (common practice for a pin in a "
                    "close-fitting hole; docs/references.md [Pin-bearing]: give design.bearing_strength from "
                    "the governing code)")
    whose = "the most loaded fastener's force (the FE's sharing)" if fasteners else "the pin's force"
    rows = "the fastener rows" if fasteners else "the report's pin rows"
    return (f"Bearing: {whose} over its projected area d t, against {strength} over the factor of "
            f"safety on yield; the real contact pressure peaks above this average ({rows}).")


def _where(feature: RaiserId | None) -> str:
    """The peak's raiser in a sentence ("hole 2", or "the plate" when it is at no raiser)."""
    return "the plate (at no raiser)" if feature is None else str(feature)


def _root_radius(result: CheckResult, q_given: bool) -> tuple[float | None, str]:
    """(radius in mm of the raiser carrying the peak, or None; how it was found)."""
    feature = result.peak.feature
    radii = {f.name: f.radius for f in result.solution.mesh.features}
    radius = radii.get(feature)
    if radius is None or not (math.isfinite(radius) and radius > 0.0):
        radius = None
        note = (f"The peak is on {_where(feature)}, where there is no radius of curvature for a notch-"
                "sensitivity fit" + ("." if q_given else ": q = 1 is assumed (Kf = Kt)."))
    else:
        note = (f"Root radius of {feature}, the raiser carrying the peak (its smallest radius of curvature)"
                + (", not used: q is given." if q_given else ", used for the notch sensitivity."))
    return radius, note


def load_force(spec: PartSpec) -> float | None:
    """The [load]'s one force in N (load.axial alone, or the pin's force), or None."""
    if spec.load.kind == "axial":
        return spec.load.axial
    if spec.load.kind == "pin":
        return spec.load.pin.force
    return None


def notch_at_load(result: CheckResult) -> tuple[float, float]:
    """(nominal, elastic peak) at the notch under the result's own load (MPa, signed): the nominal on the
    critical section carries the peak's sign, and the peak is Kt x nominal with Kt at least 1."""
    kt, _ = _kt_for_signoff(result)
    peak = result.peak.stress
    nominal = math.copysign(abs(result.nominal.net.stress), peak)
    return nominal, kt * nominal if nominal else peak


def scales_case(result: CheckResult) -> bool:
    """Whether the part's [fatigue] cycle is this load case's load scaled (a cycle in fractions or forces of
    it); a cycle between two load cases belongs to the part (compare/case_cycle.py)."""
    fatigue = result.spec.fatigue
    return fatigue is not None and fatigue.cycle_form != "cases" and fatigue.case == result.case


def fatigue_signoff(result: CheckResult) -> FatigueSignOff | None:
    """The fatigue screen of the cycle that scales this load case's load, or None when the part file has no
    [fatigue] table or its cycle is another case's or between two cases."""
    if not scales_case(result):
        return None
    fatigue = result.spec.fatigue
    nominal, peak = notch_at_load(result)
    what = case_words(result)
    cycle = scaled_cycle(nominal, peak, fatigue.min_fraction, fatigue.max_fraction, what)
    screen = notch_screen(result, cycle)
    force = load_force(result.spec)
    forces = None if force is None else (fatigue.min_fraction * force, fatigue.max_fraction * force)
    basis = screen_basis(result, screen, _cycle_basis(result.spec, what))
    return FatigueSignOff(screen, fatigue.min_fraction, fatigue.max_fraction, forces, result.peak.feature, basis,
                          min_case=result.case, max_case=result.case, notch_case=result.case,
                          location=result.peak.location)


def case_words(result: CheckResult) -> str:
    """The load a result is for, in words: "the [load]" for a part with one, else "load case 'NAME'"."""
    return load_words(result.case, bool(result.spec.cases))


def load_words(case: str, named: bool) -> str:
    """A load case in words: "load case 'NAME'" when the part file names its cases ([[load]]), else "the [load]"."""
    return f"load case {case!r}" if named else "the [load]"


def cycle_words(fatigue: FatigueSignOff, named: bool) -> str:
    """The cycle in words, without numbers that depend on units ("0.1 to 1 x the [load]", or "between load
    case 'parked' (min) and load case 'hoist' (max)"); `named`: the part file names its load cases."""
    if fatigue.between_cases:
        return (f"between {load_words(fatigue.min_case, named)} (min) and {load_words(fatigue.max_case, named)} "
                "(max)")
    return f"{fatigue.min_fraction:.4g} to {fatigue.max_fraction:.4g} x {load_words(fatigue.max_case, named)}"


def notch_screen(result: CheckResult, cycle: NotchCycle) -> FatigueScreen:
    """The fatigue screen of `cycle` at the notch where `result`'s peak is: its root radius, the material
    and the [fatigue] settings."""
    spec, fatigue = result.spec, result.spec.fatigue
    m = spec.material
    radius, _ = _root_radius(result, fatigue.q is not None)
    curve = None
    if fatigue.cyclic_strength is not None:
        curve = CyclicCurve(m.E, fatigue.cyclic_strength, fatigue.cyclic_exponent, fatigue.cyclic_source)
    return fatigue_screen(
        cycle=cycle,
        root_radius_mm=radius,
        ultimate_mpa=m.ultimate,
        family=m.family,
        required_factor=fatigue.required_factor,
        method=fatigue.notch_sensitivity,
        fatigue_strength_mpa=m.fatigue_strength,
        fatigue_life_cycles=m.fatigue_life,
        q=fatigue.q,
        yield_mpa=m.yield_strength,
        curve=curve,
    )


def screen_basis(result: CheckResult, screen: FatigueScreen, cycle_basis: str) -> tuple[str, ...]:
    """The assumptions of a screen at `result`'s notch: the cycle (`cycle_basis`), the root radius, the
    notch sensitivity, the first-cycle yield check, the peak's band and the code caution."""
    fatigue = result.spec.fatigue
    _, radius_note = _root_radius(result, fatigue.q is not None)
    _, kt_note = _kt_for_signoff(result)
    if screen.method == "given":
        method = "Notch sensitivity q as given"
    elif screen.method == "unity":
        method = "Notch sensitivity q = 1 (Kf = Kt)"
    else:
        method = (f"Notch sensitivity by {fatigue.notch_sensitivity.capitalize()}'s steel fit "
                  f"({_stated('notch_sensitivity', fatigue.defaults)})")
    return (
        cycle_basis,
        radius_note,
        f"{method}; required fatigue factor {fatigue.required_factor:g} "
        f"({_stated('required_factor', fatigue.defaults)}).",
        _curve_basis(fatigue, result.spec.material.yield_strength),
        _band(result),
        *kt_note,
        FATIGUE_CODE_CAUTION,
    )


CYCLE_FORM_WORDS = {"fractions": "given as multiples of it",
                    "forces": "given as forces, divided by its force",
                    "amplitude": "given as alternating and mean forces, divided by its force"}
NOT_SCREENED = ("No variable-amplitude loading, cumulative damage, fretting at fastener holes, corrosion or "
                "temperature effects.")


def _cycle_basis(spec: PartSpec, what: str) -> str:
    """How the cycle is built from the load it scales (`what`, in words), and what that assumes for it."""
    f, pin = spec.fatigue, spec.load.pin
    text = (f"Constant-amplitude cycle from {f.min_fraction:.4g} to {f.max_fraction:.4g} x {what} "
            f"({CYCLE_FORM_WORDS[f.cycle_form]}): every stress scales with the load (linear elasticity), so the "
            f"notch's nominal and elastic peak at each extreme are those of {what} times the fraction. "
            f"{NOT_SCREENED}")
    if pin is not None and pin.contact == "rigid" and pin.clearance > 0.0:
        text += (" The rigid pin's clearance makes its contact depend on the load level: the cycle runs from zero "
                 f"to {what} itself, the two states that are solved exactly.")
    elif pin is not None and pin.contact == "rigid":
        text += " A neat-fit rigid pin's contact arc does not change with the load level, so its stresses scale."
    if f.min_fraction < 0.0 and spec.load.kind in ("axial", "combined"):
        text += " The cycle reaches compression: buckling is not checked."
    return text


def _curve_basis(fatigue: FatigueSpec, yield_mpa: float | None) -> str:
    if yield_mpa is None:
        return "First-cycle yield at the notch is not checked: the material has no yield strength."
    if fatigue.cyclic_strength is None:
        return ("First-cycle yield: the elastic notch stress Kt x nominal against the yield strength; no cyclic "
                "stress-strain curve is known, so a yielding notch gets no local strain estimate.")
    return ("First-cycle yield: the elastic notch stress Kt x nominal against the yield strength; a yielding "
            "notch's local stress and strain by Neuber's rule on the cyclic Ramberg-Osgood curve (K' and n' "
            f"{fatigue.cyclic_source}; E of [material]; docs/references.md [Neuber], [Ramberg-Osgood], [Masing]).")
