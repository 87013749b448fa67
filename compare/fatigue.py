"""Fatigue screen at a stress raiser: notch sensitivity, Kf, endurance estimate, modified Goodman.

Units: mm, N, MPa. This is a screen, not a life prediction: it asks whether the notched stresses sit
inside a modified Goodman line built from a specimen fatigue strength, nothing more.

Conventions:
- q by Peterson, q = 1 / (1 + a/r), steel fit a = 0.0254 (2068/Su)^1.8 mm (R. E. Peterson in Sines &
  Waisman, Metal Fatigue, 1959, from memory); or by Neuber, q = 1 / (1 + sqrt(rho'/r)), steel fit
  sqrt(rho') = 1.24 - 2.25e-3 Su + 1.60e-6 Su² - 4.11e-10 Su³ in sqrt(mm), Su 340-1700 MPa
  (Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., eq. 6-35, from memory).
  r is the notch root radius (for a hole, its radius).
- Kf = 1 + q (Kt - 1), with Kt on the net-section nominal stress.
- Kf is applied to BOTH the alternating and the mean nominal stress (the simple, conservative
  convention for ductile metals that do not yield at the notch on the first cycle). With two notch states
  (min and max of the cycle) each state's notched stress is nominal + q (peak - nominal) = Kf x nominal.
- First-cycle yield: flagged when the elastic notch stress Kt x nominal (the FE peak) passes the yield
  strength at either extreme of the cycle; then the root's local stress and strain are estimated by
  Neuber's rule on a cyclic Ramberg-Osgood curve (compare.local_strain) when one is known.
- Modified Goodman: n_f = 1 / (sa/Se + sm/Su) for sm >= 0; for a compressive mean the line is taken
  as flat, n_f = Se / sa (common practice: compressive mean stress is not credited).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace

from ..geometry.errors import PartError
from ..geometry.materials import FAMILIES, STEEL_FAMILIES
from ..geometry.spec import NEUBER_STEEL_RANGE_MPA, Q_METHODS
from ..geometry.units import DEFAULT_SYSTEM, format_quantity
from .local_strain import CyclicCurve, NotchResponse, notch_response

STEEL_KNEE_MPA = 1400.0  # above this Su the steel endurance estimate stops rising (common practice)
SCREEN_NOT_PREDICTION = (
    "This is a screen, not a life prediction: a pass means the notched stresses lie inside a "
    "modified Goodman line built from a specimen fatigue strength, not that a life is guaranteed."
)
UNMODIFIED_CAVEAT = (
    "The strength is an unmodified polished-specimen value: surface finish, size, load type, "
    "temperature and reliability factors are not applied here and usually lower it."
)


def _positive(name: str, value: float) -> None:
    if not (math.isfinite(value) and value > 0.0):
        raise ValueError(f"{name} must be a positive finite number; got {value!r}")


def peterson_a_steel(ultimate_mpa: float) -> float:
    """Peterson's material length a in mm for steels: 0.0254 (2068 / Su)^1.8, Su in MPa."""
    _positive("ultimate_mpa", ultimate_mpa)
    return 0.0254 * (2068.0 / ultimate_mpa) ** 1.8


def peterson_q(root_radius_mm: float, a_mm: float) -> float:
    """Notch sensitivity by Peterson, q = 1 / (1 + a/r); r and a in mm."""
    _positive("root_radius_mm", root_radius_mm)
    _positive("a_mm", a_mm)
    return 1.0 / (1.0 + a_mm / root_radius_mm)


def neuber_sqrt_rho_steel(ultimate_mpa: float) -> float:
    """Neuber's sqrt(rho') in sqrt(mm) for steels, Su in MPa; refuses Su outside 340-1700 MPa."""
    low, high = NEUBER_STEEL_RANGE_MPA
    if not (math.isfinite(ultimate_mpa) and low <= ultimate_mpa <= high):
        raise PartError(
            f"Neuber's steel fit for notch sensitivity is valid only for ultimate strength "
            f"{low:.0f}-{high:.0f} MPa; got {ultimate_mpa!r} MPa. Use the Peterson method or give q."
        )
    su = ultimate_mpa
    return 1.24 - 2.25e-3 * su + 1.60e-6 * su**2 - 4.11e-10 * su**3


