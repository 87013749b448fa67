"""Loads and supports on the part's own boundary against published plane-stress solutions and statics.

Sources (docs/references.md): [Lame] the thick ring under internal pressure; [Howland] the strip with a
central hole in tension; [Practice] statics of a free body (the method of sections)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from stressraiser.compare.check import check_part, edge_section, net_section, section_nominals
from stressraiser.compare.edge_cut import EDGE_NORMAL, edge_cut
from stressraiser.compare.nominal import section_properties
from stressraiser.fem.analysis import solve_part
from stressraiser.geometry.kinds.base import across as across_load
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import part_from_dict

STEEL = {"E": 200000.0, "nu": 0.3}


def lame_hoop(p: float, a: float, b: float, r: float) -> float:
    """Hoop stress (MPa) at radius r of a ring of radii a < b under internal pressure p, free outside:
    p a^2 / (b^2 - a^2) (1 + b^2 / r^2) (docs/references.md [Lame])."""
    return p * a * a / (b * b - a * a) * (1.0 + b * b / (r * r))


def test_pressure_in_a_hole_gives_the_lame_hoop_stress():
    # A square plate of half-side b with a central hole of radius a = b / 20 under internal pressure p,
    # a quarter modelled with rollers on the two symmetry lines, the pressure given as a [[load.edge]] on
    # the hole's edge. The square lies between its inscribed ring (outer radius b) and its circumscribed
    # one (b sqrt 2), whose Lame hoop stresses at the bore differ by 0.25 %; the FE must agree with the
    # inscribed ring's within 0.5 % at the bore and 1 % out to three radii (the published solution's
    # tolerance for a converged analytic comparison, docs/references.md).
    p, a, b = 100.0, 10.0, 200.0
    spec = part_from_dict({"plate": {"length": 2 * b, "width": 2 * b, "thickness": 1.0},
                           "hole": [{"center": [0.0, 0.0], "diameter": 2 * a}], "material": STEEL,
                           "support": {"symmetry": ["x", "y"]}, "load": {"edge": [{"at": [a, 0.0], "pressure": p}]},
                           "mesh": {"tolerance": 0.002}})
    result = check_part(spec)
    assert result.kt.converged
    assert result.peak.stress == pytest.approx(lame_hoop(p, a, b, a), rel=0.005)  # [Lame]
    assert lame_hoop(p, a, b * math.sqrt(2.0), a) * 0.995 < result.peak.stress < lame_hoop(p, a, b, a) * 1.005
    # the cut normal to the bore runs along a radius and carries the hoop stress: Lame's profile along it
    cut = result.net_section.cut
    assert result.net_section.kind == EDGE_NORMAL
    for r in (1.5 * a, 2.0 * a, 3.0 * a):
        assert np.interp(r - a, cut.positions, cut.normal_stress) == pytest.approx(lame_hoop(p, a, b, r), rel=0.01)
    # statics: the pressure's pull across the cut is p 2a t; the FE carries it to 0.5 % ([Practice])
    assert result.net_section.result.statics.normal_force == pytest.approx(p * 2 * a, rel=1e-6)
    assert abs(result.net_section.equilibrium_error) < 0.005


def _strip(load: dict, hold: list | None, support: dict | None = None, tolerance: float = 0.005) -> dict:
    part = {"plate": {"length": 300.0, "width": 50.0, "thickness": 5.0},
            "hole": [{"center": [0.0, 0.0], "diameter": 15.0}], "material": STEEL, "load": load,
            "mesh": {"tolerance": tolerance}}
    if hold is not None:
        part["hold"] = hold
    if support is not None:
        part["support"] = support
    return part


def test_strip_held_and_pulled_on_its_ends_gives_howland():
    # The strip with a central hole (d/W = 0.3) held by a roller on its left end and pulled by a uniform
    # force on its right end, both through the new keys (half model about y = 0): Howland's gross Kt at
    # d/W = 0.3 is 3.36, tolerance 1 % (docs/references.md [Howland]).
    part = _strip({"edge": [{"at": [150.0, 10.0], "force": 25000.0, "direction": 0.0}]},
                  [{"at": [-150.0, 10.0], "mode": "roller"}], {"symmetry": ["y"]})
    result = check_part(part_from_dict(part))
    assert result.kt.converged and result.net_section.kind == EDGE_NORMAL
    assert result.kt.gross == pytest.approx(3.36, rel=0.01)  # [Howland], d/W = 0.3
    # the cut normal to the hole's edge at its peak is the net section across the load: N / A_net
    assert result.nominal.net.stress == pytest.approx(25000.0 / ((50.0 - 15.0) * 5.0), rel=1e-9)


def test_cut_normal_to_the_edge_equals_the_net_section_for_a_central_hole_in_tension():
    # Same solution, two cuts: the net section across the load through the hole, and the cut normal to
    # the hole's edge at the peak (the top or bottom of the hole, where the edge's normal is across the
    # load). They are the same cut, so the Kt agree to round-off (statics: N / A with no moment).
    spec = part_from_dict(_strip({"axial": 25000.0}, None))
    solution = solve_part(spec, mesh_part(spec, 0.7))
    node = solution.peak_node()
    location = tuple(solution.mesh.nodes[node])
    peak = solution.peak_stress()
    across = net_section(spec, solution, across_load(0.0, 0.0))
    normal = edge_section(spec, solution, edge_cut(spec, location))
    kt_across = peak / section_nominals(spec, peak, across).net.stress
    kt_normal = peak / section_nominals(spec, peak, normal).net.stress
    assert normal.area == pytest.approx(across.area, rel=1e-12)
    assert kt_normal == pytest.approx(kt_across, rel=1e-9)


def test_off_axis_load_cut_normal_to_the_edge_meets_statics():
    # A short plate with an off-centre hole, held by a roller on its left end and a pin in a small hole near
    # it, its right end pulled by a uniform force at 30 degrees. The peak sits on the big hole's lower
    # right, where the cut normal to the edge is oblique. Statics of the free body on the cut's +normal
    # side, written out here (the end force acts at the middle of the right end; when the supports are on
    # that side instead, the load on it is the force's opposite), gives N and M, and N / A + M s / I in the
    # peak's fibre is the nominal ([Practice]: the method of sections; the fibre stress of a straight bar).
    force, angle = 20000.0, math.radians(30.0)
    part = {"plate": {"length": 120.0, "width": 80.0, "thickness": 10.0},
            "hole": [{"center": [10.0, 8.0], "diameter": 34.0}, {"center": [-42.0, 0.0], "diameter": 14.0}],
            "material": STEEL, "hold": [{"at": [-60.0, 0.0], "mode": "roller"}, {"pin": 2}],
            "load": {"edge": [{"at": [60.0, 0.0], "force": force, "direction": 30.0}]}, "mesh": {"tolerance": 0.005}}
    result = check_part(part_from_dict(part))
    ns = result.net_section
    assert ns.kind == EDGE_NORMAL and str(result.peak.feature) == "hole 1" and result.kt.converged
    n = np.asarray(ns.normal)
    assert 0.1 < abs(n[0]) < 0.95  # oblique: neither across nor along the part
    F = force * np.array([math.cos(angle), math.sin(angle)])
    end = np.array([60.0, 0.0])
    arm = end - np.asarray(ns.result.centroid_point)
    moment_of_load = arm[0] * F[1] - arm[1] * F[0]
    loaded_side = (end - np.asarray(ns.point)) @ n > 0.0
    N = F @ n if loaded_side else -F @ n
    M = -moment_of_load if loaded_side else moment_of_load
    assert ns.result.statics.normal_force == pytest.approx(N, rel=1e-6)
    assert ns.result.statics.moment == pytest.approx(M, rel=1e-6, abs=1e-6 * force * 80.0)
    props = section_properties(ns.ligaments, 10.0)
    lig = np.asarray(ns.ligaments)
    centroid = float(np.sum((lig[:, 1] - lig[:, 0]) * lig.mean(axis=1)) / np.sum(lig[:, 1] - lig[:, 0]))
    assert result.nominal.net.stress == pytest.approx(N / props.area + M * (0.0 - centroid) / props.inertia, rel=1e-6)
    # the FE carries those resultants across the cut (method of sections, 0.5 %)
    assert abs(ns.result.normal_error) < 0.005 and abs(ns.result.moment_error) < 0.005


def test_a_roller_round_a_hole_is_the_held_pin_pressed_all_round():
    # Two formulations of one constraint: a [[hold]] roller on the hole's edge (its radial displacement
    # held node by node, fem.supports.skew_transform) and a [[hold]] pin in the hole (a rigid, neat-fit,
    # frictionless pin in contact, fem.contact), with the plate pressed on every side so that the hole
    # bears on the pin all round. With every contact node active the two systems are the same: equal to round-off.
    base = {"plate": {"length": 120.0, "width": 80.0, "thickness": 5.0},
            "hole": [{"center": [0.0, 0.0], "diameter": 20.0}], "material": STEEL,
            "load": {"edge": [{"at": [60.0, 0.0], "pressure": 20.0}, {"at": [-60.0, 0.0], "pressure": 20.0},
                              {"at": [0.0, -40.0], "pressure": 20.0}, {"at": [0.0, 40.0], "pressure": 20.0}]}}
    top = {"from": [5.0, 40.0], "to": [-5.0, 40.0], "mode": "roller"}  # against turning; the loads balance
    roller = part_from_dict({**base, "hold": [{"at": [10.0, 0.0], "mode": "roller"}, top]})
    pinned = part_from_dict({**base, "hold": [{"pin": 1}, top]})
    mesh = mesh_part(roller, 1.0)
    a, b = solve_part(roller, mesh), solve_part(pinned, mesh)
    assert b.held_pins[0].arc[1] - b.held_pins[0].arc[0] > 355.0  # the pin bears all round
    size = np.abs(a.displacement).max()
    assert np.abs(a.displacement - b.displacement).max() <= 1e-9 * size
    # the roller's reactions are the pin's contact forces
    assert np.abs(a.reactions - b.reactions).max() <= 1e-9 * np.abs(a.reactions).max()


def test_statics_between_supports_uses_the_fe_reactions_and_says_so():
    # A bar fixed at both ends under a pressure pad on its top edge: a cut between the supports has
    # supports on both sides, so statics alone cannot share the reactions; the cut uses the FE reactions
    # of its +normal side and says so, and the FE stresses across it meet them ([Practice]).
    part = {"plate": {"length": 300.0, "width": 40.0, "thickness": 10.0}, "material": STEEL,
            "hole": [{"center": [60.0, 0.0], "diameter": 10.0}],
            "hold": [{"at": [-150.0, 0.0]}, {"at": [150.0, 0.0]}],
            "load": {"edge": [{"from": [20.0, 20.0], "to": [-20.0, 20.0], "pressure": 5.0}]},
            "section": [{"x": -80.0}, {"x": 100.0}], "mesh": {"tolerance": 0.02}}
    result = check_part(part_from_dict(part))
    for cut in result.sections:
        assert "cannot share the reactions" in cut.statics.basis
        assert cut.worst_error < 0.005
    # the pad's 4 kN is carried by the two ends: the shear forces on either side sum to it
    assert abs(result.sections[0].statics.shear_force) + abs(result.sections[1].statics.shear_force) == \
        pytest.approx(5.0 * 40.0 * 10.0, rel=1e-3)
