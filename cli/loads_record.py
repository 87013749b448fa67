"""JSON pieces for loads, supports, nominal stresses, stress peaks and section cuts (mm, N, N mm, MPa)."""

from __future__ import annotations

import math
from typing import Any

from ..compare.check import CheckResult
from ..compare.method_of_sections import SectionResult
from ..fem.loads import pin_peak_pressure
from ..geometry.boundary import stretch
from ..geometry.registry import raiser_label
from ..geometry.spec import PartSpec


def load_record(spec: PartSpec) -> dict[str, Any]:
    """The load as given: end loads (N, N mm), remote state (MPa), pin (N, degrees) or loads on stretches
    of the boundary, and its kind."""
    load = spec.load
    out: dict[str, Any] = {"kind": load.kind, "axial": load.axial, "bending": load.bending, "shear": load.shear}
    if load.edges:
        out["edges"] = [_edge_record(spec, e) for e in load.edges]
    if load.fasteners:
        from .joint_record import group_loads_record

        out["fasteners"] = group_loads_record(spec)
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
    out = {"held": spec.support.held, "symmetry": list(spec.support.symmetry), "reported_for": "the full part"}
    if spec.support.holds:
        out["holds"] = [_hold_record(spec, h) for h in spec.support.holds]
    return out


def _pick_record(spec: PartSpec, pick) -> dict[str, Any]:
    """Where a stretch was picked (mm) and what it is: its length and the pieces it runs along."""
    picked = stretch(spec, pick)
    where = {"at": list(pick.at)} if pick.at is not None else {"from": list(pick.start), "to": list(pick.end)}
    return {**where, "length": picked.length, "pieces": list(dict.fromkeys(picked.labels))}


def _edge_record(spec: PartSpec, edge) -> dict[str, Any]:
    """One [[load.edge]]: its stretch, and the force (N, direction in degrees) or pressure (MPa) on it."""
    out = {"key": edge.where.key, **_pick_record(spec, edge.where)}
    if edge.pressure != 0.0:
        return {**out, "pressure": edge.pressure}
    return {**out, "force": edge.force, "direction": edge.direction,
            "traction": edge.force / (out["length"] * spec.plate.thickness)}


def _hold_record(spec: PartSpec, hold) -> dict[str, Any]:
    """One [[hold]]: fixed or roller on its stretch, or the hole a pin holds."""
    if hold.pin is not None:
        return {"key": hold.key, "mode": "pin", "pin": hold.pin}
    return {"key": hold.key, "mode": hold.mode, **_pick_record(spec, hold.where)}


def pin_holds_record(result: CheckResult) -> list[dict[str, Any]]:
    """Each pin hold's contact on the finest mesh: arc (degrees from its seat, the direction it was seated
    in), peak contact pressure (MPa) and its reaction on the part (N)."""
    return [{"hole": c.hole, "arc": list(c.arc), "seat": c.seat, "peak_pressure": c.peak_pressure, "passes": c.passes,
             "penetration": c.penetration, "reaction": [float(v) for v in c.force]}
            for c in result.solution.held_pins]


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
            "governing": "compressive (minimum principal)" if result.peak.stress < 0.0 else "tensile (maximum principal)"}


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
    """Extra keys of the net section: which cut it is, where, and statics against the FE resultants."""
    ns = result.net_section
    out: dict[str, Any] = {"cut": ns.kind, "point": list(ns.point), "normal": list(ns.normal),
                           "gross_ligaments": [list(s) for s in ns.gross]}
    if ns.result is not None:
        rec = section_record(ns.result)
        out.update({k: rec[k] for k in ("fe", "statics", "errors")})
    return out


def _finite(value: float | None) -> float | None:
    return value if value is not None and math.isfinite(value) else None


def case_record(result: CheckResult, governing: bool) -> dict[str, Any]:
    """One load case of a check: its load, converged peak, critical section, Kt and band, the peak of
    every mesh level, and its sign-off when the part file asks for one (mm, N, MPa)."""
    from .joint_record import joints_record
    from .signoff_record import design_record, fatigue_record

    ns, kt = result.net_section, result.kt
    return {
        "name": result.case,
        "governing": governing,
        "load": load_record(result.spec),
        "peak": {"stress": result.peak.stress, "fe_stress": result.peak.fe_stress,
                 "location": list(result.peak.location), "feature": raiser_label(result.peak.feature)},
        "critical_section": {"average": ns.average, "area": ns.area, "ligaments": [list(s) for s in ns.ligaments],
                             "equilibrium_error": ns.equilibrium_error, **net_section_statics(result)},
        "kt": {"net": _finite(kt.net), "gross": _finite(kt.gross), "error": _finite(kt.error),
               "converged": bool(kt.converged), "basis": kt_basis(result)},
        "levels": [lv.peak for lv in result.study.levels],
        "stop_reason": result.study.stop_reason,
        "warnings": [str(w) for w in result.warnings],
        "design": design_record(result.design),
        "fatigue": fatigue_record(result.fatigue),
        "fasteners": joints_record(result),
    }
