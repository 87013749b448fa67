"""Nodal stress recovery and derived stresses.

Superconvergent patch recovery (O. C. Zienkiewicz and J. Z. Zhu, "The superconvergent patch recovery and
a posteriori error estimates", Int. J. Numer. Meth. Engng 33, 1992): for every interior node a polynomial
is fitted by least squares to the constant stresses of the triangles of its patch, sampled at their
centroids; the nodal value is the polynomial at the node. A boundary node takes the average of the
polynomials of the interior nodes it shares a triangle with, evaluated at the boundary node. On a
traction-free edge the stress is then set to the exact edge state (see `free_edge_stress`), where the
peak of a flat part almost always is.

Interior nodes next to the boundary use a complete quadratic on a two-ring patch (every triangle
touching the node or one of its neighbours): near a hole edge the stress varies steeply, and a linear
fit extrapolated to the boundary understates the peak by several per cent at practical element sizes.
Other interior nodes use the classical linear fit on the triangles around them.

Stress components are ordered (sxx, syy, txy), in MPa.
"""

from __future__ import annotations

import numpy as np
import scipy.sparse as sp

from .assembly import triangle_areas

N_TERMS = 6  # 1, x, y, x^2, xy, y^2
MIN_QUADRATIC = 9  # triangles a quadratic patch needs to be well over-determined
MIN_LINEAR = 3
MAX_CONDITION = 1e10


def patch_recovery(nodes: np.ndarray, tris: np.ndarray, stress: np.ndarray, boundary: np.ndarray) -> np.ndarray:
    """Nodal stresses (n, 3) recovered from element stresses (m, 3); `boundary` lists boundary nodes.
    Any number of columns works alike (m, c) -> (n, c): several load cases' stresses side by side share
    the patches and their least-squares factorisations.

    Interior nodes next to the boundary get quadratic fits on two-ring patches (they feed the boundary
    values, where the peak usually is); other interior nodes get the classical linear fit on the
    triangles around them; boundary nodes take the neighbouring quadratic patches evaluated there.
    """
    n = nodes.shape[0]
    incidence = _incidence(tris, n)
    scale = _node_scale(nodes, tris, incidence)
    interior = np.ones(n, dtype=bool)
    interior[boundary] = False
    near = interior & _touches(incidence, ~interior)

    coef = np.zeros((n, N_TERMS, stress.shape[1]))
    ring = incidence
    fitted_lin = _fit(coef, nodes, tris, stress, ring, np.flatnonzero(interior & ~near), scale, 3, MIN_LINEAR)
    two_ring = (incidence @ (incidence.T @ incidence)).tocsr()
    fitted_quad = _fit(coef, nodes, tris, stress, two_ring, np.flatnonzero(near), scale, N_TERMS, MIN_QUADRATIC)
    # near-boundary nodes whose quadratic fit failed fall back to the linear fit
    fitted_lin |= _fit(coef, nodes, tris, stress, ring, np.flatnonzero(near & ~fitted_quad), scale, 3, MIN_LINEAR)
    fitted = fitted_lin | fitted_quad

    out = np.zeros((n, stress.shape[1]))
    out[fitted] = coef[fitted, 0, :]
    reached = _from_neighbour_patches(out, nodes, tris, coef, fitted, scale, fitted_quad)
    _area_average(out, tris, stress, np.abs(triangle_areas(nodes, tris)), ~(fitted | reached))
    return out


def _incidence(tris: np.ndarray, n: int) -> sp.csr_matrix:
    """(n, m) node-triangle incidence."""
    m = tris.shape[0]
    data = np.ones(3 * m, dtype=np.float64)
    return sp.csr_matrix((data, (tris.ravel().astype(np.int64), np.repeat(np.arange(m), 3))), shape=(n, m))


def _touches(incidence: sp.csr_matrix, mask: np.ndarray) -> np.ndarray:
    """Nodes sharing a triangle with any node in `mask`."""
    return (incidence @ (incidence.T @ mask.astype(np.float64))) > 0


def _node_scale(nodes: np.ndarray, tris: np.ndarray, incidence: sp.csr_matrix) -> np.ndarray:
    """A length per node (mm): root of the mean area of its triangles; scales patch coordinates."""
    area = np.abs(triangle_areas(nodes, tris))
    count = np.maximum(np.diff(incidence.indptr), 1)
    scale = np.sqrt((incidence @ area) / count)
    scale[scale == 0] = 1.0
    return scale


