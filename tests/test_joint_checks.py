"""Hand checks of a bolted or pinned connection (compare/joint_checks.py) and published fastener stiffness
(fem/fastener_stiffness.py), against examples worked by hand and brute force."""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest
from shapely.geometry import box

from stressraiser.compare.joint_checks import (critical_net_path, elastic_method, equal_shares, simple_connection,
                                               spacing, staggered_net_width, understatement)
from stressraiser.fem.fastener_stiffness import huth_flexibility, huth_stiffness

SQUARE = np.array([(50.0, 50.0), (-50.0, 50.0), (-50.0, -50.0), (50.0, -50.0)])


def test_equal_shares_of_a_concentric_group():
    shares = equal_shares((12000.0, -3000.0), 4)  # common practice: F / n each
    assert shares == pytest.approx(np.tile([3000.0, -750.0], (4, 1)))


def test_elastic_method_worked_by_hand():
    # Four bolts on a 100 mm square, 10 kN downwards 200 mm to the right of their centroid ([Shigley]
    # section 8-12's method, from memory): direct share 2.5 kN down each; M = -2e6 N mm about the centroid,
    # sum r^2 = 4 x 5000 = 20000 mm^2, so the moment share is -100 N/mm x (-r_y, r_x): at (50, 50) it is
    # (5000, -5000) N, total (5000, -7500) N, 9014 N; at (-50, 50) (5000, 5000) + (0, -2500) = (5000, 2500) N
    forces = elastic_method(SQUARE, (0.0, -10000.0), 0.0, at=(200.0, 0.0))
    assert forces == pytest.approx(np.array([(5000.0, -7500.0), (5000.0, 2500.0), (-5000.0, 2500.0),
                                             (-5000.0, -7500.0)]))
    assert np.linalg.norm(forces, axis=1).max() == pytest.approx(math.hypot(5000.0, 7500.0))
    # statics (exact): the forces sum to the load and their moment about the load's point is zero
    arm = SQUARE - np.array([200.0, 0.0])
    assert forces.sum(axis=0) == pytest.approx([0.0, -10000.0])
    assert np.sum(arm[:, 0] * forces[:, 1] - arm[:, 1] * forces[:, 0]) == pytest.approx(0.0, abs=1e-6)
    # the same load given as a force at the centroid and its moment there
    assert elastic_method(SQUARE, (0.0, -10000.0), -2.0e6) == pytest.approx(forces)


def test_elastic_method_refuses_a_moment_on_one_point():
    with pytest.raises(ValueError, match="carries no moment"):
        elastic_method(np.array([(0.0, 0.0)]), (100.0, 0.0), 5.0)


def test_staggered_net_width_worked_by_hand():
    # Cochrane's rule ([Cochrane], from memory): a 250 mm plate, two gauge lines 75 mm apart, holes of 24 mm
    # deduction staggered 50 mm: through both 250 - 2 x 24 + 50^2 / (4 x 75) = 210.33 mm; through one 226 mm
    centres = np.array([(0.0, -37.5), (50.0, 37.5)])
    assert staggered_net_width(250.0, centres, [24.0, 24.0], [0, 1]) == pytest.approx(250.0 - 48.0 + 2500.0 / 300.0)
    assert staggered_net_width(250.0, centres, [24.0, 24.0], [1]) == pytest.approx(226.0)
    critical = critical_net_path(250.0, centres, [24.0, 24.0])
    assert critical.holes == (0, 1) and critical.width == pytest.approx(210.0 + 1.0 / 3.0)


def test_critical_path_is_the_least_of_every_path():
    # Four gauge lines 60 mm apart, holes staggered 40 mm, 20 mm deduction, 240 mm plate. By hand: the
    # straight path through two holes on one line of stagger 240 - 40 = 200 mm; the zig-zag through all four
    # 240 - 80 + 3 x 40^2 / (4 x 60) = 180 mm, the least. Brute force over every path (each subset of holes
    # taken in order across the load) must agree with the shortest-path search.
    centres = np.array([(0.0, -90.0), (40.0, -30.0), (0.0, 30.0), (40.0, 90.0)])
    d = [20.0] * 4
    best = min(staggered_net_width(240.0, centres, d, path)
               for k in range(1, 5) for path in itertools.combinations(range(4), k))
    critical = critical_net_path(240.0, centres, d)
    assert critical.width == pytest.approx(best) == pytest.approx(180.0)
    assert critical.holes == (0, 1, 2, 3)
    assert staggered_net_width(240.0, centres, d, [0, 2]) == pytest.approx(200.0)


