"""The sign-off for every load kind: the hand check on the load's own nominal, the peak by both criteria, a
pin's bearing, and the fatigue screen with a cycle given as multiples of the [load].

Sources of the expected values:
- The nominal of each load (common practice, docs/references.md [Practice]; beam theory, [Timoshenko-Goodier]):
  axial N / A_net; bending |M| c / I of the net section about its own centroid; axial with bending the
  larger extreme-fibre N / A + M s / I; a pin P / A_net and the bearing stress P / (d t). Each is computed
  here by hand from the exact geometry and compared to round-off (the check takes them from statics on the
  exact section, not from the mesh).
- The criteria (docs/references.md [Criteria], from memory): von Mises for ductile metals, maximum principal
  for brittle ones. A remote state's von Mises stress sqrt(sx^2 - sx sy + sy^2 + 3 txy^2) is exact; under pure
  shear the hole's edge carries 4 txy (Kirsch superposed, docs/references.md [Kirsch]), by either criterion,
  within 2 % for a hole 1/20 of the plate (as tests/test_remote.py).
- Plane strain: on a traction-free edge szz = nu s, so von Mises is s sqrt(1 - nu + nu^2) (the definition).
- The bearing strength default 1.5 x yield (docs/references.md [Pin-bearing], common practice).
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.geometry.partfile import load_part, part_from_dict

from conftest import EXAMPLES

EXACT = 1e-6  # hand calculations from exact geometry (the section cuts a fine polygon of the hole, as in test_signoff.py)
W, T, D, YC = 60.0, 8.0, 10.0, 15.0  # plate width and thickness, hole diameter and its offset towards +y (mm)
M, N = 1.0e6, 20_000.0  # N mm, N


def _net_section():
    """Area, centroid, second moment and extreme fibres of the section through the offset hole (hand-computed
    from its two ligaments [-30, 10] and [20, 30] mm)."""
    ligaments = [(-W / 2, YC - D / 2), (YC + D / 2, W / 2)]
    lengths = [b - a for a, b in ligaments]
    middles = [(a + b) / 2 for a, b in ligaments]
    area = T * sum(lengths)
    centroid = sum(l * m for l, m in zip(lengths, middles)) / sum(lengths)
    inertia = T * sum(l**3 / 12 + l * (m - centroid) ** 2 for l, m in zip(lengths, middles))
    return area, centroid, inertia, (-W / 2 - centroid, W / 2 - centroid)


def _bar(load, **tables):
    return part_from_dict({
        "title": "bar with an offset hole",
        "plate": {"length": 240.0, "width": W, "thickness": T},
        "hole": [{"center": [0.0, YC], "diameter": D}],
        "material": {"grade": "s355"},
        "load": load,
        "mesh": {"tolerance": 0.02},
        **tables,
    })


@pytest.fixture(scope="module")
def bending():
    return check_part(_bar({"bending": M}, design={"yield_factor": 1.5},
                           fatigue={"min_fraction": -1.0, "max_fraction": 1.0}))


def test_bending_hand_check_is_m_c_over_i(bending) -> None:
    area, centroid, inertia, (bottom, top) = _net_section()
    c = bending.design.check
    # beam theory on the net section (hand-computed): |M| c / I with c the farther fibre from the centroid
    assert c.load_kind == "bending" and c.hand.key == "net-section"
    assert c.hand.actual_mpa == pytest.approx(M * max(-bottom, top) / inertia, rel=EXACT)
    # required thickness: every stress goes as 1 / t (definition): t x actual / allowable
    assert c.hand.required_thickness_mm == pytest.approx(T * c.hand.actual_mpa / (355.0 / 1.5), rel=EXACT)
    assert c.hand.achieved_fos_yield == pytest.approx(355.0 / c.hand.actual_mpa, rel=EXACT)


def test_bending_cycle_scales_the_notch(bending) -> None:
    # a fully reversed cycle of the [load]: the notch runs from -peak to +peak, the nominal from -S to +S with
    # S the bending nominal (linear elasticity); sa = S, sm = 0 (definitions)
    s = bending.fatigue.screen
    peak, nominal = bending.peak.stress, bending.design.check.hand.actual_mpa
    assert s.cycle.high.peak_mpa == pytest.approx(peak, rel=EXACT)
    assert s.cycle.low.peak_mpa == pytest.approx(-peak, rel=EXACT)
    assert s.sa_nominal_mpa == pytest.approx(nominal, rel=EXACT) and s.sm_nominal_mpa == pytest.approx(0.0, abs=1e-9)
    assert bending.fatigue.forces is None  # a moment is not one force


def test_combined_hand_check_is_the_extreme_fibre() -> None:
    r = check_part(_bar({"axial": N, "bending": M}, design={"yield_factor": 1.5}))
    area, centroid, inertia, fibres = _net_section()
    # the axial force acts at the gross centroid y = 0, above the net centroid: about the net centroid the
    # moment is M + N (0 - centroid), positive stretching +y (statics); then the larger |N / A + M s / I|
    moment = M + N * (0.0 - centroid)
    expected = max(abs(N / area + moment * s / inertia) for s in fibres)
    c = r.design.check
    assert c.load_kind == "combined" and c.hand.actual_mpa == pytest.approx(expected, rel=EXACT)


@pytest.fixture(scope="module")
def clevis():
    return check_part(load_part(EXAMPLES / "trolley_clevis_half.toml"))


def test_pin_net_tension_and_bearing(clevis) -> None:
    c = clevis.design.check
    force, width, hole, thickness = 24_000.0, 50.0, 20.0, 8.0  # examples/trolley_clevis_half.toml
    # hand-computed: net tension P / ((W - d) t) = 100 MPa; bearing P / (d t) = 150 MPa
    assert c.hand.actual_mpa == pytest.approx(force / ((width - hole) * thickness), rel=EXACT)
    assert c.bearing.actual_mpa == pytest.approx(force / (hole * thickness), rel=EXACT)
    # the default bearing strength 1.5 x yield 355 MPa ([Pin-bearing], common practice), over the factor 1.5
    assert c.bearing_strength_mpa == pytest.approx(1.5 * 355.0, rel=EXACT)
    assert c.bearing.allowable_mpa == pytest.approx(355.0, rel=EXACT)
    assert c.bearing.required_thickness_mm == pytest.approx(thickness * 150.0 / 355.0, rel=EXACT)
    assert c.passes and c.bearing.passes
    assert any("bearing" in line.lower() and "common practice" in line for line in clevis.design.basis)


def test_pin_fatigue_cycle_in_fractions(clevis) -> None:
    f = clevis.fatigue
    # 0 to 0.4 of a 24 kN pull (examples/trolley_clevis_half.toml): 0 to 9.6 kN, nominal 0 to 40 MPa
    assert f.forces == pytest.approx((0.0, 9_600.0), rel=EXACT)
    assert f.screen.cycle.high.nominal_mpa == pytest.approx(0.4 * 100.0, rel=EXACT)
    assert f.screen.cycle.high.peak_mpa == pytest.approx(0.4 * clevis.peak.stress, rel=EXACT)


def test_rigid_pin_peaks_leave_out_the_contact() -> None:
    r = check_part(load_part(EXAMPLES / "gate_hinge_strap.toml"))
    design = r.design
    # the von Mises peak lies on the hole's free edge, outside the contact arc the pin found
    center, radius = np.array([60.0, 0.0]), 10.0  # examples/gate_hinge_strap.toml
    offset = np.asarray(design.von_mises_location) - center
    assert np.hypot(*offset) == pytest.approx(radius, rel=1e-6)
    angle = abs(math.degrees(math.atan2(offset[1], offset[0])))
    low, high = r.solution.contact.arc
    assert angle > max(abs(low), abs(high))
    assert design.check.bearing is not None and design.check.passes


@pytest.fixture(scope="module")
def shear():
    return check_part(part_from_dict({
        "plate": {"length": 200.0, "width": 200.0, "thickness": 2.0},
        "hole": [{"center": [0.0, 0.0], "diameter": 10.0}],
        "material": {"grade": "6061-t6"},
        "load": {"remote": {"txy": 100.0}},
        "design": {"yield_factor": 1.5},
    }))


def test_remote_shear_hand_check_by_von_mises_and_peaks_by_both_criteria(shear) -> None:
    c = shear.design.check
    # von Mises of pure shear: sqrt(3) txy (exact, [Criteria])
    assert c.hand.key == "remote-stress" and c.hand.actual_mpa == pytest.approx(math.sqrt(3.0) * 100.0, rel=EXACT)
    assert c.hand.required_thickness_mm is None and c.net_width_mm is None
    # Kirsch superposed: 4 txy on the hole's edge by either criterion, within 2 % ([Kirsch])
    assert c.peak_von_mises.actual_mpa == pytest.approx(400.0, rel=0.02)
    assert c.peak_principal.actual_mpa == pytest.approx(400.0, rel=0.02)


def test_remote_shear_for_a_brittle_material_takes_the_principal_stress(shear) -> None:
    from dataclasses import replace

    from stressraiser.compare.signoff import with_signoff

    spec = replace(shear.spec, design=replace(shear.spec.design, behaviour="brittle"))
    c = with_signoff(replace(shear, spec=spec)).design.check
    # pure shear's principal stresses are +-txy (exact): the brittle hand check takes 100 MPa
    assert c.hand.actual_mpa == pytest.approx(100.0, rel=EXACT)
    assert c.governing_check == "peak" and c.peak_criterion == "maximum principal"


def test_plane_strain_von_mises_is_below_the_principal_peak() -> None:
    text = (EXAMPLES / "winch_strap.toml").read_text().replace("[plate]", '[plate]\ncondition = "plane-strain"')
    text += "\n[design]\nbehaviour = \"ductile\"\n"
    from stressraiser.geometry.partfile import parse_part

    r = check_part(parse_part(text))
    c = r.design.check
    nu = 0.3  # examples/winch_strap.toml
    # on the hole's free edge szz = nu s: von Mises s sqrt(1 - nu + nu^2) (definition), within the bands
    assert c.peak_von_mises.actual_mpa == pytest.approx(c.peak_principal.actual_mpa * math.sqrt(1 - nu + nu**2),
                                                        rel=0.01)
    assert c.peak is c.peak_von_mises  # ductile: von Mises governs the peak check, the principal is shown


def test_first_cycle_yield_and_local_strain_in_the_record(tmp_path) -> None:
    out = tmp_path / "splice.json"
    assert main(["check", str(EXAMPLES / "mezzanine_splice_plate.toml"), "--json", str(out), "--quiet"]) == 0
    f = json.loads(out.read_text())["fatigue"]
    assert f["cycle"]["min_fraction"] == 0.6 and f["cycle"]["max_fraction"] == 1.0
    assert f["cycle"]["min_force"] == pytest.approx(36_000.0, rel=EXACT)  # 0.6 x 60 kN
    y = f["first_cycle_yield"]
    # the elastic notch stress at the top of the cycle is the peak of the [load], above S355's 355 MPa
    assert y["yields"] is True and y["elastic_peak"] == pytest.approx(f["notch"]["max"]["peak"], rel=EXACT)
    assert y["elastic_peak"] > y["yield"] == 355.0
    local = f["local"]
    assert local["curve"] == {"E": 210_000.0, "K": 776.0, "n": 0.15, "source": "given in [fatigue]"}
    # Neuber's product on first loading (docs/references.md [Neuber]): sigma eps E = elastic^2
    high = local["high"]
    assert high["stress"] * high["strain"] * 210_000.0 == pytest.approx(y["elastic_peak"] ** 2, rel=1e-9)
    assert high["stress"] < 355.0 < y["elastic_peak"]
    assert any("not a fatigue life" in s for s in f["statements"])