def neuber_q(root_radius_mm: float, sqrt_rho_sqrt_mm: float) -> float:
    """Notch sensitivity by Neuber, q = 1 / (1 + sqrt(rho') / sqrt(r)); r in mm, sqrt(rho') in sqrt(mm)."""
    _positive("root_radius_mm", root_radius_mm)
    _positive("sqrt_rho_sqrt_mm", sqrt_rho_sqrt_mm)
    return 1.0 / (1.0 + sqrt_rho_sqrt_mm / math.sqrt(root_radius_mm))


def _check_method(method: str) -> None:
    if method not in Q_METHODS:
        allowed = ", ".join(Q_METHODS)
        raise PartError(f"notch sensitivity method {method!r} is not known; use one of {allowed}")


def steel_notch_sensitivity(root_radius_mm: float, ultimate_mpa: float, method: str) -> float:
    """q for a steel notch of root radius r (mm) and ultimate Su (MPa) by "peterson" or "neuber"."""
    _check_method(method)
    if method == "peterson":
        return peterson_q(root_radius_mm, peterson_a_steel(ultimate_mpa))
    return neuber_q(root_radius_mm, neuber_sqrt_rho_steel(ultimate_mpa))


def fatigue_notch_factor(kt: float, q: float) -> float:
    """Kf = 1 + q (Kt - 1), with Kt >= 1 and 0 <= q <= 1."""
    if not (math.isfinite(kt) and kt >= 1.0):
        raise ValueError(f"kt must be a finite number >= 1; got {kt!r}")
    if not (math.isfinite(q) and 0.0 <= q <= 1.0):
        raise ValueError(f"q must be between 0 and 1; got {q!r}")
    return 1.0 + q * (kt - 1.0)


def endurance_limit_steel(ultimate_mpa: float) -> float:
    """Unmodified specimen endurance limit Se' in MPa for steels (common practice).

    Se' = 0.5 Su for Su <= 1400 MPa, 700 MPa above. Surface, size, load, temperature and reliability
    factors are NOT applied; they usually lower the value.
    """
    _positive("ultimate_mpa", ultimate_mpa)
    return 0.5 * ultimate_mpa if ultimate_mpa <= STEEL_KNEE_MPA else 0.5 * STEEL_KNEE_MPA


@dataclass(frozen=True)
class NotchState:
    """The notch at one extreme of a load cycle: the nominal stress on the notch's net section and the
    elastic peak stress at its root (MPa, signed, tension positive; the nominal carries the peak's sign).
    `label` says where it comes from ("0.1 x [load]", or a named load case)."""

    nominal_mpa: float
    peak_mpa: float
    label: str = ""


@dataclass(frozen=True)
class NotchCycle:
    """A constant-amplitude cycle at the notch between two solved states: `low` at the cycle's minimum
    load, `high` at its maximum. Two states of one solution scaled by load fractions (`scaled_cycle`), or
    the solutions of two load cases, alike."""

    low: NotchState
    high: NotchState

    @property
    def nominal_alternating(self) -> float:
        return 0.5 * abs(self.high.nominal_mpa - self.low.nominal_mpa)

    @property
    def nominal_mean(self) -> float:
        return 0.5 * (self.high.nominal_mpa + self.low.nominal_mpa)

    @property
    def kt(self) -> float:
        """|peak / nominal| of the state with the larger nominal stress (the cycle's Kt); infinite when the
        nominal vanishes under a peak."""
        state = self.high if abs(self.high.nominal_mpa) >= abs(self.low.nominal_mpa) else self.low
        if state.nominal_mpa == 0.0:
            return math.inf if state.peak_mpa != 0.0 else 1.0
        return abs(state.peak_mpa / state.nominal_mpa)


