"""Quadratic (6-node) triangles: the patch test for a quadratic displacement field, consistent loads on
3-node edges, and convergence of the hole-edge peak to Kirsch's value."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from stressraiser.fem.analysis import recover_nodal
from stressraiser.fem.convergence import LEVEL_RATIO, richardson
from stressraiser.fem.elasticity import plane_stress_matrix
from stressraiser.fem.quadratic import SAMPLE_POINTS, quadratic_edge_forces, quadratic_stiffness, stresses_at
from stressraiser.fem.solve import solve_constrained
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.quadratic import sub_triangles
from stressraiser.geometry.registry import RaiserId

from analytic import kirsch_stress
from conftest import plate_with_hole

E, NU = 210000.0, 0.3
D = plane_stress_matrix(E, NU)


def _quadratic_square(n=6, seed=5):
    """A 10 x 10 mm square of straight-sided 6-node triangles with jittered interior corners."""
    rng = np.random.default_rng(seed)
    g = np.linspace(0.0, 10.0, 2 * n + 1)
    X, Y = np.meshgrid(g, g)
    nodes = np.column_stack([X.ravel(), Y.ravel()])
    k = 2 * n + 1
    corner = lambda i, j: j * k + i  # noqa: E731
    interior = [(i, j) for j in range(2, 2 * n, 2) for i in range(2, 2 * n, 2)]
    for i, j in interior:
        nodes[corner(i, j)] += rng.uniform(-0.3, 0.3, 2) * (10.0 / n)
    tri6 = []
    for j in range(0, 2 * n, 2):
        for i in range(0, 2 * n, 2):
            a, b, c, d = corner(i, j), corner(i + 2, j), corner(i + 2, j + 2), corner(i, j + 2)
            tri6.append([a, b, c, corner(i + 1, j), corner(i + 2, j + 1), corner(i + 1, j + 1)])
            tri6.append([a, c, d, corner(i + 1, j + 1), corner(i + 1, j + 2), corner(i, j + 1)])
    tri6 = np.array(tri6, dtype=np.int32)
    # mid-side nodes at the middle of the (straight) edges between the jittered corners
    for e in tri6:
        for m, (p, q) in zip(e[3:], ((e[0], e[1]), (e[1], e[2]), (e[2], e[0]))):
            nodes[m] = 0.5 * (nodes[p] + nodes[q])
    return nodes, tri6


def _bending_field(kappa=2e-4, shift=(1e-3, -2e-3), tilt=3e-4):
    """Pure in-plane bending of a plane-stress plate plus a rigid motion: u = -k x y + ..., v = k/2 (x^2 +
    nu y^2) + ...; stress sxx = -E k y, syy = txy = 0, which satisfies equilibrium with no body force
    (Timoshenko & Goodier, Theory of Elasticity, 3rd ed., pure bending of a beam, from memory)."""
    def u(p):
        x, y = p[:, 0], p[:, 1]
        return np.column_stack([-kappa * x * y + shift[0] - tilt * y, 0.5 * kappa * (x * x + NU * y * y) + shift[1] + tilt * x])

    def stress(p):
        return np.column_stack([-E * kappa * p[:, 1], np.zeros(len(p)), np.zeros(len(p))])

    return u, stress


def test_patch_test_quadratic_displacement_is_exact():
    # Patch test (B. M. Irons; Zienkiewicz & Taylor, The Finite Element Method, vol. 1): with the boundary
    # nodes moved by an equilibrated quadratic field, a 6-node mesh must reproduce the field at every
    # interior node and its linear stress at every sample point, to round-off.
    nodes, tri6 = _quadratic_square()
    field, stress = _bending_field()
    u_exact = field(nodes).ravel()
    K = quadratic_stiffness(nodes, tri6, D, 2.0)
    on_edge = np.flatnonzero((np.abs(nodes % 10.0) < 1e-12).any(axis=1) | (np.abs(nodes - 10.0) < 1e-12).any(axis=1))
    fixed = np.sort(np.concatenate([2 * on_edge, 2 * on_edge + 1]))
    free = np.setdiff1d(np.arange(K.shape[0]), fixed)
    import scipy.sparse.linalg as spla
    u = u_exact.copy()
    u[free] = spla.spsolve(K[free][:, free].tocsc(), -K[free][:, fixed] @ u_exact[fixed])
    np.testing.assert_allclose(u, u_exact, rtol=0, atol=1e-12 * np.abs(u_exact).max())
    sampled = stresses_at(nodes, tri6, D, u, SAMPLE_POINTS).reshape(-1, 3)
    centroids = nodes[sub_triangles(tri6)].mean(axis=1)  # straight sides: sample points are these centroids
    np.testing.assert_allclose(sampled, stress(centroids), rtol=0, atol=1e-8 * E * 2e-4 * 10)


def test_traction_patch_test_with_three_node_edges():
    # The same bending reached through consistent loads on 3-node edges: the linear traction sxx = -E k y
    # on both ends (a couple), supports only against rigid-body motion; the stress must be exact
    # (pure bending, Timoshenko & Goodier, from memory).
    nodes, tri6 = _quadratic_square()
    kappa = 2e-4
    K = quadratic_stiffness(nodes, tri6, D, 1.0)

    def end_edges(x):
        on = np.flatnonzero(np.abs(nodes[:, 0] - x) < 1e-12)
        on = on[np.argsort(nodes[on, 1])]
        return np.column_stack([on[:-2:2], on[2::2], on[1:-1:2]])  # (end, end, middle)

    right = quadratic_edge_forces(nodes, end_edges(10.0), lambda p: np.column_stack([-E * kappa * (p[:, 1] - 5.0), 0 * p[:, 1]]), 1.0)
    left = quadratic_edge_forces(nodes, end_edges(0.0), lambda p: np.column_stack([E * kappa * (p[:, 1] - 5.0), 0 * p[:, 1]]), 1.0)
    origin = int(np.argmin(np.hypot(nodes[:, 0], nodes[:, 1] - 5.0)))
    top = int(np.argmin(np.hypot(nodes[:, 0], nodes[:, 1] - 10.0)))
    u = solve_constrained(K, left + right, np.array([2 * origin, 2 * origin + 1, 2 * top]), nodes=nodes)
    sampled = stresses_at(nodes, tri6, D, u, SAMPLE_POINTS).reshape(-1, 3)
    centroids = nodes[sub_triangles(tri6)].mean(axis=1)
    expected = np.column_stack([-E * kappa * (centroids[:, 1] - 5.0), np.zeros(len(centroids)), np.zeros(len(centroids))])
    np.testing.assert_allclose(sampled, expected, rtol=0, atol=1e-7 * E * kappa * 5.0)


def test_curved_edge_length_and_loads():
    # A 6-node mesh's curved hole edges follow the circle: the consistent forces of a unit radial pressure
    # over the whole hole sum to zero, and their sum along +x over the right half is 2 r t (the projected
    # area, common practice), to the accuracy of a parabola through three points of each arc.
    spec = plate_with_hole(length=160.0, width=160.0, thickness=2.0, holes=((0.0, 0.0, 16.0),))
    spec = dataclasses.replace(spec, mesh=dataclasses.replace(spec.mesh, order=2))
    mesh = mesh_part(spec, 1.0)
    edges3 = mesh.quadratic_edges[RaiserId("hole", 1)]
    outward = lambda p: -p / np.linalg.norm(p, axis=1)[:, None]  # noqa: E731 - pressure pushes away from the centre
    f = quadratic_edge_forces(mesh.nodes, edges3, lambda p: -outward(p), 2.0)
    assert abs(f[0::2].sum()) < 1e-9 and abs(f[1::2].sum()) < 1e-9
    right = edges3[(mesh.nodes[edges3[:, 2], 0] > 0)]
    fr = quadratic_edge_forces(mesh.nodes, right, lambda p: -outward(p), 2.0)
    assert fr[0::2].sum() == pytest.approx(2 * 8.0 * 2.0, rel=1e-4)


def _kirsch_peak_t6(scale):
    half, a = 80.0, 8.0
    spec = plate_with_hole(length=2 * half, width=2 * half, thickness=1.0, holes=((0.0, 0.0, 2 * a),))
    spec = dataclasses.replace(spec, mesh=dataclasses.replace(spec.mesh, order=2))
    mesh = mesh_part(spec, scale)
    K = quadratic_stiffness(mesh.nodes, mesh.quadratic, D, 1.0)

    def traction(outward):
        def t(p):
            s, n = kirsch_stress(p, a), outward(p)
            return np.column_stack([s[:, 0] * n[:, 0] + s[:, 2] * n[:, 1], s[:, 2] * n[:, 0] + s[:, 1] * n[:, 1]])
        return t

    normals = {"held": lambda p: np.tile([-1.0, 0.0], (len(p), 1)), "loaded": lambda p: np.tile([1.0, 0.0], (len(p), 1)),
               "side": lambda p: np.column_stack([np.zeros(len(p)), np.sign(p[:, 1])])}
    f = sum(quadratic_edge_forces(mesh.nodes, mesh.quadratic_edges[k], traction(n), 1.0) for k, n in normals.items())
    held, loaded = mesh.edge_nodes("held"), mesh.edge_nodes("loaded")
    p = held[np.argmin(np.abs(mesh.nodes[held, 1]))]
    q = loaded[np.argmin(np.abs(mesh.nodes[loaded, 1]))]
    u = solve_constrained(K, f, np.array([2 * p, 2 * p + 1, 2 * q + 1]), nodes=mesh.nodes)
    from stressraiser.fem.quadratic import sub_triangle_stresses
    nodal = recover_nodal(mesh, sub_triangle_stresses(mesh.nodes, mesh.quadratic, D, u), u, E)
    hole = mesh.edge_nodes(RaiserId("hole", 1))
    top = hole[np.argmax(mesh.nodes[hole, 1])]
    return nodal[top, 0]  # s_xx = s_tt at (0, a)


def test_kirsch_peak_converges_with_quadratic_triangles():
    # Kirsch (1898; Timoshenko & Goodier, 3rd ed., from memory): s_tt = 3 x remote at the hole edge at 90
    # degrees. Three 6-node levels refined by LEVEL_RATIO: each within 0.5 %, the errors shrinking, and the
    # extrapolated peak within 0.1 %.
    peaks = [_kirsch_peak_t6(s) for s in (1.0, 1.0 / LEVEL_RATIO, 0.5)]
    errors = [abs(p / 3.0 - 1.0) for p in peaks]
    assert max(errors) < 0.005
    assert errors[2] < errors[0]
    assert richardson(peaks).value == pytest.approx(3.0, rel=1e-3)