def _basis(d: np.ndarray, terms: int) -> np.ndarray:
    x, y = d[:, 0], d[:, 1]
    full = (np.ones_like(x), x, y, x * x, x * y, y * y)
    return np.column_stack(full[:terms])


def _fit(coef, nodes, tris, stress, patches, picked, scale, terms, min_count) -> np.ndarray:
    """Least-squares polynomial fits (`terms` = 3 linear, 6 quadratic) of element stresses sampled at
    centroids over each picked node's patch (rows of `patches`), in the node's scaled local coordinates.
    Writes coef[picked, :terms] and returns the mask of nodes fitted."""
    n = nodes.shape[0]
    fitted = np.zeros(n, dtype=bool)
    if picked.size == 0:
        return fitted
    rows = patches[picked]
    counts = np.diff(rows.indptr)
    enough = counts >= min_count
    rows, picked, counts = rows[enough], picked[enough], counts[enough]
    if picked.size == 0:
        return fitted
    node_of = np.repeat(picked, counts)
    elem_of = rows.indices.astype(np.int64)
    centroid = nodes[tris].mean(axis=1)
    P = _basis((centroid[elem_of] - nodes[node_of]) / scale[node_of, None], terms)
    starts = rows.indptr[:-1].astype(np.int64)
    A = np.add.reduceat(P[:, :, None] * P[:, None, :], starts, axis=0)
    b = np.add.reduceat(P[:, :, None] * stress[elem_of][:, None, :], starts, axis=0)
    well = _well_conditioned(A)
    coef[picked[well], :terms] = np.linalg.solve(A[well], b[well])
    coef[picked[well], terms:] = 0.0
    fitted[picked[well]] = True
    return fitted


def _well_conditioned(A: np.ndarray) -> np.ndarray:
    """Symmetric normal matrices whose eigenvalue ratio is below MAX_CONDITION."""
    w = np.linalg.eigvalsh(A)
    return w[:, 0] > w[:, -1] / MAX_CONDITION


def _from_neighbour_patches(out, nodes, tris, coef, fitted, scale, quadratic_fit) -> np.ndarray:
    """Fill unfitted nodes with the mean of neighbouring fitted patches evaluated there; return the mask
    filled. Quadratic patches (`quadratic_fit`, by node) are preferred where a node has any."""
    n = nodes.shape[0]
    pairs = np.column_stack([np.repeat(tris, 3, axis=1).ravel(), np.tile(tris, (1, 3)).ravel()]).astype(np.int64)
    pairs = np.unique(pairs[(~fitted[pairs[:, 0]]) & fitted[pairs[:, 1]]], axis=0)
    quadratic = quadratic_fit[pairs[:, 1]]
    has_quadratic = np.bincount(pairs[quadratic, 0], minlength=n) > 0
    pairs = pairs[quadratic | ~has_quadratic[pairs[:, 0]]]
    target, source = pairs[:, 0], pairs[:, 1]
    P = _basis((nodes[target] - nodes[source]) / scale[source, None], N_TERMS)
    value = np.einsum("kt,ktc->kc", P, coef[source])
    hits = np.bincount(target, minlength=n)
    reached = (~fitted) & (hits > 0)
    for comp in range(out.shape[1]):
        total = np.bincount(target, weights=value[:, comp], minlength=n)
        out[reached, comp] = total[reached] / hits[reached]
    return reached


def _area_average(out, tris, stress, area, mask) -> None:
    """Last resort for nodes no patch reaches: area-weighted mean of the touching triangles."""
    if not mask.any():
        return
    n = out.shape[0]
    node_of = tris.ravel().astype(np.int64)
    w = np.repeat(area, 3)
    wsum = np.bincount(node_of, weights=w, minlength=n)
    for comp in range(out.shape[1]):
        avg = np.bincount(node_of, weights=w * np.repeat(stress[:, comp], 3), minlength=n)
        out[mask, comp] = avg[mask] / np.maximum(wsum[mask], 1e-300)


