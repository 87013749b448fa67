"""Long, thin plates: meshed coarsely far from every raiser, end and cut (geometry/far_field.py), so the
cost hardly grows with the length; a long, slender, properly held part is no mechanism; a solve that
would lose too many digits stops the refinement instead of reporting round-off.

Independent values: Saint-Venant's principle (docs/references.md [Practice]): a raiser a few widths from
every end sees the same field in a long plate as in a short one, so Kt must agree within the band; a
uniform bar under an axial force carries P / A exactly (statics), which constant-strain triangles
represent exactly.
"""

from __future__ import annotations

import numpy as np
import pytest

from stressraiser.compare.check import check_part
from stressraiser.fem import convergence
from stressraiser.fem.assembly import stiffness_matrix
from stressraiser.fem.budget import estimate_elements
from stressraiser.fem.elasticity import constitutive_matrix
from stressraiser.fem.loads import part_loads
from stressraiser.fem.solve import RoundOffError, SolverError, solve_system
from stressraiser.fem.supports import part_supports
from stressraiser.geometry.far_field import far_cuts, far_zones, grown_size_expression
from stressraiser.geometry.meshing import far_size, mesh_part
from stressraiser.geometry.partfile import load_part, part_from_dict

from conftest import EXAMPLES


def strap(length: float, width: float, load: dict, hole: tuple[float, float, float] | None = None,
          max_elements: int = 2_000_000):
    """A steel strap with an optional hole (x, y, d), all mm, N."""
    data = {
        "title": "long strap",
        "plate": {"length": length, "width": width, "thickness": 2.0},
        "material": {"E": 210000.0, "nu": 0.3},
        "load": load,
        "mesh": {"tolerance": 0.01, "max_elements": max_elements},
    }
    if hole is not None:
        data["hole"] = [{"center": [hole[0], hole[1]], "diameter": hole[2]}]
    return part_from_dict(data)


def assert_same_kt(long, short):
    # Saint-Venant (docs/references.md [Practice]): the two must agree within the larger band.
    band = max(long.kt.error, short.kt.error)
    assert long.kt.converged and short.kt.converged
    assert long.kt.net == pytest.approx(short.kt.net, rel=band), (long.kt, short.kt)


def test_a_plate_600_widths_long_checks_like_a_short_one():
    # A 3 mm hole in a 10 mm strap, 6 m long (600 widths): it was "a mechanism" (exit 3, "fix the supports").
    hole = (0.0, 0.0, 3.0)
    long = check_part(strap(6000.0, 10.0, {"axial": 10000.0}, hole))
    short = check_part(strap(60.0, 10.0, {"axial": 10000.0}, hole))
    assert_same_kt(long, short)
    assert [str(w) for w in long.warnings] == []  # no stalled refinement either: the far zones do not refine
    assert long.study.levels[-1].elements < 2 * short.study.levels[-1].elements  # measured 8,612 and 5,626


def test_bending_far_field_is_carried_to_the_raiser():
    # A pure moment is the same on every cut (statics); a hole W/4 off the axis, on the stretched side, in a
    # strap 60 widths long against one 8 widths long (no far zone): the same Kt within the band, although
    # the far zones hold elements as large as the width (constant-strain triangles only approximate the
    # linear stress there; benchmarks/long_plates.py).
    hole = (0.0, 5.0, 4.0)
    long_spec = strap(1200.0, 20.0, {"bending": 2.0e5}, hole)
    assert far_zones(long_spec)
    short_spec = strap(160.0, 20.0, {"bending": 2.0e5}, hole)
    assert not far_zones(short_spec)
    assert_same_kt(check_part(long_spec), check_part(short_spec))


def test_a_plate_10000_by_1_mm_checks_with_a_small_mesh():
    # It sat in gmsh's mesher for over 600 s (1.54 million elements estimated). Now about 40,000 elements
    # (four per width), meshed in pieces; with a 100,000-element limit it checks (a few seconds).
    spec = strap(10000.0, 1.0, {"axial": 100.0}, max_elements=100_000)
    assert estimate_elements(spec) < 50_000
    result = check_part(spec)
    assert result.study.levels[-1].elements < 50_000
    # statics: P / A = 100 N / (1 mm x 2 mm) = 50 MPa everywhere, exact for constant-strain triangles up to
    # round-off, which grows with the slenderness (3e-5 here, at the held end; 3 times less than with the
    # previous uniform far field at 3,000 widths)
    assert result.peak.stress == pytest.approx(50.0, rel=1e-4)


