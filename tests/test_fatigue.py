"""Fatigue screen: notch sensitivity, Kf, endurance estimate and modified Goodman.

Check points for q and Kf are from docs/references.md [Peterson-q], [Shigley]: Peterson (R. E. Peterson in
Sines & Waisman, Metal Fatigue, 1959, from memory) and Neuber's steel fit (Budynas & Nisbett, Shigley's
Mechanical Engineering Design, 9th ed., eq. 6-35, from memory). Tolerance there: 1 %.
Goodman and endurance cases are hand-computed from the definitions (common practice), rel 1e-12.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stressraiser.compare.fatigue import (
    cycle_from_alternating,
    cycle_from_range,
    endurance_limit_steel,
    fatigue_notch_factor,
    fatigue_screen,
    goodman_factor,
    neuber_q,
    neuber_sqrt_rho_steel,
    peterson_a_steel,
    peterson_q,
    steel_notch_sensitivity,
)
from stressraiser.geometry.errors import PartError

REL = 1e-12
REF = 0.01  # 1 % on the docs/references.md [Peterson-q], [Shigley] check points


def test_peterson_q_check_point() -> None:
    # docs/references.md [Peterson-q], [Shigley], Peterson in Sines & Waisman (1959), from memory: Su 700 MPa, r 1 mm -> q 0.848
    assert peterson_q(1.0, peterson_a_steel(700.0)) == pytest.approx(0.848, rel=REF)


def test_neuber_q_check_point() -> None:
    # docs/references.md [Peterson-q], [Shigley], Shigley 9th ed. eq. 6-35, from memory: Su 700 MPa, r 1 mm -> q 0.765
    assert neuber_q(1.0, neuber_sqrt_rho_steel(700.0)) == pytest.approx(0.765, rel=REF)


def test_kf_check_points() -> None:
    # docs/references.md [Peterson-q], [Shigley] (from memory): Kt 2.5 -> Kf 2.273 (Peterson) and 2.147 (Neuber)
    q_p = steel_notch_sensitivity(1.0, 700.0, "peterson")
    q_n = steel_notch_sensitivity(1.0, 700.0, "neuber")
    assert fatigue_notch_factor(2.5, q_p) == pytest.approx(2.273, rel=REF)
    assert fatigue_notch_factor(2.5, q_n) == pytest.approx(2.147, rel=REF)


def test_kf_limits() -> None:
    # definition Kf = 1 + q (Kt - 1): q = 0 -> 1 (insensitive), q = 1 -> Kt (fully sensitive)
    assert fatigue_notch_factor(3.0, 0.0) == 1.0
    assert fatigue_notch_factor(3.0, 1.0) == 3.0


@pytest.mark.parametrize("su", [339.9, 1700.1, 200.0, 2000.0, math.nan])
def test_neuber_steel_fit_refuses_outside_its_range(su: float) -> None:
    # validity Su 340-1700 MPa: docs/references.md [Peterson-q], [Shigley] (Shigley 9th ed. eq. 6-35, from memory)
    with pytest.raises(PartError, match="340-1700 MPa"):
        neuber_sqrt_rho_steel(su)


def test_neuber_range_ends_are_accepted() -> None:
    assert neuber_sqrt_rho_steel(340.0) > 0.0 and neuber_sqrt_rho_steel(1700.0) > 0.0


def test_endurance_estimate_for_steels() -> None:
    # common practice: Se' = 0.5 Su up to 1400 MPa, 700 MPa above
    assert endurance_limit_steel(600.0) == pytest.approx(300.0, rel=REL)
    assert endurance_limit_steel(1400.0) == pytest.approx(700.0, rel=REL)
    assert endurance_limit_steel(1800.0) == pytest.approx(700.0, rel=REL)


def test_cycles() -> None:
    # hand-computed: min 0, max 20 kN -> alternating 10 kN, mean 10 kN; min -5, max 15 -> 10, 5
    assert cycle_from_range(0.0, 20_000.0) == cycle_from_alternating(10_000.0, 10_000.0)
    c = cycle_from_range(-5.0, 15.0)
    assert (c.alternating, c.mean) == (10.0, 5.0)
    with pytest.raises(ValueError):
        cycle_from_range(10.0, 5.0)


def test_goodman_hand_case() -> None:
    # hand-computed, modified Goodman (common practice): 1 / (100/300 + 50/600) = 1 / (5/12) = 2.4
    assert goodman_factor(100.0, 50.0, 300.0, 600.0) == pytest.approx(2.4, rel=REL)
    # fully reversed: n = Se / sa = 300 / 100
    assert goodman_factor(100.0, 0.0, 300.0, 600.0) == pytest.approx(3.0, rel=REL)
    # compressive mean not credited (common practice): n = Se / sa
    assert goodman_factor(100.0, -200.0, 300.0, 600.0) == pytest.approx(3.0, rel=REL)
    assert goodman_factor(0.0, 0.0, 300.0, 600.0) == math.inf


def test_screen_on_steel_hand_case() -> None:
    # 0 -> 20 kN on 100 mm² net: sa = sm = 100 MPa nominal. Su 700 MPa -> Se' = 350 MPa (common practice).
    # With Kf = 2.273 (docs/references.md [Peterson-q], [Shigley], from memory) on both: n = 1 / (227.3/350 + 227.3/700) = 1.0267
    s = fatigue_screen(cycle_from_range(0.0, 20_000.0), 100.0, 2.5, 1.0, 700.0, "steel", 1.0)
    assert s.method == "peterson" and s.se_basis == "estimate" and s.life_cycles is None
    assert s.se_mpa == pytest.approx(350.0, rel=REL)
    assert s.sa_nominal_mpa == pytest.approx(100.0, rel=REL)
    assert s.sm_nominal_mpa == pytest.approx(100.0, rel=REL)
    assert s.kf == pytest.approx(2.273, rel=REF)
    assert s.sa_mpa == pytest.approx(227.3, rel=REF) and s.sm_mpa == pytest.approx(227.3, rel=REF)
    assert s.n_f == pytest.approx(700.0 / (3.0 * 2.273 * 100.0), rel=REF)
    assert s.passes  # 1.027 >= 1.0
    assert not fatigue_screen(cycle_from_range(0.0, 20_000.0), 100.0, 2.5, 1.0, 700.0, "steel", 1.5).passes
    text = " ".join(s.statements)
    assert "a screen, not a life prediction" in text
    assert "Kf applied to both alternating and mean" in text
    assert "surface finish, size" in text and "reliability" in text


def test_screen_neuber_method() -> None:
    s = fatigue_screen(cycle_from_alternating(5_000.0, 0.0), 100.0, 2.5, 1.0, 700.0, "steel", 1.0,
                       method="neuber")
    # docs/references.md [Peterson-q], [Shigley] (from memory): Kf 2.147; fully reversed hand case n = 350 / (2.147 x 50)
    assert s.method == "neuber" and s.kf == pytest.approx(2.147, rel=REF)
    assert s.n_f == pytest.approx(350.0 / (2.147 * 50.0), rel=REF)


def test_aluminium_needs_a_fatigue_strength_at_a_life() -> None:
    cycle = cycle_from_alternating(2_000.0, 0.0)
    with pytest.raises(PartError, match="no endurance limit"):
        fatigue_screen(cycle, 100.0, 2.5, 1.0, 290.0, "aluminium", 1.0)
    with pytest.raises(PartError, match="life in cycles"):
        fatigue_screen(cycle, 100.0, 2.5, 1.0, 290.0, "aluminium", 1.0, fatigue_strength_mpa=96.5)
    s = fatigue_screen(cycle, 100.0, 2.5, 1.0, 290.0, "aluminium", 1.0,
                       fatigue_strength_mpa=96.5, fatigue_life_cycles=5e8)
    # no built-in q fit for aluminium: q = 1 so Kf = Kt (conservative); n = 96.5 / (2.5 x 20) = 1.93
    assert s.q == 1.0 and s.method == "unity" and s.kf == 2.5
    assert s.n_f == pytest.approx(96.5 / 50.0, rel=REL)
    assert s.life_cycles == 5e8 and "5e+08 cycles" in " ".join(s.statements)


def test_given_q_and_strength_override_estimates() -> None:
    s = fatigue_screen(cycle_from_alternating(5_000.0, 0.0), 100.0, 3.0, 1.0, 700.0, "steel", 1.0,
                       fatigue_strength_mpa=280.0, q=0.5)
    # hand-computed: Kf = 1 + 0.5 x 2 = 2; n = 280 / (2 x 50) = 2.8
    assert s.method == "given" and s.kf == pytest.approx(2.0, rel=REL)
    assert s.n_f == pytest.approx(2.8, rel=REL)


@pytest.mark.parametrize(
    "kwargs",
    [
        {"family": "wood"},
        {"method": "guess"},
        {"required_factor": 0.8},
        {"q": 1.2},
        {"fatigue_strength_mpa": 800.0},  # above the ultimate
    ],
)
def test_screen_refuses_bad_inputs(kwargs: dict) -> None:
    args = {"family": "steel", "required_factor": 1.0} | kwargs
    with pytest.raises(PartError):
        fatigue_screen(cycle_from_alternating(1.0, 0.0), 100.0, 2.0, 1.0, 700.0, **args)


@given(r=st.floats(0.01, 100.0), su=st.floats(340.0, 1700.0), kt=st.floats(1.0, 10.0))
def test_q_and_kf_bounds(r: float, su: float, kt: float) -> None:
    # from the definitions: 0 < q < 1 for a finite radius, so 1 <= Kf <= Kt
    for method in ("peterson", "neuber"):
        q = steel_notch_sensitivity(r, su, method)
        assert 0.0 < q < 1.0
        assert 1.0 <= fatigue_notch_factor(kt, q) <= kt


@given(r=st.floats(0.05, 50.0), su=st.floats(340.0, 1700.0))
def test_q_grows_with_radius_and_strength(r: float, su: float) -> None:
    # Peterson and Neuber (docs/references.md [Peterson-q], [Shigley]): blunter notches and stronger steels are more sensitive
    for method in ("peterson", "neuber"):
        q = steel_notch_sensitivity(r, su, method)
        assert steel_notch_sensitivity(r * 1.1, su, method) > q
        assert steel_notch_sensitivity(r, min(su * 1.05, 1700.0), method) >= q
