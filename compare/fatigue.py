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
  convention for ductile metals that do not yield at the notch on the first cycle).
- Modified Goodman: n_f = 1 / (sa/Se + sm/Su) for sm >= 0; for a compressive mean the line is taken
  as flat, n_f = Se / sa (common practice: compressive mean stress is not credited).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from ..geometry.errors import PartError
from ..geometry.materials import FAMILIES, STEEL_FAMILIES
from ..geometry.spec import NEUBER_STEEL_RANGE_MPA, Q_METHODS
from ..geometry.units import DEFAULT_SYSTEM, format_quantity

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
class LoadCycle:
    """A constant-amplitude cycle: alternating (>= 0) and mean values, in N (or MPa for stresses)."""

    alternating: float
    mean: float


def cycle_from_alternating(alternating: float, mean: float) -> LoadCycle:
    """LoadCycle from an alternating value (its magnitude is used) and a signed mean."""
    if not (math.isfinite(alternating) and math.isfinite(mean)):
        raise ValueError(f"alternating and mean must be finite; got {alternating!r}, {mean!r}")
    return LoadCycle(abs(alternating), mean)


def cycle_from_range(minimum: float, maximum: float) -> LoadCycle:
    """LoadCycle from the signed minimum and maximum of the cycle.

    alternating = (max - min) / 2, mean = (max + min) / 2. Requires minimum <= maximum.
    """
    if not (math.isfinite(minimum) and math.isfinite(maximum)):
        raise ValueError(f"minimum and maximum must be finite; got {minimum!r}, {maximum!r}")
    if minimum > maximum:
        raise ValueError(f"minimum {minimum!r} is above maximum {maximum!r}")
    return LoadCycle(0.5 * (maximum - minimum), 0.5 * (maximum + minimum))


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

    q, method:        notch sensitivity and how it was obtained ("peterson", "neuber", "given",
                      or "unity" when no fit exists for the family and q = 1 is assumed).
    family:           the material family screened (one of FAMILIES).
    kf:               fatigue notch factor 1 + q (Kt - 1).
    se_mpa:           fatigue strength used in the Goodman line.
    se_basis:         where se_mpa came from.
    life_cycles:      the life se_mpa applies to, or None for an endurance limit (steels).
    sa_nominal_mpa, sm_nominal_mpa: net-section alternating and mean stresses.
    sa_mpa, sm_mpa:   notched stresses, Kf times the nominal ones (both).
    n_f:              modified Goodman factor of safety on the notched stresses.
    required_factor:  the factor n_f must reach; passes = n_f >= required_factor.
    """

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
    cycle_n: LoadCycle,
    net_area_mm2: float,
    kt_net: float,
    root_radius_mm: float | None,
    ultimate_mpa: float,
    family: str,
    required_factor: float,
    method: str = "peterson",
    fatigue_strength_mpa: float | None = None,
    fatigue_life_cycles: float | None = None,
    q: float | None = None,
) -> FatigueScreen:
    """Screen one raiser for fatigue under a constant-amplitude axial load cycle.

    cycle_n:         alternating and mean axial force in N.
    net_area_mm2:    net-section area in mm² (nominal stress = force / net area).
    kt_net:          Kt on the net-section nominal stress (>= 1).
    root_radius_mm:  notch root radius in mm (hole radius for a hole), or None when the peak is at no
                     curved raiser: then q = 1 is assumed (Kf = Kt, conservative).
    ultimate_mpa:    ultimate tensile strength Su in MPa.
    family:          "steel", "stainless", "aluminium" or "titanium".
    required_factor: the Goodman factor n_f must reach (>= 1).
    method:          "peterson" or "neuber" (steel families; others use q = 1 unless q is given).
    fatigue_strength_mpa, fatigue_life_cycles: published/test fatigue strength and its life; required
                     for aluminium and titanium, optional for steels (else Se' is estimated).
    q:               notch sensitivity to use instead of a fit (0..1).
    """
    if family not in FAMILIES:
        raise PartError(f"material family {family!r} is not known; use one of {', '.join(FAMILIES)}")
    if not (math.isfinite(required_factor) and required_factor >= 1.0):
        raise PartError(f"required fatigue factor must be >= 1; got {required_factor!r}")
    _check_method(method)
    _positive("net_area_mm2", net_area_mm2)
    if root_radius_mm is not None:
        _positive("root_radius_mm", root_radius_mm)
    _positive("ultimate_mpa", ultimate_mpa)
    q_value, q_method = _notch_sensitivity(family, root_radius_mm, ultimate_mpa, method, q)
    kf = fatigue_notch_factor(kt_net, q_value)
    se, se_basis, life = _fatigue_strength(family, ultimate_mpa, fatigue_strength_mpa, fatigue_life_cycles)
    sa_nom = cycle_n.alternating / net_area_mm2
    sm_nom = cycle_n.mean / net_area_mm2
    sa, sm = kf * sa_nom, kf * sm_nom
    n_f = goodman_factor(sa, sm, se, ultimate_mpa)
    screen = FatigueScreen(
        q=q_value,
        method=q_method,
        family=family,
        kt_net=kt_net,
        kf=kf,
        root_radius_mm=root_radius_mm,
        ultimate_mpa=ultimate_mpa,
        se_mpa=se,
        se_basis=se_basis,
        life_cycles=life,
        sa_nominal_mpa=sa_nom,
        sm_nominal_mpa=sm_nom,
        sa_mpa=sa,
        sm_mpa=sm,
        n_f=n_f,
        required_factor=required_factor,
        passes=n_f >= required_factor,
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
    if s.family == "stainless" and (s.method != "given" or s.se_basis != "given"):
        out.append(
            "The steel fits were developed for carbon and alloy steels; they are applied to stainless "
            "steel here as common practice. Confirm with data for the grade."
        )
    return tuple(out)
