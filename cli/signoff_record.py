"""The `design` and `fatigue` objects of the JSON record: numbers in mm, N, MPa with stable keys.

Keys (all numbers in mm, N, MPa; factors and margins dimensionless; margin = allowable / actual - 1):

design:  factors {yield, ultimate}, behaviour, governing_check, governing_criterion,
         allowable {yield, ultimate, governing}, net_section {average, margin, passes},
         peak {stress, kt_net, margin, passes},
         achieved_factor {net_yield, peak_yield, net_ultimate, peak_ultimate},
         required {net_area, net_area_with_kt, thickness, thickness_with_kt, actual_thickness, net_width},
         passes, statements, basis
fatigue: cycle {min_force, max_force, alternating_force, mean_force}, feature, root_radius,
         notch_sensitivity {q, method}, kt_net, kf, strength {value, basis, life_cycles},
         nominal {alternating, mean}, notched {alternating, mean}, factor, required_factor, passes,
         statements, basis
part.material: E, nu, yield, ultimate, grade, family, ductile, fatigue_strength, fatigue_life, source.
Values that are not defined (no ultimate factor, no root radius) are null; an infinite factor is null.
"""

from __future__ import annotations

import math
from typing import Any

from ..compare.signoff import DesignSignOff, FatigueSignOff
from ..geometry.spec import Material


def _finite(value: float | None) -> float | None:
    return value if value is not None and math.isfinite(value) else None


def design_record(design: DesignSignOff | None) -> dict[str, Any] | None:
    """The `design` object, or None when the part file has no [design] table."""
    if design is None:
        return None
    c = design.check
    return {
        "factors": {"yield": c.fos_yield, "ultimate": c.fos_ultimate},
        "behaviour": "ductile" if c.ductile else "brittle",
        "governing_check": c.governing_check,
        "governing_criterion": c.governing_criterion,
        "allowable": {"yield": c.allowable_yield_mpa, "ultimate": c.allowable_ultimate_mpa,
                      "governing": c.allowable_mpa},
        "net_section": {"average": c.net_average_mpa, "margin": _finite(c.net_margin), "passes": c.net_passes},
        "peak": {"stress": c.peak_mpa, "kt_net": c.kt_net, "margin": _finite(c.peak_margin),
                 "passes": c.peak_passes},
        "achieved_factor": {
            "net_yield": _finite(c.achieved_fos_net_yield),
            "peak_yield": _finite(c.achieved_fos_peak_yield),
            "net_ultimate": _finite(c.achieved_fos_net_ultimate),
            "peak_ultimate": _finite(c.achieved_fos_peak_ultimate),
        },
        "required": {
            "net_area": c.required_net_area_mm2,
            "net_area_with_kt": c.required_net_area_kt_mm2,
            "thickness": c.required_thickness_mm,
            "thickness_with_kt": c.required_thickness_kt_mm,
            "actual_thickness": c.thickness_mm,
            "net_width": c.net_width_mm,
        },
        "passes": c.passes,
        "statements": list(c.statements),
        "basis": list(design.basis),
    }


def fatigue_record(fatigue: FatigueSignOff | None) -> dict[str, Any] | None:
    """The `fatigue` object, or None when the part file has no [fatigue] table."""
    if fatigue is None:
        return None
    s, cycle = fatigue.screen, fatigue.cycle
    return {
        "cycle": {
            "min_force": cycle.mean - cycle.alternating,
            "max_force": cycle.mean + cycle.alternating,
            "alternating_force": cycle.alternating,
            "mean_force": cycle.mean,
        },
        "feature": fatigue.feature,
        "root_radius": s.root_radius_mm,
        "notch_sensitivity": {"q": s.q, "method": s.method},
        "kt_net": s.kt_net,
        "kf": s.kf,
        "strength": {"value": s.se_mpa, "basis": s.se_basis, "life_cycles": s.life_cycles},
        "nominal": {"alternating": s.sa_nominal_mpa, "mean": s.sm_nominal_mpa},
        "notched": {"alternating": s.sa_mpa, "mean": s.sm_mpa},
        "factor": _finite(s.n_f),
        "required_factor": s.required_factor,
        "passes": s.passes,
        "statements": list(s.statements),
        "basis": list(fatigue.basis),
    }


def material_record(material: Material) -> dict[str, Any]:
    """The part's material: E, nu and strengths in MPa, fatigue life in cycles, and where they came from."""
    return {
        "E": material.E,
        "nu": material.nu,
        "yield": material.yield_strength,
        "ultimate": material.ultimate,
        "grade": material.grade,
        "family": material.family,
        "ductile": material.ductile,
        "fatigue_strength": material.fatigue_strength,
        "fatigue_life": material.fatigue_life,
        "source": material.source,
    }
