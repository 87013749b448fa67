"""Isotropic linear-elastic constitutive matrices in Voigt order (sxx, syy, txy) with engineering
shear strain gxy = 2 exy. Units: E in MPa; D maps strain (-) to stress (MPa)."""

from __future__ import annotations

import numpy as np


def plane_stress_matrix(E: float, nu: float) -> np.ndarray:
    """D for plane stress (szz = 0): E/(1-nu^2) [[1, nu, 0], [nu, 1, 0], [0, 0, (1-nu)/2]]."""
    c = E / (1.0 - nu * nu)
    return c * np.array([[1.0, nu, 0.0], [nu, 1.0, 0.0], [0.0, 0.0, 0.5 * (1.0 - nu)]])


def plane_strain_matrix(E: float, nu: float) -> np.ndarray:
    """D for plane strain (ezz = 0): E/((1+nu)(1-2nu)) [[1-nu, nu, 0], [nu, 1-nu, 0], [0, 0, (1-2nu)/2]]."""
    c = E / ((1.0 + nu) * (1.0 - 2.0 * nu))
    return c * np.array([[1.0 - nu, nu, 0.0], [nu, 1.0 - nu, 0.0], [0.0, 0.0, 0.5 - nu]])


def constitutive_matrix(E: float, nu: float, condition: str) -> np.ndarray:
    """D for "plane-stress" or "plane-strain"."""
    if condition == "plane-stress":
        return plane_stress_matrix(E, nu)
    if condition == "plane-strain":
        return plane_strain_matrix(E, nu)
    raise ValueError(f"unknown condition {condition!r}")
