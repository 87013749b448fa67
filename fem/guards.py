"""Checks on a solved level that turn a silent wrong answer into a SolverError (exit code 3).

fem/solve.py refuses a stiffness with an unrestrained rigid-body motion and a solve with a large residual;
here the fields that come out of the solve and the stress recovery must be finite (a NaN peak would
otherwise be reported, or crash the JSON writer).
"""

from __future__ import annotations

import numpy as np

from .solve import SolverError


def check_fields(displacement: np.ndarray, nodal_stress: np.ndarray) -> None:
    """SolverError when the solve produced non-finite displacements or stresses."""
    for name, field in (("displacements", displacement), ("stresses", nodal_stress)):
        bad = int(np.count_nonzero(~np.isfinite(field)))
        if bad:
            raise SolverError(f"the solve produced {bad} non-finite {name} (NaN or infinity); the stiffness may "
                              "be singular or the numbers out of range")
