"""Fastener groups through the part file ([[fasteners]], [[load.fasteners]]): the reader's refusals, and the
sharing the analysis finds against hand methods and an independent spring-chain model (issue 16's acceptance).

Each part is a part-file text read by geometry.partfile.parse_part and solved on one mesh of the study
(fem.convergence.mesh_level, fem.analysis.solve_cases); forces are the fasteners' forces on the part (N).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
import scipy.linalg

from conftest import assert_refused
from stressraiser.compare.check import check_part
from stressraiser.compare.joint_checks import elastic_method
from stressraiser.fem.analysis import solve_cases
from stressraiser.fem.convergence import mesh_level
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import parse_part

STEEL, ALUMINIUM = 210000.0, 70000.0


def holes(centres, diameter):
    return "".join(f"[[hole]]\ncenter = [{x}, {y}]\ndiameter = {diameter}\n" for x, y in centres)


def part(plate, centres, diameter, rest, E=STEEL):
    """Part-file text: a plate (length, width, thickness), holes, a material of modulus E and `rest`."""
    length, width, thickness = plate
    return (f"title = \"fastener test plate\"\n[plate]\nlength = {length}\nwidth = {width}\nthickness = {thickness}\n"
            f"{holes(centres, diameter)}[material]\nE = {E}\nnu = 0.3\nyield = 355.0\nfamily = \"steel\"\n{rest}")


def solved(text, scale=1.0):
    """The part and its first case's Solution on the study's mesh at `scale`."""
    spec = parse_part(text)
    return spec, solve_cases(spec, mesh_level(spec, scale))[0]


def forces(solution, group=None):
    fs = solution.fasteners.fasteners
    return np.array([f.force for f in fs if group is None or f.group == group])


# --- the reader --------------------------------------------------------------------------------------------

ROW2 = [(60.0, -20.0), (60.0, 20.0)]
GROUP = '[[fasteners]]\nname = "g"\nholes = [1, 2]\n'
LOAD = '[load]\n[[load.fasteners]]\ngroup = "g"\nforce = "10 kN"\ndirection = 0.0\n'


def base(groups=GROUP, load=LOAD, extra="", centres=ROW2, diameter=12.0):
    return part((300.0, 100.0, 10.0), centres, diameter, groups + load + extra)


def test_a_group_reads_with_its_fit_and_stiffness():
    spec = parse_part(base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nclearance = 0.2\nshear_planes = 2\n'
                           'stiffness = "60 kN/mm"\n'))
    (g,) = spec.fasteners
    assert (g.holes, g.diameter, g.clearance, g.shear_planes, g.stiffness, g.stiffness_value) == \
        ((1, 2), pytest.approx(11.8), pytest.approx(0.2), 2, "given", pytest.approx(60000.0))
    assert spec.load.kind == "fasteners" and spec.load.fasteners[0].components == pytest.approx((10000.0, 0.0, 0.0))
    vector = parse_part(base(load='[load]\n[[load.fasteners]]\ngroup = "g"\nforce = 5.0\ndirection = [0.0, -2.0]\n'))
    assert vector.load.fasteners[0].direction == pytest.approx(-90.0)
    huth = parse_part(base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nstiffness = "huth"\n[fasteners.huth]\n'
                           'other_thickness = 8.0\nother_modulus = "70 GPa"\nfastener_modulus = "210 GPa"\n'))
    assert huth.fasteners[0].huth.other_modulus == pytest.approx(70000.0)


HELD = '[[fasteners]]\nname = "h"\nholes = [3, 4]\nholds = true\n'
FOUR = ROW2 + [(-60.0, -20.0), (-60.0, 20.0)]


@pytest.mark.parametrize("text, words", [
    (base('[[fasteners]]\nname = "g"\nholes = [1, 3]\n'), ["fasteners 1.holes", "names no hole"]),
    (base(GROUP + '[[fasteners]]\nname = "k"\nholes = [2]\n'), ["fasteners 2.holes", "hole 2", "fasteners 1"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\ndiameter = 12.5\n'), ["fasteners 1.diameter", "larger"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\ndiameter = 11.0\nclearance = 0.5\n'),
     ["fasteners 1.clearance", "must equal"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nclearance = 2.0\n'), ["fasteners 1.clearance", "close fits"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 1]\n'), ["fasteners 1.holes", "twice"]),
    (base('[[fasteners]]\nname = "g"\nholes = []\n'), ["fasteners 1.holes", "list"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nstiffness = "soft"\n'), ["fasteners 1.stiffness", "rigid"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nstiffness = "60 kN"\n'), ["fasteners 1.stiffness", "a force"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nstiffness = "huth"\n'), ["fasteners 1.huth", "missing"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nshear_planes = 3\n'), ["fasteners 1.shear_planes", "1 to 2"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nholds = "yes"\n'), ["fasteners 1.holds", "true"]),
    (base(load='[load]\n[[load.fasteners]]\ngroup = "x"\nforce = 1.0\ndirection = 0.0\n'),
     ["load.fasteners 1.group", "'x'", "'g'"]),
    (base(load='[load]\n[[load.fasteners]]\ngroup = "g"\nforce = 1.0\n'), ["load.fasteners 1.direction", "missing"]),
    (base(load='[load]\n[[load.fasteners]]\ngroup = "g"\n'), ["load.fasteners 1", "both zero"]),
    (base(load='[load]\n[[load.fasteners]]\ngroup = "g"\nforce = -1.0\ndirection = 0.0\n'),
     ["load.fasteners 1.force", "zero or more"]),
    (base(load='[load]\n[[load.fasteners]]\ngroup = "g"\nforce = 1.0\ndirection = [0, 0]\n'),
     ["load.fasteners 1.direction", "vector"]),
    # a group neither loaded nor holding; a load on a holding group; a one-fastener group with a moment
    (base(GROUP + '[[fasteners]]\nname = "k"\nholes = [3, 4]\n', centres=FOUR), ["fasteners 2", "'k'", "neither"]),
    (base(GROUP + HELD, LOAD + '[[load.fasteners]]\ngroup = "h"\nforce = 1.0\ndirection = 0.0\n', centres=FOUR),
     ["load.fasteners 2.group", "holds the part"]),
    (base('[[fasteners]]\nname = "g"\nholes = [1]\n[[fasteners]]\nname = "k"\nholes = [2]\nholds = true\n',
          '[load]\n[[load.fasteners]]\ngroup = "g"\nmoment = 100.0\n'), ["load.fasteners 1.moment", "one-fastener"]),
    # held by nothing but one fastener: it could turn about the pin
    (base('[[fasteners]]\nname = "g"\nholes = [1]\n[[fasteners]]\nname = "k"\nholes = [2]\nholds = true\n'),
     ["hold", "rotation about (60, 20) mm"]),
    # symmetry, a pin in a group's hole, the held end with a holding group
    (base(extra='[support]\nsymmetry = ["y"]\n'), ["fasteners 1", "symmetry"]),
    (base(GROUP + HELD, LOAD, '[support]\nheld = "clamped"\n', centres=FOUR), ["support.held", "fastener groups"]),
    (base(GROUP, '[load]\n[load.pin]\nhole = 1\nforce = 1.0\n'), ["fasteners 1.holes", "takes a pin"]),
    (base(load='[load]\n[load.pin]\nhole = 1\nforce = 1.0\n[[load.fasteners]]\ngroup = "g"\nforce = 1.0\n'
               'direction = 0.0\n'), ["load.pin", "one-fastener group"]),
])
def test_each_mistake_is_one_line_naming_the_key(tmp_path, capsys, text, words):
    assert_refused(tmp_path, capsys, text, words)


def test_holes_of_one_group_must_have_one_diameter():
    text = part((300.0, 100.0, 10.0), [], 0, holes([(60.0, -20.0)], 12.0) + holes([(60.0, 20.0)], 13.0) + GROUP + LOAD)
    with pytest.raises(PartError, match="one diameter"):
        parse_part(text)


# --- equal shares, statics and the rows -------------------------------------------------------------------------

INNER = [(25.0, 25.0), (-25.0, 25.0), (-25.0, -25.0), (25.0, -25.0)]
OUTER = [(70.0, 70.0), (-70.0, 70.0), (-70.0, -70.0), (70.0, -70.0)]
TURN = ('[[fasteners]]\nname = "turn"\nholes = [1, 2, 3, 4]\n[[fasteners]]\nname = "hold"\nholes = [5, 6, 7, 8]\n'
        'holds = true\n[load]\n[[load.fasteners]]\ngroup = "turn"\nmoment = "2 kN m"\n')


def test_a_rotationally_symmetric_group_shares_equally():
    # A square plate held only by four bolts at its corners and turned by a pure moment through four bolts
    # at its centre: part, groups and load map onto themselves under a quarter turn, so every fastener of a
    # group carries the same force (symmetry; common practice) to the discretisation error (measured 0.03 %)
    spec, solution = solved(part((200.0, 200.0, 10.0), INNER + OUTER, 12.0, TURN))
    size = np.linalg.norm(forces(solution), axis=1)
    for group in (size[:4], size[4:]):
        assert group == pytest.approx(np.full(4, group.mean()), rel=1e-3)
    # statics and symmetry: each inner bolt's tangential force M / (4 r) = 2e6 / (4 x 35.36) N, to the small
    # radial part (the elastic method, [Shigley] section 8-12, from memory)
    assert size[:4].mean() == pytest.approx(2.0e6 / (4 * 25.0 * math.sqrt(2.0)), rel=1e-3)


LINK = [(-90.0, -20.0), (-90.0, 20.0), (-60.0, -20.0), (-60.0, 20.0), (40.0, -25.0), (40.0, 25.0)]
LINK_GROUPS = ('[[fasteners]]\nname = "hold"\nholes = [1, 2, 3, 4]\nholds = true\nshear_planes = 2\n'
               '[[fasteners]]\nname = "clevis"\nholes = [5, 6]\ndiameter = 10.0\n'
               '[[fasteners]]\nname = "flange"\nholes = [7, 8, 9]\nstiffness = "huth"\n[fasteners.huth]\n'
               'other_thickness = 8.0\nother_modulus = 210000.0\nfastener_modulus = 210000.0\n'
               '[load]\n[[load.fasteners]]\ngroup = "clevis"\nforce = 15524.17\ndirection = [15000.0, 4000.0]\n'
               'moment = 2.0e5\n[[load.fasteners]]\ngroup = "flange"\nforce = 10816.65\n'
               'direction = [-6000.0, 9000.0]\nmoment = -1.5e5\nabout = [110.0, 30.0]\n')


@pytest.fixture(scope="module")
def link():
    """A link plate held only by a four-bolt group, loaded by a two-bolt group with clearance (force and
    moment) and a three-bolt group with Huth-flexible bolts (force and moment about a point off it)."""
    text = part((240.0, 90.0, 8.0), [], 0, holes(LINK, 10.2) + holes([(85.0, -20.0), (85.0, 0.0), (85.0, 20.0)], 10.0)
                + LINK_GROUPS)
    return solved(text)


def test_fastener_forces_sum_to_each_group_load_to_round_off(link):
    spec, solution = link
    groups = solution.fasteners.groups
    for load, g in zip(spec.load.fasteners, groups[1:]):
        fx, fy, mz = load.components
        f = forces(solution, groups.index(g))
        centre = np.asarray(g.group.point)
        arms = np.array([h.center for h in g.group.holes]) - centre
        size = math.hypot(fx, fy) * np.max(np.linalg.norm(arms, axis=1)) + abs(mz)
        # statics of the rigid connecting member (exact): its fasteners' forces on the plate are its load
        assert f.sum(axis=0) == pytest.approx([fx, fy], abs=1e-9 * math.hypot(fx, fy))
        assert abs(np.sum(arms[:, 0] * f[:, 1] - arms[:, 1] * f[:, 0]) - mz) <= 1e-9 * size
    assert spec.fasteners[2].stiffness == "huth" and groups[2].group.fastener.stiffness_source.startswith("Huth")
    # the holding group reacts the rest: the whole plate balances
    total = forces(solution).sum(axis=0)
    assert total == pytest.approx([0.0, 0.0], abs=1e-9 * 26000.0)


def test_bearing_rows_are_the_hand_calculation(link):
    spec, solution = link
    t = spec.plate.thickness
    for f in solution.fasteners.fasteners:
        g = spec.fasteners[f.group]
        F = math.hypot(*f.force)
        # common practice: bearing F / (d t), average fastener shear F / (n pi d^2 / 4)
        assert f.bearing == pytest.approx(F / (g.diameter * t), rel=1e-12)
        assert f.shear == pytest.approx(F / (g.shear_planes * math.pi * g.diameter ** 2 / 4.0), rel=1e-12)
    assert spec.fasteners[1].clearance == pytest.approx(0.2) and spec.fasteners[1].diameter == pytest.approx(10.0)


SPLICE = [(-150.0, -35.0), (-150.0, 35.0), (-100.0, -35.0), (-100.0, 35.0),
          (100.0, -35.0), (100.0, 35.0), (150.0, -35.0), (150.0, 35.0)]
SPLICE_GROUPS = ('[[fasteners]]\nname = "a"\nholes = [1, 2, 3, 4]\nholds = true\nshear_planes = 2\n'
                 '[[fasteners]]\nname = "b"\nholes = [5, 6, 7, 8]\nshear_planes = 2\n'
                 '[load]\n[[load.fasteners]]\ngroup = "b"\nforce = "120 kN"\ndirection = 0.0\n'
                 '[design]\nyield_factor = 1.5\nfastener_shear_strength = 400.0\n[mesh]\ntolerance = 0.05\n'
                 'max_levels = 3\n')


@pytest.fixture(scope="module")
def splice():
    return check_part(parse_part(part((400.0, 140.0, 10.0), SPLICE, 18.0, SPLICE_GROUPS)))


def test_the_rows_of_a_splice_are_statics_and_hand_calculations(splice):
    joints = splice.joints
    t, d = 10.0, 18.0
    for g in joints.groups:
        assert g.statics_error <= 1e-9
        shares = [f.share for f in g.fasteners]
        assert sum(shares) == pytest.approx(1.0, rel=1e-12)
        mean = np.mean([f.magnitude for f in g.fasteners]) / (d * t)
        assert g.mean_bearing == pytest.approx(mean, rel=1e-12)  # the group's mean bearing F / (d t)
        for f in g.fasteners:
            assert f.bearing == pytest.approx(f.magnitude / (d * t), rel=1e-12)
            assert f.shear == pytest.approx(f.magnitude / (2 * math.pi * d * d / 4.0), rel=1e-12)
            assert f.kt_bearing == pytest.approx(f.peak / g.mean_bearing, rel=1e-12)
            assert f.kt_net == pytest.approx(f.peak / f.net, rel=1e-12)
            # the hand sharing of a concentric group: equal shares of 120 kN (common practice)
            assert np.hypot(*f.hand) == pytest.approx(30000.0, rel=1e-12)
            # spacing over d: the edge 35 mm away, the pitch 50 mm (exact geometry)
            assert f.edge == pytest.approx(35.0 / d, rel=1e-9) and f.pitch == pytest.approx(50.0 / d, rel=1e-9)
        ends = [f for f in g.fasteners if abs(abs(spec_x(f.hole)) - 150.0) < 1e-9]
        inner = [f for f in g.fasteners if abs(abs(spec_x(f.hole)) - 100.0) < 1e-9]
        # statics of the cut through the end holes: no plate load passes them (the plate ends beyond them)
        for f in ends:
            assert abs(f.bypass) <= 1e-6 * 120000.0
        # through the inner holes: the other row's load (the two end bolts') goes by, shared by the two holes
        for f in inner:
            assert f.bypass == pytest.approx(sum(e.magnitude * abs(math.cos(math.radians(e.direction))) for e in ends) / 2,
                                             rel=1e-6)
        # the row nearest the joint carries more than its equal share (common practice)
        assert min(f.magnitude for f in inner) > 30000.0 > max(f.magnitude for f in ends)
    assert len(joints.passes) == len(splice.study.levels) and all(p >= 1 for p in joints.passes)


def spec_x(hole):
    return SPLICE[hole - 1][0]


def test_the_splice_signs_off_its_fasteners(splice):
    check = splice.design.check
    most = max(f.shear for g in splice.joints.groups for f in g.fasteners)
    # the most loaded fastener's average shear against the given shear strength over the yield factor
    assert check.fastener_shear.actual_mpa == pytest.approx(most, rel=1e-12)
    assert check.fastener_shear.allowable_mpa == pytest.approx(400.0 / 1.5, rel=1e-12)
    # its bearing against the default bearing strength 1.5 x yield over the yield factor (common practice)
    top = max(f.bearing for g in splice.joints.groups for f in g.fasteners)
    assert check.bearing.actual_mpa == pytest.approx(top, rel=1e-12)
    assert check.bearing.allowable_mpa == pytest.approx(1.5 * 355.0 / 1.5, rel=1e-12)
    assert check.passes == (check.hand.passes and check.bearing.passes and check.fastener_shear.passes)


# --- a row of four bolts against the spring chain (Tate and Rosenfeld) ---------------------------------------

ROW = {"W": 25.0, "t": 5.0, "d": 8.0, "p": 40.0, "a": 40.0, "P": 10000.0}  # an aluminium lap strap


def strap(bolts, tail, rest):
    """The strap: held at its left end, `bolts` holes at pitch p from a (from the held end), `tail` mm of
    plate beyond the last, one group in the holes."""
    r = ROW
    length = r["a"] + (bolts - 1) * r["p"] + tail
    x0 = -0.5 * length
    centres = [(x0 + r["a"] + i * r["p"], 0.0) for i in range(bolts)]
    numbers = ", ".join(str(i + 1) for i in range(bolts))
    return part((length, r["W"], r["t"]), centres, r["d"], f'[[fasteners]]\nname = "row"\nholes = [{numbers}]\n{rest}',
                ALUMINIUM)


def row_load(force, extra=""):
    return f'[load]\n{extra}[[load.fasteners]]\ngroup = "row"\nforce = {force}\ndirection = 0.0\n'


@pytest.fixture(scope="module")
def hole_compliances():
    """(c_b, c_x, c_h) of one hole in the strap (mm/N), measured through part files on a one-hole strip held at
    its left end, its pin pulled along by F and its right end by T (the load bypassing the hole): the pin
    moves V = a (F + T) / (E A) + c_b F + c_x T and the right end R = (2 a T + a F) / (E A) + c_x' F + c_h T
    beyond the gross strip's stretch; c_x is the mean of c_x and c_x' (equal by reciprocity)."""
    r = ROW
    EA = ALUMINIUM * r["W"] * r["t"]

    def run(T):
        spec, solution = solved(strap(1, r["a"], row_load(r["P"], f"axial = {T}\n" if T else "")))
        pin = solution.fasteners.fasteners[0].displacement[0] - r["a"] * (r["P"] + T) / EA
        end = np.mean(solution.displacement[2 * solution.mesh.edge_nodes("loaded")]) - r["a"] * (r["P"] + 2 * T) / EA
        return pin, end

    (v1, r1), (v2, r2) = run(0.0), run(r["P"])
    return v1 / r["P"], 0.5 * ((v2 - v1) + r1) / r["P"], (r2 - r1) / r["P"]


def spring_chain(stiffness, c_b, c_x, c_h, bolts=4):
    """Bolt forces (N) of the spring-chain model of the lap strap (Tate and Rosenfeld's method, docs/
    references.md [Tate-Rosenfeld]): the strap as axial springs E A / length between the held end and the
    bolts' stations, each bolt a shear spring 1/k (0 when rigid) to the other member (rigid here, as the
    connecting member is); each hole adds c_b under its bolt's force and c_x, c_h under the load bypassing
    it. Unknowns: the bolt forces and the other member's displacement; solved by scipy."""
    r = ROW
    EA = ALUMINIUM * r["W"] * r["t"]
    lengths = [r["a"]] + [r["p"]] * (bolts - 1)
    upper = np.triu(np.ones((bolts, bolts)))
    strict = np.triu(np.ones((bolts, bolts)), 1)
    station = np.zeros((bolts, bolts))
    for i in range(bolts):
        station[i] = (station[i - 1] if i else 0.0) + lengths[i] / EA * upper[i]
        if i:
            station[i] += c_x * np.eye(bolts)[i - 1] + c_h * strict[i - 1]
    bolt = 0.0 if math.isinf(stiffness) else 1.0 / stiffness
    pin = station + (c_b + bolt) * np.eye(bolts) + c_x * strict
    A = np.block([[pin, -np.ones((bolts, 1))], [np.ones((1, bolts)), np.zeros((1, 1))]])
    return scipy.linalg.solve(A, np.concatenate([np.zeros(bolts), [r["P"]]]))[:bolts]


