"""Quadratic (6-node) isoparametric triangles: stiffness, stresses and consistent edge loads.

Local nodes: corners 1, 2, 3 (counter-clockwise), then the middles of edges 1-2, 2-3, 3-1 (geometry/
quadratic.py). With area coordinates L1 = 1 - xi - eta, L2 = xi, L3 = eta the shape functions are
N1 = L1 (2 L1 - 1), N2 = L2 (2 L2 - 1), N3 = L3 (2 L3 - 1), N4 = 4 L1 L2, N5 = 4 L2 L3, N6 = 4 L3 L1
(O. C. Zienkiewicz and R. L. Taylor, The Finite Element Method, vol. 1, quadratic triangle). The same
functions map the element, so an edge whose middle node lies on an arc is a parabola through three
points of the arc. The stiffness is integrated with the 6-point rule of degree 4 (D. A. Dunavant, "High
degree efficient symmetrical Gaussian quadrature rules for the triangle", Int. J. Numer. Meth. Engng 21,
1985), exact for straight-sided elements (whose integrand is quadratic) and accurate for curved ones.

Stresses vary linearly over a straight element. They are sampled at the centroids of the element's four
sub-triangles (the points of the 3-point rule and the centroid) so that the patch recovery and the
free-edge state of fem/recovery.py, written for linear triangles, run on the sub-triangle mesh unchanged.
"""

from __future__ import annotations

import numpy as np
import scipy.sparse as sp

from .assembly import Gradients, assemble

# Dunavant's degree-4 rule on the reference triangle (area 1/2): points (xi, eta) and weights
_A, _B = 0.445948490915965, 0.091576213509771
_WA, _WB = 0.223381589678011, 0.109951743655322
STIFFNESS_POINTS = np.array([[_A, _A], [1 - 2 * _A, _A], [_A, 1 - 2 * _A], [_B, _B], [1 - 2 * _B, _B], [_B, 1 - 2 * _B]])
STIFFNESS_WEIGHTS = 0.5 * np.array([_WA, _WA, _WA, _WB, _WB, _WB])
# centroids of the sub-triangles of geometry.quadratic.SUB_TRIANGLES, in reference coordinates
SAMPLE_POINTS = np.array([[1 / 6, 1 / 6], [2 / 3, 1 / 6], [1 / 6, 2 / 3], [1 / 3, 1 / 3]])
EDGE_POINTS = 4  # Gauss-Legendre points per 3-node boundary edge


def shape_functions(points: np.ndarray) -> np.ndarray:
    """(q, 6) shape functions at (q, 2) reference points (xi, eta)."""
    l2, l3 = points[:, 0], points[:, 1]
    l1 = 1.0 - l2 - l3
    return np.column_stack([l1 * (2 * l1 - 1), l2 * (2 * l2 - 1), l3 * (2 * l3 - 1), 4 * l1 * l2, 4 * l2 * l3, 4 * l3 * l1])


def shape_derivatives(points: np.ndarray) -> np.ndarray:
    """(q, 2, 6) derivatives d N / d (xi, eta) at (q, 2) reference points."""
    l2, l3 = points[:, 0], points[:, 1]
    l1 = 1.0 - l2 - l3
    zero = np.zeros_like(l2)
    dxi = np.column_stack([1 - 4 * l1, 4 * l2 - 1, zero, 4 * (l1 - l2), 4 * l3, -4 * l3])
    deta = np.column_stack([1 - 4 * l1, zero, 4 * l3 - 1, -4 * l2, 4 * l2, 4 * (l1 - l3)])
    return np.stack([dxi, deta], axis=1)