def scaled_cycle(nominal_mpa: float, peak_mpa: float, low_fraction: float, high_fraction: float,
                 what: str = "[load]") -> NotchCycle:
    """The cycle between `low_fraction` and `high_fraction` of one solved load (low < high), whose notch
    has the nominal and peak stresses given (MPa, signed): linear elasticity scales both with the load."""
    if not (math.isfinite(low_fraction) and math.isfinite(high_fraction) and low_fraction < high_fraction):
        raise ValueError(f"need finite fractions with low < high; got {low_fraction!r}, {high_fraction!r}")

    def state(f: float) -> NotchState:
        return NotchState(f * nominal_mpa, f * peak_mpa, f"{f:g} x {what}")

    return NotchCycle(state(low_fraction), state(high_fraction))


def notched_stress(state: NotchState, q: float) -> float:
    """The fatigue-effective notch stress of a state: nominal + q (peak - nominal), i.e. Kf x nominal with
    Kf = 1 + q (Kt - 1) (MPa, signed)."""
    return state.nominal_mpa + q * (state.peak_mpa - state.nominal_mpa)


def goodman_factor(sa_mpa: float, sm_mpa: float, se_mpa: float, su_mpa: float) -> float:
    """Modified Goodman fatigue factor of safety n = 1 / (sa/Se + sm/Su), all MPa.

    sa >= 0 is the alternating stress, sm the signed mean. For sm < 0 the compressive mean is not
    credited: n = Se / sa. Returns inf when there is no alternating and no tensile mean stress.
    """
    _positive("se_mpa", se_mpa)
    _positive("su_mpa", su_mpa)
    if not (math.isfinite(sa_mpa) and sa_mpa >= 0.0 and math.isfinite(sm_mpa)):
        raise ValueError(f"sa must be finite and >= 0 and sm finite; got {sa_mpa!r}, {sm_mpa!r}")
    demand = sa_mpa / se_mpa + max(sm_mpa, 0.0) / su_mpa
    return math.inf if demand == 0.0 else 1.0 / demand


@dataclass(frozen=True)
class FatigueScreen:
    """Result of the fatigue screen at one raiser (MPa, mm, cycles).

    cycle:            the two notch states screened (compare.fatigue.NotchCycle).
    q, method:        notch sensitivity and how it was obtained ("peterson", "neuber", "given",
                      or "unity" when no fit exists for the family and q = 1 is assumed).
    family:           the material family screened (one of FAMILIES).
    kt_net:           the cycle's Kt on the net-section nominal; kf: fatigue notch factor 1 + q (Kt - 1).
    se_mpa:           fatigue strength used in the Goodman line.
    se_basis:         where se_mpa came from.
    life_cycles:      the life se_mpa applies to, or None for an endurance limit (steels).
    sa_nominal_mpa, sm_nominal_mpa: net-section alternating and mean stresses.
    sa_mpa, sm_mpa:   notched stresses, Kf times the nominal ones (both).
    n_f:              modified Goodman factor of safety on the notched stresses.
    required_factor:  the factor n_f must reach; passes = n_f >= required_factor.
    yield_mpa:        the monotonic yield strength the first cycle is compared with (None: not known).
    elastic_peak_mpa: the largest elastic notch stress of the cycle in magnitude (Kt x nominal).
    first_cycle_yield: True when elastic_peak_mpa passes yield_mpa: the notch root yields on the first cycle.
    reversed_yield:   True when the elastic notch stress range passes twice the yield strength (the root
                      yields again on every reversal, common practice).
    local:            the Neuber / Ramberg-Osgood estimate of the notch root's stress and strain
                      (compare.local_strain.NotchResponse) when the root yields and a cyclic curve is known.
    curve:            that cyclic curve (compare.local_strain.CyclicCurve), or None.
    """

    cycle: NotchCycle
    q: float
    method: str
    family: str
    kt_net: float
    kf: float
    root_radius_mm: float | None
    ultimate_mpa: float
    se_mpa: float
    se_basis: str
    life_cycles: float | None
    sa_nominal_mpa: float
    sm_nominal_mpa: float
    sa_mpa: float
    sm_mpa: float
    n_f: float
    required_factor: float
    passes: bool
    yield_mpa: float | None
    elastic_peak_mpa: float
    first_cycle_yield: bool
    reversed_yield: bool
    local: NotchResponse | None
    curve: CyclicCurve | None
    statements: tuple[str, ...]