@pytest.mark.parametrize("stiffness, given", [(math.inf, "rigid"), (3.0e4, "30 kN/mm")], ids=["rigid", "flexible"])
def test_a_row_of_four_bolts_matches_the_spring_chain(stiffness, given, hole_compliances):
    # issue 16's acceptance: within 3 % per bolt, stiff and flexible fasteners
    c_b, c_x, c_h = hole_compliances
    spec, solution = solved(strap(4, 3.0 * ROW["d"], f'stiffness = "{given}"\n' + row_load(ROW["P"])))
    fe = forces(solution)[:, 0]
    chain = spring_chain(stiffness, c_b, c_x, c_h)
    assert fe == pytest.approx(chain, rel=0.03)
    assert np.all(np.diff(fe) < 0.0)  # the bolt nearest the held end carries most (common practice)


# --- the elastic method, and the pin as a one-fastener group ------------------------------------------------------

def test_an_eccentric_group_on_a_stiff_plate_approaches_the_elastic_method():
    # Five bolts of a bracket carry a force applied off their centroid into a steel plate clamped at its far
    # end, fasteners 210 x softer than the plate's E t: the elastic method (rigid plate, equal fasteners;
    # [Shigley] section 8-12, from memory) within 2 % of each bolt's force (issue 16's acceptance)
    centres = [(-20.0, -30.0), (-20.0, 30.0), (40.0, -30.0), (40.0, 30.0), (10.0, 0.0)]
    force, at = (3000.0, -20000.0), (100.0, 10.0)
    text = part((240.0, 120.0, 10.0), centres, 12.0,
                '[[fasteners]]\nname = "bracket"\nholes = [1, 2, 3, 4, 5]\nstiffness = "10 kN/mm"\n'
                f'[load]\n[[load.fasteners]]\ngroup = "bracket"\nforce = {math.hypot(*force)!r}\n'
                f'direction = [{force[0]}, {force[1]}]\nabout = [{at[0]}, {at[1]}]\n[support]\nheld = "clamped"\n')
    spec, solution = solved(text)
    expected = elastic_method(np.array(centres), force, 0.0, at)
    error = np.linalg.norm(forces(solution) - expected, axis=1) / np.linalg.norm(expected, axis=1)
    assert np.all(error <= 0.02)


