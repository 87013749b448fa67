"""Mesh-convergence study of the peak stress with Richardson extrapolation.

The part is solved on a sequence of meshes whose element sizes all shrink by LEVEL_RATIO per level.
From the last three peaks f1, f2, f3 (coarse to fine) the observed order is
p = ln((f2 - f1) / (f3 - f2)) / ln(ratio), the extrapolated peak f3 + (f3 - f2) / (ratio^p - 1), and the
error band the fine-grid convergence index of P. J. Roache (Verification and Validation in Computational
Science and Engineering, 1998): 1.25 |f3 - f2| / (ratio^p - 1), relative to the extrapolated peak. When
the peaks do not converge monotonically the finest peak is kept and the band widened (see `richardson`).
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from ..geometry.kinds.base import RaiserId
from ..geometry.mesh import Mesh
from ..geometry.mesh_process import MeshProcess
from ..geometry.spec import PartSpec
from .analysis import Solution, solve_part
from .budget import BudgetError, check_first_level, level_over_budget
from .equivalent_peak import von_mises_peak
from .guards import check_fields
from .raiser_peaks import raiser_peaks
from .solve import RoundOffError

LEVEL_RATIO = math.sqrt(2.0)  # element size ratio between successive levels
FIRST_SCALE = 1.0  # element-size scale of the coarsest level
MIN_LEVELS = 3
SAFETY = 1.25  # Roache's factor of safety for three-grid studies with an observed order
SAFETY_UNSURE = 3.0  # Roache's factor when the order cannot be trusted
ORDER_LIMITS = (0.5, 3.0)  # observed orders outside this range are clipped to it


@dataclass(frozen=True)
class Level:
    """One mesh of the study: scale, size, peak (MPa) and where it is (mm), and stage times (s)."""

    scale: float
    nodes: int
    elements: int
    peak: float
    location: tuple[float, float]
    seconds: dict[str, float]
    raisers: dict[RaiserId, tuple[float, tuple[float, float]]] = field(default_factory=dict)  # fem.raiser_peaks
    solver: str = ""  # the method that solved this level's system: "pardiso", "superlu" or "amg-cg" (fem.solve)
    von_mises: tuple[float, tuple[float, float]] | None = None  # von Mises peak and where (fem.equivalent_peak)


@dataclass(frozen=True)
class Estimate:
    """Converged value with its relative error band and how it was obtained.

    method: "richardson" (monotone convergence, extrapolated), "bounded" (monotone but differences not
    shrinking: finest value, widened band), "oscillating" (finest value, band from the spread).
    """

    value: float
    error: float
    order: float | None
    method: str


@dataclass(frozen=True)
class Study:
    """The levels solved, the estimate, whether it met the tolerance, and why the study stopped."""

    levels: tuple[Level, ...]
    estimate: Estimate
    converged: bool
    stop_reason: str


def richardson(values: list[float] | np.ndarray, ratio: float = LEVEL_RATIO) -> Estimate:
    """Estimate the limit of the last three values of a sequence refined by `ratio` per step."""
    f1, f2, f3 = (float(v) for v in values[-3:])
    e21, e32 = f2 - f1, f3 - f2
    size = max(abs(f3), 1e-300)
    if e32 == 0.0:
        return Estimate(f3, 0.0, None, "richardson")
    if e21 * e32 > 0 and abs(e21) > abs(e32):
        p = min(max(math.log(abs(e21 / e32)) / math.log(ratio), ORDER_LIMITS[0]), ORDER_LIMITS[1])
        gain = ratio ** p - 1.0
        value = f3 + e32 / gain
        return Estimate(value, SAFETY * abs(e32) / gain / max(abs(value), 1e-300), p, "richardson")
    if e21 * e32 > 0:
        return Estimate(f3, SAFETY_UNSURE * abs(e32) / size, None, "bounded")
    return Estimate(f3, SAFETY * max(abs(e21), abs(e32)) / size, None, "oscillating")


def converge(spec: PartSpec, report: Callable[[Level], None] | None = None) -> tuple[Study, Solution]:
    """Solve on finer and finer meshes until the peak's estimated error is below spec.mesh.tolerance.

    Stops unconverged at spec.mesh.max_levels levels, or when the next level would exceed
    spec.mesh.max_elements. Returns the study and the finest solution. Each level is meshed in a child
    process (geometry/mesh_process.py): an interrupt stops gmsh at once, and a crash in it is a MeshError.
    """
    with MeshProcess() as mesher:
        return _study(spec, report, mesher.mesh)


def _study(spec: PartSpec, report: Callable[[Level], None] | None, mesh_level: Callable[..., Mesh]
           ) -> tuple[Study, Solution]:
    levels: list[Level] = []
    solution: Solution | None = None
    scale = FIRST_SCALE
    stop = ""
    check_first_level(spec, scale)  # refuse a hopeless coarsest mesh before gmsh spends minutes on it
    while True:
        clock = time.perf_counter()
        mesh = mesh_level(spec, scale)
        meshed = time.perf_counter() - clock
        stop = level_over_budget(spec, mesh.n_elements, first=not levels)
        if stop:
            break
        try:
            level_solution = solve_part(spec, mesh, _contact_start(solution))
        except (BudgetError, RoundOffError) as exc:  # memory or round-off: keep the levels solved so far, if any
            if not levels:
                raise
            stop = str(exc)
            break
        check_fields(level_solution.displacement, level_solution.nodal_stress)
        solution = level_solution
        node = solution.peak_node()
        level = Level(
            scale=scale,
            nodes=mesh.n_nodes,
            elements=mesh.n_elements,
            peak=solution.peak_stress(),
            location=(float(solution.mesh.nodes[node, 0]), float(solution.mesh.nodes[node, 1])),  # full part
            seconds={"mesh": meshed, **solution.seconds},
            raisers=raiser_peaks(solution),
            solver=solution.solver.method if solution.solver is not None else "",
            von_mises=von_mises_peak(spec, solution),
        )
        levels.append(level)
        if report is not None:
            report(level)
        if len(levels) >= MIN_LEVELS:
            estimate = richardson([lv.peak for lv in levels])
            if estimate.error <= spec.mesh.tolerance:
                return Study(tuple(levels), estimate, True, "tolerance met"), solution
        if len(levels) >= spec.mesh.max_levels:
            stop = f"reached the most levels allowed (mesh.max_levels = {spec.mesh.max_levels})"
            break
        if _next_elements(levels) > spec.mesh.max_elements:
            stop = f"the next level would exceed mesh.max_elements = {spec.mesh.max_elements}"
            break
        scale /= LEVEL_RATIO
    estimate = sequence_estimate([lv.peak for lv in levels])
    return Study(tuple(levels), estimate, estimate.error <= spec.mesh.tolerance and len(levels) >= MIN_LEVELS, stop), solution


def _contact_start(solution: Solution | None) -> tuple[float, float] | None:
    """A rigid pin's contact arc on the previous level: the next level's first active set (fem.contact)."""
    return solution.contact.arc if solution is not None and solution.contact is not None else None


def _next_elements(levels: list[Level]) -> float:
    """Predicted triangle count of the next level from the growth seen so far."""
    if len(levels) < 2:
        return levels[-1].elements * LEVEL_RATIO ** 2
    return levels[-1].elements * levels[-1].elements / levels[-2].elements


def sequence_estimate(values: list[float]) -> Estimate:
    """The converged estimate of a value recorded on every level (coarse to fine): Richardson's from three
    or more levels, else the finest value with a band from the last change (or unknown from one level)."""
    if len(values) >= MIN_LEVELS:
        return richardson(values)
    if len(values) < 2:
        return Estimate(values[-1], math.inf, None, "single level")
    f2, f3 = values[-2], values[-1]
    return Estimate(f3, SAFETY_UNSURE * abs(f3 - f2) / max(abs(f3), 1e-300), None, "bounded")
