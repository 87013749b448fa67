"""Linear solve of K u = f with held DOFs at zero, by the strategy that suits the system's size.

Strategies (`solver`):
- "direct": a sparse direct solve. SuperLU in symmetric mode with a minimum-degree ordering on A^T + A
  (it suits the symmetric positive-definite stiffness of a 2-D mesh far better than scipy's default
  column ordering); on large systems, when the optional `fast` extra is installed
  (`pip install "stressraiser[fast]"`: pypardiso, the binding of Intel oneMKL PARDISO), a supernodal
  Cholesky factorisation by PARDISO with a METIS nested-dissection ordering and the matrix grouped into
  its 2 x 2 node blocks, several times faster and leaner than SuperLU there (benchmarks/solve.py).
- "iterative": conjugate gradients preconditioned by smoothed-aggregation algebraic multigrid (pyamg)
  with the three in-plane rigid-body modes as near-null space and 2 x 2 node blocks, to a relative
  residual of CG_TOLERANCE; time and memory grow about linearly with the size.
- "auto" (default): SuperLU below LARGE_FROM free DOFs; from there PARDISO when installed, else the
  iterative solver.
Small systems always use SuperLU, which gives the same bits on every machine and in every process
(PARDISO runs threads whose number a batch worker may limit); large ones use the fastest solver present.

Several load cases on one stiffness: `f` may hold one right-hand side per column (N, m). SuperLU and
PARDISO factorise once and solve every column; the multigrid hierarchy is built once and conjugate
gradients solve each column with it. The answer for each column is the one a single-column solve gives.

A system that cannot be solved raises SolverError with a message a user can act on: a part that is not
held against every rigid-body motion (a mechanism), a piece with no stiffness, or a numerical failure.

Every solve is checked twice, both scale-free:
- its normwise backward error ||f - K u|| / (||K|| ||u|| + ||f||) (infinity norms over the free DOFs;
  docs/references.md [Higham]): the smallest relative change of K and f that u solves exactly. A direct solve
  gives about 1e-16, CG its tolerance; above BACKWARD_LIMIT the solver failed.
- its round-off amplification ||K|| ||u|| / ||f||, which bounds how far round-off of relative size eps can
  move u (in its softest direction) relative to the load's scale. A stiffness that is singular (a mechanism
  the coordinates could not show) gives 1e14 and more; a slender strap in bending grows it with the cube of
  its slenderness (1e8 at 60 widths, 1e11 at 600, 6e12 at 2000, 3e13 at 4000, where Kt came out 0.44 %
  low, outside its band: benchmarks/long_plates.py). Above AMPLIFICATION_LIMIT the solve raises
  RoundOffError: the convergence study keeps the levels solved so far.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla

SOLVERS = ("auto", "direct", "iterative")
LARGE_FROM = 120_000  # free DOFs from which "auto" leaves SuperLU for PARDISO or AMG-CG (benchmarks/solve.py)
CG_TOLERANCE = 1e-10  # relative residual ||f - K u|| / ||f|| at which conjugate gradients stops
MAX_ITERATIONS = 500
BACKWARD_LIMIT = 1e-6  # a solve whose normwise backward error exceeds this has failed
AMPLIFICATION_LIMIT = 5e12  # round-off amplification above which eps * it passes 0.1 % (see the docstring)
RIGID_LIMIT = 1e-12  # held share of a rigid-body motion's mean square below which it is unrestrained (see _check_supported)


class SolverError(RuntimeError):
    """The stiffness system cannot be solved (a mechanism, or a numerical failure)."""


class RoundOffError(SolverError):
    """The solve would amplify round-off beyond AMPLIFICATION_LIMIT: a nearly singular stiffness."""


@dataclass(frozen=True)
class SolveReport:
    """How one system was solved.

    method: "pardiso", "superlu" or "amg-cg"; dofs: free DOFs; iterations: CG iterations (0 for a
    direct solve; the most of any column); residual: relative residual ||f - K u|| / ||f|| on the free
    DOFs (the largest of any column); seconds: wall time (all columns).
    """

    method: str
    dofs: int
    iterations: int
    residual: float
    seconds: float


def pardiso_available() -> bool:
    """True when the optional PARDISO binding (pypardiso with oneMKL) can be loaded."""
    try:
        import pypardiso  # noqa: F401  (loads oneMKL's runtime library on import)
    except (ImportError, OSError):
        return False
    return True


def choose_method(solver: str, dofs: int) -> str:
    """The method `solver` ("auto", "direct", "iterative") uses for a system of `dofs` free DOFs."""
    if solver not in SOLVERS:
        raise ValueError(f"unknown solver {solver!r}; use one of {', '.join(SOLVERS)}")
    if solver == "iterative":
        return "amg-cg"
    if dofs < LARGE_FROM:
        return "superlu"
    if pardiso_available():
        return "pardiso"
    return "superlu" if solver == "direct" else "amg-cg"


def solve_system(K: sp.spmatrix, f: np.ndarray, fixed: np.ndarray, solver: str = "auto",
                 nodes: np.ndarray | None = None) -> tuple[np.ndarray, SolveReport]:
    """Displacements (2n,) in mm with u = 0 on the `fixed` DOFs, and how they were found; with `f` of shape
    (2n, m), one column of displacements per column of forces (one factorisation for all).

    K: (2n, 2n) symmetric stiffness (N/mm), DOFs ordered (u1, v1, u2, v2, ...); f: (2n,) or (2n, m) forces
    (N); nodes: (n, 2) coordinates (mm), which give the rigid-body modes for the mechanism check and the
    multigrid near-null space (without them only translations are used).
    """
    clock = time.perf_counter()
    K = sp.csr_matrix(K)
    free = np.ones(K.shape[0], dtype=bool)
    free[np.asarray(fixed, dtype=np.int64)] = False
    n_free = int(free.sum())
    if n_free == 0:
        return np.zeros(f.shape), SolveReport("none", 0, 0, 0.0, 0.0)
    modes = rigid_modes(K.shape[0] // 2, nodes)
    _check_supported(K, free, modes)
    method = choose_method(solver, n_free)
    from .budget import check_solve  # budget imports SolverError from here

    check_solve(n_free, method)  # refuse, with the figure, a solve that would not fit in memory
    iterations = 0
    if method == "amg-cg":
        u, iterations = _amg_cg(K, f, free, modes)
    elif method == "pardiso":
        u = _pardiso(K, f, free)
    else:
        u = np.zeros(f.shape)
        u[free] = _superlu(K[free][:, free], f[free])
    if not np.all(np.isfinite(u)):
        raise SolverError("the solve returned non-finite displacements; the part may be a mechanism")
    backward, amplification = solve_errors(K, u, f, free)
    if not backward <= BACKWARD_LIMIT:
        raise SolverError(f"the {method} solve failed (a backward error of {backward:.1e}); the stiffness matrix "
                          "is singular or nearly so (is the part held against every rigid-body motion?)")
    if not amplification <= AMPLIFICATION_LIMIT:
        raise RoundOffError(f"the {method} solve amplified round-off by {amplification:.1e}, above "
                            f"{AMPLIFICATION_LIMIT:.0e} (where it could move the stresses by 0.1 %): the stiffness "
                            "is nearly singular; is the part held against every rigid-body motion, or too slender "
                            "for its load (a strap thousands of widths long in bending)?")
    residual = _relative_residual(K, u, f, free)
    return u, SolveReport(method, n_free, iterations, residual, time.perf_counter() - clock)


def solve_constrained(K: sp.spmatrix, f: np.ndarray, fixed: np.ndarray, solver: str = "auto",
                      nodes: np.ndarray | None = None) -> np.ndarray:
    """Displacements (2n,) in mm with u = 0 on the `fixed` DOFs (see `solve_system`)."""
    return solve_system(K, f, fixed, solver, nodes)[0]


def rigid_modes(n: int, nodes: np.ndarray | None) -> np.ndarray:
    """(2n, r) in-plane rigid-body modes: x and y translation and, given node coordinates, the rotation
    about their centroid (scaled to unit size)."""
    modes = np.zeros((2 * n, 3 if nodes is not None else 2))
    modes[0::2, 0] = 1.0
    modes[1::2, 1] = 1.0
    if nodes is not None:
        d = nodes - nodes.mean(axis=0)
        size = max(float(np.abs(d).max()), 1e-300)
        modes[0::2, 2] = -d[:, 1] / size
        modes[1::2, 2] = d[:, 0] / size
    return modes


def _check_supported(K: sp.csr_matrix, free: np.ndarray, modes: np.ndarray) -> None:
    """Raise SolverError when a free DOF has no stiffness or a rigid-body motion is not held.

    A rigid-body motion strains nothing, so only the held DOFs resist it: it is held exactly when it
    moves some held DOF (of a node that has stiffness). The test is kinematic and scale-free: over every
    rigid-body motion (a combination of `modes`), the smallest ratio of its mean square displacement at
    the held DOFs to its mean square displacement over the whole part, a generalised eigenvalue of the
    two 3 x 3 Gram matrices. A properly held part gives about (held lever / part length)^2 (a plate
    10,000 widths long held along one end: about 5e-9); a mechanism gives round-off (1e-16 and below).
    """
    diag = K.diagonal()
    if np.any(diag[free] <= 0.0):
        raise SolverError("a node has no stiffness (it belongs to no element); the mesh is not in one piece")
    held = ~free & (diag > 0.0)
    whole = modes.T @ modes / modes.shape[0]
    at_held = modes[held].T @ modes[held] / max(int(held.sum()), 1)
    if held_fraction(at_held, whole) < RIGID_LIMIT:
        raise SolverError("the part is a mechanism: the supports do not hold it against every rigid-body "
                          "motion (translation in x, translation in y and rotation)")


def held_fraction(at_held: np.ndarray, whole: np.ndarray) -> float:
    """The smallest generalised eigenvalue of the Gram matrices (at the held DOFs, over the whole part):
    the mean square motion at the held DOFs of the least-held rigid-body motion, per unit mean square
    motion of the part."""
    import scipy.linalg

    return float(scipy.linalg.eigh(at_held, whole, eigvals_only=True)[0])


def _superlu(Kff: sp.csr_matrix, ff: np.ndarray) -> np.ndarray:
    try:
        lu = spla.splu(Kff.tocsc(), permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0,
                       options={"SymmetricMode": True})
    except RuntimeError as exc:
        raise SolverError(f"the stiffness matrix is singular ({exc}); is the part supported and in one piece?") from None
    return lu.solve(ff)


# oneMKL PARDISO controls (1-based iparm numbers, as pypardiso's set_iparm takes them; Intel oneMKL
# Developer Reference, "pardiso iparm Parameter"): iparm 1 = 1 says the others are given; iparm 2 = 2 is
# METIS nested dissection (sequential, so the ordering and the bits repeat; the parallel variant 3 cannot
# promise that); iparm 37 = -80 groups the CSR matrix into variable-size blocks (here the 2 x 2 node
# blocks) wherever 80 % of a block's entries are non-zero, which cut the ordering and factorisation time
# by about a fifth at 723k DOFs (benchmarks/solve.py). Every other entry 0 keeps its documented default
# for a real symmetric positive-definite matrix (mtype 2).
PARDISO_IPARM = {1: 1, 2: 2, 37: -80}
PARDISO_SPD = 2


def _pardiso(K: sp.csr_matrix, f: np.ndarray, free: np.ndarray) -> np.ndarray:
    """Cholesky solve by oneMKL PARDISO of the whole system with the held DOFs decoupled (rows and
    columns zeroed, diagonal kept, right-hand side zero), upper triangle only, so the 2 x 2 node blocks
    stay whole for its block format."""
    from pypardiso import PyPardisoSolver
    from pypardiso.pardiso_wrapper import PyPardisoError

    solver = PyPardisoSolver(mtype=PARDISO_SPD)
    for number, value in PARDISO_IPARM.items():
        solver.set_iparm(number, value)
    try:
        return solver.solve(_upper(_decouple(K, free)), np.where(free if f.ndim == 1 else free[:, None], f, 0.0))
    except PyPardisoError as exc:
        raise SolverError(f"the stiffness matrix is not positive definite (PARDISO: {exc}); is the part "
                          "supported and in one piece?") from None
    finally:
        solver.free_memory(everything=True)


def _upper(A: sp.csr_matrix) -> sp.csr_matrix:
    """The upper triangle (diagonal included) of a CSR matrix with sorted indices, kept in CSR."""
    rows = np.repeat(np.arange(A.shape[0], dtype=A.indices.dtype), np.diff(A.indptr))
    keep = A.indices >= rows
    indptr = np.zeros(A.shape[0] + 1, dtype=A.indptr.dtype)
    np.cumsum(np.bincount(rows[keep], minlength=A.shape[0]), out=indptr[1:])
    return sp.csr_matrix((A.data[keep], A.indices[keep], indptr), shape=A.shape)


def _amg_cg(K: sp.csr_matrix, f: np.ndarray, free: np.ndarray, modes: np.ndarray) -> tuple[np.ndarray, int]:
    """CG preconditioned by smoothed-aggregation AMG on the whole system with the held DOFs decoupled
    (their rows and columns zeroed, diagonal kept), so the 2 x 2 node blocks survive for aggregation; one
    hierarchy, each column of f solved with it."""
    import pyamg
    from threadpoolctl import threadpool_limits

    with threadpool_limits(limits=1, user_api="blas"):  # level-1 and tiny dense BLAS only: threads cost more
        return _amg_cg_serial(pyamg, K, f, free, modes)


def _amg_cg_serial(pyamg, K: sp.csr_matrix, f: np.ndarray, free: np.ndarray, modes: np.ndarray) -> tuple[np.ndarray, int]:
    A = _decouple(K, free).tobsr(blocksize=(2, 2))
    B = modes * free[:, None]
    ml = pyamg.smoothed_aggregation_solver(A, B=B, symmetry="symmetric", max_coarse=1000, coarse_solver="splu")
    columns = f.reshape(f.shape[0], -1)
    u = np.zeros(columns.shape)
    most = 0
    for k in range(columns.shape[1]):
        b = np.where(free, columns[:, k], 0.0)
        residuals: list[float] = []
        u[:, k] = ml.solve(b, tol=CG_TOLERANCE, maxiter=MAX_ITERATIONS, accel="cg", residuals=residuals)
        if residuals and residuals[-1] > CG_TOLERANCE * 10 * np.linalg.norm(b):
            raise SolverError(f"conjugate gradients did not converge in {MAX_ITERATIONS} iterations (relative "
                              f"residual {residuals[-1] / np.linalg.norm(b):.1e}); the part may be a mechanism")
        most = max(most, len(residuals) - 1)
    u[~free] = 0.0
    return u.reshape(f.shape), max(most, 0)


def _decouple(K: sp.csr_matrix, free: np.ndarray) -> sp.csr_matrix:
    """K with the rows and columns of held DOFs zeroed except their diagonal (same sparsity)."""
    rows = np.repeat(np.arange(K.shape[0], dtype=K.indices.dtype), np.diff(K.indptr))
    keep = (free[rows] & free[K.indices]) | (rows == K.indices)
    return sp.csr_matrix((K.data * keep, K.indices, K.indptr), shape=K.shape)


def solve_errors(K: sp.csr_matrix, u: np.ndarray, f: np.ndarray, free: np.ndarray) -> tuple[float, float]:
    """(normwise backward error, round-off amplification) of a solve on the free DOFs (see the module
    docstring; infinity norms, ||K|| the largest row sum of |K| over the free rows and columns); for
    several right-hand sides (columns), the largest of each over the columns."""
    if u.ndim == 2:
        errors = [solve_errors(K, u[:, k], f[:, k], free) for k in range(u.shape[1])]
        return max(e[0] for e in errors), max(e[1] for e in errors)
    r = np.abs(f - K @ u)[free]
    row_sums = abs(K) @ free.astype(float)
    norm_k = float(row_sums[free].max())
    norm_u, norm_f = float(np.abs(u[free]).max()), float(np.abs(f[free]).max())
    scale = norm_k * norm_u + norm_f
    backward = float(r.max()) / scale if scale > 0 else 0.0
    amplification = norm_k * norm_u / norm_f if norm_f > 0 else (0.0 if norm_u == 0 else math.inf)
    return backward, amplification


def _relative_residual(K: sp.csr_matrix, u: np.ndarray, f: np.ndarray, free: np.ndarray) -> float:
    """||f - K u|| / ||f|| on the free DOFs; for several columns, the largest of them."""
    r = (f - K @ u)[free]
    scale = np.linalg.norm(f[free], axis=0)
    norm = np.linalg.norm(r, axis=0)
    return float(np.max(np.where(scale > 0, norm / np.where(scale > 0, scale, 1.0), norm)))
