"""JSON pieces for loads, supports, nominal stresses, stress peaks and section cuts (mm, N, N mm, MPa)."""

from __future__ import annotations

import math
from typing import Any

from ..compare.check import CheckResult
from ..compare.method_of_sections import SectionResult
from ..fem.loads import pin_peak_pressure
from ..geometry.spec import PartSpec


def load_record(spec: PartSpec) -> dict[str, Any]:
    """The load as given: end loads (N, N mm), remote state (MPa) or pin (N, degrees), and its kind."""
    load = spec.load
    out: dict[str, Any] = {"kind": load.kind, "axial": load.axial, "bending": load.bending, "shear": load.shear}
    if load.remote is not None:
        out["remote"] = {"sx": load.remote.sx, "sy": load.remote.sy, "txy": load.remote.txy}
    if load.pin is not None:
        hole = spec.holes[load.pin.hole - 1]
        out["pin"] = {"hole": load.pin.hole, "force": load.pin.force, "direction": load.pin.direction,
                      "bearing_stress": load.pin.force / (hole.diameter * spec.plate.thickness),
                      "contact": load.pin.contact, "clearance": load.pin.clearance}
    return out


def pin_contact_record(result: CheckResult) -> dict[str, Any] | None:
    """How the pin bore on its hole on the finest mesh: the cosine pressure's arc and peak (exact), or the
    rigid pin's contact found by the solve (mm, N, MPa, degrees); None without a pin."""
    pin = result.spec.load.pin
    if pin is None:
        return None
    contact = result.solution.contact
    if contact is None:  # the cosine pressure of common practice
        d = result.spec.holes[pin.hole - 1].diameter
        return {"model": pin.contact, "clearance": 0.0, "arc": [-90.0, 90.0],
                "peak_pressure": pin_peak_pressure(pin.force, d, result.spec.plate.thickness), "passes": None,
                "pin_displacement": None, "penetration": None, "resultant": None}
    return {"model": pin.contact, "clearance": contact.clearance, "arc": list(contact.arc),
            "peak_pressure": contact.peak_pressure, "passes": contact.passes,
            "pin_displacement": list(contact.pin_displacement), "penetration": contact.penetration,
            "resultant": [float(v) for v in contact.forces.sum(axis=0)]}


def support_record(spec: PartSpec) -> dict[str, Any]:
    return {"held": spec.support.held, "symmetry": list(spec.support.symmetry), "reported_for": "the full part"}


def kt_basis(result: CheckResult) -> dict[str, Any] | None:
    """Which nominal stress the headline Kt(net) and Kt(gross) use."""
    if result.nominal is None:
        return None
    return {"net": _nominal(result.nominal.net), "gross": _nominal(result.nominal.gross)}


def nominal_records(result: CheckResult) -> list[dict[str, Any]]:
    """Every nominal stress of the load with the Kt it gives."""
    return [] if result.nominal is None else [_nominal(n) for n in result.nominal.all]


def _nominal(n) -> dict[str, Any]:
    return {"key": n.key, "label": n.label, "formula": n.formula, "stress": n.stress, "kt": _finite(n.kt)}


def stresses_record(result: CheckResult) -> dict[str, Any] | None:
    """Finest-mesh peaks of the principal, von Mises and Tresca stresses, and which principal governs."""
    s = result.stresses
    if s is None:
        return None

    def at(v) -> dict[str, Any]:
        return {"value": v.value, "location": list(v.location)}

    return {"max_principal": at(s.max_principal), "min_principal": at(s.min_principal),
            "von_mises": at(s.von_mises), "tresca": at(s.tresca),
            "governing": "compressive (minimum principal)" if s.compressive_governs else "tensile (maximum principal)"}


def peak_component(result: CheckResult) -> str:
    return "minimum principal" if result.peak.stress < 0.0 else "maximum principal"


def section_record(r: SectionResult) -> dict[str, Any]:
    """One cut: geometry, FE and statics resultants, errors, averages, peak and the distribution along it.

    Positions are mm along the cut from `point` in the direction (-normal_y, normal_x); the moment is about
    the centroid of the cut's material, positive when it stretches the material on that direction's side.
    """
    st = r.statics
    return {
        "label": r.label,
        "point": list(r.point),
        "normal": list(r.normal),
        "ligaments": [list(s) for s in r.ligaments],
        "area": r.area,
        "centroid": list(r.centroid_point),
        "fe": {"normal_force": r.fe_normal_force, "shear_force": r.fe_shear_force, "moment": r.fe_moment},
        "statics": {"normal_force": st.normal_force, "shear_force": st.shear_force, "moment": st.moment,
                    "basis": st.basis},
        "errors": {"normal_force": r.normal_error, "shear_force": r.shear_error, "moment": r.moment_error},
        "average_normal_stress": r.average_normal,
        "average_shear_stress": r.average_shear,
        "peak_normal_stress": {"value": r.peak_normal, "position": r.peak_position, "location": list(r.peak_point)},
        "peak_shear_stress": r.peak_shear,
        "distribution": {"position": r.cut.positions.tolist(), "normal_stress": r.cut.normal_stress.tolist(),
                         "shear_stress": r.cut.shear_stress.tolist()},
    }


def net_section_statics(result: CheckResult) -> dict[str, Any]:
    """Extra keys of the net section: the cut, and statics against the FE resultants."""
    ns = result.net_section
    out: dict[str, Any] = {"point": list(ns.point), "normal": list(ns.normal)}
    if ns.result is not None:
        rec = section_record(ns.result)
        out.update({k: rec[k] for k in ("fe", "statics", "errors")})
    return out


def _finite(value: float | None) -> float | None:
    return value if value is not None and math.isfinite(value) else None