def _notch_sensitivity(
    family: str, root_radius_mm: float | None, ultimate_mpa: float, method: str, q: float | None
) -> tuple[float, str]:
    """(q, method label) for the family, method and optional given q."""
    if q is not None:
        if not (math.isfinite(q) and 0.0 <= q <= 1.0):
            raise PartError(f"notch sensitivity q must be between 0 and 1; got {q!r}")
        return q, "given"
    if family in STEEL_FAMILIES and root_radius_mm is not None:
        return steel_notch_sensitivity(root_radius_mm, ultimate_mpa, method), method
    return 1.0, "unity"


def _fatigue_strength(
    family: str, ultimate_mpa: float, strength_mpa: float | None, life_cycles: float | None
) -> tuple[float, str, float | None]:
    """(Se in MPa, basis "given" or "estimate", life in cycles or None) for the family and data."""
    if life_cycles is not None and not (math.isfinite(life_cycles) and life_cycles > 0.0):
        raise PartError(f"fatigue life must be a positive number of cycles; got {life_cycles!r}")
    if strength_mpa is not None:
        if not (math.isfinite(strength_mpa) and 0.0 < strength_mpa <= ultimate_mpa):
            raise PartError(
                f"fatigue strength must be positive and not above the ultimate strength "
                f"{ultimate_mpa:.4g} MPa; got {strength_mpa!r}"
            )
        if family not in STEEL_FAMILIES and life_cycles is None:
            raise PartError(
                f"{family} has no endurance limit: give the life in cycles that the fatigue strength "
                f"{strength_mpa:.4g} MPa applies to"
            )
        return strength_mpa, "given", life_cycles
    if family in STEEL_FAMILIES:
        return endurance_limit_steel(ultimate_mpa), "estimate", None
    raise PartError(
        f"{family} has no endurance limit: a fatigue strength and the life in cycles it applies to are "
        "needed for the fatigue screen"
    )


