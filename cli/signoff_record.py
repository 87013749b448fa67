"""The `design` and `fatigue` objects of the JSON record: numbers in mm, N, MPa with stable keys.

Keys (all numbers in mm, N, MPa; factors and margins dimensionless; margin = allowable / actual - 1):

design:  load_kind, factors {yield, ultimate}, behaviour, governing_check, governing_criterion,
         peak_criterion, allowable {yield, ultimate, governing, bearing},
         net_section {average, margin, passes, formula} (the hand check: the load's own nominal),
         peak {stress, kt_net, margin, passes, criterion} (by the material's criterion),
         checks [{key, label, formula, stress, allowable, strength, margin, passes,
                  achieved_factor {yield, ultimate}, required_thickness}] (every check),
         von_mises {value, error, method, location} (the converged von Mises peak),
         achieved_factor {net_yield, peak_yield, net_ultimate, peak_ultimate},
         required {net_area, net_area_with_kt, thickness, thickness_with_kt, actual_thickness, net_width},
         bearing_strength, passes, statements, basis
fatigue: cycle {min_fraction, max_fraction, min_force, max_force, alternating_force, mean_force, min_case,
         max_case, between_cases} (fractions null for a cycle between two load cases, forces null unless
         the load scaled is one force), notch {min, max: {nominal, peak}, case, location, ratio},
         other_notches [{feature, location, case, factor, passes, first_cycle_yield}], wider_range (null,
         or a point with a wider range that is not screened: {feature, location, ratio}), feature,
         root_radius, notch_sensitivity {q, method}, kt_net, kf, strength {value, basis, life_cycles},
         nominal {alternating, mean}, notched {alternating, mean}, factor, required_factor, passes,
         first_cycle_yield {yields, elastic_peak, yield, reversed}, local (null unless the root yields and
         a cyclic curve is known: {high, low: {stress, strain}, stress_range, strain_range, mean_stress,
         strain_amplitude, plastic_strain_amplitude, first, curve {E, K, n, source}}), statements, basis
part.material: E, nu, yield, ultimate, grade, family, ductile, fatigue_strength, fatigue_life, source, stated.
Values that are not defined (no ultimate factor, no root radius) are null; an infinite factor is null.
"""

from __future__ import annotations

import math
from typing import Any

from ..compare.design import CheckLine
from ..compare.signoff import DesignSignOff, FatigueSignOff
from ..geometry.registry import raiser_label
from ..geometry.spec import Material


def _finite(value: float | None) -> float | None:
    return value if value is not None and math.isfinite(value) else None


def _check(line: CheckLine) -> dict[str, Any]:
    return {
        "key": line.key,
        "label": line.label,
        "formula": line.formula,
        "stress": line.actual_mpa,
        "allowable": line.allowable_mpa,
        "strength": line.strength_mpa,
        "margin": _finite(line.margin),
        "passes": line.passes,
        "achieved_factor": {"yield": _finite(line.achieved_fos_yield), "ultimate": _finite(line.achieved_fos_ultimate)},
        "required_thickness": line.required_thickness_mm,
    }


def design_record(design: DesignSignOff | None) -> dict[str, Any] | None:
    """The `design` object, or None when the part file has no [design] table."""
    if design is None:
        return None
    c = design.check
    return {
        "load_kind": c.load_kind,
        "factors": {"yield": c.fos_yield, "ultimate": c.fos_ultimate},
        "behaviour": "ductile" if c.ductile else "brittle",
        "governing_check": c.governing_check,
        "governing_criterion": c.governing_criterion,
        "peak_criterion": c.peak_criterion,
        "allowable": {"yield": c.allowable_yield_mpa, "ultimate": c.allowable_ultimate_mpa,
                      "governing": c.allowable_mpa,
                      "bearing": None if c.bearing is None else c.bearing.allowable_mpa},
        "net_section": {"average": c.hand.actual_mpa, "margin": _finite(c.hand.margin), "passes": c.hand.passes,
                        "formula": c.hand.formula},
        "peak": {"stress": c.peak.actual_mpa, "kt_net": c.kt_net, "margin": _finite(c.peak.margin),
                 "passes": c.peak.passes, "criterion": c.peak_criterion},
        "checks": [_check(line) for line in c.checks],
        "von_mises": {"value": design.von_mises.value, "error": _finite(design.von_mises.error),
                      "method": design.von_mises.method, "location": list(design.von_mises_location)},
        "achieved_factor": {
            "net_yield": _finite(c.hand.achieved_fos_yield),
            "peak_yield": _finite(c.peak.achieved_fos_yield),
            "net_ultimate": _finite(c.hand.achieved_fos_ultimate),
            "peak_ultimate": _finite(c.peak.achieved_fos_ultimate),
        },
        "required": {
            "net_area": c.required_net_area_mm2,
            "net_area_with_kt": c.required_net_area_kt_mm2,
            "thickness": c.hand.required_thickness_mm,
            "thickness_with_kt": c.peak.required_thickness_mm,
            "actual_thickness": c.thickness_mm,
            "net_width": c.net_width_mm,
        },
        "bearing_strength": c.bearing_strength_mpa,
        "fastener_shear_strength": c.fastener_shear_strength_mpa,
        "passes": c.passes,
        "statements": list(c.statements),
        "basis": list(design.basis),
    }


