"""The JSON record of a check: plain numbers in mm, N, MPa, with stable keys."""

from __future__ import annotations

import math
from typing import Any

from .. import __version__
from ..compare.check import CheckResult

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
        "part": {
            "length": spec.plate.length,
            "width": spec.plate.width,
            "thickness": spec.plate.thickness,
            "condition": spec.plate.condition,
            "holes": [{"center": list(h.center), "diameter": h.diameter} for h in spec.holes],
            "material": {"E": spec.material.E, "nu": spec.material.nu},
            "load": {"axial": spec.load.axial},
        },
        "peak": {
            "stress": result.peak.stress,
            "fe_stress": result.peak.fe_stress,
            "location": list(result.peak.location),
            "feature": result.peak.feature,
            "component": "maximum principal",
        },
        "net_section": {
            "x": ns.x,
            "ligaments": [list(s) for s in ns.ligaments],
            "width": ns.width,
            "area": ns.area,
            "average": ns.average,
            "fe_force": ns.fe_force,
            "applied_force": spec.load.axial,
            "equilibrium_error": ns.equilibrium_error,
            "distribution": {
                "y": ns.cut.positions.tolist(),
                "normal_stress": ns.cut.normal_stress.tolist(),
            },
        },
        "gross_average": result.gross_average,
        "understatement": 1.0 - ns.average / result.peak.stress,
        "kt": {
            "net": result.kt.net,
            "gross": result.kt.gross,
            "error": _finite(result.kt.error),
            "converged": result.kt.converged,
            "net_band": [result.kt.net * (1 - _finite(result.kt.error, 1.0)), result.kt.net * (1 + _finite(result.kt.error, 1.0))],
        },
        "mesh": {
            "tolerance": spec.mesh.tolerance,
            "method": study.estimate.method,
            "observed_order": study.estimate.order,
            "stop_reason": study.stop_reason,
            "levels": [
                {"scale": lv.scale, "nodes": lv.nodes, "elements": lv.elements, "peak": lv.peak,
                 "location": list(lv.location)}
                for lv in study.levels
            ],
        },
        "handbook": None if preferred is None else _match(preferred),
        "handbook_alternatives": [_match(m) for m in result.handbook[1:]],
        "handbook_note": None if preferred else "no handbook case covers this geometry",
        "warnings": list(result.warnings),
        "cautions": list(result.cautions),
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
    }


def _finite(value: float, fallback: float | None = None) -> float | None:
    return value if math.isfinite(value) else fallback
