"""Linear solve of K u = f with held DOFs eliminated."""

from __future__ import annotations

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla


class SolverError(RuntimeError):
    """The stiffness system cannot be solved (a mechanism, or a numerical failure)."""


def solve_constrained(K: sp.csr_matrix, f: np.ndarray, fixed: np.ndarray) -> np.ndarray:
    """Displacements (2n,) in mm with u = 0 on the `fixed` DOFs.

    Sparse LU in symmetric mode with a minimum-degree ordering on A^T + A, which suits the symmetric
    positive-definite stiffness of a 2-D mesh far better than the column ordering used by default.
    """
    free = np.ones(K.shape[0], dtype=bool)
    free[fixed] = False
    Kff = K[free][:, free].tocsc()
    try:
        lu = spla.splu(Kff, permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0, options={"SymmetricMode": True})
    except RuntimeError as exc:
        raise SolverError(f"the stiffness matrix is singular ({exc}); is the part supported and in one piece?") from None
    uf = lu.solve(f[free])
    if not np.all(np.isfinite(uf)):
        raise SolverError("the solve returned non-finite displacements; the part may be a mechanism")
    u = np.zeros(K.shape[0])
    u[free] = uf
    return u