def test_critical_path_never_crosses_one_gauge_line_twice():
    # two holes side by side along the load (one gauge line): a path crosses the line once, at one hole
    centres = np.array([(0.0, 0.0), (30.0, 0.0), (15.0, 40.0)])
    with pytest.raises(ValueError, match="one gauge line"):
        staggered_net_width(120.0, centres, [10.0] * 3, [0, 1])
    critical = critical_net_path(120.0, centres, [10.0] * 3)
    assert len(critical.holes) == 2 and 2 in critical.holes
    assert critical.width == pytest.approx(120.0 - 20.0 + 15.0 ** 2 / 160.0)


def test_simple_connection_averages_worked_by_hand():
    # 60 kN through three 16 mm bolts in double shear, 12 mm plate, 100 mm net width (common practice):
    # each bolt 20 kN; shear 20000 / (2 x pi x 16^2 / 4) = 49.74 MPa; bearing 20000 / (16 x 12) = 104.17 MPa;
    # net tension 60000 / (100 x 12) = 50 MPa
    shear, bearing, tension = simple_connection(60000.0, 3, 16.0, 2, 12.0, 100.0)
    assert shear.stress == pytest.approx(49.7359, rel=1e-5)
    assert bearing.stress == pytest.approx(104.1667, rel=1e-5)
    assert tension.stress == pytest.approx(50.0)
    assert all("common practice" in c.source for c in (shear, bearing, tension))


def test_understatement_states_how_far_the_average_is_below_the_peak():
    _, _, tension = simple_connection(60000.0, 3, 16.0, 2, 12.0, 100.0)
    short = understatement(tension, 130.0, "tensile peak at hole 2")
    assert short.ratio == pytest.approx(2.6) and short.short == pytest.approx(1.0 - 50.0 / 130.0)
    assert short.words() == ("the net-section tension average 50 MPa understates the FE tensile peak at hole 2 "
                             "130 MPa by 62% (the peak is 2.6 x the average)")
    assert "overstates" in understatement(tension, 40.0, "peak").words()


def test_spacing_in_multiples_of_the_diameter():
    # a 200 x 100 mm plate centred on the origin, 10 mm holes at (80, 20) and (50, 20): the first is 20 mm
    # from the end x = 100 (its nearest edge), 30 mm from the edge y = 50, 30 mm from the other hole
    plate = box(-100.0, -50.0, 100.0, 50.0)
    first, second = spacing(np.array([(80.0, 20.0), (50.0, 20.0)]), 10.0, plate, directions=[0.0, 90.0])
    assert (first.edge, first.end, first.pitch) == pytest.approx((2.0, 2.0, 3.0))
    assert (second.edge, second.end, second.pitch) == pytest.approx((3.0, 3.0, 3.0))


def test_huth_stiffness_worked_by_hand():
    # Huth's formula ([Huth], from memory) for a 6.35 mm titanium bolt (E3 = 110 GPa) joining two 3.2 mm
    # aluminium plates (71 GPa), bolted metallic (a = 2/3, b = 3): ((3.2 + 3.2) / 12.7)^(2/3) = 0.63326;
    # 1/(3.2 x 71000) = 4.4014e-6 twice and 1/(2 x 3.2 x 110000) = 1.4205e-6 twice: sum 1.16437e-5;
    # C = 0.63326 x 3 x 1.16437e-5 = 2.2121e-5 mm/N, k = 45207 N/mm. Double shear (n = 2):
    # 0.63326 x 1.5 x (4.4014 + 2.2007 + 1.4205 + 0.7102)e-6 = 8.2953e-6 mm/N, 120551 N/mm
    args = (6.35, 3.2, 71000.0, 3.2, 71000.0, 110000.0)
    assert huth_flexibility(*args) == pytest.approx(2.2121e-5, rel=1e-4)
    stiffness, source = huth_stiffness(*args)
    assert stiffness == pytest.approx(45207.0, rel=1e-4) and "Huth" in source and "from memory" in source
    assert huth_stiffness(*args, shear_planes=2)[0] == pytest.approx(120551.0, rel=1e-4)
    # every modulus doubled halves the flexibility (the formula is a sum of 1/(t E) terms)
    doubled = huth_flexibility(6.35, 3.2, 142000.0, 3.2, 142000.0, 220000.0)
    assert doubled == pytest.approx(0.5 * huth_flexibility(*args))
    # riveted joints: a = 2/5, b = 2.2
    assert huth_flexibility(*args, joint="riveted metallic") == pytest.approx(
        (6.4 / 12.7) ** 0.4 * 2.2 * 1.16437e-5, rel=1e-4)
    with pytest.raises(ValueError, match="unknown joint kind"):
        huth_flexibility(*args, joint="welded")