LUG = ('title = "lug"\n[plate]\nlength = 150.0\nwidth = 50.0\nthickness = 8.0\n[[hole]]\ncenter = [50.0, 0.0]\n'
       'diameter = 20.0\n[lug]\nhole = 1\n[material]\nE = 205000.0\nnu = 0.29\n')


def test_a_pin_loaded_lug_is_a_one_fastener_group():
    # The lug's [load.pin] with a rigid neat pin and the same pin as a one-fastener group of the part file
    # are one model (fem.contact): the same contact, forces and hole peak on the same mesh, to round-off
    pin_spec, pin = solved(LUG + '[load.pin]\nhole = 1\nforce = "24 kN"\ncontact = "rigid"\n')
    group_spec = parse_part(LUG + '[[fasteners]]\nname = "pin"\nholes = [1]\n[load]\n[[load.fasteners]]\n'
                                  'group = "pin"\nforce = "24 kN"\ndirection = 0.0\n')
    (group,) = solve_cases(group_spec, pin.mesh)
    assert group.fasteners.fasteners[0].force == pytest.approx([24000.0, 0.0], abs=1e-6)
    assert group.principal[:, 0].max() == pytest.approx(pin.principal[:, 0].max(), rel=1e-9)
    assert group.pressure.max() == pytest.approx(pin.pressure.max(), rel=1e-9)


