"""In-plane bending and transverse shear of plain bars: the FE against beam theory and the exact
plane-stress solutions, through the part-file loads and the method of sections."""

from __future__ import annotations

import numpy as np
import pytest

from stressraiser.compare.method_of_sections import section_result
from stressraiser.fem.analysis import solve_part
from stressraiser.fem.convergence import LEVEL_RATIO, richardson
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.spec import SectionSpec

E, NU = 210000.0, 0.3


def _bar(length, width, thickness, load, held="x"):
    return part_from_dict({"plate": {"length": length, "width": width, "thickness": thickness},
                           "material": {"E": E, "nu": NU}, "load": load, "support": {"held": held}})


def _cut(spec, solution, x):
    return section_result(spec, solution, SectionSpec((x, 0.0), (1.0, 0.0), f"x = {x:g}"))


@pytest.mark.parametrize("held", ["x", "clamped"])
def test_pure_bending_matches_my_over_i(held):
    L, W, t, M = 240.0, 40.0, 5.0, 4.0e5
    spec = _bar(L, W, t, {"bending": M}, held)
    solution = solve_part(spec, mesh_part(spec, 0.5))
    inertia = t * W ** 3 / 12.0
    edge = M * (W / 2) / inertia
    for x in (-60.0, 0.0, 60.0):  # away from both ends (Saint-Venant: more than a width from them)
        cut = _cut(spec, solution, x)
        expected = M * cut.cut.positions / inertia
        # Pure bending of a plane-stress beam: s_xx = M y / I exactly (S. P. Timoshenko and J. N. Goodier,
        # Theory of Elasticity, 3rd ed., art. 22 (from memory); elementary beam theory, common practice)
        assert np.max(np.abs(cut.cut.normal_stress - expected)) <= 0.01 * edge
        # the moment recovered on the cut is the applied moment (statics; common practice)
        assert cut.fe_moment == pytest.approx(M, rel=0.005)
        assert cut.statics.moment == pytest.approx(M, rel=1e-6)
        assert abs(cut.fe_normal_force) <= 0.005 * 6 * M / W and abs(cut.fe_shear_force) <= 0.005 * 6 * M / W


def _tip_deflection(spec, scale):
    mesh = mesh_part(spec, scale)
    solution = solve_part(spec, mesh)
    loaded = mesh.edge_nodes("loaded")
    tip = loaded[np.argmin(np.abs(mesh.nodes[loaded, 1]))]
    return float(solution.displacement[2 * tip + 1]), spec, solution


@pytest.mark.parametrize("held", ["clamped", "x"])
def test_cantilever_tip_deflection_and_shear(held):
    L, W, t, V = 200.0, 40.0, 5.0, 1000.0
    spec = _bar(L, W, t, {"shear": V}, held)
    inertia, area, G = t * W ** 3 / 12.0, W * t, E / (2 * (1 + NU))
    # Timoshenko beam with shear deformation, shear coefficient 5/6 for a rectangle: tip deflection
    # V L^3 / (3 E I) + V L / (k G A) (S. P. Timoshenko, Phil. Mag. 41, 1921; J. M. Gere and S. P.
    # Timoshenko, Mechanics of Materials (from memory); k = 5/6 common practice)
    expected = V * L ** 3 / (3 * E * inertia) + V * L / (5.0 / 6.0 * G * area)
    runs = [_tip_deflection(spec, LEVEL_RATIO ** -k) for k in (1, 2, 3)]
    estimate = richardson([r[0] for r in runs])
    assert estimate.value == pytest.approx(expected, rel=0.02)
    _, spec, finest = runs[-1]
    for x in (-40.0, 0.0, 40.0):
        cut = _cut(spec, finest, x)
        # statics of the free end: V on every cut is the applied shear, M = -V (L/2 - x) (common practice)
        assert cut.fe_shear_force == pytest.approx(V, rel=0.005)
        assert cut.statics.moment == pytest.approx(-V * (L / 2 - x), rel=1e-6)
        assert cut.fe_moment == pytest.approx(-V * (L / 2 - x), rel=0.005)
