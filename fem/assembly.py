"""Vectorised constant-strain-triangle (CST) kinematics and stiffness assembly.

DOF numbering: node i has DOFs 2i (u_x) and 2i+1 (u_y). No per-element Python loops.
"""

from __future__ import annotations

import numpy as np
import scipy.sparse as sp

CHUNK = 200_000  # elements per chunk when forming element matrices (bounds peak memory)


def triangle_areas(nodes: np.ndarray, tris: np.ndarray) -> np.ndarray:
    """Signed areas (mm^2) of triangles; positive when counter-clockwise."""
    p = nodes[tris]
    return 0.5 * ((p[:, 1, 0] - p[:, 0, 0]) * (p[:, 2, 1] - p[:, 0, 1]) - (p[:, 2, 0] - p[:, 0, 0]) * (p[:, 1, 1] - p[:, 0, 1]))


def strain_displacement(nodes: np.ndarray, tris: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """B matrices (m, 3, 6) mapping element DOFs to (exx, eyy, gxy), and areas (m,)."""
    p = nodes[tris]
    x, y = p[:, :, 0], p[:, :, 1]
    b = np.stack([y[:, 1] - y[:, 2], y[:, 2] - y[:, 0], y[:, 0] - y[:, 1]], axis=1)
    c = np.stack([x[:, 2] - x[:, 1], x[:, 0] - x[:, 2], x[:, 1] - x[:, 0]], axis=1)
    area = 0.5 * (b[:, 0] * c[:, 1] - b[:, 1] * c[:, 0])
    B = np.zeros((tris.shape[0], 3, 6))
    B[:, 0, 0::2] = b
    B[:, 1, 1::2] = c
    B[:, 2, 0::2] = c
    B[:, 2, 1::2] = b
    B /= (2.0 * area)[:, None, None]
    return B, area


def element_dofs(tris: np.ndarray) -> np.ndarray:
    """(m, 6) global DOF indices of each triangle, ordered (u1, v1, u2, v2, u3, v3)."""
    t = tris.astype(np.int64)
    return np.stack([2 * t[:, 0], 2 * t[:, 0] + 1, 2 * t[:, 1], 2 * t[:, 1] + 1, 2 * t[:, 2], 2 * t[:, 2] + 1], axis=1)


def element_stiffness(nodes: np.ndarray, tris: np.ndarray, D: np.ndarray, thickness: float) -> np.ndarray:
    """(m, 6, 6) element stiffness matrices t A B^T D B (N/mm)."""
    B, area = strain_displacement(nodes, tris)
    return np.einsum("eki,kl,elj->eij", B, D, B, optimize=True) * (thickness * area)[:, None, None]


def stiffness_matrix(nodes: np.ndarray, tris: np.ndarray, D: np.ndarray, thickness: float) -> sp.csr_matrix:
    """Global stiffness (2n x 2n, CSR, N/mm), assembled in chunks of CHUNK elements."""
    n_dof = 2 * nodes.shape[0]
    parts = []
    for start in range(0, tris.shape[0], CHUNK):
        t = tris[start:start + CHUNK]
        ke = element_stiffness(nodes, t, D, thickness)
        dofs = element_dofs(t)
        rows = np.repeat(dofs, 6, axis=1).ravel()
        cols = np.tile(dofs, (1, 6)).ravel()
        parts.append(sp.coo_matrix((ke.ravel(), (rows, cols)), shape=(n_dof, n_dof)).tocsr())
    K = parts[0]
    for extra in parts[1:]:
        K = K + extra
    K.sum_duplicates()
    return K


def element_stresses(nodes: np.ndarray, tris: np.ndarray, D: np.ndarray, u: np.ndarray) -> np.ndarray:
    """(m, 3) constant element stresses (sxx, syy, txy) in MPa from nodal displacements u (2n,) in mm."""
    B, _ = strain_displacement(nodes, tris)
    strain = np.einsum("eij,ej->ei", B, u[element_dofs(tris)])
    return strain @ D.T
