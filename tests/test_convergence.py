"""Richardson extrapolation and the grid convergence index on sequences with known limits."""

from __future__ import annotations

import math

import pytest

from stressraiser.fem.convergence import richardson


@pytest.mark.parametrize("order", [1.0, 1.5, 2.0, 3.0])
def test_exact_power_law_is_extrapolated_exactly(order):
    # f(h) = f0 + c h^p refined by ratio r: Richardson's extrapolation with the observed order returns
    # f0 exactly (L. F. Richardson, Phil. Trans. R. Soc. A 210, 1911; P. J. Roache, Verification and
    # Validation in Computational Science and Engineering, 1998).
    ratio, f0, c = math.sqrt(2.0), 3.0, -0.8
    values = [f0 + c * (ratio ** -k) ** order for k in range(3)]
    est = richardson(values, ratio)
    assert est.value == pytest.approx(f0, rel=1e-12)
    assert est.order == pytest.approx(order, rel=1e-12)
    assert est.method == "richardson"
    # Roache's fine-grid index: 1.25 |f3 - f2| / (r^p - 1) / |f0|
    expected = 1.25 * abs(values[2] - values[1]) / (ratio ** order - 1) / f0
    assert est.error == pytest.approx(expected, rel=1e-12)


def test_oscillating_sequence_keeps_finest_and_widens_band():
    est = richardson([2.50, 2.52, 2.51])
    assert est.method == "oscillating"
    assert est.value == 2.51
    assert est.error == pytest.approx(1.25 * 0.02 / 2.51, rel=1e-12)


def test_non_shrinking_differences_are_not_extrapolated():
    est = richardson([2.40, 2.45, 2.51])
    assert est.method == "bounded"
    assert est.value == 2.51
    assert est.error == pytest.approx(3.0 * 0.06 / 2.51, rel=1e-12)


def test_identical_values_have_no_error():
    est = richardson([1.0, 1.0, 1.0])
    assert est.value == 1.0 and est.error == 0.0