def long_system(length: float, width: float):
    spec = strap(length, width, {"axial": 1000.0})
    mesh = mesh_part(spec, 1.0)
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    return mesh, stiffness_matrix(mesh.nodes, mesh.triangles, D, spec.plate.thickness), part_loads(spec, mesh), part_supports(spec, mesh)


def test_mechanism_check_is_scale_aware():
    # A strap 2,000 widths long held as usual (the end in x, one node in y) is not a mechanism; the axial
    # stretch is P L / (E A) exactly (statics and Hooke's law).
    mesh, K, f, fixed = long_system(2000.0, 1.0)
    u, _ = solve_system(K, f, fixed, "direct", mesh.nodes)
    loaded = mesh.edge_nodes("loaded")
    assert u[2 * loaded].mean() == pytest.approx(1000.0 * 2000.0 / (210000.0 * 2.0), rel=1e-6)
    # ... and the same strap held in x only along its end is still one: nothing holds it in y.
    with pytest.raises(SolverError, match="mechanism"):
        solve_system(K, f, 2 * mesh.edge_nodes("held"), "direct", mesh.nodes)
    # ... and held at one node only, it may still turn about that node.
    node = int(mesh.edge_nodes("held")[0])
    with pytest.raises(SolverError, match="mechanism"):
        solve_system(K, f, np.array([2 * node, 2 * node + 1]), "direct", mesh.nodes)


def test_a_solve_that_amplifies_round_off_too_far_is_refused():
    # Two springs in series along y from a held node, the far one `soft` times as stiff (x DOFs held,
    # decoupled): u = f (1/k1 + 1/k2) exactly, but round-off in K moves u by about 1e-16 x |K| |u| / |f|.
    # At 1e-14 that is 1e-2 of u: refused; at 1e-6 the chain solves to the exact value.
    def chain(soft: float):
        import scipy.sparse as sp

        k1, k2 = 1.0, soft
        K = np.diag([1.0, k1, 1.0, k1 + k2, 1.0, k2])
        K[1, 3] = K[3, 1] = -k1
        K[3, 5] = K[5, 3] = -k2
        return sp.csr_matrix(K), np.array([0.0, 0.0, 0.0, 0.0, 0.0, 1.0]), np.array([0, 1, 2, 4])

    K, f, fixed = chain(1e-6)
    u, _ = solve_system(K, f, fixed, "direct")
    assert u[5] == pytest.approx(1.0 + 1e6, rel=1e-9)
    with pytest.raises(RoundOffError):
        solve_system(*chain(1e-14), "direct")


def test_round_off_on_a_later_level_stops_the_refinement(monkeypatch):
    # Like the memory budget: the levels solved so far are kept and the reason recorded.
    import stressraiser.fem.analysis as analysis

    calls = {"n": 0}
    original = analysis.solve_system

    def solve_then_fail(*args, **kwargs):
        calls["n"] += 1
        if calls["n"] == 3:
            raise RoundOffError("the superlu solve amplified round-off by 1.0e+13")
        return original(*args, **kwargs)

    monkeypatch.setattr(analysis, "solve_system", solve_then_fail)
    (study,), _ = convergence.converge(strap(200.0, 40.0, {"axial": 1000.0}, (0.0, 0.0, 8.0)))
    assert len(study.levels) == 2 and not study.converged and "amplified round-off" in study.stop_reason


@pytest.mark.parametrize("example", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_short_parts_keep_their_meshes(example):
    # No bundled example has a far zone, so each is meshed exactly as before: the same size expression,
    # no cut across it (their Kt and level sizes were compared with the previous version: identical).
    spec = load_part(example)
    far = far_size(spec, 1.0)
    assert far_zones(spec) == () and far_cuts(spec) == ()
    assert grown_size_expression(spec, far) == repr(far)


@pytest.mark.parametrize("widths", [100, 2000])
def test_element_estimate_of_long_plates(widths):
    # The budget's estimate (fem/budget.py) stays within its calibrated band of the actual count, 0.5 to 2.
    spec = strap(widths * 20.0, 20.0, {"axial": 1000.0}, (0.0, 0.0, 6.0))
    ratio = mesh_part(spec, 1.0).n_elements / estimate_elements(spec)
    assert 0.5 <= ratio <= 2.0, ratio
