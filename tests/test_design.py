"""Static design check: hand-computed cases from the definitions (common practice).

Definitions used for every expected value below (facts of the trade, common practice, see
docs/references.md [Practice]): allowable stress = failure stress / factor of safety; average normal stress =
force / area; margin of safety = allowable / actual - 1; factor of safety = failure load / allowable load
(so achieved factor = failure stress / actual stress); required area = load / allowable stress.
Tolerance: rel 1e-12 (exact arithmetic on small decimals).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stressraiser.compare.design import (
    achieved_factor_of_safety,
    allowable_stress,
    design_check,
    hand_check,
    margin_of_safety,
    net_section_average,
    peak_check,
    required_net_area,
    required_thickness,
)

REL = 1e-12


def test_allowable_stress_is_failure_over_factor() -> None:
    # hand-computed, common practice: 300 MPa / 1.5 = 200 MPa
    assert allowable_stress(300.0, 1.5) == pytest.approx(200.0, rel=REL)


def test_net_section_average_is_force_over_area() -> None:
    # hand-computed, common practice: 30 000 N / 200 mm² = 150 MPa; compression checked on magnitude
    assert net_section_average(30_000.0, 200.0) == pytest.approx(150.0, rel=REL)
    assert net_section_average(-30_000.0, 200.0) == pytest.approx(150.0, rel=REL)


def test_margin_and_achieved_factor() -> None:
    # hand-computed, common practice: 200/150 - 1 = 1/3; 300/150 = 2
    assert margin_of_safety(200.0, 150.0) == pytest.approx(1.0 / 3.0, rel=REL)
    assert achieved_factor_of_safety(300.0, 150.0) == pytest.approx(2.0, rel=REL)
    # no stress: nothing to fail
    assert margin_of_safety(200.0, 0.0) == math.inf
    assert achieved_factor_of_safety(300.0, 0.0) == math.inf


def test_required_area_and_thickness_both_ways() -> None:
    # hand-computed, common practice: 30 000 N / 200 MPa = 150 mm²; with Kt 2: 300 mm²
    assert required_net_area(30_000.0, 200.0) == pytest.approx(150.0, rel=REL)
    assert required_net_area(30_000.0, 200.0, kt=2.0) == pytest.approx(300.0, rel=REL)
    # hand-computed: 150 mm² / 20 mm = 7.5 mm
    assert required_thickness(150.0, 20.0) == pytest.approx(7.5, rel=REL)


def test_hand_and_peak_checks() -> None:
    # hand-computed, common practice: 150 MPa vs 200 MPa passes (margin 1/3); 300 vs 200 fails (-1/3)
    hand = hand_check(30_000.0, 200.0, 200.0)
    assert hand.passes and hand.margin == pytest.approx(1.0 / 3.0, rel=REL)
    peak = peak_check(300.0, 200.0)
    assert not peak.passes and peak.margin == pytest.approx(-1.0 / 3.0, rel=REL)
    # exactly at the allowable passes with zero margin (definition: actual <= allowable)
    edge = peak_check(200.0, 200.0)
    assert edge.passes and edge.margin == 0.0


def _ductile_case(ductile: bool = True):
    # S-type plate: 20 mm net width x 10 mm thick = 200 mm² net, 30 kN, Kt_net 2 -> peak 300 MPa,
    # yield 300 MPa / 1.5, ultimate 450 MPa / 2.0
    return design_check(
        force_n=30_000.0, net_area_mm2=200.0, net_width_mm=20.0, thickness_mm=10.0,
        peak_mpa=300.0, kt_net=2.0, yield_mpa=300.0, ultimate_mpa=450.0,
        fos_yield=1.5, fos_ultimate=2.0, ductile=ductile,
    )


def test_design_check_numbers() -> None:
    c = _ductile_case()
    # hand-computed, common practice: allowables 300/1.5 = 200 and 450/2 = 225 MPa; yield governs
    assert c.allowable_yield_mpa == pytest.approx(200.0, rel=REL)
    assert c.allowable_ultimate_mpa == pytest.approx(225.0, rel=REL)
    assert c.allowable_mpa == pytest.approx(200.0, rel=REL) and c.governing_criterion == "yield"
    # hand-computed: average 30 000 / 200 = 150 MPa; margins 200/150 - 1 and 200/300 - 1
    assert c.net_average_mpa == pytest.approx(150.0, rel=REL)
    assert c.net_margin == pytest.approx(1.0 / 3.0, rel=REL)
    assert c.peak_margin == pytest.approx(-1.0 / 3.0, rel=REL)
    # hand-computed: achieved factors 300/150, 300/300, 450/150, 450/300
    assert c.achieved_fos_net_yield == pytest.approx(2.0, rel=REL)
    assert c.achieved_fos_peak_yield == pytest.approx(1.0, rel=REL)
    assert c.achieved_fos_net_ultimate == pytest.approx(3.0, rel=REL)
    assert c.achieved_fos_peak_ultimate == pytest.approx(1.5, rel=REL)
    # hand-computed: required area 30 000/200 = 150 mm² (t = 7.5 mm), with Kt 2: 300 mm² (t = 15 mm)
    assert c.required_net_area_mm2 == pytest.approx(150.0, rel=REL)
    assert c.required_net_area_kt_mm2 == pytest.approx(300.0, rel=REL)
    assert c.required_thickness_mm == pytest.approx(7.5, rel=REL)
    assert c.required_thickness_kt_mm == pytest.approx(15.0, rel=REL)


def test_ductile_part_net_section_governs_and_peak_is_still_reported() -> None:
    c = _ductile_case(ductile=True)
    assert c.net_passes and not c.peak_passes
    assert c.governing_check == "net-section" and c.passes
    text = " ".join(c.statements)
    assert "local yielding" in text and "net-section average check governs" in text
    assert "common practice" in text
    assert "Peak 300 MPa" in text and "FAILS" in text  # the failing peak is not hidden


def test_brittle_part_peak_governs() -> None:
    c = _ductile_case(ductile=False)
    assert c.governing_check == "peak" and not c.passes
    assert c.statements[0].startswith("Brittle material")
    assert "peak check governs" in c.statements[0]


def test_ultimate_can_govern() -> None:
    # hand-computed, common practice: 300/1.5 = 200 MPa vs 400/2.5 = 160 MPa -> ultimate governs
    c = design_check(30_000.0, 200.0, 20.0, 10.0, 300.0, 2.0, 300.0, 400.0, 1.5, 2.5, True)
    assert c.governing_criterion == "ultimate"
    assert c.allowable_mpa == pytest.approx(160.0, rel=REL)
    # hand-computed: 30 000 / 160 = 187.5 mm²
    assert c.required_net_area_mm2 == pytest.approx(187.5, rel=REL)


def test_without_ultimate() -> None:
    c = design_check(30_000.0, 200.0, 20.0, 10.0, 300.0, 2.0, 300.0, None, 1.5, None, True)
    assert c.allowable_ultimate_mpa is None and c.achieved_fos_net_ultimate is None
    assert c.governing_criterion == "yield"


def test_peak_above_yield_is_flagged() -> None:
    # peak 360 MPa above yield 300 MPa: the elastic peak is not the true stress
    c = design_check(36_000.0, 200.0, 20.0, 10.0, 360.0, 2.0, 300.0, None, 1.0, None, True)
    assert any("exceeds the yield strength" in s for s in c.statements)
    c2 = _ductile_case()
    assert not any("exceeds the yield strength" in s for s in c2.statements)


@pytest.mark.parametrize(
    "call",
    [
        lambda: allowable_stress(300.0, 0.9),  # a factor below 1 is refused
        lambda: allowable_stress(-300.0, 1.5),
        lambda: net_section_average(1.0, 0.0),
        lambda: required_net_area(1.0, 200.0, kt=0.5),
        lambda: required_thickness(150.0, 0.0),
        lambda: design_check(1.0, 200.0, 20.0, 10.0, 1.0, 2.0, 300.0, 450.0, 1.5, None, True),
        lambda: design_check(1.0, 200.0, 20.0, 10.0, 1.0, 2.0, 300.0, 250.0, 1.5, 2.0, True),
    ],
)
def test_bad_arguments_are_refused(call) -> None:
    with pytest.raises(ValueError):
        call()


@given(
    force=st.floats(1.0, 1e7),
    area=st.floats(1.0, 1e5),
    strength=st.floats(50.0, 2000.0),
    fos=st.floats(1.0, 5.0),
)
def test_required_area_brings_margin_to_zero(force: float, area: float, strength: float, fos: float) -> None:
    # definition (common practice): at the required area the average equals the allowable, margin 0
    allowable = allowable_stress(strength, fos)
    needed = required_net_area(force, allowable)
    assert margin_of_safety(allowable, net_section_average(force, needed)) == pytest.approx(0.0, abs=1e-9)
    # and the achieved factor of safety at that area is the requested one
    assert achieved_factor_of_safety(strength, force / needed) == pytest.approx(fos, rel=1e-9)
