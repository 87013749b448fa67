"""The solver strategies: multigrid CG, SuperLU and (when installed) CHOLMOD give the same displacements,
a mechanism raises SolverError whichever is used, and the method is recorded in the result."""

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
from stressraiser.fem.solve import SolverError, cholmod_available, solve_system
from stressraiser.fem.supports import part_supports
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import part_from_dict

from conftest import plate_with_hole

D = plane_stress_matrix(210000.0, 0.3)


@pytest.fixture(scope="module")
def strap_system():
    spec = plate_with_hole()
    mesh = mesh_part(spec, 0.35)  # about 20k DOFs
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, spec.plate.thickness)
    return mesh, K, part_loads(spec, mesh), part_supports(spec, mesh)


@pytest.fixture
def no_cholmod(monkeypatch):
    monkeypatch.setattr(solve_module, "cholmod_available", lambda: False)


def _edge_strain(mesh, u):
    """Tangential strain of every hole-edge segment (the quantity the peak is made from)."""
    e = mesh.edges["hole 1"]
    chord = mesh.nodes[e[:, 1]] - mesh.nodes[e[:, 0]]
    du = u.reshape(-1, 2)[e[:, 1]] - u.reshape(-1, 2)[e[:, 0]]
    return np.einsum("ij,ij->i", du, chord) / np.einsum("ij,ij->i", chord, chord)


def test_iterative_matches_direct(strap_system, no_cholmod):
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


def test_cholmod_matches_superlu(strap_system, monkeypatch):
    if not cholmod_available():
        pytest.skip("the optional CHOLMOD binding (scikit-sparse) is not installed")
    mesh, K, f, fixed = strap_system
    u_chol, rep = solve_system(K, f, fixed, "direct", mesh.nodes)
    monkeypatch.setattr(solve_module, "cholmod_available", lambda: False)
    u_lu, _ = solve_system(K, f, fixed, "direct", mesh.nodes)
    assert rep.method == "cholmod"
    assert np.abs(u_chol - u_lu).max() <= 1e-10 * np.abs(u_lu).max()  # two direct solves: round-off apart


def test_auto_picks_by_size(no_cholmod):
    assert solve_module.choose_method("auto", 1_000) == "superlu"
    assert solve_module.choose_method("auto", solve_module.ITERATIVE_FROM) == "amg-cg"
    assert solve_module.choose_method("direct", 10 ** 7) == "superlu"
    assert solve_module.choose_method("iterative", 10) == "amg-cg"


@pytest.mark.parametrize("solver", ["direct", "iterative", "cholmod"])
def test_mechanism_raises_solver_error(strap_system, solver, monkeypatch):
    # Held in x only along the end, nothing holds the part in y: a mechanism (rigid translation in y).
    if solver == "cholmod" and not cholmod_available():
        pytest.skip("the optional CHOLMOD binding (scikit-sparse) is not installed")
    if solver == "direct":
        monkeypatch.setattr(solve_module, "cholmod_available", lambda: False)
    mesh, K, f, _ = strap_system
    only_x = 2 * mesh.edge_nodes("held")
    with pytest.raises(SolverError, match="mechanism"):
        solve_system(K, f, only_x, "iterative" if solver == "iterative" else "direct", mesh.nodes)


def test_unheld_system_without_coordinates_still_fails_cleanly(strap_system, no_cholmod):
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
    assert {lv.solver for lv in results["direct"].study.levels} <= {"superlu", "cholmod"}
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
        part_from_dict({"plate": {"length": 300.0, "width": 80.0, "thickness": 10.0},
                        "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 1000.0}, "mesh": {key: value}})
