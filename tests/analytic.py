"""Closed-form solutions used as independent references by the tests."""

from __future__ import annotations

import numpy as np


def kirsch_stress(points: np.ndarray, a: float, s: float = 1.0) -> np.ndarray:
    """Cartesian (sxx, syy, txy) around a circular hole of radius a at the origin in an infinite plate
    under remote uniaxial stress s along x.

    G. Kirsch, Z. VDI 42 (1898); polar components as in S. P. Timoshenko and J. N. Goodier, Theory of
    Elasticity, 3rd ed. (from memory; transcribed in docs/references.md [Kirsch]).
    """
    x, y = points[:, 0], points[:, 1]
    r, t = np.hypot(x, y), np.arctan2(y, x)
    q = (a / r) ** 2
    srr = 0.5 * s * (1 - q) + 0.5 * s * (1 - 4 * q + 3 * q * q) * np.cos(2 * t)
    stt = 0.5 * s * (1 + q) - 0.5 * s * (1 + 3 * q * q) * np.cos(2 * t)
    srt = -0.5 * s * (1 + 2 * q - 3 * q * q) * np.sin(2 * t)
    c, n = np.cos(t), np.sin(t)
    sxx = srr * c * c + stt * n * n - 2 * srt * n * c
    syy = srr * n * n + stt * c * c + 2 * srt * n * c
    sxy = (srr - stt) * n * c + srt * (c * c - n * n)
    return np.column_stack([sxx, syy, sxy])


def kirsch_polar(r: float, theta: float, a: float = 1.0, s: float = 1.0) -> tuple[float, float, float]:
    """(s_rr, s_tt, s_rt) of the Kirsch solution at (r, theta)."""
    q = (a / r) ** 2
    srr = 0.5 * s * (1 - q) + 0.5 * s * (1 - 4 * q + 3 * q * q) * np.cos(2 * theta)
    stt = 0.5 * s * (1 + q) - 0.5 * s * (1 + 3 * q * q) * np.cos(2 * theta)
    srt = -0.5 * s * (1 + 2 * q - 3 * q * q) * np.sin(2 * theta)
    return float(srr), float(stt), float(srt)


def interpolate_nodal(nodes: np.ndarray, tris: np.ndarray, values: np.ndarray, point) -> np.ndarray:
    """Linear interpolation of nodal values at a point inside the mesh (barycentric, containing triangle)."""
    p = nodes[tris]
    v0, v1 = p[:, 1] - p[:, 0], p[:, 2] - p[:, 0]
    w = np.asarray(point) - p[:, 0]
    det = v0[:, 0] * v1[:, 1] - v0[:, 1] * v1[:, 0]
    l1 = (w[:, 0] * v1[:, 1] - w[:, 1] * v1[:, 0]) / det
    l2 = (v0[:, 0] * w[:, 1] - v0[:, 1] * w[:, 0]) / det
    inside = np.flatnonzero((l1 >= -1e-12) & (l2 >= -1e-12) & (l1 + l2 <= 1 + 1e-12))
    k = inside[0]
    lam = np.array([1 - l1[k] - l2[k], l1[k], l2[k]])
    return lam @ values[tris[k]]