def fatigue_record(fatigue: FatigueSignOff | None) -> dict[str, Any] | None:
    """The `fatigue` object, or None when the part file has no [fatigue] table."""
    if fatigue is None:
        return None
    s = fatigue.screen
    low, high = fatigue.forces if fatigue.forces is not None else (None, None)
    return {
        "cycle": {
            "min_fraction": fatigue.min_fraction,
            "max_fraction": fatigue.max_fraction,
            "min_force": low,
            "max_force": high,
            "alternating_force": None if low is None else 0.5 * (high - low),
            "mean_force": None if low is None else 0.5 * (high + low),
            "min_case": fatigue.min_case,
            "max_case": fatigue.max_case,
            "between_cases": fatigue.between_cases,
        },
        "notch": {"min": {"nominal": s.cycle.low.nominal_mpa, "peak": s.cycle.low.peak_mpa},
                  "max": {"nominal": s.cycle.high.nominal_mpa, "peak": s.cycle.high.peak_mpa},
                  "case": fatigue.notch_case,
                  "location": None if fatigue.location is None else list(fatigue.location),
                  "ratio": fatigue.ratio},
        "other_notches": [{"feature": raiser_label(o.feature), "location": list(o.location), "case": o.case,
                           "factor": _finite(o.n_f), "passes": o.passes, "first_cycle_yield": o.first_cycle_yield}
                          for o in fatigue.others],
        "wider_range": None if fatigue.wider is None else {
            "feature": raiser_label(fatigue.wider.feature), "location": list(fatigue.wider.location),
            "ratio": _finite(fatigue.wider.ratio)},
        "feature": raiser_label(fatigue.feature),
        "root_radius": s.root_radius_mm,
        "notch_sensitivity": {"q": s.q, "method": s.method},
        "kt_net": _finite(s.kt_net),
        "kf": _finite(s.kf),
        "strength": {"value": s.se_mpa, "basis": s.se_basis, "life_cycles": s.life_cycles},
        "nominal": {"alternating": s.sa_nominal_mpa, "mean": s.sm_nominal_mpa},
        "notched": {"alternating": s.sa_mpa, "mean": s.sm_mpa},
        "factor": _finite(s.n_f),
        "required_factor": s.required_factor,
        "passes": s.passes,
        "first_cycle_yield": {"yields": s.first_cycle_yield, "elastic_peak": s.elastic_peak_mpa,
                              "yield": s.yield_mpa, "reversed": s.reversed_yield},
        "local": _local_record(fatigue),
        "statements": list(s.statements),
        "basis": list(fatigue.basis),
    }


def _local_record(fatigue: FatigueSignOff) -> dict[str, Any] | None:
    r, c = fatigue.screen.local, fatigue.screen.curve
    if r is None or c is None:
        return None
    return {
        "high": {"stress": r.high_stress_mpa, "strain": r.high_strain},
        "low": {"stress": r.low_stress_mpa, "strain": r.low_strain},
        "first": r.first,
        "stress_range": r.stress_range_mpa,
        "strain_range": r.strain_range,
        "mean_stress": r.mean_stress_mpa,
        "strain_amplitude": r.strain_amplitude,
        "plastic_strain_amplitude": r.plastic_strain_amplitude,
        "curve": {"E": c.E, "K": c.K, "n": c.n, "source": c.source},
    }


def material_record(material: Material) -> dict[str, Any]:
    """The part's material: E, nu and strengths in MPa, fatigue life in cycles, and where they came from;
    `stated` holds each value taken from the built-in table as its source states it (number and unit,
    e.g. "yield": {"value": 35, "unit": "ksi"}), of which the MPa value is the conversion."""
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
        "stated": {key: {"value": value.value, "unit": value.unit} for key, value in material.stated},
    }
