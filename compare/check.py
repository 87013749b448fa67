"""The check of one part: converged peak, critical net section, Kt, handbook comparison, cautions."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from ..fem.analysis import Solution
from ..fem.convergence import Level, Study, converge
from ..geometry.outline import part_polygon, raiser_sections
from ..geometry.spec import PartSpec
from .handbook import Match, handbook_matches
from .sections import Cut, cut_resultants, ligaments

EQUILIBRIUM_WARNING = 0.005  # relative mismatch of the section force that earns a warning

CAUTIONS = (
    "Linear-elastic, small-strain, two-dimensional plane-stress model: no plasticity, buckling, contact, "
    "residual stress, or through-thickness effects.",
    "Loads and supports are idealised (uniform end traction, end held in the load direction); real "
    "fasteners, welds and fits load the part differently.",
    "The peak is an elastic stress at a point; whether it matters depends on the material, the loading "
    "(static or cyclic) and the governing design code.",
    "This is an engineering aid, not a substitute for the governing design code or for review and "
    "approval by a qualified, licensed engineer.",
)


@dataclass(frozen=True)
class Peak:
    """The largest maximum principal stress: converged estimate and finest-mesh value (MPa), where
    it is (mm) and which raiser it belongs to."""

    stress: float
    fe_stress: float
    location: tuple[float, float]
    feature: str


@dataclass(frozen=True)
class NetSection:
    """The critical net section: a cut perpendicular to the load at x (mm) through the peak's raiser.

    ligaments: material intervals in y (mm); width and area are their total (mm, mm^2); average is the
    applied force over the net area (MPa); fe_force the FE normal force on the cut (N), and
    equilibrium_error its relative difference from the applied force.
    """

    x: float
    ligaments: tuple[tuple[float, float], ...]
    width: float
    area: float
    average: float
    fe_force: float
    equilibrium_error: float
    cut: Cut


@dataclass(frozen=True)
class KtResult:
    """Kt on the net and gross sections, relative error band, and whether the study converged."""

    net: float
    gross: float
    error: float
    converged: bool


@dataclass(frozen=True)
class CheckResult:
    spec: PartSpec
    study: Study
    solution: Solution
    peak: Peak
    net_section: NetSection
    gross_average: float
    kt: KtResult
    handbook: tuple[Match, ...]
    cautions: tuple[str, ...]
    warnings: tuple[str, ...]


def check_part(spec: PartSpec, report: Callable[[Level], None] | None = None) -> CheckResult:
    """Run the convergence study and compare the converged peak with the net-section average."""
    study, solution = converge(spec, report)
    mesh = solution.mesh
    node = solution.peak_node()
    location = (float(mesh.nodes[node, 0]), float(mesh.nodes[node, 1]))
    feature, x_section = _owning_raiser(spec, location)
    peak = Peak(study.estimate.value, float(solution.principal[node, 0]), location, feature)
    section = net_section(spec, solution, x_section)
    gross = spec.load.axial / (spec.plate.width * spec.plate.thickness)
    kt = KtResult(peak.stress / section.average, peak.stress / gross, study.estimate.error, study.converged)
    return CheckResult(spec, study, solution, peak, section, gross, kt, tuple(handbook_matches(spec)),
                       CAUTIONS, tuple(_warnings(study, section)))


def net_section(spec: PartSpec, solution: Solution, x: float) -> NetSection:
    """Net section perpendicular to the load at x: exact ligaments, average stress, FE equilibrium."""
    spans = tuple(ligaments(part_polygon(spec), (x, 0.0), (1.0, 0.0)))
    width = sum(b - a for a, b in spans)
    area = width * spec.plate.thickness
    mesh = solution.mesh
    cut = cut_resultants(mesh.nodes, mesh.triangles, solution.nodal_stress,
                         spec.plate.thickness, (x, 0.0), (1.0, 0.0))
    force = spec.load.axial
    return NetSection(x, spans, width, area, force / area, cut.normal_force, (cut.normal_force - force) / force, cut)


def _owning_raiser(spec: PartSpec, location: tuple[float, float]) -> tuple[str, float]:
    """The raiser whose section zone holds the peak (nearest section first), else the peak's own x."""
    x, y = location
    best = ("plate", x, np.inf)
    for name, x_section, reach in raiser_sections(spec):
        gap = abs(x - x_section)
        if gap <= reach and gap < best[2]:
            best = (name, x_section, gap)
    return best[0], best[1]


def _warnings(study: Study, section: NetSection) -> list[str]:
    out = []
    if not study.converged:
        out.append(f"the peak did not converge to the requested tolerance ({study.stop_reason}); "
                   f"estimated error {study.estimate.error:.2%}")
    if abs(section.equilibrium_error) > EQUILIBRIUM_WARNING:
        out.append(f"the FE force on the net section differs from the applied force by "
                   f"{section.equilibrium_error:+.2%}; the mesh may be too coarse")
    return out
