"""Static design check of a plate: the hand check on the load's own nominal, the peak check by the
failure criterion that fits the material, and a pin's bearing (mm, N, MPa).

Definitions (facts of the trade, common practice; docs/references.md [Practice]):

    allowable stress          = failure stress / factor of safety
    margin of safety          = allowable / actual - 1          (>= 0 passes)
    achieved factor of safety = failure stress / actual stress
    required net area         = force / allowable               (without concentration)
                              = Kt_net * force / allowable      (with concentration)
    required thickness        = required net area / net width

Every stress of a plate loaded by forces and moments (not by a remote stress) is inversely proportional
to its thickness, so the thickness that brings a stress to its allowable is t x actual / allowable: for
an axial load that is the required net area over the net width, and it holds alike for a bending
nominal, an extreme-fibre stress, a peak and a bearing stress. A remote stress state is given as a
stress and does not change with the thickness: it has no required thickness.

Failure criteria (docs/references.md [Criteria]): a ductile metal's peak is checked by its von Mises
stress, a brittle material's by its largest principal stress; both are computed and shown, the governing
one named. On a traction-free edge in plane stress the two coincide (one stress acts there).

Stresses and forces are magnitudes (>= 0): a compressive part is checked on |force|, and buckling is
not considered here. A zero actual stress gives an infinite margin and factor of safety.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from ..geometry.units import DEFAULT_SYSTEM, format_quantity


def _positive(name: str, value: float) -> None:
    if not (math.isfinite(value) and value > 0.0):
        raise ValueError(f"{name} must be a positive finite number; got {value!r}")


def _non_negative(name: str, value: float) -> None:
    if not (math.isfinite(value) and value >= 0.0):
        raise ValueError(f"{name} must be a finite number >= 0; got {value!r}")


def _factor(name: str, value: float) -> None:
    if not (math.isfinite(value) and value >= 1.0):
        raise ValueError(f"{name} must be a finite factor of safety >= 1; got {value!r}")


def allowable_stress(failure_stress_mpa: float, factor_of_safety: float) -> float:
    """Allowable stress in MPa = failure stress (MPa) / factor of safety (>= 1)."""
    _positive("failure_stress_mpa", failure_stress_mpa)
    _factor("factor_of_safety", factor_of_safety)
    return failure_stress_mpa / factor_of_safety


NO_HAND_LOAD = ("Ductile material, but by statics no load crosses the critical cut through the peak (the peak is "
                "driven by what bears or ends there, e.g. a fastener in its hole): a hand check on that cut cannot "
                "see it, so the peak check governs, judged by von Mises, the criterion for ductile metals.")


def margin_of_safety(allowable_mpa: float, actual_mpa: float) -> float:
    """Margin of safety = allowable / actual - 1 (both MPa, actual >= 0); inf when actual is 0."""
    _positive("allowable_mpa", allowable_mpa)
    _non_negative("actual_mpa", actual_mpa)
    return math.inf if actual_mpa == 0.0 else allowable_mpa / actual_mpa - 1.0


def achieved_factor_of_safety(failure_stress_mpa: float, actual_mpa: float) -> float:
    """Achieved factor of safety = failure stress / actual stress (both MPa); inf when actual is 0."""
    _positive("failure_stress_mpa", failure_stress_mpa)
    _non_negative("actual_mpa", actual_mpa)
    return math.inf if actual_mpa == 0.0 else failure_stress_mpa / actual_mpa


def scaled_thickness(thickness_mm: float, actual_mpa: float, allowable_mpa: float) -> float:
    """Thickness in mm at which a stress inversely proportional to the thickness (any stress of a plate
    loaded by forces and moments) reaches the allowable: thickness x actual / allowable."""
    _positive("thickness_mm", thickness_mm)
    _non_negative("actual_mpa", actual_mpa)
    _positive("allowable_mpa", allowable_mpa)
    return thickness_mm * actual_mpa / allowable_mpa


@dataclass(frozen=True)
class HandStress:
    """The stress a hand calculation checks (MPa, magnitude): the load's own nominal on the critical
    section (N / A_net, |M| c / I_net, the extreme-fibre N / A + M s / I, a pin's net tension) or a remote
    state's equivalent stress. `key`, `label` and `formula` say which; `per_thickness` is False for a
    remote stress (given as a stress: no required thickness)."""

    key: str
    label: str
    formula: str
    stress_mpa: float
    per_thickness: bool = True


@dataclass(frozen=True)
class CheckLine:
    """One stress (MPa, magnitude) against its allowable.

    key:        "net-section" or "remote-stress" (the hand check), "peak-von-mises", "peak-principal", "bearing".
    label, formula: what the stress is and how it was obtained, in words.
    strength_mpa: the failure stress the allowable divides (the governing one of yield and ultimate, or
                the bearing strength).
    achieved_fos_yield / achieved_fos_ultimate: yield (bearing strength for bearing) / actual, and
                ultimate / actual (None without an ultimate, and for bearing).
    required_thickness_mm: the thickness that brings the stress to its allowable (None for a remote
                stress).
    """

    key: str
    label: str
    formula: str
    actual_mpa: float
    allowable_mpa: float
    strength_mpa: float
    margin: float
    passes: bool
    achieved_fos_yield: float
    achieved_fos_ultimate: float | None
    required_thickness_mm: float | None


def check_line(key: str, label: str, formula: str, actual_mpa: float, allowable_mpa: float, strength_mpa: float,
               yield_like_mpa: float, ultimate_mpa: float | None, thickness_mm: float | None) -> CheckLine:
    """A CheckLine for the magnitude of `actual_mpa`: margin and verdict against `allowable_mpa` (passes
    when actual <= allowable), achieved factors against `yield_like_mpa` and `ultimate_mpa`, and the
    required thickness from `thickness_mm` (None: no required thickness)."""
    actual = abs(actual_mpa)
    return CheckLine(
        key=key, label=label, formula=formula, actual_mpa=actual, allowable_mpa=allowable_mpa,
        strength_mpa=strength_mpa, margin=margin_of_safety(allowable_mpa, actual), passes=actual <= allowable_mpa,
        achieved_fos_yield=achieved_factor_of_safety(yield_like_mpa, actual),
        achieved_fos_ultimate=None if ultimate_mpa is None else achieved_factor_of_safety(ultimate_mpa, actual),
        required_thickness_mm=None if thickness_mm is None else scaled_thickness(thickness_mm, actual, allowable_mpa),
    )


CRITERION_DUCTILE = "von Mises"
CRITERION_BRITTLE = "maximum principal"


@dataclass(frozen=True)
class DesignCheck:
    """Static sign-off numbers of one part (mm, N, MPa) and what they mean.

    The governing allowable is the smaller of yield / fos_yield and ultimate / fos_ultimate;
    `governing_criterion` says which ("yield" or "ultimate"). `hand` checks the load's own nominal on the
    critical section (or a remote state's equivalent stress); `peak_von_mises` and `peak_principal` the
    converged peaks by both criteria, `peak_criterion` naming the one that fits the material (von Mises
    for a ductile metal, maximum principal for a brittle one). `governing_check` is the hand check's key
    for a ductile part (local yielding redistributes the peak) and "peak" for a brittle one. A pin's
    `bearing` (F / (d t) against bearing_strength / fos_yield) must pass as well. `passes` is the
    governing check's verdict and, under a pin, the bearing's. Every line is always reported.
    """

    load_kind: str
    thickness_mm: float
    net_width_mm: float | None
    kt_net: float
    ductile: bool
    yield_mpa: float
    ultimate_mpa: float | None
    fos_yield: float
    fos_ultimate: float | None
    allowable_yield_mpa: float
    allowable_ultimate_mpa: float | None
    allowable_mpa: float
    governing_criterion: str
    peak_criterion: str
    governing_check: str
    hand: CheckLine
    peak_von_mises: CheckLine
    peak_principal: CheckLine
    bearing: CheckLine | None
    bearing_strength_mpa: float | None
    passes: bool
    statements: tuple[str, ...]
    fastener_shear: CheckLine | None = None  # the most loaded fastener's average shear, when a strength is given
    fastener_shear_strength_mpa: float | None = None

    @property
    def peak(self) -> CheckLine:
        """The peak check by the criterion that fits the material."""
        return self.peak_von_mises if self.peak_criterion == CRITERION_DUCTILE else self.peak_principal

    @property
    def checks(self) -> tuple[CheckLine, ...]:
        """Every line: the hand check, the bearing (a pin), the governing peak, then the other peak."""
        other = self.peak_principal if self.peak is self.peak_von_mises else self.peak_von_mises
        return (self.hand, *((self.bearing,) if self.bearing is not None else ()),
                *((self.fastener_shear,) if self.fastener_shear is not None else ()), self.peak, other)

    @property
    def required_net_area_mm2(self) -> float | None:
        """Net area at the hand check's required thickness (None without a net section)."""
        return _area(self.hand.required_thickness_mm, self.net_width_mm)

    @property
    def required_net_area_kt_mm2(self) -> float | None:
        """Net area at the peak check's required thickness: with the concentration."""
        return _area(self.peak.required_thickness_mm, self.net_width_mm)


def _area(thickness_mm: float | None, width_mm: float | None) -> float | None:
    return None if thickness_mm is None or width_mm is None else thickness_mm * width_mm


def _governing_allowable(
    yield_mpa: float, ultimate_mpa: float | None, fos_yield: float, fos_ultimate: float | None
) -> tuple[float, float | None, float, str]:
    """(allowable vs yield, allowable vs ultimate or None, governing allowable, criterion), MPa."""
    on_yield = allowable_stress(yield_mpa, fos_yield)
    if (ultimate_mpa is None) != (fos_ultimate is None):
        raise ValueError("ultimate_mpa and fos_ultimate must be given together or both be None")
    if ultimate_mpa is None or fos_ultimate is None:
        return on_yield, None, on_yield, "yield"
    if ultimate_mpa < yield_mpa:
        raise ValueError(f"ultimate_mpa {ultimate_mpa} is below yield_mpa {yield_mpa}")
    on_ultimate = allowable_stress(ultimate_mpa, fos_ultimate)
    if on_ultimate < on_yield:
        return on_yield, on_ultimate, on_ultimate, "ultimate"
    return on_yield, on_ultimate, on_yield, "yield"


def _verdict(passes: bool) -> str:
    return "passes" if passes else "FAILS"


def design_statements(c: DesignCheck, system: str = DEFAULT_SYSTEM) -> tuple[str, ...]:
    """Plain-language reading of a DesignCheck, governing check first, its stresses and lengths shown in
    `system` (a geometry.units system name; the default gives mm, mm² and MPa)."""

    def stress(value: float) -> str:
        return format_quantity(value, "stress", system)

    def length(value: float) -> str:
        return format_quantity(value, "length", system)

    criterion = (
        f"yield {stress(c.yield_mpa)} / {c.fos_yield:.4g}"
        if c.governing_criterion == "yield"
        else f"ultimate {stress(c.ultimate_mpa)} / {c.fos_ultimate:.4g}"
    )

    def line(ln: CheckLine, what: str, basis: str) -> str:
        return (f"{what} {stress(ln.actual_mpa)} vs allowable {stress(ln.allowable_mpa)} ({basis}): margin "
                f"{ln.margin:+.3f}, {_verdict(ln.passes)}.")

    hand = line(c.hand, f"{c.hand.label[0].upper()}{c.hand.label[1:]} ({c.hand.formula})", criterion)
    kt = f"Kt_net {c.kt_net:.3g}" if math.isfinite(c.kt_net) else "no Kt_net: nil nominal"
    peak = line(c.peak, f"Peak by {c.peak_criterion} (extrapolated over the mesh levels; {kt})",
                criterion)
    other_line = c.peak_principal if c.peak is c.peak_von_mises else c.peak_von_mises
    other_name = CRITERION_BRITTLE if other_line is c.peak_principal else CRITERION_DUCTILE
    other = (f"By {other_name} the peak is {stress(other_line.actual_mpa)}: margin {other_line.margin:+.3f}, "
             f"{_verdict(other_line.passes)} (shown, not governing).")
    out: list[str] = []
    if c.ductile and c.governing_check == "peak":
        out += [NO_HAND_LOAD, peak, hand]
    elif c.ductile:
        out += [
            "Ductile material under static load: local yielding at the peak redistributes stress across the "
            f"section, so the {c.hand.label} check governs (common practice); the peak is judged by von Mises, "
            "the criterion for ductile metals.",
            hand,
            peak + " Reported, not hidden: the peak governs fatigue and any brittle fracture.",
        ]
    else:
        out += [
            "Brittle material: there is no local yielding to relieve the peak, so the peak check governs, judged "
            "by the maximum principal stress, the criterion for brittle materials.",
            peak,
            hand,
        ]
    out.append(other)
    if c.bearing is not None:
        out.append(line(c.bearing, f"{c.bearing.label[0].upper()}{c.bearing.label[1:]} ({c.bearing.formula})",
                        f"bearing strength {stress(c.bearing_strength_mpa)} / {c.fos_yield:.4g}")
                   + " It must pass as well.")
    if c.fastener_shear is not None:
        out.append(line(c.fastener_shear, f"Fastener shear ({c.fastener_shear.formula})",
                        f"shear strength {stress(c.fastener_shear_strength_mpa)} / {c.fos_yield:.4g}")
                   + " It must pass as well.")
    if max(c.peak_von_mises.actual_mpa, c.peak_principal.actual_mpa) > c.yield_mpa:
        out.append(
            f"The linear-elastic peak exceeds the yield strength {stress(c.yield_mpa)}: the material "
            "yields locally and the true peak stress is lower than the elastic figure."
        )
    out.append(_required_text(c, system))
    with_bearing = " with the bearing check" if c.bearing is not None else ""
    with_bearing += " and the fastener shear check" if c.fastener_shear is not None else ""
    out.append(f"Overall ({c.governing_check} check governs{with_bearing}): {_verdict(c.passes)}.")
    return tuple(out)


def _required_text(c: DesignCheck, system: str) -> str:
    """The required thickness of every line that has one, and the required net area where there is one."""

    def length(value: float) -> str:
        return format_quantity(value, "length", system)

    def area(value: float) -> str:
        return format_quantity(value, "area", system)

    if c.hand.required_thickness_mm is None:
        return ("No required thickness: the remote stress is given as a stress and does not change with the "
                f"thickness (actual {length(c.thickness_mm)}).")
    parts = [f"{length(c.hand.required_thickness_mm)} for the {c.hand.label}",
             f"{length(c.peak.required_thickness_mm)} for the peak ({c.peak_criterion}, with Kt_net)"]
    if c.bearing is not None:
        parts.append(f"{length(c.bearing.required_thickness_mm)} for bearing")
    text = f"Required thickness {', '.join(parts)} (actual {length(c.thickness_mm)})"
    if c.net_width_mm is not None:
        text += (f"; at the net width {length(c.net_width_mm)} a net area of {area(c.required_net_area_mm2)} "
                 f"without concentration, {area(c.required_net_area_kt_mm2)} with Kt_net")
    return text + "."


def design_check(
    hand: HandStress,
    peak_von_mises_mpa: float,
    peak_principal_mpa: float,
    kt_net: float,
    thickness_mm: float,
    net_width_mm: float | None,
    yield_mpa: float,
    ultimate_mpa: float | None,
    fos_yield: float,
    fos_ultimate: float | None,
    ductile: bool,
    load_kind: str = "axial",
    bearing_mpa: float | None = None,
    bearing_strength_mpa: float | None = None,
    bearing_label: str = "pin bearing stress",
    fastener_shear_mpa: float | None = None,
    fastener_shear_strength_mpa: float | None = None,
) -> DesignCheck:
    """Build the static DesignCheck of one part.

    hand:               the stress the hand check uses (the load's nominal, or a remote equivalent).
    peak_von_mises_mpa, peak_principal_mpa: the converged peaks (magnitudes, MPa) by both criteria.
    kt_net:             Kt on the net-section nominal stress (>= 1), for the statements.
    thickness_mm:       plate thickness (mm); net_width_mm the critical section's net width (None: none).
    yield_mpa, ultimate_mpa: material strengths in MPa (ultimate may be None).
    fos_yield, fos_ultimate: factors of safety (>= 1) on yield and ultimate (None with ultimate).
    ductile:            True if local yielding can redistribute the peak under static load.
    load_kind:          geometry.spec.LOAD_KINDS, for the record.
    bearing_mpa, bearing_strength_mpa: a pin's bearing stress F / (d t) and the bearing strength it is
                        checked against (allowable = strength / fos_yield); both or neither; bearing_label
                        names it (a pin's, or the most loaded fastener's of a group).
    fastener_shear_mpa, fastener_shear_strength_mpa: the most loaded fastener's average shear
                        F / (n pi d^2 / 4) and the fasteners' shear strength (allowable = strength / fos_yield);
                        both or neither.
    """
    _positive("thickness_mm", thickness_mm)
    if net_width_mm is not None:
        _positive("net_width_mm", net_width_mm)
    if (bearing_mpa is None) != (bearing_strength_mpa is None):
        raise ValueError("bearing_mpa and bearing_strength_mpa must be given together or both be None")
    on_yield, on_ultimate, allowable, criterion = _governing_allowable(
        yield_mpa, ultimate_mpa, fos_yield, fos_ultimate
    )
    strength = yield_mpa if criterion == "yield" else ultimate_mpa
    per_t = thickness_mm if hand.per_thickness else None

    def line(key: str, label: str, formula: str, actual: float) -> CheckLine:
        return check_line(key, label, formula, actual, allowable, strength, yield_mpa, ultimate_mpa, per_t)

    hand_line = line(hand.key, hand.label, hand.formula, hand.stress_mpa)
    von_mises = line("peak-von-mises", "peak von Mises stress", "converged over the mesh levels", peak_von_mises_mpa)
    principal = line("peak-principal", "peak principal stress", "converged over the mesh levels, magnitude",
                     peak_principal_mpa)
    bearing = None
    if bearing_mpa is not None:
        _positive("bearing_strength_mpa", bearing_strength_mpa)
        bearing = check_line("bearing", bearing_label, "F / (d t)", bearing_mpa,
                             allowable_stress(bearing_strength_mpa, fos_yield), bearing_strength_mpa,
                             bearing_strength_mpa, None, thickness_mm)
    shear = None
    if fastener_shear_mpa is not None:
        _positive("fastener_shear_strength_mpa", fastener_shear_strength_mpa)
        shear = check_line("fastener-shear", "fastener shear stress", "F / (n pi d^2 / 4), the most loaded fastener",
                           fastener_shear_mpa, allowable_stress(fastener_shear_strength_mpa, fos_yield),
                           fastener_shear_strength_mpa, fastener_shear_strength_mpa, None, None)
    peak_criterion = CRITERION_DUCTILE if ductile else CRITERION_BRITTLE
    by_hand = ductile and hand.stress_mpa > 0.0  # a hand stress of nil: no load crosses the cut (NO_HAND_LOAD)
    governing = hand.key if by_hand else "peak"
    main = hand_line if by_hand else (von_mises if peak_criterion == CRITERION_DUCTILE else principal)
    check = DesignCheck(
        load_kind=load_kind,
        thickness_mm=thickness_mm,
        net_width_mm=net_width_mm,
        kt_net=kt_net,
        ductile=ductile,
        yield_mpa=yield_mpa,
        ultimate_mpa=ultimate_mpa,
        fos_yield=fos_yield,
        fos_ultimate=fos_ultimate,
        allowable_yield_mpa=on_yield,
        allowable_ultimate_mpa=on_ultimate,
        allowable_mpa=allowable,
        governing_criterion=criterion,
        peak_criterion=peak_criterion,
        governing_check=governing,
        hand=hand_line,
        peak_von_mises=von_mises,
        peak_principal=principal,
        bearing=bearing,
        bearing_strength_mpa=bearing_strength_mpa,
        passes=main.passes and (bearing is None or bearing.passes) and (shear is None or shear.passes),
        statements=(),
        fastener_shear=shear,
        fastener_shear_strength_mpa=fastener_shear_strength_mpa,
    )
    return replace(check, statements=design_statements(check))