def fatigue_screen(
    cycle: NotchCycle,
    root_radius_mm: float | None,
    ultimate_mpa: float,
    family: str,
    required_factor: float,
    method: str = "peterson",
    fatigue_strength_mpa: float | None = None,
    fatigue_life_cycles: float | None = None,
    q: float | None = None,
    yield_mpa: float | None = None,
    curve: CyclicCurve | None = None,
) -> FatigueScreen:
    """Screen one raiser for fatigue under a constant-amplitude cycle between two notch states.

    cycle:           the nominal and elastic peak stresses at the cycle's two extremes (MPa, signed).
    root_radius_mm:  notch root radius in mm (hole radius for a hole), or None when the peak is at no
                     curved raiser: then q = 1 is assumed (Kf = Kt, conservative).
    ultimate_mpa:    ultimate tensile strength Su in MPa.
    family:          "steel", "stainless", "aluminium" or "titanium".
    required_factor: the Goodman factor n_f must reach (>= 1).
    method:          "peterson" or "neuber" (steel families; others use q = 1 unless q is given).
    fatigue_strength_mpa, fatigue_life_cycles: published/test fatigue strength and its life; required
                     for aluminium and titanium, optional for steels (else Se' is estimated).
    q:               notch sensitivity to use instead of a fit (0..1).
    yield_mpa:       monotonic yield strength for the first-cycle yield flag (None: not flagged).
    curve:           cyclic Ramberg-Osgood curve for the local stress and strain when the root yields.
    """
    if family not in FAMILIES:
        raise PartError(f"material family {family!r} is not known; use one of {', '.join(FAMILIES)}")
    if not (math.isfinite(required_factor) and required_factor >= 1.0):
        raise PartError(f"required fatigue factor must be >= 1; got {required_factor!r}")
    _check_method(method)
    if root_radius_mm is not None:
        _positive("root_radius_mm", root_radius_mm)
    _positive("ultimate_mpa", ultimate_mpa)
    q_value, q_method = _notch_sensitivity(family, root_radius_mm, ultimate_mpa, method, q)
    kt = max(cycle.kt, 1.0)
    kf = fatigue_notch_factor(kt, q_value) if math.isfinite(kt) else math.inf
    se, se_basis, life = _fatigue_strength(family, ultimate_mpa, fatigue_strength_mpa, fatigue_life_cycles)
    low, high = notched_stress(cycle.low, q_value), notched_stress(cycle.high, q_value)
    sa, sm = 0.5 * abs(high - low), 0.5 * (high + low)
    n_f = goodman_factor(sa, sm, se, ultimate_mpa)
    elastic_peak = max(abs(cycle.high.peak_mpa), abs(cycle.low.peak_mpa))
    elastic_range = abs(cycle.high.peak_mpa - cycle.low.peak_mpa)
    yields = yield_mpa is not None and elastic_peak > yield_mpa
    local = None
    if yields and curve is not None:
        top, bottom = sorted((cycle.high.peak_mpa, cycle.low.peak_mpa), reverse=True)
        local = notch_response(curve, top, bottom)
    screen = FatigueScreen(
        cycle=cycle,
        q=q_value,
        method=q_method,
        family=family,
        kt_net=kt,
        kf=kf,
        root_radius_mm=root_radius_mm,
        ultimate_mpa=ultimate_mpa,
        se_mpa=se,
        se_basis=se_basis,
        life_cycles=life,
        sa_nominal_mpa=cycle.nominal_alternating,
        sm_nominal_mpa=cycle.nominal_mean,
        sa_mpa=sa,
        sm_mpa=sm,
        n_f=n_f,
        required_factor=required_factor,
        passes=n_f >= required_factor,
        yield_mpa=yield_mpa,
        elastic_peak_mpa=elastic_peak,
        first_cycle_yield=yields,
        reversed_yield=yield_mpa is not None and elastic_range > 2.0 * yield_mpa,
        local=local,
        curve=curve,
        statements=(),
    )
    return replace(screen, statements=screen_statements(screen))


def screen_statements(s: FatigueScreen, system: str = DEFAULT_SYSTEM) -> tuple[str, ...]:
    """Plain-language reading of a FatigueScreen, its stresses and lengths shown in `system`
    (a geometry.units system name; the default gives mm and MPa)."""

    def stress(value: float) -> str:
        return format_quantity(value, "stress", system)

    if s.method == "given":
        q_text = f"Notch sensitivity q = {s.q:.3f} as given."
    elif s.method == "unity" and s.root_radius_mm is None:
        q_text = ("The peak is at no curved raiser, so there is no root radius for a notch-sensitivity fit; "
                  "q = 1 is assumed, so Kf = Kt (conservative, common practice).")
    elif s.method == "unity":
        q_text = (f"No notch-sensitivity fit is built in for {s.family}; q = 1 is assumed, so Kf = Kt "
                  "(conservative, common practice).")
    else:
        q_text = (f"Notch sensitivity q = {s.q:.3f} by {'Peterson' if s.method == 'peterson' else 'Neuber'} "
                  f"(steel fit, root radius {format_quantity(s.root_radius_mm, 'length', system)}, "
                  f"Su {stress(s.ultimate_mpa)}).")
    if s.se_basis == "estimate":
        rule = ("0.5 Su" if s.ultimate_mpa <= STEEL_KNEE_MPA
                else f"{stress(0.5 * STEEL_KNEE_MPA)} (Su above {stress(STEEL_KNEE_MPA)})")
        se_text = f"Endurance limit estimated as Se' = {rule} = {stress(s.se_mpa)} (common practice for steels). "
    elif s.life_cycles is None:
        se_text = (f"Fatigue strength {stress(s.se_mpa)} from the material data, used as an endurance limit "
                   "(infinite life). ")
    else:
        life = f"{s.life_cycles:.3g} cycles"
        se_text = (f"Fatigue strength {stress(s.se_mpa)} from the material data, at {life}; the screen covers lives "
                   f"up to {life} only. ")
    out = [
        SCREEN_NOT_PREDICTION,
        q_text,
        f"Kf = 1 + q (Kt - 1) = 1 + {s.q:.3f} x ({s.kt_net:.3f} - 1) = {s.kf:.3f}.",
        se_text + UNMODIFIED_CAVEAT,
        (
            f"Modified Goodman with Kf applied to both alternating and mean stress: sa = {stress(s.sa_mpa)}, "
            f"sm = {stress(s.sm_mpa)}, n_f = {s.n_f:.3g} against {s.required_factor:.3g} required: "
            f"{'passes' if s.passes else 'FAILS'}."
        ),
    ]
    if s.sm_mpa < 0.0:
        out.append("The mean stress is compressive and is not credited: n_f = Se / sa.")
    out += _yield_statements(s, stress)
    if s.family == "stainless" and (s.method != "given" or s.se_basis != "given"):
        out.append(
            "The steel fits were developed for carbon and alloy steels; they are applied to stainless "
            "steel here as common practice. Confirm with data for the grade."
        )
    return tuple(out)


