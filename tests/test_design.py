"""Static design check: hand-computed cases from the definitions (common practice).

Definitions used for every expected value below (facts of the trade, common practice, see
docs/references.md [Practice]): allowable stress = failure stress / factor of safety; average normal stress =
force / area; margin of safety = allowable / actual - 1; factor of safety = failure load / allowable load
(so achieved factor = failure stress / actual stress); required area = load / allowable stress, and, since
every stress of a force-loaded plate goes as 1 / thickness, required thickness = t x actual / allowable.
The criteria: von Mises for a ductile metal, maximum principal stress for a brittle one (docs/references.md
[Criteria], Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., ch. 5, from memory).
The bearing strength of a pin hole: docs/references.md [Pin-bearing] (common practice).
Tolerance: rel 1e-12 (exact arithmetic on small decimals).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stressraiser.compare.design import (
    HandStress,
    achieved_factor_of_safety,
    allowable_stress,
    design_check,
    margin_of_safety,
    scaled_thickness,
)

REL = 1e-12
AXIAL = HandStress("net-section", "net-section average", "N / A_net", 30_000.0 / 200.0)  # 30 kN on 200 mm²


def test_allowable_stress_is_failure_over_factor() -> None:
    # hand-computed, common practice: 300 MPa / 1.5 = 200 MPa
    assert allowable_stress(300.0, 1.5) == pytest.approx(200.0, rel=REL)


def test_margin_and_achieved_factor() -> None:
    # hand-computed, common practice: 200/150 - 1 = 1/3; 300/150 = 2
    assert margin_of_safety(200.0, 150.0) == pytest.approx(1.0 / 3.0, rel=REL)
    assert achieved_factor_of_safety(300.0, 150.0) == pytest.approx(2.0, rel=REL)
    # no stress: nothing to fail
    assert margin_of_safety(200.0, 0.0) == math.inf
    assert achieved_factor_of_safety(300.0, 0.0) == math.inf


def test_required_thickness_is_the_required_area_over_the_net_width() -> None:
    # hand-computed, common practice: 30 000 N / 200 MPa = 150 mm² over a 20 mm net width = 7.5 mm; the same
    # from a 10 mm plate whose 150 MPa average must come down to 200 MPa: 10 x 150 / 200
    assert scaled_thickness(10.0, 150.0, 200.0) == pytest.approx(30_000.0 / 200.0 / 20.0, rel=REL)


def _case(ductile: bool = True, von_mises: float = 300.0, principal: float = 300.0, **kw):
    # 20 mm net width x 10 mm thick = 200 mm² net, 30 kN, Kt_net 2 -> peak 300 MPa,
    # yield 300 MPa / 1.5, ultimate 450 MPa / 2.0
    args = dict(hand=AXIAL, peak_von_mises_mpa=von_mises, peak_principal_mpa=principal, kt_net=2.0,
                thickness_mm=10.0, net_width_mm=20.0, yield_mpa=300.0, ultimate_mpa=450.0, fos_yield=1.5,
                fos_ultimate=2.0, ductile=ductile)
    return design_check(**(args | kw))


def test_design_check_numbers() -> None:
    c = _case()
    # hand-computed, common practice: allowables 300/1.5 = 200 and 450/2 = 225 MPa; yield governs
    assert c.allowable_yield_mpa == pytest.approx(200.0, rel=REL)
    assert c.allowable_ultimate_mpa == pytest.approx(225.0, rel=REL)
    assert c.allowable_mpa == pytest.approx(200.0, rel=REL) and c.governing_criterion == "yield"
    # hand-computed: average 30 000 / 200 = 150 MPa; margins 200/150 - 1 and 200/300 - 1
    assert c.hand.actual_mpa == pytest.approx(150.0, rel=REL)
    assert c.hand.margin == pytest.approx(1.0 / 3.0, rel=REL)
    assert c.peak.margin == pytest.approx(-1.0 / 3.0, rel=REL)
    # hand-computed: achieved factors 300/150, 300/300, 450/150, 450/300
    assert c.hand.achieved_fos_yield == pytest.approx(2.0, rel=REL)
    assert c.peak.achieved_fos_yield == pytest.approx(1.0, rel=REL)
    assert c.hand.achieved_fos_ultimate == pytest.approx(3.0, rel=REL)
    assert c.peak.achieved_fos_ultimate == pytest.approx(1.5, rel=REL)
    # hand-computed: required area 30 000/200 = 150 mm² (t = 7.5 mm), with Kt 2: 300 mm² (t = 15 mm)
    assert c.required_net_area_mm2 == pytest.approx(150.0, rel=REL)
    assert c.required_net_area_kt_mm2 == pytest.approx(300.0, rel=REL)
    assert c.hand.required_thickness_mm == pytest.approx(7.5, rel=REL)
    assert c.peak.required_thickness_mm == pytest.approx(15.0, rel=REL)


def test_ductile_part_hand_check_governs_and_peak_is_judged_by_von_mises() -> None:
    # a von Mises peak below the principal one (as in plane strain, where szz = nu (sxx + syy)):
    # a ductile part's peak check takes von Mises, a brittle part's the principal stress ([Criteria])
    c = _case(ductile=True, von_mises=270.0, principal=300.0)
    assert c.peak_criterion == "von Mises" and c.peak is c.peak_von_mises
    assert c.peak.actual_mpa == pytest.approx(270.0, rel=REL)
    assert c.hand.passes and not c.peak.passes
    assert c.governing_check == "net-section" and c.passes
    text = " ".join(c.statements)
    assert "local yielding" in text and "net-section average check governs" in text
    assert "common practice" in text
    assert "Peak by von Mises" in text and "FAILS" in text  # the failing peak is not hidden
    assert "By maximum principal the peak is 300 MPa" in text  # the other criterion is shown


def test_brittle_part_peak_governs_by_principal_stress() -> None:
    c = _case(ductile=False, von_mises=270.0, principal=300.0)
    assert c.governing_check == "peak" and c.peak_criterion == "maximum principal" and not c.passes
    assert c.peak.actual_mpa == pytest.approx(300.0, rel=REL)
    assert c.statements[0].startswith("Brittle material")
    assert "peak check governs" in c.statements[0]
    # the other criterion (von Mises) is shown and not governing: 200 / 270 - 1
    assert c.checks[-1].key == "peak-von-mises" and c.checks[-1].margin == pytest.approx(200 / 270 - 1, rel=REL)


def test_ultimate_can_govern() -> None:
    # hand-computed, common practice: 300/1.5 = 200 MPa vs 400/2.5 = 160 MPa -> ultimate governs
    c = _case(ultimate_mpa=400.0, fos_ultimate=2.5)
    assert c.governing_criterion == "ultimate"
    assert c.allowable_mpa == pytest.approx(160.0, rel=REL)
    # hand-computed: 30 000 / 160 = 187.5 mm²
    assert c.required_net_area_mm2 == pytest.approx(187.5, rel=REL)


def test_without_ultimate() -> None:
    c = _case(ultimate_mpa=None, fos_ultimate=None)
    assert c.allowable_ultimate_mpa is None and c.hand.achieved_fos_ultimate is None
    assert c.governing_criterion == "yield"


def test_peak_above_yield_is_flagged() -> None:
    # peak 360 MPa above yield 300 MPa: the elastic peak is not the true stress
    c = _case(von_mises=360.0, principal=360.0, fos_yield=1.0)
    assert any("exceeds the yield strength" in s for s in c.statements)
    assert not any("exceeds the yield strength" in s for s in _case().statements)


def test_pin_bearing_has_its_own_allowable_and_must_pass() -> None:
    # bearing 250 MPa against a bearing strength 450 MPa / 1.5 = 300 MPa: margin 300/250 - 1 = 0.2, and a
    # required thickness 10 x 250 / 300 (definitions above; [Pin-bearing] common practice)
    c = _case(load_kind="pin", bearing_mpa=250.0, bearing_strength_mpa=450.0)
    b = c.bearing
    assert b.allowable_mpa == pytest.approx(300.0, rel=REL) and b.margin == pytest.approx(0.2, rel=REL)
    assert b.achieved_fos_yield == pytest.approx(450.0 / 250.0, rel=REL) and b.achieved_fos_ultimate is None
    assert b.required_thickness_mm == pytest.approx(10.0 * 250.0 / 300.0, rel=REL)
    assert [line.key for line in c.checks] == ["net-section", "bearing", "peak-von-mises", "peak-principal"]
    assert c.passes
    # a failing bearing fails the part even when the governing net-section check passes
    failing = _case(load_kind="pin", bearing_mpa=320.0, bearing_strength_mpa=450.0)
    assert failing.hand.passes and not failing.bearing.passes and not failing.passes


def test_remote_stress_has_no_required_thickness() -> None:
    remote = HandStress("remote-stress", "remote stress", "von Mises of the remote sx, sy, txy", 90.0, False)
    c = _case(hand=remote, net_width_mm=None, load_kind="remote")
    assert c.hand.required_thickness_mm is None and c.peak.required_thickness_mm is None
    assert c.required_net_area_mm2 is None and c.governing_check == "remote-stress"
    assert any("No required thickness" in s for s in c.statements)


@pytest.mark.parametrize(
    "call",
    [
        lambda: allowable_stress(300.0, 0.9),  # a factor below 1 is refused
        lambda: allowable_stress(-300.0, 1.5),
        lambda: scaled_thickness(10.0, 1.0, 0.0),
        lambda: _case(fos_ultimate=None),  # an ultimate without its factor
        lambda: _case(ultimate_mpa=250.0),  # ultimate below yield
        lambda: _case(bearing_mpa=100.0),  # a bearing stress without its strength
        lambda: _case(thickness_mm=0.0),
    ],
)
def test_bad_arguments_are_refused(call) -> None:
    with pytest.raises(ValueError):
        call()


@given(
    stress=st.floats(1.0, 1e4),
    thickness=st.floats(0.1, 100.0),
    strength=st.floats(50.0, 2000.0),
    fos=st.floats(1.0, 5.0),
)
def test_required_thickness_brings_margin_to_zero(stress: float, thickness: float, strength: float, fos: float) -> None:
    # definition (common practice): a stress going as 1 / t equals the allowable at the required thickness
    allowable = allowable_stress(strength, fos)
    needed = scaled_thickness(thickness, stress, allowable)
    assert margin_of_safety(allowable, stress * thickness / needed) == pytest.approx(0.0, abs=1e-9)
    # and the achieved factor of safety there is the requested one
    assert achieved_factor_of_safety(strength, stress * thickness / needed) == pytest.approx(fos, rel=1e-9)