def test_a_fatigue_cycle_of_fasteners_stays_one_way(tmp_path, capsys):
    # a fastener bears on one side of its hole: a reversed cycle is another load case; with a clearance the
    # contact depends on the load level, so only the 0-1 cycle of the case is the case scaled
    fatigue = '[fatigue]\nmin_fraction = {}\nmax_fraction = 1.0\n'
    assert_refused(tmp_path, capsys, base(extra=fatigue.format(-1.0)), ["fatigue.min_fraction", "one way"])
    clear = base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nclearance = 0.2\n', extra=fatigue.format(0.5))
    assert_refused(tmp_path, capsys, clear, ["fatigue.min_fraction", "clearance"])
    text = base(extra=fatigue.format(0.5)).replace("yield = 355.0", "yield = 355.0\nultimate = 490.0\n"
                                                   "fatigue_strength = 200.0")
    assert parse_part(text).fatigue.min_fraction == 0.5


def test_the_summary_and_the_record_carry_every_fastener(splice):
    import io
    import json

    import jsonschema
    from rich.console import Console

    from stressraiser.cli.record import check_record
    from stressraiser.cli.schema import check_schema
    from stressraiser.cli.summary import print_summary

    record = json.loads(json.dumps(check_record(splice)))
    jsonschema.Draft202012Validator(check_schema()).validate(record)
    rows = [f for g in record["fasteners"]["groups"] for f in g["fasteners"]]
    fe = [f for g in splice.joints.groups for f in g.fasteners]
    assert [r["hole"] for r in rows] == [f.hole for f in fe] == list(range(1, 9))
    assert [r["magnitude"] for r in rows] == [f.magnitude for f in fe]
    assert record["fasteners"]["contact_passes"] == [lv["contact_passes"] for lv in record["mesh"]["levels"]]
    assert record["part"]["load"]["fasteners"][0]["group"] == "b"
    console = Console(width=200, record=True, file=io.StringIO())
    print_summary(splice, console)
    text = console.export_text()
    assert "Fastener group 'a' (holds the part)" in text and "Fastener group 'b' (loads the part)" in text
    assert "Contact passes per mesh level" in text and "understates" in text


