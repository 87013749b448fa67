"""Kirsch's infinite-plate solution: a square with a central hole loaded on its outer edges by the
exact Kirsch tractions must reproduce the whole field, and its hole-edge peak converges to 3 x remote."""

from __future__ import annotations

import numpy as np
import pytest

from stressraiser.fem.analysis import recover_nodal
from stressraiser.fem.assembly import element_stresses, stiffness_matrix
from stressraiser.fem.convergence import LEVEL_RATIO, richardson
from stressraiser.fem.elasticity import plane_stress_matrix
from stressraiser.fem.loads import edge_forces
from stressraiser.fem.solve import solve_constrained
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.registry import RaiserId

from analytic import interpolate_nodal, kirsch_polar, kirsch_stress
from conftest import plate_with_hole

A = 8.0  # hole radius, mm
HALF = 80.0  # half side of the square, mm (10 radii)
D = plane_stress_matrix(210000.0, 0.3)


def _kirsch_traction(outward):
    def traction(p):
        s = kirsch_stress(p, A)
        n = outward(p)
        return np.column_stack([s[:, 0] * n[:, 0] + s[:, 2] * n[:, 1], s[:, 2] * n[:, 0] + s[:, 1] * n[:, 1]])
    return traction


def _solve_kirsch_square(scale):
    spec = plate_with_hole(length=2 * HALF, width=2 * HALF, thickness=1.0, holes=((0.0, 0.0, 2 * A),))
    mesh = mesh_part(spec, scale)
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, 1.0)
    normals = {
        "held": lambda p: np.tile([-1.0, 0.0], (len(p), 1)),
        "loaded": lambda p: np.tile([1.0, 0.0], (len(p), 1)),
        "side": lambda p: np.column_stack([np.zeros(len(p)), np.sign(p[:, 1])]),
    }
    f = sum(edge_forces(mesh.nodes, mesh.edges[name], _kirsch_traction(n), 1.0) for name, n in normals.items())
    held, loaded = mesh.edge_nodes("held"), mesh.edge_nodes("loaded")
    a = held[np.argmin(np.abs(mesh.nodes[held, 1]))]
    b = loaded[np.argmin(np.abs(mesh.nodes[loaded, 1]))]
    u = solve_constrained(K, f, np.array([2 * a, 2 * a + 1, 2 * b + 1]))  # rigid-body modes only
    nodal = recover_nodal(mesh, element_stresses(mesh.nodes, mesh.triangles, D, u), u, 210000.0)
    return mesh, nodal


def test_reference_formula_check_points():
    # Check points of docs/references.md [Kirsch] (Kirsch, from memory): s = 1, a = 1.
    srr, stt, _ = kirsch_polar(2.0, np.pi / 2)
    assert (srr, stt) == pytest.approx((0.28125, 1.21875), abs=5e-6)
    assert kirsch_polar(1.5, np.pi / 3) == pytest.approx((0.32407, 1.12037, -0.56131), abs=5e-6)


def test_field_matches_kirsch_away_from_hole():
    # Kirsch (1898): FE field within 1 % of the remote stress at points away from the hole.
    mesh, nodal = _solve_kirsch_square(0.5)
    rng = np.random.default_rng(7)
    r = rng.uniform(2 * A, 0.8 * HALF, 40)
    t = rng.uniform(-np.pi, np.pi, 40)
    points = np.column_stack([r * np.cos(t), r * np.sin(t)])
    fe = np.array([interpolate_nodal(mesh.nodes, mesh.triangles, nodal, p) for p in points])
    np.testing.assert_allclose(fe, kirsch_stress(points, A), atol=0.01)
    # and the two published check points (r = 2a, 90 deg; r = 1.5a, 60 deg), scaled to a = 8 mm
    for (r_, t_), expected in (((2.0, 90.0), kirsch_polar(2.0, np.pi / 2)), ((1.5, 60.0), kirsch_polar(1.5, np.pi / 3))):
        p = A * r_ * np.array([np.cos(np.radians(t_)), np.sin(np.radians(t_))])
        sxx, syy, txy = interpolate_nodal(mesh.nodes, mesh.triangles, nodal, p)
        c, s = np.cos(np.radians(t_)), np.sin(np.radians(t_))
        srr = sxx * c * c + syy * s * s + 2 * txy * s * c
        stt = sxx * s * s + syy * c * c - 2 * txy * s * c
        assert (srr, stt) == pytest.approx(expected[:2], abs=0.01)


def test_hole_edge_peak_converges_to_three():
    # Kirsch: s_tt on the hole edge at 90 deg is 3 x the remote stress; the extrapolated FE peak of a
    # study refined by LEVEL_RATIO per level must be within 1 %.
    peaks = []
    for level in range(4):
        mesh, nodal = _solve_kirsch_square(LEVEL_RATIO ** -level)
        hole = mesh.edge_nodes(RaiserId("hole", 1))
        peaks.append(nodal[hole, 0].max())
    estimate = richardson(peaks)
    assert estimate.value == pytest.approx(3.0, rel=0.01)
    assert estimate.error < 0.01
    # the finest recovered peak approaches from below: the extrapolation must move towards 3
    assert abs(estimate.value - 3.0) < abs(peaks[-1] - 3.0)
