"""Tangent-continuous arcs in place of smooth curves (geometry/arcfit.py).

Checked against plane geometry (common practice): a biarc meets its end points and end tangents and has one
tangent where its arcs meet (the defining property of a biarc, docs/references.md [Bolton]); an ellipse's
radius of curvature is b²/a at the ends of its major axis and a²/b at the ends of its minor axis; a curve
that is a circle or a line is returned as that circle or line.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from stressraiser.geometry.arcfit import BEND, HALF, biarc, distance_to, fit_curve
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.shapes import Arc, Line, segment_points


def ellipse(a: float, b: float):
    def curve(t):
        c, s = np.cos(t)[:, None], np.sin(t)[:, None]
        major, minor = np.array([a, 0.0]), np.array([0.0, b])
        return c * major + s * minor, -s * major + c * minor, -c * major - s * minor
    return curve


def direction(seg, at_end: bool) -> np.ndarray:
    """Unit tangent of a piece in its direction of travel, at its start or end."""
    if isinstance(seg, Line):
        d = np.subtract(seg.end, seg.start)
        return d / np.linalg.norm(d)
    angle = seg.end if at_end else seg.start
    return math.copysign(1.0, seg.end - seg.start) * np.array([-math.sin(angle), math.cos(angle)])


@pytest.mark.parametrize("seed", range(20))
def test_biarc_meets_its_ends_and_tangents(seed):
    rng = np.random.default_rng(seed)
    p0, p1 = rng.uniform(-10, 10, 2), rng.uniform(-10, 10, 2)
    t0, t1 = (np.array([math.cos(a), math.sin(a)]) for a in rng.uniform(0, 2 * math.pi, 2))
    pieces = biarc(p0, t0, p1, t1)
    assert np.allclose(segment_points(pieces[0])[0], p0, atol=1e-9)
    assert np.allclose(segment_points(pieces[-1])[1], p1, atol=1e-9)
    assert np.allclose(direction(pieces[0], False), t0, atol=1e-9)
    assert np.allclose(direction(pieces[-1], True), t1, atol=1e-9)
    if len(pieces) == 2:
        assert np.allclose(segment_points(pieces[0])[1], segment_points(pieces[1])[0], atol=1e-9)
        assert np.allclose(direction(pieces[0], True), direction(pieces[1], False), atol=1e-9)


@pytest.mark.parametrize("a, b", [(8.0, 3.2), (10.0, 1.0), (10.0, 9.0), (25.0, 2.0)])
def test_ellipse_arcs_follow_distance_and_curvature(a, b):
    tol = 0.01
    chain = fit_curve(ellipse(a, b), 0.0, 2.0 * math.pi, tol, [k * math.pi / 2 for k in range(1, 4)])
    assert not chain.exact and chain.deviation <= tol and chain.bend <= BEND
    t = np.linspace(0.0, 2.0 * math.pi, 20001)
    dense = np.column_stack([a * np.cos(t), b * np.sin(t)])
    assert np.min([distance_to(s, dense) for s in chain.pieces], axis=0).max() <= tol  # every curve point near
    radii = [s.radius for s in chain.pieces]
    assert min(radii) == pytest.approx(b * b / a, rel=BEND)  # tip radius b²/a
    # flank radius a²/b: curvature held to BEND of the larger of its own and half the tip's (arcfit.HALF)
    assert abs(1.0 / max(radii) - b / a ** 2) <= BEND * max(b / a ** 2, HALF * a / b ** 2)
    for s, u in zip(chain.pieces, chain.pieces[1:] + chain.pieces[:1]):  # closed and tangent-continuous
        assert np.allclose(segment_points(s)[1], segment_points(u)[0], atol=1e-9)
        assert float(direction(s, True) @ direction(u, False)) == pytest.approx(1.0, abs=1e-9)


def test_circles_and_lines_stay_exact():
    circle = fit_curve(ellipse(5.0, 5.0), 0.3, 2.0, 0.01)
    assert circle.exact and len(circle.pieces) == 1
    (arc,) = circle.pieces
    assert isinstance(arc, Arc) and arc.radius == pytest.approx(5.0, rel=1e-12)
    assert (arc.start, arc.end) == pytest.approx((0.3, 2.0), rel=1e-12)

    def straight(t):
        return np.column_stack([1.0 + 2.0 * t, 3.0 - t]), np.tile([2.0, -1.0], (len(t), 1)), np.zeros((len(t), 2))

    line = fit_curve(straight, 0.0, 4.0, 0.01)
    assert line.exact and line.pieces == (Line((1.0, 3.0), (9.0, -1.0)),)


def test_an_unreasonably_fine_tolerance_is_refused():
    with pytest.raises(PartError, match="SPLINE #1: more than 4000 arcs"):
        fit_curve(ellipse(1000.0, 1.0), 0.0, 2.0 * math.pi, 1e-12, [math.pi / 2, math.pi, 1.5 * math.pi], "SPLINE #1")
