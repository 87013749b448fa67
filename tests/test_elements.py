"""The constant-strain triangle: constitutive matrices, patch test, and an independent cross-check of
the assembled stiffness against scikit-fem on the same mesh."""

from __future__ import annotations

import numpy as np
import pytest

from stressraiser.fem.assembly import element_stresses, stiffness_matrix, strain_displacement
from stressraiser.fem.elasticity import plane_strain_matrix, plane_stress_matrix
from stressraiser.fem.loads import edge_forces
from stressraiser.fem.solve import solve_constrained
from stressraiser.geometry.meshing import mesh_part

from conftest import plate_with_hole


def test_plane_stress_matrix_closed_form():
    # Closed form of the plane-stress elasticity matrix, e.g. Timoshenko & Goodier, Theory of
    # Elasticity, 3rd ed., Hooke's law with szz = 0 (from memory); checked entry by entry.
    E, nu = 70000.0, 0.33
    D = plane_stress_matrix(E, nu)
    c = E / (1 - nu ** 2)
    expected = np.array([[c, c * nu, 0], [c * nu, c, 0], [0, 0, E / (2 * (1 + nu))]])
    np.testing.assert_allclose(D, expected, rtol=1e-14)


def test_plane_strain_matrix_inverts_hooke():
    # Plane strain: applying D to the strains of Hooke's law for a known stress with
    # szz = nu (sxx + syy) returns that stress (Hooke's law, common practice).
    E, nu = 200000.0, 0.28
    s = np.array([120.0, -40.0, 35.0])
    szz = nu * (s[0] + s[1])
    exx = (s[0] - nu * (s[1] + szz)) / E
    eyy = (s[1] - nu * (s[0] + szz)) / E
    gxy = 2 * (1 + nu) / E * s[2]
    np.testing.assert_allclose(plane_strain_matrix(E, nu) @ [exx, eyy, gxy], s, rtol=1e-12)


def _irregular_square(n=9, seed=3):
    """Nodes on a jittered grid over [0, 10]^2 and a Delaunay-like split of each cell."""
    rng = np.random.default_rng(seed)
    g = np.linspace(0.0, 10.0, n)
    X, Y = np.meshgrid(g, g)
    nodes = np.column_stack([X.ravel(), Y.ravel()])
    interior = (nodes[:, 0] > 0) & (nodes[:, 0] < 10) & (nodes[:, 1] > 0) & (nodes[:, 1] < 10)
    nodes[interior] += rng.uniform(-0.35, 0.35, size=(interior.sum(), 2)) * (10.0 / (n - 1))
    tris = []
    for j in range(n - 1):
        for i in range(n - 1):
            a, b, c, d = j * n + i, j * n + i + 1, (j + 1) * n + i + 1, (j + 1) * n + i
            tris += [[a, b, c], [a, c, d]] if (i + j) % 2 else [[a, b, d], [b, c, d]]
    return nodes, np.array(tris, dtype=np.int32)


def test_patch_test_uniform_stress_is_exact():
    # Patch test (B. M. Irons; O. C. Zienkiewicz and R. L. Taylor, The Finite Element Method, vol. 1):
    # displacements prescribed on the boundary from a linear field must give that field's constant
    # stress in every element, to round-off, on an irregular mesh.
    nodes, tris = _irregular_square()
    D = plane_stress_matrix(210000.0, 0.3)
    a = np.array([[1e-3, 4e-4], [-2e-4, -5e-4]])  # u = a @ x
    u_exact = (nodes @ a.T).ravel()
    K = stiffness_matrix(nodes, tris, D, 2.0)
    boundary = np.flatnonzero((nodes[:, 0] % 10 == 0) | (nodes[:, 1] % 10 == 0))
    fixed = np.sort(np.concatenate([2 * boundary, 2 * boundary + 1]))
    free = np.setdiff1d(np.arange(K.shape[0]), fixed)
    rhs = -K[free][:, fixed] @ u_exact[fixed]
    u = u_exact.copy()
    u[free] = 0.0
    import scipy.sparse.linalg as spla
    u[free] = spla.spsolve(K[free][:, free].tocsc(), rhs)
    sigma = element_stresses(nodes, tris, D, u)
    strain = np.array([a[0, 0], a[1, 1], a[0, 1] + a[1, 0]])
    np.testing.assert_allclose(sigma, np.tile(D @ strain, (len(tris), 1)), rtol=0, atol=1e-9 * np.abs(D @ strain).max())


def test_traction_patch_test():
    # The same uniform state reached through tractions: a square pulled by sxx = 50 MPa on x = 10,
    # held in x on x = 0 and at one point in y, has sxx = 50, syy = txy = 0 everywhere (exact solution
    # of uniaxial tension, common practice).
    nodes, tris = _irregular_square()
    D = plane_stress_matrix(210000.0, 0.3)
    K = stiffness_matrix(nodes, tris, D, 1.0)
    right = np.flatnonzero(nodes[:, 0] == 10.0)
    right = right[np.argsort(nodes[right, 1])]
    edges = np.column_stack([right[:-1], right[1:]])
    f = edge_forces(nodes, edges, lambda p: np.column_stack([np.full(len(p), 50.0), np.zeros(len(p))]), 1.0)
    left = np.flatnonzero(nodes[:, 0] == 0.0)
    fixed = np.concatenate([2 * left, [2 * left[0] + 1]])
    u = solve_constrained(K, f, fixed)
    sigma = element_stresses(nodes, tris, D, u)
    np.testing.assert_allclose(sigma, np.tile([50.0, 0.0, 0.0], (len(tris), 1)), atol=1e-9)


def test_strain_displacement_areas_positive():
    nodes, tris = _irregular_square()
    _, area = strain_displacement(nodes, tris)
    assert area.min() > 0
    assert area.sum() == pytest.approx(100.0, rel=1e-12)  # the square's area, 10 x 10 mm


def test_stiffness_matches_scikit_fem():
    # Independent cross-check: scikit-fem's vector P1 linear-elasticity form on the same gmsh mesh
    # must give the same global stiffness to round-off (scikit-fem, skfem.models.elasticity).
    skfem = pytest.importorskip("skfem")
    from skfem.models.elasticity import lame_parameters, linear_elasticity

    spec = plate_with_hole(thickness=1.0)
    mesh = mesh_part(spec, 1.0)
    E, nu = 210000.0, 0.3
    ours = stiffness_matrix(mesh.nodes, mesh.triangles, plane_stress_matrix(E, nu), 1.0)
    basis = skfem.Basis(skfem.MeshTri(mesh.nodes.T.copy(), mesh.triangles.T.copy()), skfem.ElementVector(skfem.ElementTriP1()))
    lam, mu = lame_parameters(E, nu)
    theirs = skfem.asm(linear_elasticity(2 * lam * mu / (lam + 2 * mu), mu), basis)  # plane-stress lambda
    order = np.empty(theirs.shape[0], dtype=int)
    order[0::2], order[1::2] = basis.nodal_dofs[0], basis.nodal_dofs[1]
    diff = abs(ours - theirs[order][:, order]).max()
    assert diff <= 1e-10 * abs(ours).max()
