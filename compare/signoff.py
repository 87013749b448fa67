"""The sign-off of one checked part: the static design check and the fatigue screen.

Wires the part file's [design] and [fatigue] tables (geometry.spec.DesignSpec, FatigueSpec) to the
converged FE numbers of a CheckResult (mm, N, MPa):

- the hand check uses the net-section average (applied axial force / net area of the critical section);
- the peak check uses the converged peak (Richardson estimate of the largest maximum principal stress);
- required net area and thickness are given without and with the concentration (Kt_net);
- the fatigue screen takes the notch root radius from the mesh feature that carries the peak (its
  smallest radius of curvature; a hole's radius), so new raiser families work as soon as the mesher
  names them and records their radius.

Each result carries a `basis`: the assumptions and where every input came from, in words without
numbers that depend on units, so the same lines serve the terminal, the JSON and the HTML report;
`material_basis` says where the material values came from (once per report).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from ..geometry.spec import PartSpec
from .design import DesignCheck, design_check
from .fatigue import FatigueScreen, LoadCycle, cycle_from_alternating, fatigue_screen

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
    "Not checked here: buckling, bearing at fastener holes, shear tear-out, block shear, welds, "
    "fastener load sharing and combined loads other than the axial [load]."
)
TABLE_VALUES = (
    "The built-in table gives recalled specified minimums (from memory, see `stressraiser materials`); "
    "check them against the governing specification and the mill certificate."
)


@dataclass(frozen=True)
class DesignSignOff:
    """The static design check of one part and the assumptions behind it."""

    check: DesignCheck
    basis: tuple[str, ...]


@dataclass(frozen=True)
class FatigueSignOff:
    """The fatigue screen of one part.

    cycle:   alternating and mean axial force in N.
    feature: the raiser carrying the peak, whose radius is the notch root radius ("plate" if none).
    basis:   the assumptions and where the inputs came from.
    """

    screen: FatigueScreen
    cycle: LoadCycle
    feature: str
    basis: tuple[str, ...]


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
    return (f"The peak is the FE estimate extrapolated over the mesh levels ({state}, error band "
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


def design_signoff(result: CheckResult) -> DesignSignOff | None:
    """The static design check, or None when the part file has no [design] table."""
    spec, design = result.spec, result.spec.design
    if design is None:
        return None
    m, section = spec.material, result.net_section
    kt, kt_note = _kt_for_signoff(result)
    check = design_check(
        force_n=spec.load.axial,
        net_area_mm2=section.area,
        net_width_mm=section.width,
        thickness_mm=spec.plate.thickness,
        peak_mpa=result.peak.stress,
        kt_net=kt,
        yield_mpa=m.yield_strength,
        ultimate_mpa=m.ultimate if design.ultimate_factor is not None else None,
        fos_yield=design.yield_factor,
        fos_ultimate=design.ultimate_factor,
        ductile=design.behaviour == "ductile",
    )
    ultimate = ("not checked (no design.ultimate_factor)" if design.ultimate_factor is None
                else f"{design.ultimate_factor:g} on ultimate (as given)")
    basis = (
        f"Factor of safety {design.yield_factor:g} on yield ({_stated('yield_factor', design.defaults)}); "
        f"{ultimate}.",
        f"Behaviour: {design.behaviour} ({design.behaviour_basis}).",
        f"Static axial load on the critical net section through {_where(result.peak.feature)}; the hand check "
        "uses its average stress, the peak check the converged peak, both as magnitudes.",
        _band(result),
        *kt_note,
        NOT_CHECKED,
        CODE_CAUTION,
    )
    return DesignSignOff(check, basis)


def _where(feature: str) -> str:
    """The peak's feature in a sentence ("hole 2", or "the plate" when it is at no raiser)."""
    return "the plate (at no raiser)" if feature == "plate" else feature


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


def fatigue_signoff(result: CheckResult) -> FatigueSignOff | None:
    """The fatigue screen, or None when the part file has no [fatigue] table."""
    spec, fatigue = result.spec, result.spec.fatigue
    if fatigue is None:
        return None
    m = spec.material
    kt, kt_note = _kt_for_signoff(result)
    radius, radius_note = _root_radius(result, fatigue.q is not None)
    cycle = cycle_from_alternating(fatigue.alternating_force, fatigue.mean_force)
    screen = fatigue_screen(
        cycle_n=cycle,
        net_area_mm2=result.net_section.area,
        kt_net=kt,
        root_radius_mm=radius,
        ultimate_mpa=m.ultimate,
        family=m.family,
        required_factor=fatigue.required_factor,
        method=fatigue.notch_sensitivity,
        fatigue_strength_mpa=m.fatigue_strength,
        fatigue_life_cycles=m.fatigue_life,
        q=fatigue.q,
    )
    if screen.method == "given":
        method = "Notch sensitivity q as given"
    elif screen.method == "unity":
        method = "Notch sensitivity q = 1 (Kf = Kt)"
    else:
        method = (f"Notch sensitivity by {fatigue.notch_sensitivity.capitalize()}'s steel fit "
                  f"({_stated('notch_sensitivity', fatigue.defaults)})")
    basis = (
        "Constant-amplitude axial load cycle; Kt_net from the static [load] case applies to the cycle by "
        "linearity. No variable-amplitude loading, cumulative damage, fretting at fastener holes, "
        "corrosion or temperature effects.",
        radius_note,
        f"{method}; required fatigue factor {fatigue.required_factor:g} "
        f"({_stated('required_factor', fatigue.defaults)}).",
        _band(result),
        *kt_note,
        FATIGUE_CODE_CAUTION,
    )
    return FatigueSignOff(screen, cycle, result.peak.feature, basis)
