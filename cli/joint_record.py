"""The fastener groups in the JSON record (compare/joint_result.py): per group, per fastener and per hole,
the hand checks beside the FE, and the contact passes per mesh level (mm, N, MPa, degrees)."""

from __future__ import annotations

import math
from typing import Any

from ..compare.check import CheckResult
from ..geometry.spec import PartSpec


def _number(value: float | None) -> float | None:
    """A finite number, or None (JSON has no infinity)."""
    return None if value is None or not math.isfinite(value) else float(value)


def fasteners_spec_record(spec: PartSpec) -> list[dict[str, Any]]:
    """The part file's fastener groups as given (settled fits)."""
    return [{"name": g.name, "holes": list(g.holes), "diameter": g.diameter, "clearance": g.clearance,
             "shear_planes": g.shear_planes, "stiffness": g.stiffness, "stiffness_value": g.stiffness_value,
             "holds": g.holds} for g in spec.fasteners]


def group_loads_record(spec: PartSpec) -> list[dict[str, Any]]:
    """The load case's [[load.fasteners]] loads (N, degrees, N mm, mm)."""
    return [{"group": f.group, "force": f.force, "direction": f.direction, "moment": f.moment,
             "about": None if f.about is None else list(f.about)} for f in spec.load.fasteners]


def joints_record(result: CheckResult) -> dict[str, Any] | None:
    """Every fastener group of the result's load case, or None without groups."""
    joints = result.joints
    if joints is None:
        return None
    groups = []
    for g in joints.groups:
        groups.append({
            "name": g.name,
            "holds": g.holds,
            "load": list(g.load),  # Fx N, Fy N, Mz N mm: the load, or a holding group's reaction
            "resultant": list(g.resultant),
            "statics_error": g.statics_error,
            "mean_bearing": g.mean_bearing,
            "fastener": {"diameter": g.diameter, "clearance": g.clearance, "shear_planes": g.shear_planes,
                         "stiffness": _number(g.stiffness), "stiffness_source": g.stiffness_source},
            "hand_method": g.hand_method,
            "hand_source": g.hand_source,
            "fasteners": [{
                "hole": f.hole, "force": [float(v) for v in f.force], "magnitude": f.magnitude,
                "direction": f.direction, "share": f.share, "bearing": f.bearing, "shear": f.shear,
                "bypass": _number(f.bypass), "net_stress": _number(f.net), "peak": _number(f.peak), "peak_error": _number(f.peak_error),
                "kt_net": _number(f.kt_net), "kt_bearing": _number(f.kt_bearing), "edge_over_d": _number(f.edge),
                "pitch_over_d": _number(f.pitch), "hand_force": [float(v) for v in f.hand],
                "contact_arc": list(f.arc), "peak_pressure": f.peak_pressure,
            } for f in g.fasteners],
            "net_path": None if g.net_path is None else {
                "holes": list(g.net_path.holes), "net_width": g.net_path.width, "gross_width": g.net_path.gross,
                "fe_peak_hole": g.net_path.fe_hole, "source": g.net_path.source},
            "average_checks": [{
                "name": a.check.name, "average": a.check.stress, "formula": a.check.formula,
                "source": a.check.source, "fe_peak": a.peak, "fe_what": a.peak_what, "ratio": a.ratio,
                "understates_by": a.short,
            } for a in g.averages],
        })
    return {"groups": groups, "contact_passes": [p for p in joints.passes], "cautions": list(joints.cautions)}