def test_every_load_case_loads_its_groups():
    # two [[load]] cases on one stiffness: each case's groups carry that case's load (statics, exact)
    cases = ('[[load]]\nname = "along"\n[[load.fasteners]]\ngroup = "g"\nforce = "10 kN"\ndirection = 0.0\n'
             '[[load]]\nname = "across"\n[[load.fasteners]]\ngroup = "g"\nforce = "4 kN"\ndirection = 90.0\n'
             'moment = "0.1 kN m"\n')
    spec = parse_part(base(load=cases, extra='[support]\nheld = "clamped"\n'))
    along, across = solve_cases(spec, mesh_level(spec, 1.0))
    assert forces(along).sum(axis=0) == pytest.approx([10000.0, 0.0], abs=1e-9 * 10000.0)
    assert forces(across).sum(axis=0) == pytest.approx([0.0, 4000.0], abs=1e-9 * 4000.0)
    arms = np.array(ROW2) - np.mean(ROW2, axis=0)
    f = forces(across)
    assert np.sum(arms[:, 0] * f[:, 1] - arms[:, 1] * f[:, 0]) == pytest.approx(1.0e5, rel=1e-9)


def test_a_square_lug_pinned_by_a_one_fastener_group_is_the_lug_case():
    # the recalled lug chart (compare/pin_cases.py, indicative, with its caution) recognises the lug whose pin
    # is given as a one-fastener group as it does the [load.pin] lug; a moment or a second group is not it
    from stressraiser.compare.handbook import handbook_matches
    from stressraiser.compare.pin_cases import build_square_lug

    lug = build_square_lug({"d/H": 0.4})
    lug["fasteners"] = [{"name": "pin", "holes": [1]}]
    lug["load"] = {"fasteners": [{"group": "pin", "force": 10000.0, "direction": 0.0}]}
    from stressraiser.geometry.partfile import part_from_dict

    (match,) = [m for m in handbook_matches(part_from_dict(lug)) if m.case.key == "pin-loaded-square-lug"]
    assert "one-fastener group" in match.recognised.description and match.recognised.params["d/H"] == 0.4
    lug["load"]["fasteners"][0]["direction"] = 90.0
    assert not [m for m in handbook_matches(part_from_dict(lug)) if m.case.key == "pin-loaded-square-lug"]