def free_edge_stress(nodes: np.ndarray, stress: np.ndarray, displacement: np.ndarray, free_edges: np.ndarray,
                     other_nodes: np.ndarray, modulus: float, pressure: np.ndarray | None = None,
                     coupling: float = 0.0) -> np.ndarray:
    """Replace the stress at nodes of traction-free edges by the exact edge state s = s_tt t t.

    On a traction-free edge the normal and shear tractions vanish, so the only in-plane stress is the
    tangential one, s_tt = E' e_tt, with E' = E in plane stress and E / (1 - nu^2) in plane strain. The
    tangential strain e_tt is the stretch of each boundary edge computed from the FE displacements
    (mm/mm, a strain gauge laid along the edge), accurate to second order at the edge's midpoint; a node
    takes the mean of its two edges. Nodes in `other_nodes` (corners shared with loaded or held edges)
    keep their recovered stress. `displacement` is (2n,) in mm, `modulus` E' in MPa.

    Where a frictionless contact presses on the edge (`pressure`, (n,) MPa >= 0, e.g. a pin), the normal
    stress is -p and the edge state is s_tt t t - p n n with s_tt = E' e_tt - coupling p (coupling = nu in
    plane stress, nu / (1 - nu) in plane strain).
    """
    out = stress.copy()
    if free_edges.size == 0:
        return out
    n = nodes.shape[0]
    a, b = free_edges[:, 0], free_edges[:, 1]
    chord = nodes[b] - nodes[a]
    u = displacement.reshape(-1, 2)
    strain = np.einsum("ij,ij->i", u[b] - u[a], chord) / np.einsum("ij,ij->i", chord, chord)
    unit = chord / np.linalg.norm(chord, axis=1)[:, None]
    hits = np.bincount(free_edges.ravel(), minlength=n)
    stt = np.bincount(free_edges.ravel(), weights=np.repeat(modulus * strain, 2), minlength=n)
    # nodal tangent: principal direction of the mean of u u^T over the node's edges (sign-free)
    q = np.zeros((n, 3))
    for end in (a, b):
        np.add.at(q, end, np.column_stack([unit[:, 0] ** 2, unit[:, 1] ** 2, unit[:, 0] * unit[:, 1]]))
    on = np.unique(free_edges)
    on = on[~np.isin(on, other_nodes)]
    angle = 0.5 * np.arctan2(2.0 * q[on, 2], q[on, 0] - q[on, 1])
    t = np.column_stack([np.cos(angle), np.sin(angle)])
    s = stt[on] / hits[on]
    out[on] = np.column_stack([s * t[:, 0] ** 2, s * t[:, 1] ** 2, s * t[:, 0] * t[:, 1]])
    if pressure is not None and np.any(pressure[on] != 0.0):
        p = pressure[on]
        # normal n = (-t_y, t_x): add -p n n and the Poisson share of the pressure to s_tt
        out[on] -= p[:, None] * np.column_stack([t[:, 1] ** 2, t[:, 0] ** 2, -t[:, 0] * t[:, 1]])
        out[on] -= (coupling * p)[:, None] * np.column_stack([t[:, 0] ** 2, t[:, 1] ** 2, t[:, 0] * t[:, 1]])
    return out


def principal_stresses(stress: np.ndarray) -> np.ndarray:
    """(k, 2) in-plane principal stresses (s1 >= s2) of (k, 3) stresses (sxx, syy, txy)."""
    sxx, syy, txy = stress.T
    centre = 0.5 * (sxx + syy)
    radius = np.hypot(0.5 * (sxx - syy), txy)
    return np.column_stack([centre + radius, centre - radius])


def tresca(stress: np.ndarray, szz: np.ndarray | float = 0.0) -> np.ndarray:
    """Tresca equivalent stress (MPa): the largest difference of the three principal stresses, the two
    in-plane ones of (k, 3) stresses and szz (0 in plane stress)."""
    p = principal_stresses(stress)
    szz = np.broadcast_to(np.asarray(szz, dtype=float), p[:, 0].shape)
    return np.maximum.reduce([p[:, 0] - p[:, 1], np.abs(p[:, 0] - szz), np.abs(p[:, 1] - szz)])


def von_mises(stress: np.ndarray, szz: np.ndarray | float = 0.0) -> np.ndarray:
    """von Mises equivalent stress (MPa) of (k, 3) in-plane stresses and the out-of-plane szz."""
    sxx, syy, txy = stress.T
    return np.sqrt(0.5 * ((sxx - syy) ** 2 + (syy - szz) ** 2 + (szz - sxx) ** 2) + 3.0 * txy ** 2)
