"""Budgets checked before work starts: the element count of a mesh level, and the memory of a solve.

Element count (`estimate_elements`), before gmsh is called: the size field is known in closed form, so
the count of near-equilateral triangles is the integral of 1 / (triangle area) = 4 / (sqrt(3) h^2) over
the part. Far from every raiser h is the cap `far` (area A / far^2 term), except in the far zones of a
long plate, where the cap grows along the length and the count is integrated in closed form
(geometry/far_field.far_zone_triangles; gmsh's count was 1.1 to 1.3 times the estimate on plates 400 to
100,000 widths long). Around a raiser whose edge has length P, the size grows linearly, h = e + g rho, over an offset band whose length is at most
P + 2 pi rho (Steiner's formula), so the extra triangles there are at most

    4/sqrt(3) * integral_0^R (P + 2 pi rho) / (e + g rho)^2 d rho,   R = (far - e) / g,
    = 4/sqrt(3) / g * [(P - 2 pi e / g) (1/e - 1/far) + (2 pi / g) ln(far / e)].

ELEMENT_FACTOR calibrates the estimate to gmsh's meshes, whose structured bands and boundary layers hold
more triangles than the formula (measured at scales 1 and 0.5 over the bundled examples, plates from 4 to
400 widths long with none to 50 holes, and the parts of the built-in handbook suite: the actual count is
0.5 to 2 times the calibrated estimate; `benchmarks/budget.py` prints the ratios). The estimate refuses a hopeless first level (a plate
a thousand widths long) before gmsh spends minutes and gigabytes on it; later levels are predicted from
the growth measured so far (fem/convergence.py).

Memory of a solve (`solve_bytes`), checked in fem/solve.py before factorising, by method:
- "superlu" / "pardiso" (direct): the factor's non-zeros were measured for SuperLU with a minimum-degree
  ordering on plates with holes (16k to 340k elements): nnz(L+U) per free DOF grows like dof^0.23 (111
  at 18k DOFs, 152 at 69k, 199 at 229k). Each non-zero costs a value and an index with SuperLU's
  supernode overhead (16 bytes counted); assembly and stress recovery add about 1.5 kB per element
  (about one element per DOF). Measured peak resident memory of a whole level (mesh, assemble, solve,
  recover; `benchmarks/budget.py --memory`): SuperLU 0.85 GB at 228k elements and 1.34 GB at 342k
  (estimated 1.2 and 1.9 GB): on the safe side by 1.4 times. PARDISO's Cholesky factor (nested
  dissection) holds fewer entries than SuperLU's L + U (67 M at 723k DOFs, 93 per DOF) and is counted with
  the same estimate, further on the safe side (4.2 GB estimated at 723k DOFs; benchmarks/solve.py measures
  the solve itself).
- "amg-cg" (iterative): linear in the size: the stiffness, the multigrid hierarchy (about twice the
  stiffness) and the CG vectors, counted as 600 bytes per DOF, plus the same 1.5 kB per element.
At the default mesh.max_elements (2 million, about 2 million DOFs) the direct estimate is about 13 GB and
the iterative one (which "auto" picks at that size) about 4 GB: both inside the default budget on a 24 GB
machine.

The memory budget is MEMORY_SHARE of the machine's physical memory.
"""

from __future__ import annotations

import math
import os

from ..geometry.meshing import Sizing, far_size, raiser_features
from ..geometry.spec import PartSpec
from .solve import SolverError

TRIANGLES_PER_AREA = 4.0 / math.sqrt(3.0)  # equilateral triangles of side h per h^2 of area
ELEMENT_FACTOR = 1.5  # measured count / formula was 0.95 to 2.3 (see the module docstring)
LU_PER_DOF = 11.7  # nnz(L+U) / dof = LU_PER_DOF * dof^LU_EXPONENT (SuperLU, MMD on A^T + A)
LU_EXPONENT = 0.23
BYTES_PER_LU_ENTRY = 16
BYTES_PER_ELEMENT = 1500.0  # assembly (element matrices, triplets, CSR) and recovery patches
BYTES_PER_ITERATIVE_DOF = 600.0  # stiffness, multigrid hierarchy and CG vectors
BASE_BYTES = 150e6  # interpreter, numpy, scipy, gmsh
MEMORY_SHARE = 0.75  # of the machine's physical memory


class BudgetError(SolverError):
    """A mesh level or a solve would exceed the element or memory budget (exit code 3)."""


