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
    NotchCycle,
    NotchState,
    endurance_limit_steel,
    fatigue_notch_factor,
    fatigue_screen,
    goodman_factor,
    neuber_q,
    neuber_sqrt_rho_steel,
    peterson_a_steel,
    peterson_q,
    scaled_cycle,
    steel_notch_sensitivity,
)
from stressraiser.compare.local_strain import CyclicCurve
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


def reversed_cycle(nominal_amplitude: float, kt: float) -> NotchCycle:
    """A fully reversed cycle of the given nominal amplitude (MPa) at a notch of Kt."""
    return scaled_cycle(nominal_amplitude, kt * nominal_amplitude, -1.0, 1.0)


def test_cycles() -> None:
    # hand-computed (linear elasticity: stresses scale with the load): a [load] giving 200 MPa nominal and
    # 500 MPa at the notch, cycled from 0 to 1 x: alternating = mean = 100 MPa nominal; from -0.25 to 0.75 x:
    # alternating 100, mean 50; Kt = 500 / 200 at both extremes
    c = scaled_cycle(200.0, 500.0, 0.0, 1.0)
    assert (c.low.nominal_mpa, c.high.nominal_mpa, c.high.peak_mpa) == (0.0, 200.0, 500.0)
    assert (c.nominal_alternating, c.nominal_mean, c.kt) == (100.0, 100.0, 2.5)
    c = scaled_cycle(200.0, 500.0, -0.25, 0.75)
    assert (c.nominal_alternating, c.nominal_mean) == (100.0, 50.0)
    assert c.low.label == "-0.25 x [load]" and c.high.label == "0.75 x [load]"
    with pytest.raises(ValueError):
        scaled_cycle(200.0, 500.0, 1.0, 0.5)


def test_goodman_hand_case() -> None:
    # hand-computed, modified Goodman (common practice): 1 / (100/300 + 50/600) = 1 / (5/12) = 2.4
    assert goodman_factor(100.0, 50.0, 300.0, 600.0) == pytest.approx(2.4, rel=REL)
    # fully reversed: n = Se / sa = 300 / 100
    assert goodman_factor(100.0, 0.0, 300.0, 600.0) == pytest.approx(3.0, rel=REL)
    # compressive mean not credited (common practice): n = Se / sa
    assert goodman_factor(100.0, -200.0, 300.0, 600.0) == pytest.approx(3.0, rel=REL)
    assert goodman_factor(0.0, 0.0, 300.0, 600.0) == math.inf


def test_screen_on_steel_hand_case() -> None:
    # 0 -> 20 kN on 100 mm² net (Kt 2.5): sa = sm = 100 MPa nominal. Su 700 MPa -> Se' = 350 MPa (common practice).
    # With Kf = 2.273 (docs/references.md [Peterson-q], [Shigley], from memory) on both: n = 1 / (227.3/350 + 227.3/700) = 1.0267
    s = fatigue_screen(scaled_cycle(200.0, 500.0, 0.0, 1.0), 1.0, 700.0, "steel", 1.0)
    assert s.method == "peterson" and s.se_basis == "estimate" and s.life_cycles is None
    assert s.se_mpa == pytest.approx(350.0, rel=REL)
    assert s.sa_nominal_mpa == pytest.approx(100.0, rel=REL)
    assert s.sm_nominal_mpa == pytest.approx(100.0, rel=REL)
    assert s.kf == pytest.approx(2.273, rel=REF)
    assert s.sa_mpa == pytest.approx(227.3, rel=REF) and s.sm_mpa == pytest.approx(227.3, rel=REF)
    assert s.n_f == pytest.approx(700.0 / (3.0 * 2.273 * 100.0), rel=REF)
    assert s.passes  # 1.027 >= 1.0
    assert not fatigue_screen(scaled_cycle(200.0, 500.0, 0.0, 1.0), 1.0, 700.0, "steel", 1.5).passes
    text = " ".join(s.statements)
    assert "a screen, not a life prediction" in text
    assert "Kf applied to both alternating and mean" in text
    assert "surface finish, size" in text and "reliability" in text


def test_screen_neuber_method() -> None:
    s = fatigue_screen(reversed_cycle(50.0, 2.5), 1.0, 700.0, "steel", 1.0, method="neuber")
    # docs/references.md [Peterson-q], [Shigley] (from memory): Kf 2.147; fully reversed hand case n = 350 / (2.147 x 50)
    assert s.method == "neuber" and s.kf == pytest.approx(2.147, rel=REF)
    assert s.n_f == pytest.approx(350.0 / (2.147 * 50.0), rel=REF)


