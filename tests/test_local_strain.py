"""Notch-root stress and strain by Neuber's rule on a cyclic Ramberg-Osgood curve (compare/local_strain.py).

References (docs/references.md): [Neuber] sigma eps = (Kt S)^2 / E on first loading, d_sigma d_eps =
(Kt dS)^2 / E on a reversal; [Ramberg-Osgood] eps = sigma / E + (sigma / K')^(1/n'); [Masing] branches are
the cyclic curve doubled. The independent value is scipy.optimize.brentq (a bracketing root-finder, nothing
shared with the module's Newton iteration in ln sigma) solving the same equations written out here, to a
relative 1e-9; and exact limits of the equations themselves (an elastic material, a fully reversed cycle).
The curves below are parameter sets of the size metals have (K' 400-2000 MPa, n' 0.05-0.3), not data.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st
from scipy.optimize import brentq

from stressraiser.compare.local_strain import (
    CyclicCurve,
    branch_strain_range,
    curve_strain,
    neuber_range,
    neuber_stress,
    notch_response,
)

ROOT = 1e-9  # against the independent root-find
EXACT = 1e-12  # identities of the equations

CURVES = [CyclicCurve(210_000.0, 776.0, 0.15), CyclicCurve(73_100.0, 655.0, 0.065),
          CyclicCurve(200_000.0, 1_800.0, 0.3), CyclicCurve(113_800.0, 1_400.0, 0.05)]
ELASTIC = [50.0, 250.0, 420.0, 700.0, 1_500.0, 4_000.0]


def _brentq_first(c: CyclicCurve, elastic: float) -> float:
    """sigma with sigma (sigma / E + (sigma / K)^(1/n)) = elastic^2 / E, written out ([Neuber], [Ramberg-Osgood])."""
    return brentq(lambda s: s * (s / c.E + (s / c.K) ** (1.0 / c.n)) - elastic**2 / c.E, 1e-12, elastic * (1 + 1e-6),
                  xtol=1e-15, rtol=1e-15, maxiter=500)


def _brentq_range(c: CyclicCurve, elastic_range: float) -> float:
    """d_sigma with d_sigma (d_sigma / E + 2 (d_sigma / (2K))^(1/n)) = elastic_range^2 / E ([Masing])."""
    return brentq(lambda d: d * (d / c.E + 2.0 * (d / (2.0 * c.K)) ** (1.0 / c.n)) - elastic_range**2 / c.E,
                  1e-12, elastic_range * (1 + 1e-6), xtol=1e-15, rtol=1e-15, maxiter=500)


@pytest.mark.parametrize("curve", CURVES)
@pytest.mark.parametrize("elastic", ELASTIC)
def test_first_loading_matches_an_independent_root_find(curve: CyclicCurve, elastic: float) -> None:
    sigma, eps = neuber_stress(curve, elastic)
    assert sigma == pytest.approx(_brentq_first(curve, elastic), rel=ROOT)  # scipy brentq, same equations
    # Neuber's product and the curve itself hold at the answer (definitions)
    assert sigma * eps == pytest.approx(elastic**2 / curve.E, rel=EXACT)
    assert eps == pytest.approx(sigma / curve.E + (sigma / curve.K) ** (1.0 / curve.n), rel=EXACT)


@pytest.mark.parametrize("curve", CURVES)
@pytest.mark.parametrize("elastic", ELASTIC)
def test_reversal_matches_an_independent_root_find(curve: CyclicCurve, elastic: float) -> None:
    d_sigma, d_eps = neuber_range(curve, 2.0 * elastic)
    assert d_sigma == pytest.approx(_brentq_range(curve, 2.0 * elastic), rel=ROOT)  # scipy brentq
    assert d_sigma * d_eps == pytest.approx((2.0 * elastic) ** 2 / curve.E, rel=EXACT)
    assert d_eps == pytest.approx(branch_strain_range(curve, d_sigma), rel=EXACT)


def test_an_elastic_material_keeps_the_elastic_stress() -> None:
    # limit of the equations: with K' far above any stress the plastic term vanishes, sigma = sigma_e, and
    # eps = sigma_e / E
    curve = CyclicCurve(200_000.0, 1e9, 0.2)
    sigma, eps = neuber_stress(curve, 300.0)
    assert sigma == pytest.approx(300.0, rel=EXACT) and eps == pytest.approx(300.0 / 200_000.0, rel=EXACT)


@pytest.mark.parametrize("curve", CURVES)
def test_fully_reversed_cycle_is_symmetric_and_its_loop_is_the_first_point_doubled(curve: CyclicCurve) -> None:
    # [Masing]: the doubled curve through 2 sigma_e^2 ... has the root d_sigma = 2 sigma_1, d_eps = 2 eps_1, so a
    # fully reversed cycle runs from (sigma_1, eps_1) to (-sigma_1, -eps_1), mean stress zero (exact)
    r = notch_response(curve, 600.0, -600.0)
    sigma_1, eps_1 = neuber_stress(curve, 600.0)
    assert r.stress_range_mpa == pytest.approx(2.0 * sigma_1, rel=EXACT)
    assert r.strain_range == pytest.approx(2.0 * eps_1, rel=EXACT)
    assert r.low_stress_mpa == pytest.approx(-sigma_1, rel=EXACT) and r.low_strain == pytest.approx(-eps_1, rel=EXACT)
    assert r.mean_stress_mpa == pytest.approx(0.0, abs=EXACT * sigma_1)


def test_yielding_root_unloads_to_a_compressive_residual_stress() -> None:
    # zero to a yielding peak and back to zero: the local stress after unloading is sigma_1 - d_sigma, below zero
    # when the root yielded (d_sigma is nearly the elastic range, sigma_1 well below it), and the strain stays
    # positive; below yield the root returns to zero (definitions of the loop above)
    curve = CURVES[0]
    r = notch_response(curve, 700.0, 0.0)
    assert r.first == "high" and r.low_stress_mpa < 0.0 and r.low_strain > 0.0
    assert r.low_stress_mpa == pytest.approx(r.high_stress_mpa - r.stress_range_mpa, rel=EXACT)
    elastic = notch_response(CyclicCurve(200_000.0, 1e9, 0.2), 300.0, 0.0)
    assert elastic.low_stress_mpa == pytest.approx(0.0, abs=1e-9) and elastic.low_strain == pytest.approx(0.0, abs=1e-12)


def test_compression_first_when_it_is_the_larger_extreme() -> None:
    # the curve is odd in the stress: a cycle from -500 to +100 MPa starts with compression, the mirror image of
    # one from -100 to +500
    curve = CURVES[0]
    a, b = notch_response(curve, 100.0, -500.0), notch_response(curve, 500.0, -100.0)
    assert a.first == "low" and b.first == "high"
    assert a.low_stress_mpa == pytest.approx(-b.high_stress_mpa, rel=EXACT)
    assert a.high_stress_mpa == pytest.approx(-b.low_stress_mpa, rel=EXACT)
    assert a.strain_amplitude == pytest.approx(b.strain_amplitude, rel=EXACT)


@given(elastic=st.floats(1.0, 1e4), k=st.floats(300.0, 3000.0), n=st.floats(0.04, 0.4))
def test_local_stress_never_exceeds_the_elastic_one(elastic: float, k: float, n: float) -> None:
    # sigma eps = sigma_e^2 / E with eps >= sigma / E gives sigma <= sigma_e, and the strain is at least the
    # elastic one, eps >= sigma_e / E (Neuber's rule moves the point along the hyperbola)
    curve = CyclicCurve(200_000.0, k, n)
    sigma, eps = neuber_stress(curve, elastic)
    assert 0.0 < sigma <= elastic * (1.0 + 1e-12)
    assert eps >= elastic / curve.E * (1.0 - 1e-12)
    assert math.isclose(curve_strain(curve, -sigma), -eps, rel_tol=1e-12)


@pytest.mark.parametrize("args", [(0.0, 700.0, 0.1), (200_000.0, -5.0, 0.1), (200_000.0, 700.0, 0.0),
                                  (200_000.0, 700.0, 1.0), (200_000.0, math.nan, 0.1)])
def test_bad_curves_are_refused(args) -> None:
    with pytest.raises(ValueError):
        CyclicCurve(*args)


def test_high_below_low_is_refused() -> None:
    with pytest.raises(ValueError):
        notch_response(CURVES[0], 100.0, 200.0)
    with pytest.raises(ValueError):
        neuber_range(CURVES[0], -1.0)
