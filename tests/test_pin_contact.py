"""A rigid, frictionless pin in contact with its hole (fem/contact.py) and the pin-loaded square-ended lug
of the handbook (compare/pin_cases.py).

The lug is the one of compare.pin_cases.build_square_lug: width H = 40 mm, 5 mm thick, the hole one width
from the square free end and five from the held end, a 10 kN pin pulling towards the free end.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from stressraiser.cli.main import main
from stressraiser.compare.case_kt import case_kt
from stressraiser.compare.check import check_part
from stressraiser.compare.pin_cases import build_square_lug, square_lug_kt
from stressraiser.fem.analysis import solve_part
from stressraiser.fem.assembly import stiffness_matrix
from stressraiser.fem.contact import solve_pin_contact
from stressraiser.fem.elasticity import constitutive_matrix
from stressraiser.fem.loads import load_resultant, part_loads, pin_bearing_loads
from stressraiser.fem.supports import part_supports
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import part_from_dict

from conftest import EXAMPLES

P, H, T = 10000.0, 40.0, 5.0


def lug(d_over_h: float, contact: str | None = "rigid", clearance: float | None = None, force: float = P,
        symmetry: tuple[str, ...] = (), tolerance: float = 0.01):
    """The square-ended lug at d/H, its pin model and clearance (mm), force (N) and symmetry planes."""
    part = build_square_lug({"d/H": d_over_h})
    pin = part["load"]["pin"]
    pin["force"] = force
    pin.pop("contact")
    if contact is not None:
        pin["contact"] = contact
    if clearance is not None:
        pin["clearance"] = clearance
    part["support"] = {"symmetry": list(symmetry)}
    part["mesh"] = {"tolerance": tolerance}
    return part_from_dict(part)


@pytest.fixture(scope="module")
def neat_045():
    """The converged check of the lug at d/H = 0.45 with a rigid, neat-fit pin (shared by three tests)."""
    return check_part(lug(0.45))


def _one_level(spec, scale=0.7):
    """Stiffness, loads, supports and mesh of one level of `spec`."""
    mesh = mesh_part(spec, scale)
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, spec.plate.thickness)
    return mesh, K, part_loads(spec, mesh), part_supports(spec, mesh)


# --- (a) the contact solve: equilibrium, no penetration, compressive forces, an independent formulation -----

@pytest.mark.parametrize("clearance", [0.0, 0.02])
def test_contact_forces_balance_the_pin_and_nothing_penetrates(clearance):
    spec = lug(0.45, clearance=clearance)
    mesh, K, f, fixed = _one_level(spec)
    solved = solve_pin_contact(K, f, fixed, spec, mesh)
    hole, lam, on = solved.contact, solved.normal_force, solved.active
    centre = np.asarray(spec.holes[0].center)
    forces = solved.forces.reshape(-1, 2)[hole.nodes]
    # statics of the rigid pin: the contact forces on the part add up to the pin force (here along +x)
    # and, being radial (frictionless), have no moment about the hole's centre - to round-off
    assert forces.sum(axis=0) == pytest.approx([P, 0.0], abs=1e-9 * P)
    arm = mesh.nodes[hole.nodes] - centre
    assert abs(np.sum(arm[:, 0] * forces[:, 1] - arm[:, 1] * forces[:, 0])) <= 1e-9 * P * spec.holes[0].radius
    # a pin pushes, never pulls: every contact force presses the material away from the hole's centre
    assert on.sum() >= 5 and np.all(lam[on] > 0.0) and np.all(lam[~on] == 0.0)
    # no penetration anywhere; the active constraints hold to round-off (exact, not penalty springs)
    scale = float(np.max(np.abs(solved.gap - hole.gap)))
    assert np.all(solved.gap >= -1e-9 * scale)
    assert np.all(np.abs(solved.gap[on]) <= 1e-9 * scale)
    assert solved.passes <= 12


def test_exact_constraints_agree_with_an_independent_penalty_formulation():
    # The same contact set imposed by stiff penalty springs between each contact node's radial
    # displacement and the pin (solved here by scipy's own sparse LU, not fem.solve): the springs leave a
    # penetration of about 1/beta of the node's own deflection, so the two displacement fields agree to
    # that order (penalty method, common practice).
    spec = lug(0.45, clearance=0.02)
    mesh, K, f, fixed = _one_level(spec)
    solved = solve_pin_contact(K, f, fixed, spec, mesh)
    n, hole, on = mesh.n_nodes, solved.contact, solved.active
    beta = 1e7
    nodes, e, g0 = hole.nodes[on], hole.normal[on], hole.gap[on]
    diag = K.diagonal()
    k = beta * (diag[2 * nodes] * e[:, 0] ** 2 + diag[2 * nodes + 1] * e[:, 1] ** 2)
    dofs = np.column_stack([2 * nodes, 2 * nodes + 1, np.full(len(nodes), 2 * n), np.full(len(nodes), 2 * n + 1)])
    v = np.column_stack([e, -e])  # the spring stretches by e . (u_i - U) + g0
    block = k[:, None, None] * v[:, :, None] * v[:, None, :]
    springs = sp.coo_matrix((block.ravel(), (np.repeat(dofs, 4, axis=1).ravel(), np.tile(dofs, (1, 4)).ravel())),
                            shape=(2 * n + 2, 2 * n + 2))
    A = sp.block_diag([K, sp.csr_matrix((2, 2))]) + springs
    b = np.concatenate([f, [P, 0.0]])
    np.add.at(b, dofs.ravel(), (-(k * g0)[:, None] * v).ravel())
    free = np.setdiff1d(np.arange(2 * n + 2), fixed)
    u = np.zeros(2 * n + 2)
    u[free] = spla.spsolve(A.tocsc()[free][:, free], b[free])
    size = np.max(np.abs(solved.displacement))
    assert np.max(np.abs(u[:2 * n] - solved.displacement)) <= 1e-4 * size
    assert u[2 * n:] == pytest.approx(solved.fasteners[0].displacement, abs=1e-4 * size)


# --- (b) the neat-fit rigid pin against the handbook's lug fit -------------------------------------------

# FE / fit - 1 measured by this project at mesh.tolerance 0.01 (0.005 and 0.003 move it by at most 2.3 %):
# the rigid, neat-fit pin reads below the fit at every geometry
MEASURED_BELOW_FIT = {0.3: -0.08, 0.45: -0.08, 0.6: -0.20}
# at d/H = 0.3 the tensile peak sits beside the contact arc's edge and converges slowly (observed order about
# 0.6 from level 6 to 9, measured: 245.9, 246.7, 247.4, 247.9 MPa), so Roache's band with Fs 3 cannot reach
# 1 % in six levels; the comparison is held at 3 % anyway
TOLERANCE = {0.3: 0.03, 0.45: 0.01, 0.6: 0.01}


@pytest.mark.parametrize("x", sorted(MEASURED_BELOW_FIT))
def test_neat_fit_rigid_pin_against_the_recalled_lug_fit(x, neat_045):
    result = neat_045 if x == 0.45 else check_part(lug(x, tolerance=TOLERANCE[x]))
    match = result.handbook[0]
    assert match.case.key == "pin-loaded-square-lug" and match.in_range
    assert result.kt.converged and result.peak.stress > 0.0  # the tensile peak at the hole's side governs
    fit = square_lug_kt({"d/H": x})
    below = result.kt.net / fit - 1.0
    # Pilkey & Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), ch. 5, square-ended lug with
    # a closely fitting pin, c/H >= 1, fit of Frocht & Hill's photoelastic data (from memory). Peterson notes
    # that pin clearance raises Kt strongly and the photoelastic pins had some, so a neat fit must read
    # below the fit; by how much is this project's measurement (MEASURED_BELOW_FIT), held within 3 % (the
    # FE's own band is under 1 %; the rest covers the mesh levels a tolerance change picks). It is not
    # the fit's 3-5 % scatter: the neat-fit idealisation is not the experiment.
    assert below < 0.0
    assert below == pytest.approx(MEASURED_BELOW_FIT[x], abs=0.03)
    # the bearing definition: the same peak over P / (d t), so Ktb = Ktn d / (H - d) (definition); the fit's
    # Ktb is formed the same way, so the two definitions stand at the same distance from the fit
    bearing = next(n for n in result.nominal.all if n.key == "bearing")
    assert bearing.stress == pytest.approx(P / (x * H * T))
    assert bearing.kt == pytest.approx(result.kt.net * x / (1.0 - x), rel=1e-9)


# --- (c) clearance ------------------------------------------------------------------------------------------

def test_clearance_raises_kt_and_shrinks_the_contact_arc(neat_045):
    loose = [check_part(lug(0.45, clearance=c)) for c in (0.02, 0.1)]
    # the tensile peak at the hole's side, which the lug's Kt describes (compare/case_kt.py: with much
    # clearance the compressive contact pressure under the pin governs the part's own Kt instead)
    kts = [case_kt(r).kt_net for r in (neat_045, *loose)]
    arcs = [r.solution.contact.arc[1] for r in (neat_045, *loose)]
    # Peterson (Pilkey & Pilkey, 3rd ed., 2008, ch. 5; from memory): clearance raises a lug's Kt; the
    # contact arc of a pin with clearance shrinks from the neat fit's near-half circle (Hertzian contact of
    # conforming cylinders, common practice)
    assert kts[0] < kts[1] < kts[2] and arcs[0] > arcs[1] > arcs[2]
    # measured by this project at 10 kN, E = 200 GPa: +8.5 % and a half-arc of 31 degrees at 0.1 mm
    assert kts[2] / kts[0] - 1.0 == pytest.approx(0.085, abs=0.03)
    assert arcs[2] == pytest.approx(31.0, abs=3.0) and arcs[0] == pytest.approx(88.0, abs=2.0)
    assert all(r.solution.contact.arc[0] == pytest.approx(-r.solution.contact.arc[1], abs=1e-6) for r in loose)


def test_contact_with_clearance_depends_on_load_over_clearance_only():
    # Linear elasticity with a contact gap: doubling both the force and a gap proportional to the clearance
    # doubles every displacement and force, so Kt and the contact arc repeat; doubling the force alone
    # closes more of the gap (homogeneity of the contact problem, common practice). The exact gap between
    # a circle and the pin inside it, s (1 - cos a) + s^2 sin^2 a / (2 r) + ..., departs from
    # proportionality by at most c/d of itself (s = c/2, r = d/2; fem.fastener_groups.initial_gap), so Kt repeats
    # to that order: 0.04 / 18 here.
    def one_level(force, clearance):
        spec = lug(0.45, clearance=clearance, force=force)
        solution = solve_part(spec, mesh_part(spec, 0.7))
        return solution.peak_stress() / force, solution.contact.arc[1]

    base, doubled, heavier = one_level(P, 0.02), one_level(2 * P, 0.04), one_level(2 * P, 0.02)
    assert doubled[0] == pytest.approx(base[0], rel=0.04 / 18.0) and doubled[1] == pytest.approx(base[1], abs=1e-9)
    assert heavier[0] < base[0] and heavier[1] > base[1]


# --- (d) the cosine model is unchanged ------------------------------------------------------------------------

def test_cosine_model_is_unchanged_and_its_pressure_carries_the_pin_force():
    omitted, cosine = lug(0.3, contact=None, tolerance=0.02), lug(0.3, contact="cosine", tolerance=0.02)
    assert omitted.load.pin.contact == "cosine" and omitted == cosine
    # the cosine pressure p0 cos(a - phi), p0 = 4 P / (pi d t), over the loaded half has resultant P
    # (common practice; integrated exactly over the hole's arc, and as the mesh's nodal forces)
    fx, fy, mz = load_resultant(pin_bearing_loads(cosine)[0], T, about=cosine.holes[0].center)
    assert (fx, fy, mz) == pytest.approx((P, 0.0, 0.0), abs=1e-9 * P)
    mesh = mesh_part(cosine, 0.7)
    f = part_loads(cosine, mesh)
    assert (f[0::2].sum(), f[1::2].sum()) == pytest.approx((P, 0.0), abs=1e-9 * P)
    first, second = check_part(omitted), check_part(cosine)
    assert second.kt.net == first.kt.net and second.solution.contact is None  # bit for bit
    assert np.array_equal(first.solution.nodal_stress, second.solution.nodal_stress)


# --- (e) symmetric models -----------------------------------------------------------------------------------

def test_half_model_matches_the_full_model(neat_045):
    half = check_part(lug(0.45, symmetry=("y",)))
    # a part, pin and load symmetric about y = 0: the half model with rollers on the plane is the same
    # problem (common practice), so the converged Kt agree within their bands and the arcs match
    band = max(neat_045.kt.error + half.kt.error, 0.005)
    assert half.kt.net == pytest.approx(neat_045.kt.net, rel=band)
    assert half.solution.contact.arc == pytest.approx(neat_045.solution.contact.arc, abs=0.5)
    assert half.solution.contact.forces.sum(axis=0) == pytest.approx([P, 0.0], abs=1e-9 * P)
    assert abs(half.net_section.equilibrium_error) < 0.005


def test_mirrored_pin_of_a_link_with_the_plane_x():
    # A link pulled by two equal pins: modelled on x > 0 (its mirror image carries the mirrored pin), and a
    # quarter with y = 0 as well; the two models are the same problem (common practice)
    def link(planes):
        return check_part(part_from_dict({
            "plate": {"length": 300.0, "width": 40.0, "thickness": T},
            "hole": [{"center": [110.0, 0.0], "diameter": 16.0}, {"center": [-110.0, 0.0], "diameter": 16.0}],
            "material": {"E": 200000.0, "nu": 0.3},
            "load": {"pin": {"hole": 1, "force": P, "contact": "rigid"}},
            "support": {"symmetry": planes}, "mesh": {"tolerance": 0.02}, "section": [{"x": 50.0}]}))

    half, quarter = link(["x"]), link(["x", "y"])
    assert quarter.kt.net == pytest.approx(half.kt.net, rel=max(half.kt.error + quarter.kt.error, 0.005))
    for r in (half, quarter):
        contact = r.solution.contact
        # the full part: two pins pulling apart, balanced; each pin's own force is P
        assert contact.forces.sum(axis=0) == pytest.approx([0.0, 0.0], abs=1e-9 * P)
        assert contact.forces[contact.points[:, 0] > 0].sum(axis=0) == pytest.approx([P, 0.0], abs=1e-9 * P)
        assert abs(r.sections[0].normal_error) < 0.005  # statics across the link between the pins


# --- input and output -------------------------------------------------------------------------------------------

@pytest.mark.parametrize("pin, words", [
    ({"contact": "tight"}, "load.pin.contact: 'tight' is not allowed; use one of cosine, rigid"),
    ({"clearance": 0.05}, "load.pin.clearance: applies only with load.pin.contact = \"rigid\""),
    ({"contact": "rigid", "clearance": -0.1}, "load.pin.clearance: must be zero or more"),
    ({"contact": "rigid", "clearance": "5 N"}, "load.pin.clearance"),
    ({"contact": "rigid", "clearance": 2.0}, "load.pin.clearance: 2 mm is not less than 10% of the hole's diameter"),
])
def test_pin_model_mistakes_name_the_key(pin, words):
    part = build_square_lug({"d/H": 0.45})
    part["load"]["pin"].pop("contact")
    part["load"]["pin"].update(pin)
    with pytest.raises(PartError) as err:
        part_from_dict(part)
    assert words in str(err.value) and "\n" not in str(err.value)


def test_bad_pin_model_exits_2_with_one_line(tmp_path, capsys):
    path = tmp_path / "lug.toml"
    path.write_text((EXAMPLES / "gate_hinge_strap.toml").read_text().replace('contact = "rigid"', 'contact = "snug"'))
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err.strip()
    assert err.count("\n") == 0 and "load.pin.contact" in err


def test_summary_and_record_name_the_pin_model(tmp_path, capsys):
    out = tmp_path / "hinge.json"
    assert main(["check", str(EXAMPLES / "gate_hinge_strap.toml"), "--json", str(out)]) == 0
    record = json.loads(out.read_text())
    assert record["part"]["load"]["pin"]["contact"] == "rigid"
    assert record["part"]["load"]["pin"]["clearance"] == pytest.approx(0.1)
    contact = record["pin_contact"]
    assert contact["model"] == "rigid" and contact["passes"] >= 1 and contact["penetration"] < 1e-9
    assert contact["resultant"] == pytest.approx([18000.0, 0.0], abs=1e-6)  # the file's pin force (statics)
    assert 0.0 < contact["arc"][1] < 90.0 and contact["arc"][0] == pytest.approx(-contact["arc"][1])
    printed = capsys.readouterr().out
    assert "Pin model" in printed and "rigid" in printed and "contact arc" in printed
    assert math.isfinite(record["kt"]["net"])