def test_aluminium_needs_a_fatigue_strength_at_a_life() -> None:
    cycle = reversed_cycle(20.0, 2.5)  # 2 kN alternating on 100 mm²
    with pytest.raises(PartError, match="no endurance limit"):
        fatigue_screen(cycle, 1.0, 290.0, "aluminium", 1.0)
    with pytest.raises(PartError, match="life in cycles"):
        fatigue_screen(cycle, 1.0, 290.0, "aluminium", 1.0, fatigue_strength_mpa=96.5)
    s = fatigue_screen(cycle, 1.0, 290.0, "aluminium", 1.0, fatigue_strength_mpa=96.5, fatigue_life_cycles=5e8)
    # no built-in q fit for aluminium: q = 1 so Kf = Kt (conservative); n = 96.5 / (2.5 x 20) = 1.93
    assert s.q == 1.0 and s.method == "unity" and s.kf == 2.5
    assert s.n_f == pytest.approx(96.5 / 50.0, rel=REL)
    assert s.life_cycles == 5e8 and "5e+08 cycles" in " ".join(s.statements)


def test_given_q_and_strength_override_estimates() -> None:
    s = fatigue_screen(reversed_cycle(50.0, 3.0), 1.0, 700.0, "steel", 1.0, fatigue_strength_mpa=280.0, q=0.5)
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
        fatigue_screen(reversed_cycle(0.01, 2.0), 1.0, 700.0, **args)


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


def test_two_states_of_different_kt() -> None:
    # two solved load cases need not share a Kt: each state's notched stress is nominal + q (peak - nominal)
    # (Kf x nominal, Kf = 1 + q (Kt - 1): docs/references.md [Shigley]). Hand-computed, q = 0.5:
    # low 20 + 0.5 (60 - 20) = 40, high 100 + 0.5 (200 - 100) = 150 -> sa 55, sm 95; n = 1 / (55/280 + 95/700)
    cycle = NotchCycle(NotchState(20.0, 60.0, "case A"), NotchState(100.0, 200.0, "case B"))
    s = fatigue_screen(cycle, 1.0, 700.0, "steel", 1.0, fatigue_strength_mpa=280.0, q=0.5)
    assert (s.sa_mpa, s.sm_mpa) == pytest.approx((55.0, 95.0), rel=REL)
    assert s.n_f == pytest.approx(1.0 / (55.0 / 280.0 + 95.0 / 700.0), rel=REL)
    assert s.kt_net == pytest.approx(2.0, rel=REL)  # the Kt of the state with the larger nominal, 200 / 100


def test_first_cycle_yield_is_flagged_with_or_without_a_curve() -> None:
    # elastic notch stress Kt x nominal = 2.5 x 160 = 400 MPa at the top of a 0.2-1 cycle, above a 355 MPa
    # yield: flagged (common practice, docs/references.md [Shigley] section 6-12, [Strain-life])
    cycle = scaled_cycle(160.0, 400.0, 0.2, 1.0)
    bare = fatigue_screen(cycle, 1.0, 470.0, "steel", 1.0, yield_mpa=355.0)
    assert bare.first_cycle_yield and not bare.reversed_yield and bare.local is None
    assert bare.elastic_peak_mpa == pytest.approx(400.0, rel=REL)
    text = " ".join(bare.statements)
    assert "FIRST-CYCLE YIELD" in text and "fatigue.cyclic_strength" in text
    # with a cyclic curve the root's local stress and strain come out (Neuber on Ramberg-Osgood,
    # tests/test_local_strain.py checks those numbers); the local peak is below the elastic one
    curve = CyclicCurve(210_000.0, 776.0, 0.15, "given")
    s = fatigue_screen(cycle, 1.0, 470.0, "steel", 1.0, yield_mpa=355.0, curve=curve)
    assert s.local is not None and s.local.first == "high"
    assert s.local.elastic_high_mpa == pytest.approx(400.0, rel=REL)
    assert s.local.elastic_low_mpa == pytest.approx(80.0, rel=REL)
    assert s.local.high_stress_mpa < 400.0
    assert "not a fatigue life" in " ".join(s.statements)
    # below yield: said so, and no local estimate
    calm = fatigue_screen(scaled_cycle(100.0, 250.0, 0.2, 1.0), 1.0, 470.0, "steel", 1.0, yield_mpa=355.0, curve=curve)
    assert not calm.first_cycle_yield and calm.local is None
    assert "No first-cycle yield" in " ".join(calm.statements)
    # no yield strength: not checked, and said so
    assert "not checked" in " ".join(fatigue_screen(cycle, 1.0, 470.0, "steel", 1.0).statements)


def test_reversed_yield_when_the_elastic_range_passes_twice_yield() -> None:
    # fully reversed, elastic notch stress +-400 MPa: range 800 MPa > 2 x 355 MPa (common practice)
    s = fatigue_screen(reversed_cycle(160.0, 2.5), 1.0, 470.0, "steel", 1.0, yield_mpa=355.0)
    assert s.first_cycle_yield and s.reversed_yield
    assert "every reversal" in " ".join(s.statements)
