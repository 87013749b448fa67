"""Local stress and strain at a notch root that yields: Neuber's rule on a cyclic Ramberg-Osgood curve.

Stresses in MPa, strains dimensionless (mm/mm), tension positive. Pure functions of numbers; nothing here
knows about meshes or part files. Sources: docs/references.md [Neuber], [Ramberg-Osgood], [Masing].

The cyclic stress-strain curve, in the Ramberg-Osgood form strain-life practice uses (odd in the stress:
compression mirrors tension):

    eps = sigma / E + (sigma / K')^(1/n')

After a reversal the local stress and strain change along the same curve doubled (Masing's hypothesis):

    d_eps = d_sigma / E + 2 (d_sigma / (2 K'))^(1/n')

Neuber's rule: the product of the local stress and strain equals the product the elastic solution gives,
so with the elastic notch stress sigma_e = Kt S (the FE peak) on first loading and its range on each
reversal,

    sigma eps = sigma_e^2 / E,        d_sigma d_eps = d_sigma_e^2 / E.

Each is one equation in one unknown. Written in s = ln(sigma) it reads g(s) = ln(sigma eps(sigma)) -
ln(sigma_e^2 / E) = 0, where ln(sigma eps) = logaddexp(2 s - ln E, (1 + 1/n') s - ln(K')/n') (times 2,
K' -> 2 K' for a range) is convex and increasing in s and g >= 0 at s = ln(sigma_e) (the elastic stress is
never below the local one): Newton's method from there converges monotonically, in a handful of steps.

This is the notch-root estimate of strain-life practice, a screen: it assumes a uniaxial stress at the
notch root (a free edge in plane stress), a net section that stays elastic, a cyclically stable material
and Masing behaviour; it does not give a fatigue life.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

NEWTON_STEPS = 100  # far more than needed: the iteration is monotone and nearly linear in ln(sigma)
RELATIVE_TOLERANCE = 1e-14  # on the stress


@dataclass(frozen=True)
class CyclicCurve:
    """A cyclic Ramberg-Osgood curve: E and K' in MPa, n' dimensionless (0 < n' < 1), and where each value
    came from (`source`: words, e.g. "material table 2024-t3 (from memory)" or "given in [fatigue]")."""

    E: float
    K: float
    n: float
    source: str = ""

    def __post_init__(self) -> None:
        for name, value in (("E", self.E), ("K", self.K)):
            if not (math.isfinite(value) and value > 0.0):
                raise ValueError(f"{name} must be a positive finite stress in MPa; got {value!r}")
        if not (math.isfinite(self.n) and 0.0 < self.n < 1.0):
            raise ValueError(f"n must be between 0 and 1; got {self.n!r}")


def curve_strain(curve: CyclicCurve, stress_mpa: float) -> float:
    """Total strain on the cyclic curve at `stress_mpa` (signed): sigma / E + (|sigma| / K')^(1/n') sign."""
    plastic = (abs(stress_mpa) / curve.K) ** (1.0 / curve.n)
    return stress_mpa / curve.E + math.copysign(plastic, stress_mpa)


def branch_strain_range(curve: CyclicCurve, stress_range_mpa: float) -> float:
    """Strain range along a hysteresis branch for a stress range (>= 0): the cyclic curve doubled (Masing)."""
    return 2.0 * curve_strain(curve, 0.5 * stress_range_mpa)


def _neuber_root(elastic_mpa: float, E: float, K: float, n: float, doubled: bool) -> float:
    """sigma >= 0 with sigma^2/E + c sigma (sigma/K_)^(1/n) = elastic^2/E (c = 1, K_ = K; doubled: c = 2,
    K_ = 2K), by Newton's method in ln(sigma) (see the module docstring)."""
    if elastic_mpa == 0.0:
        return 0.0
    c, k = (2.0, 2.0 * K) if doubled else (1.0, K)
    log_target = 2.0 * math.log(elastic_mpa) - math.log(E)
    elastic_slope, plastic_slope = 2.0, 1.0 + 1.0 / n
    plastic_offset = math.log(c) - math.log(k) / n
    s = math.log(elastic_mpa)
    for _ in range(NEWTON_STEPS):
        a = elastic_slope * s - math.log(E)
        b = plastic_slope * s + plastic_offset
        total = max(a, b) + math.log1p(math.exp(-abs(a - b)))  # logaddexp(a, b)
        weight = math.exp(b - total)  # the plastic share of sigma eps
        step = (total - log_target) / (elastic_slope + (plastic_slope - elastic_slope) * weight)
        s -= step
        if abs(step) <= RELATIVE_TOLERANCE:
            break
    return math.exp(s)


def neuber_stress(curve: CyclicCurve, elastic_mpa: float) -> tuple[float, float]:
    """(local stress MPa, local strain) on first loading from zero to the elastic notch stress `elastic_mpa`
    (signed): sigma eps = elastic^2 / E on the cyclic curve."""
    sigma = math.copysign(_neuber_root(abs(elastic_mpa), curve.E, curve.K, curve.n, doubled=False), elastic_mpa)
    return sigma, curve_strain(curve, sigma)


def neuber_range(curve: CyclicCurve, elastic_range_mpa: float) -> tuple[float, float]:
    """(local stress range MPa, local strain range) for an elastic notch stress range (>= 0) on a Masing
    branch: d_sigma d_eps = d_sigma_e^2 / E."""
    if elastic_range_mpa < 0.0:
        raise ValueError(f"a range is not negative; got {elastic_range_mpa!r}")
    d_sigma = _neuber_root(elastic_range_mpa, curve.E, curve.K, curve.n, doubled=True)
    return d_sigma, branch_strain_range(curve, d_sigma)


@dataclass(frozen=True)
class NotchResponse:
    """The notch root through one cycle: loaded from zero to the first extreme, then reversed to the other.

    elastic_high_mpa, elastic_low_mpa: the elastic notch stresses (Kt x nominal) at the cycle's extremes.
    first:              "high" or "low", the extreme reached first (the larger in magnitude; high on a tie).
    high_stress_mpa, high_strain, low_stress_mpa, low_strain: the local values at the two extremes.
    stress_range_mpa, strain_range: the hysteresis loop's ranges; mean_stress_mpa its mean stress;
    strain_amplitude half the strain range; plastic_strain_amplitude half its plastic part.
    """

    elastic_high_mpa: float
    elastic_low_mpa: float
    first: str
    high_stress_mpa: float
    high_strain: float
    low_stress_mpa: float
    low_strain: float
    stress_range_mpa: float
    strain_range: float
    mean_stress_mpa: float
    strain_amplitude: float
    plastic_strain_amplitude: float


def notch_response(curve: CyclicCurve, elastic_high_mpa: float, elastic_low_mpa: float) -> NotchResponse:
    """Local stress and strain at the notch root for a cycle between two elastic notch stresses (MPa, signed;
    high >= low). The root is loaded from zero to the extreme of larger magnitude (Neuber on the cyclic
    curve), then reversed to the other (Neuber on the Masing branch)."""
    if not elastic_high_mpa >= elastic_low_mpa:
        raise ValueError(f"the high elastic stress {elastic_high_mpa!r} is below the low {elastic_low_mpa!r}")
    first = "high" if abs(elastic_high_mpa) >= abs(elastic_low_mpa) else "low"
    sigma_1, eps_1 = neuber_stress(curve, elastic_high_mpa if first == "high" else elastic_low_mpa)
    d_sigma, d_eps = neuber_range(curve, elastic_high_mpa - elastic_low_mpa)
    if first == "high":
        high, low = (sigma_1, eps_1), (sigma_1 - d_sigma, eps_1 - d_eps)
    else:
        low, high = (sigma_1, eps_1), (sigma_1 + d_sigma, eps_1 + d_eps)
    return NotchResponse(
        elastic_high_mpa=elastic_high_mpa,
        elastic_low_mpa=elastic_low_mpa,
        first=first,
        high_stress_mpa=high[0],
        high_strain=high[1],
        low_stress_mpa=low[0],
        low_strain=low[1],
        stress_range_mpa=d_sigma,
        strain_range=d_eps,
        mean_stress_mpa=0.5 * (high[0] + low[0]),
        strain_amplitude=0.5 * d_eps,
        plastic_strain_amplitude=0.5 * (d_eps - d_sigma / curve.E),
    )
