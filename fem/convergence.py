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
from .analysis import Solution, solve_cases
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


def converge(spec: PartSpec, report: Callable[[Level], None] | None = None
             ) -> tuple[tuple[Study, ...], tuple[Solution, ...]]:
    """Solve on finer and finer meshes until every load case's peak has an estimated error below
    spec.mesh.tolerance.

    Every case is solved on the same meshes (one stiffness per level, fem.analysis.solve_cases) and
    followed over the same levels: each has its own peak, levels and estimate. Stops unconverged at
    spec.mesh.max_levels levels, or when the next level would exceed spec.mesh.max_elements. Returns one
    study and the finest solution per case, in the order of spec.load_cases. `report` sees each level of
    the case with the largest peak on it. Each level is meshed in a child process
    (geometry/mesh_process.py): an interrupt stops gmsh at once, and a crash in it is a MeshError.
    """
    with MeshProcess() as mesher:
        return _study(spec, report, mesher.mesh)


def _study(spec: PartSpec, report: Callable[[Level], None] | None, mesh_level: Callable[..., Mesh]
           ) -> tuple[tuple[Study, ...], tuple[Solution, ...]]:
    cases = [spec.for_case(case) for case in spec.load_cases]
    levels: list[list[Level]] = [[] for _ in cases]
    solutions: tuple[Solution, ...] = ()
    scale = FIRST_SCALE
    stop = ""
    check_first_level(spec, scale)  # refuse a hopeless coarsest mesh before gmsh spends minutes on it
    while True:
        clock = time.perf_counter()
        mesh = mesh_level(spec, scale)
        meshed = time.perf_counter() - clock
        stop = level_over_budget(spec, mesh.n_elements, first=not levels[0])
        if stop:
            break
        try:
            solved = solve_cases(spec, mesh, _contact_starts(solutions))
        except (BudgetError, RoundOffError) as exc:  # memory or round-off: keep the levels solved so far, if any
            if not levels[0]:
                raise
            stop = str(exc)
            break
        for solution in solved:
            check_fields(solution.displacement, solution.nodal_stress)
        solutions = solved
        for case, solution, case_levels in zip(cases, solutions, levels):
            case_levels.append(_level(case, scale, mesh, meshed, solution))
        if report is not None:
            report(max((lv[-1] for lv in levels), key=lambda lv: abs(lv.peak)))
        if len(levels[0]) >= MIN_LEVELS:
            estimates = [richardson([lv.peak for lv in case]) for case in levels]
            if all(e.error <= spec.mesh.tolerance for e in estimates):
                return tuple(Study(tuple(case), e, True, "tolerance met") for case, e in zip(levels, estimates)), solutions
        if len(levels[0]) >= spec.mesh.max_levels:
            stop = f"reached the most levels allowed (mesh.max_levels = {spec.mesh.max_levels})"
            break
        if _next_elements(levels[0]) > spec.mesh.max_elements:
            stop = f"the next level would exceed mesh.max_elements = {spec.mesh.max_elements}"
            break
        scale /= LEVEL_RATIO
    studies = []
    for case in levels:
        estimate = sequence_estimate([lv.peak for lv in case])
        converged = estimate.error <= spec.mesh.tolerance and len(case) >= MIN_LEVELS
        studies.append(Study(tuple(case), estimate, converged, "tolerance met" if converged and len(cases) > 1 else stop))
    return tuple(studies), solutions


def _level(spec: PartSpec, scale: float, mesh: Mesh, meshed: float, solution: Solution) -> Level:
    """One case's record of one mesh level (`spec`: the part under that case)."""
    node = solution.peak_node()
    return Level(
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


def _contact_starts(solutions: tuple[Solution, ...]) -> list | None:
    """Per case, the contact arcs of its fasteners (a rigid loading pin, pin holds) on the previous level:
    the next level's first active sets (fem.contact); None on the first level."""
    if not solutions:
        return None
    return [s.contact_arcs for s in solutions]


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