def physical_gradients(nodes: np.ndarray, tri6: np.ndarray, points: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """dN/dx, dN/dy (m, q, 6) in 1/mm and det J (m, q) in mm^2 at reference `points` of (m, 6) elements."""
    dN = shape_derivatives(points)  # (q, 2, 6)
    X = nodes[tri6]  # (m, 6, 2)
    J = np.einsum("qra,mac->mqrc", dN, X)  # J[r, c] = d x_c / d ref_r
    det = J[..., 0, 0] * J[..., 1, 1] - J[..., 0, 1] * J[..., 1, 0]
    if np.any(det <= 0.0):
        bad = int(np.argmin(det.min(axis=1)))
        x, y = X[bad, :3].mean(axis=0)
        raise ValueError(f"a quadratic triangle near ({x:.4g}, {y:.4g}) mm is inverted or too distorted")
    inv = 1.0 / det
    # inverse Jacobian applied to the reference derivatives
    gx = (J[..., 1, 1, None] * dN[None, :, 0, :] - J[..., 0, 1, None] * dN[None, :, 1, :]) * inv[..., None]
    gy = (-J[..., 1, 0, None] * dN[None, :, 0, :] + J[..., 0, 0, None] * dN[None, :, 1, :]) * inv[..., None]
    return gx, gy, det


def quadratic_gradients(nodes: np.ndarray, tri6: np.ndarray, thickness: float) -> Gradients:
    """Gradients at the stiffness points with weights w |J| t (mm^3)."""
    gx, gy, det = physical_gradients(nodes, tri6, STIFFNESS_POINTS)
    return Gradients(gx, gy, det * STIFFNESS_WEIGHTS[None, :] * thickness)


def quadratic_stiffness(nodes: np.ndarray, tri6: np.ndarray, D: np.ndarray, thickness: float) -> sp.csr_matrix:
    """Global stiffness (2n x 2n, CSR, N/mm) of (m, 6) quadratic triangles."""
    tri6 = np.asarray(tri6)
    return assemble(tri6, nodes.shape[0], lambda index: quadratic_gradients(nodes, tri6[index], thickness), D)


def stresses_at(nodes: np.ndarray, tri6: np.ndarray, D: np.ndarray, u: np.ndarray, points: np.ndarray) -> np.ndarray:
    """(m, q, 3) stresses (sxx, syy, txy) in MPa at reference `points` of each element, from u (2n,) in mm."""
    gx, gy, _ = physical_gradients(nodes, tri6, points)
    U = u.reshape(-1, 2)[tri6]  # (m, 6, 2)
    exx = np.einsum("mqa,ma->mq", gx, U[:, :, 0])
    eyy = np.einsum("mqa,ma->mq", gy, U[:, :, 1])
    gxy = np.einsum("mqa,ma->mq", gy, U[:, :, 0]) + np.einsum("mqa,ma->mq", gx, U[:, :, 1])
    return np.stack([exx, eyy, gxy], axis=-1) @ D.T


def sub_triangle_stresses(nodes: np.ndarray, tri6: np.ndarray, D: np.ndarray, u: np.ndarray) -> np.ndarray:
    """(4m, 3) stresses at the centroids of the sub-triangles (geometry.quadratic.sub_triangles order)."""
    return stresses_at(nodes, tri6, D, u, SAMPLE_POINTS).reshape(-1, 3)


def edge_shape_functions(s: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Shape functions (q, 3) of a 3-node edge (end, end, middle) at s in [-1, 1], and their derivatives."""
    N = np.column_stack([0.5 * s * (s - 1.0), 0.5 * s * (s + 1.0), 1.0 - s * s])
    dN = np.column_stack([s - 0.5, s + 0.5, -2.0 * s])
    return N, dN


def quadratic_edge_forces(nodes: np.ndarray, edges3: np.ndarray, traction, thickness: float,
                          points: int = EDGE_POINTS) -> np.ndarray:
    """Global force vector (2n,) in N of a traction on (k, 3) boundary edges (end, end, middle).

    Consistent forces f_a = t int N_a(s) traction(x(s)) |dx/ds| ds along each (possibly curved) edge by
    Gauss-Legendre quadrature. `traction` maps (p, 2) points in mm to (p, 2) tractions in MPa (the same
    callables as fem/loads.py); 4 points integrate a traction up to quadratic along a straight edge exactly.
    """
    s, w = np.polynomial.legendre.leggauss(points)
    N, dN = edge_shape_functions(s)  # (q, 3)
    X = nodes[edges3]  # (k, 3, 2)
    x = np.einsum("qa,kac->kqc", N, X)
    jac = np.linalg.norm(np.einsum("qa,kac->kqc", dN, X), axis=2)  # |dx/ds| (k, q)
    t = traction(x.reshape(-1, 2)).reshape(x.shape)  # (k, q, 2)
    fe = np.einsum("qa,kq,kqc->kac", N, jac * w[None, :] * thickness, t)  # (k, 3, 2)
    f = np.zeros(2 * nodes.shape[0])
    dofs = 2 * edges3.astype(np.int64)
    for comp in (0, 1):
        f += np.bincount((dofs + comp).ravel(), weights=fe[:, :, comp].ravel(), minlength=f.size)
    return f