def test_the_critical_net_path_is_a_straight_row_of_the_splice(splice):
    # the s^2 / (4 g) rule ([Cochrane], from memory) across a rectangular pattern: a straight row of two holes,
    # W - 2 d = 140 - 36 = 104 mm, beats any staggered path (+ 50^2 / (4 x 70) = 8.9 mm); the FE's largest
    # peak of each group is at an inner hole, on the row nearest the joint
    for g in splice.joints.groups:
        p = g.net_path
        assert p.width == pytest.approx(140.0 - 2 * 18.0, rel=1e-12) and p.gross == pytest.approx(140.0, rel=1e-12)
        assert len(p.holes) == 2 and SPLICE[p.holes[0] - 1][0] == SPLICE[p.holes[1] - 1][0]
        assert abs(SPLICE[p.fe_hole - 1][0]) == 100.0


def test_groups_join_holds_and_edge_loads_on_the_boundary():
    # a plate held on its left edge by a [[hold]], loaded through a group and by a force on its top edge: the
    # group carries its own load exactly, and the supports' reactions balance everything (statics)
    extra = ('[[hold]]\nat = [-150.0, 0.0]\nmode = "fixed"\n'
             '[[load.edge]]\nat = [0.0, 50.0]\nforce = "2 kN"\ndirection = 0.0\n')
    spec = parse_part(base(load=LOAD + extra))
    assert spec.support.holds and spec.load.edges and spec.load.kind == "fasteners"
    (solution,) = solve_cases(spec, mesh_level(spec, 1.0))
    assert forces(solution).sum(axis=0) == pytest.approx([10000.0, 0.0], abs=1e-9 * 10000.0)
    reactions = solution.reactions.reshape(-1, 2).sum(axis=0)
    assert reactions == pytest.approx([-12000.0, 0.0], abs=1e-6 * 12000.0)


def test_a_hole_deforming_far_beyond_its_clearance_is_named():
    # E given in GPa by mistake (210 for 210 GPa): the holes deform far more than the 0.2 mm clearance, which
    # then no longer counts (compare/plausibility.py, as for the rigid pin)
    from stressraiser.compare.plausibility import input_warnings

    text = base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nclearance = 0.2\n').replace("E = 210000.0", "E = 210.0")
    text = text.replace('"10 kN"', '"30 kN"')  # the holes then deform by about 5 mm
    spec, solution = solved(text)
    words = [str(w) for w in input_warnings(spec, solution, 100.0)]
    assert any("hole 1 deforms by" in w and "fasteners 1 ('g')" in w and "check material.E" in w for w in words)
    spec, solution = solved(base('[[fasteners]]\nname = "g"\nholes = [1, 2]\nclearance = 0.2\n'))
    assert not any("deforms by" in str(w) for w in input_warnings(spec, solution, 100.0))
