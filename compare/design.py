"""Static design check of a plate's net section and peak stress (mm, N, MPa).

Definitions (facts of the trade, common practice):

    allowable stress          = failure stress / factor of safety
    net-section average       = force / net area
    margin of safety          = allowable / actual - 1          (>= 0 passes)
    achieved factor of safety = failure stress / actual stress
    required net area         = force / allowable               (without concentration)
                              = Kt_net * force / allowable      (with concentration)
    required thickness        = required net area / net width

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


def net_section_average(force_n: float, net_area_mm2: float) -> float:
    """Average normal stress on the net section in MPa = |force| (N) / net area (mm²)."""
    _positive("net_area_mm2", net_area_mm2)
    return abs(force_n) / net_area_mm2


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


def required_net_area(force_n: float, allowable_mpa: float, kt: float = 1.0) -> float:
    """Net area in mm² needed to keep kt * |force| / area at the allowable (MPa).

    kt = 1 gives the hand (net-section average) sizing; kt = Kt_net sizes on the peak.
    """
    _positive("allowable_mpa", allowable_mpa)
    if not (math.isfinite(kt) and kt >= 1.0):
        raise ValueError(f"kt must be a finite number >= 1; got {kt!r}")
    return kt * abs(force_n) / allowable_mpa


def required_thickness(required_area_mm2: float, net_width_mm: float) -> float:
    """Thickness in mm giving `required_area_mm2` over the net width (mm) of the section."""
    _non_negative("required_area_mm2", required_area_mm2)
    _positive("net_width_mm", net_width_mm)
    return required_area_mm2 / net_width_mm


@dataclass(frozen=True)
class StressCheck:
    """One stress (MPa) compared with one allowable (MPa): margin = allowable/actual - 1."""

    label: str
    actual_mpa: float
    allowable_mpa: float
    margin: float
    passes: bool


def stress_check(label: str, actual_mpa: float, allowable_mpa: float) -> StressCheck:
    """Compare an actual stress magnitude with an allowable (MPa); passes when actual <= allowable."""
    actual = abs(actual_mpa)
    margin = margin_of_safety(allowable_mpa, actual)
    return StressCheck(label, actual, allowable_mpa, margin, actual <= allowable_mpa)


def hand_check(force_n: float, net_area_mm2: float, allowable_mpa: float) -> StressCheck:
    """Net-section average |force| / net area (N, mm² -> MPa) against the allowable (MPa)."""
    return stress_check("net-section average", net_section_average(force_n, net_area_mm2), allowable_mpa)


def peak_check(peak_mpa: float, allowable_mpa: float) -> StressCheck:
    """Peak stress (MPa) against the allowable (MPa)."""
    return stress_check("peak", peak_mpa, allowable_mpa)


@dataclass(frozen=True)
class DesignCheck:
    """Static sign-off numbers for one net section (mm, N, MPa) and what they mean.

    The governing allowable is the smaller of yield / fos_yield and ultimate / fos_ultimate;
    `governing_criterion` says which ("yield" or "ultimate"). `governing_check` is "net-section" for a
    ductile part (local yielding redistributes the peak) and "peak" for a brittle one; `passes` is the
    result of that check. Both checks are always reported. Achieved factors of safety against ultimate
    are None when no ultimate strength is given.
    """

    force_n: float
    net_area_mm2: float
    net_width_mm: float
    thickness_mm: float
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
    net_average_mpa: float
    peak_mpa: float
    net_margin: float
    peak_margin: float
    net_passes: bool
    peak_passes: bool
    achieved_fos_net_yield: float
    achieved_fos_peak_yield: float
    achieved_fos_net_ultimate: float | None
    achieved_fos_peak_ultimate: float | None
    required_net_area_mm2: float
    required_net_area_kt_mm2: float
    required_thickness_mm: float
    required_thickness_kt_mm: float
    governing_check: str
    passes: bool
    statements: tuple[str, ...]


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
    """Plain-language reading of a DesignCheck, governing check first, its stresses, areas and
    lengths shown in `system` (a geometry.units system name; the default gives mm, mm² and MPa)."""

    def stress(value: float) -> str:
        return format_quantity(value, "stress", system)

    def area(value: float) -> str:
        return format_quantity(value, "area", system)

    def length(value: float) -> str:
        return format_quantity(value, "length", system)

    criterion = (
        f"yield {stress(c.yield_mpa)} / {c.fos_yield:.4g}"
        if c.governing_criterion == "yield"
        else f"ultimate {stress(c.ultimate_mpa)} / {c.fos_ultimate:.4g}"
    )
    net = (
        f"Net-section average {stress(c.net_average_mpa)} vs allowable {stress(c.allowable_mpa)} "
        f"({criterion}): margin {c.net_margin:+.3f}, {_verdict(c.net_passes)}."
    )
    peak = (
        f"Peak {stress(c.peak_mpa)} (Kt_net {c.kt_net:.3g}) vs allowable {stress(c.allowable_mpa)}: "
        f"margin {c.peak_margin:+.3f}, {_verdict(c.peak_passes)}."
    )
    out: list[str] = []
    if c.ductile:
        out += [
            "Ductile material under static load: local yielding at the peak redistributes stress across "
            "the net section, so the net-section average check governs (common practice).",
            net,
            peak + " The peak is reported, not hidden: it governs fatigue and any brittle fracture.",
        ]
    else:
        out += [
            "Brittle material: there is no local yielding to relieve the peak, so the peak check governs.",
            peak,
            net,
        ]
    if c.peak_mpa > c.yield_mpa:
        out.append(
            f"The linear-elastic peak exceeds the yield strength {stress(c.yield_mpa)}: the material "
            "yields locally and the true peak stress is lower than the elastic figure."
        )
    out.append(
        f"Required net area {area(c.required_net_area_mm2)} without concentration, "
        f"{area(c.required_net_area_kt_mm2)} with Kt_net; at the net width {length(c.net_width_mm)} that "
        f"is a thickness of {length(c.required_thickness_mm)} or {length(c.required_thickness_kt_mm)} "
        f"(actual {length(c.thickness_mm)})."
    )
    out.append(f"Overall ({c.governing_check} check governs): {_verdict(c.passes)}.")
    return tuple(out)


def design_check(
    force_n: float,
    net_area_mm2: float,
    net_width_mm: float,
    thickness_mm: float,
    peak_mpa: float,
    kt_net: float,
    yield_mpa: float,
    ultimate_mpa: float | None,
    fos_yield: float,
    fos_ultimate: float | None,
    ductile: bool,
) -> DesignCheck:
    """Build the static DesignCheck for one net section.

    force_n:        axial force in N (sign ignored; magnitude is checked).
    net_area_mm2:   net (minimum) section area in mm².
    net_width_mm:   net width of that section in mm (used to turn areas into thicknesses).
    thickness_mm:   plate thickness in mm (reported beside the required thickness).
    peak_mpa:       peak stress magnitude in MPa from the FE solution.
    kt_net:         Kt on the net-section nominal stress (>= 1), used for the area with concentration.
    yield_mpa, ultimate_mpa: material strengths in MPa (ultimate may be None).
    fos_yield, fos_ultimate: factors of safety (>= 1) on yield and ultimate (None with ultimate).
    ductile:        True if local yielding can redistribute the peak under static load.
    """
    _positive("net_width_mm", net_width_mm)
    _positive("thickness_mm", thickness_mm)
    on_yield, on_ultimate, allowable, criterion = _governing_allowable(
        yield_mpa, ultimate_mpa, fos_yield, fos_ultimate
    )
    net = hand_check(force_n, net_area_mm2, allowable)
    peak = peak_check(peak_mpa, allowable)
    area = required_net_area(force_n, allowable)
    area_kt = required_net_area(force_n, allowable, kt_net)
    governing = "net-section" if ductile else "peak"
    check = DesignCheck(
        force_n=force_n,
        net_area_mm2=net_area_mm2,
        net_width_mm=net_width_mm,
        thickness_mm=thickness_mm,
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
        net_average_mpa=net.actual_mpa,
        peak_mpa=peak.actual_mpa,
        net_margin=net.margin,
        peak_margin=peak.margin,
        net_passes=net.passes,
        peak_passes=peak.passes,
        achieved_fos_net_yield=achieved_factor_of_safety(yield_mpa, net.actual_mpa),
        achieved_fos_peak_yield=achieved_factor_of_safety(yield_mpa, peak.actual_mpa),
        achieved_fos_net_ultimate=(
            None if ultimate_mpa is None else achieved_factor_of_safety(ultimate_mpa, net.actual_mpa)
        ),
        achieved_fos_peak_ultimate=(
            None if ultimate_mpa is None else achieved_factor_of_safety(ultimate_mpa, peak.actual_mpa)
        ),
        required_net_area_mm2=area,
        required_net_area_kt_mm2=area_kt,
        required_thickness_mm=required_thickness(area, net_width_mm),
        required_thickness_kt_mm=required_thickness(area_kt, net_width_mm),
        governing_check=governing,
        passes=net.passes if ductile else peak.passes,
        statements=(),
    )
    return replace(check, statements=design_statements(check))
