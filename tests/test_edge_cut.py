"""The cut normal to the edge at a peak: which ligaments it takes, and the free body it leaves.

The independent values are plane geometry of the invented C-shaped region below: its arms and the tip a
cut across one arm separates."""

from __future__ import annotations

import numpy as np
import pytest
from shapely.geometry import Polygon, box

from stressraiser.compare.edge_cut import cut_through


def test_a_cut_takes_the_fewest_ligaments_that_separate_the_part():
    # A C: a 100 mm square with a 20 mm wide slot from its right side to x = 20. A peak on the top arm's
    # inner edge at (50, 60): the line along its inward normal (+y) crosses the top arm (y 60...100) and,
    # across the slot, the bottom arm (y 0...40). Cutting the top arm alone separates its tip (x > 50), so
    # the cut is that one ligament, and its free body is the tip, not a half-plane.
    c = box(0.0, 0.0, 100.0, 100.0).difference(box(20.0, 40.0, 110.0, 60.0))
    cut = cut_through(c, (50.0, 60.0), (0.0, 1.0), 100.0)
    assert cut.window == pytest.approx((0.0, 40.0), abs=1e-9)
    assert not cut.whole_line
    tip = cut.side.polygon
    assert tip.area == pytest.approx(50.0 * 40.0, rel=1e-4)  # the tip, grown by a hair
    assert cut.normal == pytest.approx((1.0, 0.0))  # the edge's tangent; positions run along +y, into the arm
    inside = cut.side.contains(np.array([[75.0, 80.0], [10.0, 50.0], [75.0, 20.0]]), np.array([50.0, 60.0]),
                               np.asarray(cut.normal))
    assert inside.tolist() == [True, False, False]  # the tip is the +normal side; the back and bottom arm not
    # from the back of the C (x = 0 ... 20, its only link) a cut across the back separates the two arms
    back = cut_through(c, (0.0, 50.0), (1.0, 0.0), 100.0)
    assert back.window == pytest.approx((0.0, 20.0), abs=1e-9)
    # a ring needs both ligaments either side of the hole: the whole line
    ring = Polygon([(0, 0), (100, 0), (100, 100), (0, 100)], [[(40, 40), (60, 40), (60, 60), (40, 60)]])
    across = cut_through(ring, (50.0, 60.0), (0.0, 1.0), 100.0)
    assert across.whole_line and across.window == pytest.approx((-60.0, 40.0), abs=1e-9)