def _strain(value: float) -> str:
    return f"{100.0 * value:.3g} %"


def _yield_statements(s: FatigueScreen, stress: Callable[[float], str]) -> list[str]:
    """First-cycle and reversed yield at the notch root, and the local stress and strain estimate."""
    if s.yield_mpa is None:
        return ["First-cycle yield at the notch is not checked: the material has no yield strength."]
    if not s.first_cycle_yield:
        return [f"No first-cycle yield at the notch: the largest elastic notch stress (Kt x nominal) "
                f"{stress(s.elastic_peak_mpa)} is below the yield strength {stress(s.yield_mpa)}."]
    out = [f"FIRST-CYCLE YIELD at the notch: the elastic notch stress Kt x nominal reaches "
           f"{stress(s.elastic_peak_mpa)}, above the yield strength {stress(s.yield_mpa)}. The root yields on the "
           "first cycle: the elastic notch stresses above overstate the local ones, and the local mean stress "
           "shifts (the Goodman screen keeps the elastic, conservative mean)."]
    if s.reversed_yield:
        out.append(f"The elastic notch stress range passes twice the yield strength ({stress(2.0 * s.yield_mpa)}): "
                   "the root yields again on every reversal (low-cycle fatigue, common practice); a stress screen "
                   "does not cover this, a strain-life assessment is needed.")
    if s.local is None or s.curve is None:
        out.append("No cyclic stress-strain curve is known for this material: give fatigue.cyclic_strength (K') "
                   "and fatigue.cyclic_exponent (n') for the local stress and strain by Neuber's rule.")
        return out
    r, c = s.local, s.curve
    first = ("high", r.high_stress_mpa, r.high_strain) if r.first == "high" else ("low", r.low_stress_mpa, r.low_strain)
    then = ("low", r.low_stress_mpa, r.low_strain) if r.first == "high" else ("high", r.high_stress_mpa, r.high_strain)
    out.append(
        f"Local stress and strain at the notch root by Neuber's rule on the cyclic Ramberg-Osgood curve "
        f"(E {stress(c.E)}, K' {stress(c.K)}, n' {c.n:.4g}; {c.source}): first loading to the cycle's {first[0]} "
        f"extreme, {stress(first[1])} at {_strain(first[2])} strain; reversal to the {then[0]}, {stress(then[1])} "
        f"at {_strain(then[2])}. Loop: stress range {stress(r.stress_range_mpa)}, strain amplitude "
        f"{_strain(r.strain_amplitude)} (plastic {_strain(r.plastic_strain_amplitude)}), local mean stress "
        f"{stress(r.mean_stress_mpa)}.")
    out.append("This local strain is the notch-root estimate of strain-life practice, a screen and not a fatigue "
               "life: it assumes a uniaxial stress at the root, an elastic net section, a cyclically stable "
               "material and Masing loops; a life needs the material's strain-life curve and is not computed here.")
    return out
