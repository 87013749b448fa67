"""The JSON record of a check: plain numbers in mm, N, MPa, with stable keys."""

from __future__ import annotations

import math
from typing import Any

from .. import __version__
from ..compare.check import CheckResult
from ..fem.convergence import FORMAL_ORDER
from ..geometry.registry import kind_of, named, outline_of, raiser_label
from .loads_record import (case_record, kt_basis, load_record, net_section_statics, nominal_records, peak_component,
                           pin_contact_record, pin_holds_record, section_record, stresses_record, support_record)
from .joint_record import fasteners_spec_record, joints_record
from .signoff_record import design_record, fatigue_record, material_record

SCHEMA = "stressraiser.check/1"


def check_record(result: CheckResult) -> dict[str, Any]:
    """Everything a reviewer needs from one check, as JSON-ready data."""
    spec, study, ns = result.spec, result.study, result.net_section
    preferred = result.handbook[0] if result.handbook else None
    return {
        "schema": SCHEMA,
        "version": __version__,
        "title": spec.title,
        "units": {"length": "mm", "force": "N", "stress": "MPa"},
        "display_units": spec.units,  # the part file's system, used by the terminal summary
        "part": {
            "length": spec.plate.length,
            "width": spec.plate.width,
            "thickness": spec.plate.thickness,
            "condition": spec.plate.condition,
            **_raisers(spec),
            **outline_of(spec).record(spec),
            "material": material_record(spec.material),
            "load": load_record(spec),
            "support": support_record(spec),
            "fasteners": fasteners_spec_record(spec),
        },
        "peak": {
            "stress": result.peak.stress,
            "fe_stress": result.peak.fe_stress,
            "location": list(result.peak.location),
            "feature": raiser_label(result.peak.feature),
            "component": peak_component(result),
            "estimate": "extrapolated" if study.estimate.extrapolated else "finest level",
            "candidate": str(study.governing),
        },
        "stresses": stresses_record(result),
        "net_section": {
            "x": ns.x,
            "ligaments": [list(s) for s in ns.ligaments],
            "width": ns.width,
            "area": ns.area,
            "average": ns.average,
            "fe_force": ns.fe_force,
            "applied_force": ns.result.statics.normal_force if ns.result is not None else spec.load.axial,
            "equilibrium_error": ns.equilibrium_error,
            **net_section_statics(result),
            "distribution": {
                "y": ns.cut.positions.tolist(),
                "normal_stress": ns.cut.normal_stress.tolist(),
            },
        },
        "sharp_corners": [sharp_corner_record(s) for s in result.sharp_corners],
        "gross_average": result.gross_average,
        "understatement": result.understatement,
        "kt": {
            "net": result.kt.net,
            "gross": result.kt.gross,
            "error": _finite(result.kt.error),
            "converged": result.kt.converged,
            "net_band": [result.kt.net * (1 - _finite(result.kt.error, 1.0)), result.kt.net * (1 + _finite(result.kt.error, 1.0))],
            "basis": kt_basis(result),
            "gross_section": None if result.gross is None else result.gross.definition,
        },
        "bearing": bearing_record(result),
        "nominal_stresses": nominal_records(result),
        "pin_contact": pin_contact_record(result),
        "pin_holds": pin_holds_record(result),
        "fasteners": joints_record(result),
        "sections": [section_record(r) for r in result.sections],
        "mesh": {
            "tolerance": spec.mesh.tolerance,
            "element_order": spec.mesh.order,
            "solver_setting": spec.mesh.solver,
            "method": study.estimate.method,
            "observed_order": study.estimate.order,
            "formal_order": FORMAL_ORDER[spec.mesh.order],
            "safety_factor": study.estimate.safety,
            "stop_reason": study.stop_reason,
            "governing": str(study.governing),
            "candidates": {str(name): _estimate(e) for name, e in study.estimates.items()},
            "levels": [
                {"scale": lv.scale, "nodes": lv.nodes, "elements": lv.elements, "peak": lv.peak,
                 "location": list(lv.location), "solver": lv.solver,
                 "raisers": {str(name): peak for name, (peak, _) in lv.raisers.items()},
                 "bearing_pressure": lv.bearing, "contact_passes": lv.passes}
                for lv in study.levels
            ],
        },
        "peaks": [_raiser_peak(p) for p in result.peaks],
        "handbook": None if preferred is None else _match(preferred),
        "handbook_alternatives": [_match(m) for m in result.handbook[1:]],
        "handbook_note": None if preferred else "no handbook case covers this geometry",
        "warnings": [str(w) for w in result.warnings],  # numbers in mm, N, MPa, each with its unit label
        "design": design_record(result.design),
        "fatigue": fatigue_record(result.fatigue),
        "cautions": list(result.cautions),
        "case": result.case,  # the load case this record's numbers are for: the governing one
        "cases": [case_record(r, r.case == result.case) for r in result.every_case],
    }


