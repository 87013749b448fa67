"""The solver strategies: multigrid CG, SuperLU and (when the `fast` extra is installed) PARDISO give the
same displacements, a mechanism raises SolverError whichever is used, and the method is recorded in the
result."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from stressraiser.cli.record import check_record
from stressraiser.compare.check import check_part
from stressraiser.fem import solve as solve_module
from stressraiser.fem.assembly import stiffness_matrix
from stressraiser.fem.elasticity import plane_stress_matrix
from stressraiser.fem.loads import part_loads
from stressraiser.fem.solve import SolverError, pardiso_available, solve_system
from stressraiser.fem.supports import part_supports
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RaiserId

from conftest import plate_with_hole, strap

D = plane_stress_matrix(210000.0, 0.3)


@pytest.fixture(scope="module")
def strap_system():
    spec = plate_with_hole()
    mesh = mesh_part(spec, 0.35)  # about 20k DOFs
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, spec.plate.thickness)
    return mesh, K, part_loads(spec, mesh), part_supports(spec, mesh)


@pytest.fixture
def no_pardiso(monkeypatch):
    monkeypatch.setattr(solve_module, "pardiso_available", lambda: False)


@pytest.fixture
def pardiso_everywhere(monkeypatch):
    """PARDISO for systems of any size (auto keeps it for large ones), skipped when it is not installed."""
    if not pardiso_available():
        pytest.skip("the optional PARDISO binding (pypardiso) is not installed")
    monkeypatch.setattr(solve_module, "LARGE_FROM", 0)


def _edge_strain(mesh, u):
    """Tangential strain of every hole-edge segment (the quantity the peak is made from)."""
    e = mesh.edges[RaiserId("hole", 1)]
    chord = mesh.nodes[e[:, 1]] - mesh.nodes[e[:, 0]]
    du = u.reshape(-1, 2)[e[:, 1]] - u.reshape(-1, 2)[e[:, 0]]
    return np.einsum("ij,ij->i", du, chord) / np.einsum("ij,ij->i", chord, chord)


def test_iterative_matches_direct(strap_system, no_pardiso):
    # CG stops at a relative residual of 1e-10 (fem.solve.CG_TOLERANCE); the displacements must then agree
    # with SuperLU's to 1e-7 of the largest displacement and the hole-edge strains (hence the peak) to 1e-6.
    mesh, K, f, fixed = strap_system
    u_direct, direct = solve_system(K, f, fixed, "direct", mesh.nodes)
    u_iter, iterative = solve_system(K, f, fixed, "iterative", mesh.nodes)
    assert (direct.method, iterative.method) == ("superlu", "amg-cg")
    assert 0 < iterative.iterations < 100 and iterative.residual < 1e-9
    assert np.abs(u_iter - u_direct).max() <= 1e-7 * np.abs(u_direct).max()
    strain_d, strain_i = _edge_strain(mesh, u_direct), _edge_strain(mesh, u_iter)
    assert np.abs(strain_i - strain_d).max() <= 1e-6 * np.abs(strain_d).max()


def test_pardiso_matches_superlu(strap_system, pardiso_everywhere, monkeypatch):
    # Two direct factorisations of the same SPD system (PARDISO Cholesky with METIS and block grouping;
    # SuperLU LU with minimum degree): the displacements agree to round-off, and PARDISO repeats its bits.
    mesh, K, f, fixed = strap_system
    u_pardiso, rep = solve_system(K, f, fixed, "direct", mesh.nodes)
    again, _ = solve_system(K, f, fixed, "direct", mesh.nodes)
    monkeypatch.setattr(solve_module, "pardiso_available", lambda: False)
    u_lu, lu = solve_system(K, f, fixed, "direct", mesh.nodes)
    assert (rep.method, lu.method) == ("pardiso", "superlu")
    assert rep.residual < 1e-12
    assert np.abs(u_pardiso - u_lu).max() <= 1e-10 * np.abs(u_lu).max()
    assert np.array_equal(u_pardiso, again)
    assert np.all(u_pardiso[fixed] == 0.0)


def test_pardiso_check_agrees_with_superlu(monkeypatch, pardiso_everywhere):
    # The whole check with PARDISO at every level gives the SuperLU Kt to 1e-9 (round-off of two direct solves).
    spec = plate_with_hole()
    with_pardiso = check_part(spec)
    monkeypatch.setattr(solve_module, "pardiso_available", lambda: False)
    with_superlu = check_part(dataclasses.replace(spec, mesh=dataclasses.replace(spec.mesh, solver="direct")))
    assert {lv.solver for lv in with_pardiso.study.levels} == {"pardiso"}
    assert {lv.solver for lv in with_superlu.study.levels} == {"superlu"}
    assert with_pardiso.kt.net == pytest.approx(with_superlu.kt.net, rel=1e-9)


def test_auto_picks_by_size(monkeypatch):
    large = solve_module.LARGE_FROM
    for installed, large_auto, large_direct in ((False, "amg-cg", "superlu"), (True, "pardiso", "pardiso")):
        monkeypatch.setattr(solve_module, "pardiso_available", lambda installed=installed: installed)
        assert solve_module.choose_method("auto", 1_000) == "superlu"  # small: always SuperLU (same bits everywhere)
        assert solve_module.choose_method("direct", large - 1) == "superlu"
        assert solve_module.choose_method("auto", large) == large_auto
        assert solve_module.choose_method("direct", 10 ** 7) == large_direct
        assert solve_module.choose_method("iterative", 10) == "amg-cg"


@pytest.mark.parametrize("solver", ["direct", "iterative", "pardiso"])
def test_mechanism_raises_solver_error(strap_system, solver, monkeypatch):
    # Held in x only along the end, nothing holds the part in y: a mechanism (rigid translation in y).
    if solver == "pardiso":
        if not pardiso_available():
            pytest.skip("the optional PARDISO binding (pypardiso) is not installed")
        monkeypatch.setattr(solve_module, "LARGE_FROM", 0)
    mesh, K, f, _ = strap_system
    only_x = 2 * mesh.edge_nodes("held")
    with pytest.raises(SolverError, match="mechanism"):
        solve_system(K, f, only_x, "iterative" if solver == "iterative" else "direct", mesh.nodes)


def test_unheld_system_without_coordinates_still_fails_cleanly(strap_system, no_pardiso):
    # Without node coordinates the rotation check is skipped; a part held at one node only must still
    # fail with SolverError (singular factor or a residual far from zero), never return displacements.
    mesh, K, f, _ = strap_system
    node = int(mesh.edge_nodes("held")[0])
    with pytest.raises(SolverError):
        solve_system(K, f, np.array([2 * node, 2 * node + 1]), "direct")


def test_solver_is_recorded_and_results_agree():
    # The same part checked with the direct and the iterative solver: each level records its method, the
    # JSON record carries it, and Kt agrees to 1e-6 (CG to a 1e-10 residual changes no printed digit).
    spec = plate_with_hole()
    results = {}
    for solver in ("direct", "iterative"):
        s = dataclasses.replace(spec, mesh=dataclasses.replace(spec.mesh, solver=solver))
        results[solver] = check_part(s)
    assert {lv.solver for lv in results["iterative"].study.levels} == {"amg-cg"}
    assert {lv.solver for lv in results["direct"].study.levels} <= {"superlu"}
    record = check_record(results["iterative"])
    assert [lv["solver"] for lv in record["mesh"]["levels"]] == ["amg-cg"] * len(results["iterative"].study.levels)
    assert record["mesh"]["solver_setting"] == "iterative"
    assert results["iterative"].kt.net == pytest.approx(results["direct"].kt.net, rel=1e-6)


@pytest.mark.parametrize("key, value, words", [
    ("order", 3, "mesh.order"),
    ("order", "2", "mesh.order"),
    ("solver", "fastest", "mesh.solver"),
])
def test_bad_mesh_options_name_the_key(key, value, words):
    with pytest.raises(PartError, match=words):
        part_from_dict(strap(hole=None, load={"axial": 1000.0}, mesh={key: value}))