def estimate_elements(spec: PartSpec, scale: float = 1.0, sizing: Sizing = Sizing()) -> float:
    """Expected triangle count of the mesh at `scale` (see the module docstring)."""
    from ..geometry.far_field import far_zone_triangles
    from ..geometry.outline import feature_edges, part_polygon

    far = far_size(spec, scale, sizing)
    zone_area, zone_count = far_zone_triangles(spec, far, sizing.far_grading)
    count = (part_polygon(spec).area - zone_area) / far ** 2 + zone_count
    g = scale * sizing.growth
    lengths = {name: float(getattr(line, "length", 0.0)) for name, line in feature_edges(spec).items()}
    for feature in raiser_features(spec, scale, sizing):
        e = min(feature.edge_size, far)
        perimeter = lengths.get(feature.name, 2.0 * math.pi * feature.radius)
        count += ((perimeter - 2.0 * math.pi * e / g) * (1.0 / e - 1.0 / far) + 2.0 * math.pi / g * math.log(far / e)) / g
    return ELEMENT_FACTOR * TRIANGLES_PER_AREA * count


def solve_bytes(dofs: int, method: str = "superlu") -> float:
    """Estimated peak memory (bytes) of one level with `dofs` free unknowns solved by `method`
    ("superlu", "pardiso" or "amg-cg"): assembly, the solve, stress recovery."""
    elements = dofs  # a triangle mesh has about two triangles per node, two DOFs per node
    if method == "amg-cg":
        return BASE_BYTES + (BYTES_PER_ELEMENT + BYTES_PER_ITERATIVE_DOF) * dofs
    return BASE_BYTES + BYTES_PER_ELEMENT * elements + BYTES_PER_LU_ENTRY * LU_PER_DOF * dofs ** (1.0 + LU_EXPONENT)


def physical_memory() -> float:
    """The machine's physical memory in bytes (0 where the system does not say)."""
    try:
        return float(os.sysconf("SC_PAGE_SIZE") * os.sysconf("SC_PHYS_PAGES"))
    except (AttributeError, ValueError, OSError):
        return 0.0


def memory_budget() -> float:
    """Bytes one solve may use: MEMORY_SHARE of physical memory (unlimited when unknown)."""
    total = physical_memory()
    return MEMORY_SHARE * total if total > 0 else math.inf


def gigabytes(n: float) -> str:
    return f"{n / 1e9:.3g} GB"


def check_first_level(spec: PartSpec, scale: float) -> None:
    """BudgetError before meshing when the coarsest level alone would exceed mesh.max_elements or the
    memory budget: no level could be solved."""
    from .solve import choose_method

    expected = estimate_elements(spec, scale)
    limit = spec.mesh.max_elements
    if expected > limit:
        raise BudgetError(f"the coarsest mesh of this part would have about {expected:,.0f} elements, more than "
                          f"the limit of {limit:,} (mesh.max_elements or --max-elements); raise the limit or "
                          "check the part's dimensions (a very long or very wide plate, or many features)")
    dofs = int(expected)  # about one DOF per element
    need, budget = solve_bytes(dofs, choose_method("auto", dofs)), memory_budget()
    if need > budget:
        raise BudgetError(f"the coarsest mesh of this part (about {expected:,.0f} elements) would need about "
                          f"{gigabytes(need)} of memory to solve; the budget is {gigabytes(budget)} "
                          f"({MEMORY_SHARE:.0%} of this machine's memory)")


def level_over_budget(spec: PartSpec, elements: int, first: bool) -> str:
    """Why a meshed level may not be solved ("" when it may): more elements than mesh.max_elements. On the
    first level this raises BudgetError instead (nothing to report); on later levels the study stops
    refining and reports the levels it has."""
    limit = spec.mesh.max_elements
    if elements <= limit:
        return ""
    if first:
        raise BudgetError(f"the coarsest mesh has {elements:,} elements, more than the limit of {limit:,} "
                          "(mesh.max_elements or --max-elements); nothing was solved")
    return f"the next level has {elements:,} elements, more than mesh.max_elements = {limit:,}"


def check_solve(dofs: int, method: str) -> None:
    """BudgetError before solving a system of `dofs` free unknowns by `method` that would not fit the
    memory budget."""
    need, budget = solve_bytes(dofs, method), memory_budget()
    if need > budget:
        raise BudgetError(f"the {method} solve of {dofs:,} unknowns would need about {gigabytes(need)} of memory; "
                          f"the budget is {gigabytes(budget)} ({MEMORY_SHARE:.0%} of this machine's memory); "
                          "lower mesh.max_elements or mesh.tolerance")