def _match(match) -> dict[str, Any]:
    return {
        "case": match.case.key,
        "title": match.case.title,
        "kt_net": match.kt_net,
        "kt_gross": match.kt_gross,
        "nominal": match.case.nominal,
        "parameters": dict(match.recognised.params),
        "source": match.case.source,
        "in_range": match.in_range,
        "checked_range": None if match.case.checked is None else {k: list(v) for k, v in match.case.checked.items()},
        "in_checked_range": match.in_checked,
        "raiser": None if match.recognised.raiser is None else str(match.recognised.raiser),
    }


FIRST_LAYOUT = {"hole": "holes", "ellipse": "ellipses", "slot": "slots", "notch": "notches"}  # keys of schema/1


def _raisers(spec) -> dict[str, Any]:
    """Every raiser as given (mm, degrees) under `raisers`, each with its name, kind and number; and, as the
    record's first layout had them, the holes (always) and the ellipses, slots and notches (when present)
    under their own keys."""
    items = named(spec)
    out: dict[str, Any] = {"holes": []}
    for rid, item in items:
        if rid.kind in FIRST_LAYOUT:
            out.setdefault(FIRST_LAYOUT[rid.kind], []).append(kind_of(item).record(item))
    out["raisers"] = [{"name": str(rid), "kind": rid.kind, "number": rid.number, **kind_of(item).record(item)}
                      for rid, item in items]
    return out


def _raiser_peak(p) -> dict[str, Any]:
    """One competing raiser's own peak (see compare.check.raiser_peaks)."""
    return {"feature": str(p.feature), "stress": p.stress, "error": _finite(p.error), "fe_stress": p.fe_stress,
            "location": list(p.location), "kt_net": p.kt_net, "kt_gross": p.kt_gross,
            "net_section": {"x": p.section.x, "width": p.section.width, "area": p.section.area,
                            "average": p.section.average, "equilibrium_error": p.section.equilibrium_error}}


def _estimate(e) -> dict[str, Any]:
    """One candidate's estimate over the mesh levels (fem.convergence.Estimate)."""
    return {"value": e.value, "error": _finite(e.error), "method": e.method, "observed_order": e.order,
            "safety_factor": e.safety}


def bearing_record(result: CheckResult) -> dict[str, Any] | None:
    """A pin's peak contact pressure against the bearing stress P / (d t) (MPa), or None without a pin."""
    b = result.bearing
    if b is None:
        return None
    return {"pressure": b.pressure, "fe_pressure": b.fe_pressure, "error": _finite(b.error), "resolved": b.resolved,
            "prescribed": b.prescribed, "bearing_stress": b.bearing_stress, "ratio": b.ratio,
            "state": "prescribed" if b.prescribed else "converged" if b.resolved else "not resolved: contact edge"}


def _finite(value: float, fallback: float | None = None) -> float | None:
    return value if math.isfinite(value) else fallback


def sharp_corner_record(sharp) -> dict[str, Any]:
    """A sharp inside corner (compare.check.SharpCornerResult): where, on what, its material angle, the zone
    left out of the peak search, its zone's peak on every level (the growth is the evidence) and whether it
    exceeds the governing peak."""
    c = sharp.corner
    return {"location": list(c.point), "on": c.on, "angle": c.angle, "zone_radius": c.zone,
            "zone_peaks": [_finite(p) for p in sharp.peaks], "growth": _finite(sharp.growth),
            "governing_peak": sharp.governing, "exceeds_governing": sharp.exceeds}
