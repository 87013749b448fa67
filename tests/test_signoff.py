"""The sign-off end to end: part file -> converged FE -> design check and fatigue screen -> report.

Sources of the expected values:
- Definitions (common practice; docs/references.md [Practice]): allowable stress = failure stress / factor of
  safety; average = force / area; margin = allowable / actual - 1; factor of safety = failure load /
  allowable load, so achieved factor = failure stress / actual stress; required area = load / allowable.
- Kt of a central hole in a finite-width strip: Pilkey & Pilkey, Peterson's Stress Concentration
  Factors, 3rd ed. (2008), chart 4.1 curve fit (docs/references.md [Howland], [Peterson]; validity range from memory).
  The FE is known to agree with it within 0.4 % (tests/test_central_hole.py), so 1 % is used here for
  every figure that carries Kt.
- Notch sensitivity: docs/references.md [Peterson-q], [Shigley] check points, Peterson (R. E. Peterson in Sines & Waisman,
  Metal Fatigue, 1959, from memory) and Neuber's steel fit (Budynas & Nisbett, Shigley's Mechanical
  Engineering Design, 9th ed., eq. 6-35, from memory): Su 700 MPa, r 1 mm -> q 0.848 / 0.765, 1 %.
- Steel endurance estimate Se' = 0.5 Su (common practice).
- Material values: EN 10025-2:2004 S355, ReH 355 MPa and Rm 470 MPa for t <= 16 mm (from memory),
  as in the built-in table.
- Unit factors: NIST SP 811 (2008), appendix B: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N (exact).
"""

from __future__ import annotations

import contextlib
import io
import json
from dataclasses import replace

import pytest

from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.compare.signoff import with_signoff
from stressraiser.geometry.partfile import parse_part, part_from_dict
from stressraiser.geometry.spec import DesignSpec

from conftest import EXAMPLES, strap

EXACT = 1e-6  # hand-computed from exact geometry (the net width comes from a fine polygon, 2e-5 r)
KT_REL = 0.01  # figures that carry the FE Kt, against the chart 4.1 fit
INCH, LBF = 25.4, 4.4482216152605  # NIST SP 811, exact
PSI = LBF / INCH**2  # MPa per psi, by definition psi = lbf / in²


def peterson_chart_4_1(x: float) -> float:
    """Ktn of a central hole, d/W = x: Pilkey & Pilkey 3rd ed. chart 4.1 fit (docs/references.md [Howland], [Peterson])."""
    return 2.0 + 0.284 * (1 - x) - 0.600 * (1 - x) ** 2 + 1.32 * (1 - x) ** 3


# --- the design check: hand-computed definitions on a converged part ------------------------------------

STRAP = strap(title="design hand case", material={"grade": "s355"}, design={"yield_factor": 1.5, "ultimate_factor": 2.0})


@pytest.fixture(scope="module")
def strap_result():
    return check_part(part_from_dict(STRAP))


def test_design_follows_the_definitions(strap_result) -> None:
    c = strap_result.design.check
    # hand-computed: net area (80 - 22) x 10 = 580 mm²; average 120 000 / 580 = 206.897 MPa
    assert strap_result.net_section.area == pytest.approx(580.0, rel=EXACT)
    assert c.hand.actual_mpa == pytest.approx(120_000.0 / 580.0, rel=EXACT)
    assert c.load_kind == "axial" and c.hand.formula == "N / A_net"
    # common practice: allowables 355 / 1.5 = 236.67 and 470 / 2 = 235 MPa (S355, EN 10025-2, from memory);
    # the smaller, on ultimate, governs
    assert c.allowable_yield_mpa == pytest.approx(355.0 / 1.5, rel=EXACT)
    assert c.allowable_ultimate_mpa == pytest.approx(235.0, rel=EXACT)
    assert c.allowable_mpa == pytest.approx(235.0, rel=EXACT) and c.governing_criterion == "ultimate"
    # common practice: margin 235 / 206.897 - 1; achieved factors 355 / 206.897 and 470 / 206.897
    assert c.hand.margin == pytest.approx(235.0 * 580.0 / 120_000.0 - 1.0, rel=EXACT)
    assert c.hand.achieved_fos_yield == pytest.approx(355.0 * 580.0 / 120_000.0, rel=EXACT)
    assert c.hand.achieved_fos_ultimate == pytest.approx(470.0 * 580.0 / 120_000.0, rel=EXACT)
    # the same factor as failure load / applied load (common practice): 355 MPa x 580 mm² / 120 kN
    assert c.hand.achieved_fos_yield == pytest.approx((355.0 * 580.0) / 120_000.0, rel=EXACT)
    # common practice: required area 120 000 / 235 = 510.64 mm², thickness over the 58 mm net width
    assert c.required_net_area_mm2 == pytest.approx(120_000.0 / 235.0, rel=EXACT)
    assert c.hand.required_thickness_mm == pytest.approx(120_000.0 / 235.0 / 58.0, rel=EXACT)
    assert c.hand.passes and c.passes and c.governing_check == "net-section"


def test_design_with_the_concentration(strap_result) -> None:
    c = strap_result.design.check
    kt = peterson_chart_4_1(22.0 / 80.0)  # Pilkey & Pilkey 3rd ed. chart 4.1 fit: 2.3935
    average = 120_000.0 / 580.0
    # required area with Kt = Kt x load / allowable; peak = Kt x average (definitions, common practice)
    assert c.required_net_area_kt_mm2 == pytest.approx(kt * 120_000.0 / 235.0, rel=KT_REL)
    assert c.peak.required_thickness_mm == pytest.approx(kt * 120_000.0 / 235.0 / 58.0, rel=KT_REL)
    # the peak sits on the hole's free edge, where von Mises is the tangential stress ([Criteria]): both
    # criteria give Kt x average, each converged over the levels
    assert c.peak_criterion == "von Mises"
    for line in (c.peak_von_mises, c.peak_principal):
        assert line.actual_mpa == pytest.approx(kt * average, rel=KT_REL)
    assert 1.0 + c.peak.margin == pytest.approx(235.0 / (kt * average), rel=KT_REL)
    assert c.peak.achieved_fos_yield == pytest.approx(355.0 / (kt * average), rel=KT_REL)
    assert not c.peak.passes  # the peak (about 495 MPa) is above the allowable and is still reported
    text = " ".join(c.statements)
    assert "net-section average check governs (common practice)" in text
    assert "Reported, not hidden" in text and "FAILS" in text


def test_brittle_behaviour_makes_the_peak_govern(strap_result) -> None:
    # same converged part, behaviour stated brittle: the peak check governs and fails (peak > allowable)
    spec = replace(strap_result.spec, design=DesignSpec(yield_factor=1.5, ultimate_factor=2.0,
                                                        behaviour="brittle", behaviour_basis="stated"))
    c = with_signoff(replace(strap_result, spec=spec)).design.check
    assert c.governing_check == "peak" and not c.passes
    assert c.statements[0].startswith("Brittle material")


def test_design_basis_states_assumptions_and_defers_to_code(strap_result) -> None:
    basis = " ".join(strap_result.design.basis)
    assert "Factor of safety 1.5 on yield (as given)" in basis and "2 on ultimate" in basis
    assert "ductile (from the material grade s355)" in basis
    assert "does not replace" in basis and "licensed engineer" in basis
    assert "buckling" in basis  # what is not checked is said


def test_default_factor_is_stated() -> None:
    spec = parse_part(_toml(STRAP, design={}))
    assert spec.design.yield_factor == 1.5 and spec.design.ultimate_factor is None
    assert spec.design.defaults == ("yield_factor", "behaviour")


# --- the fatigue screen: root radius from the geometry ----------------------------------------------------

LINK = """
title = "small steel link, 2 mm hole"
[plate]
length = 60.0
width = 10.0
thickness = 2.0
[[hole]]
center = [0.0, 0.0]
diameter = 2.0
[material]
E = 205000.0
nu = 0.3
yield = 450.0
ultimate = 700.0
family = "steel"
[load]
axial = 2000.0
[fatigue]
alternating_force = 1000.0
mean_force = 0.0
"""


@pytest.fixture(scope="module")
def link_record(tmp_path_factory):
    out = tmp_path_factory.mktemp("link") / "link.json"
    part = out.with_suffix(".toml")
    part.write_text(LINK + 'notch_sensitivity = "peterson"\n')
    assert main(["check", str(part), "--json", str(out), "--quiet"]) == 0
    return json.loads(out.read_text())


def test_peterson_q_from_the_hole_radius(link_record) -> None:
    f = link_record["fatigue"]
    # the root radius is the radius of hole 1, the raiser carrying the peak: 2 mm / 2
    assert f["feature"] == "hole 1" and f["root_radius"] == pytest.approx(1.0, rel=1e-12)
    # docs/references.md [Peterson-q], [Shigley], Peterson (Sines & Waisman 1959, from memory): Su 700 MPa, r 1 mm -> q 0.848
    assert f["notch_sensitivity"]["method"] == "peterson"
    assert f["notch_sensitivity"]["q"] == pytest.approx(0.848, rel=0.01)
    # Kf = 1 + q (Kt - 1) with Kt from chart 4.1 (d/W = 0.2 -> 2.519, docs/references.md [Howland], [Peterson]): 2.288
    kf = 1.0 + 0.848 * (peterson_chart_4_1(0.2) - 1.0)
    assert f["kf"] == pytest.approx(kf, rel=KT_REL)
    # fully reversed: n_f = Se' / (Kf sa), Se' = 0.5 x 700 (common practice), sa = 1000 N / 16 mm²
    assert f["strength"] == {"value": 350.0, "basis": "estimate", "life_cycles": None}
    assert f["nominal"]["alternating"] == pytest.approx(1000.0 / 16.0, rel=EXACT)
    assert f["factor"] == pytest.approx(350.0 / (kf * 1000.0 / 16.0), rel=KT_REL)
    assert f["passes"] is True  # 350 / (2.288 x 62.5) = 2.45 >= 1.5 (default required factor)
    assert any("a screen, not a life prediction" in s for s in f["statements"])
    assert any("Se' = 0.5 Su" in s and "surface finish" in s for s in f["statements"])  # the caveat


def test_neuber_q_from_the_hole_radius() -> None:
    result = check_part(parse_part(LINK + 'notch_sensitivity = "neuber"\n'))
    s = result.fatigue.screen
    # docs/references.md [Peterson-q], [Shigley], Shigley 9th ed. eq. 6-35 (from memory): Su 700 MPa, r 1 mm -> q 0.765
    assert s.root_radius_mm == pytest.approx(1.0, rel=1e-12) and s.method == "neuber"
    assert s.q == pytest.approx(0.765, rel=0.01)
    # Kf with chart 4.1's Kt (2.519 at d/W = 0.2): 1 + 0.765 x 1.519 = 2.162
    assert s.kf == pytest.approx(1.0 + 0.765 * (peterson_chart_4_1(0.2) - 1.0), rel=KT_REL)


# --- units: the same part in mm-N-MPa and in in-lbf-psi ---------------------------------------------------

MM_TWIN = f"""
title = "boat-lift strap in mm"
[plate]
length = {10 * INCH!r}
width = {2 * INCH!r}
thickness = {0.25 * INCH!r}
[[hole]]
center = [0.0, 0.0]
diameter = {0.5 * INCH!r}
[material]
grade = "6061-t6"
[load]
axial = {4000 * LBF!r}
[design]
[fatigue]
min_force = {400 * LBF!r}
max_force = {2000 * LBF!r}
"""


@pytest.fixture(scope="module")
def unit_twins(tmp_path_factory):
    """{"inch"|"mm": (JSON record, printed summary)} of the inch example and its mm twin."""
    folder = tmp_path_factory.mktemp("twins")
    (folder / "mm.toml").write_text(MM_TWIN)
    runs = {}
    for name, path in (("inch", EXAMPLES / "dock_lift_strap_inch.toml"), ("mm", folder / "mm.toml")):
        out, printed = folder / f"{name}.json", io.StringIO()
        with contextlib.redirect_stdout(printed):
            assert main(["check", str(path), "--json", str(out)]) == 0
        runs[name] = (json.loads(out.read_text()), printed.getvalue())
    return runs


def test_same_part_in_both_systems_gives_the_same_numbers(unit_twins) -> None:
    inch, mm = unit_twins["inch"][0], unit_twins["mm"][0]
    assert (inch["display_units"], mm["display_units"]) == ("in-lbf-psi", "mm-N-MPa")
    pairs = [
        (inch["kt"]["net"], mm["kt"]["net"]),
        (inch["design"]["net_section"]["margin"], mm["design"]["net_section"]["margin"]),
        (inch["design"]["peak"]["margin"], mm["design"]["peak"]["margin"]),
        (inch["design"]["required"]["net_area_with_kt"], mm["design"]["required"]["net_area_with_kt"]),
        (inch["fatigue"]["factor"], mm["fatigue"]["factor"]),
    ]
    for a, b in pairs:
        assert a == pytest.approx(b, rel=1e-3)  # issue acceptance: within 0.1 %
    # the record stays in mm, N, MPa: the net area is (2 - 0.5) x 0.25 in² = 0.375 x 645.16 mm² (NIST SP 811)
    assert inch["net_section"]["area"] == pytest.approx(0.375 * INCH**2, rel=EXACT)


def _signoff_block(printed: str) -> str:
    return printed[printed.index("Sign-off"):printed.index("Cautions")]


def test_each_report_is_in_its_own_units(unit_twins) -> None:
    inch, mm = _signoff_block(unit_twins["inch"][1]), _signoff_block(unit_twins["mm"][1])
    assert "in-lbf-psi" in inch and "psi" in inch and "lbf" in inch and "in²" in inch
    assert "MPa" not in inch and " mm" not in inch and " N," not in inch
    assert "MPa" in mm and "mm²" in mm and " N " in mm and "psi" not in mm
    # the net-section average 4000 lbf / 0.375 in² = 10667 psi (hand-computed), printed as such
    assert "Net-section average (N / A_net) 10667 psi" in inch
    # and in the mm report the same stress in MPa: 10666.67 psi x 0.006894757 MPa/psi = 73.54 MPa
    assert "Net-section average (N / A_net) 73.54 MPa" in mm
    assert unit_twins["inch"][0]["net_section"]["average"] == pytest.approx(4000 / 0.375 * PSI, rel=EXACT)


# --- the record when nothing is asked for ---------------------------------------------------------------


def test_no_tables_no_signoff(tmp_path, capsys) -> None:
    out = tmp_path / "winch.json"
    assert main(["check", str(EXAMPLES / "winch_strap.toml"), "--json", str(out)]) == 0
    record = json.loads(out.read_text())
    assert record["design"] is None and record["fatigue"] is None
    assert record["display_units"] == "mm-N-MPa"
    assert record["part"]["material"]["yield"] == 355.0 and record["part"]["material"]["grade"] is None
    assert "Sign-off" not in capsys.readouterr().out


def _toml(base: dict, **tables: dict) -> str:
    """TOML text of a part dictionary (tables of scalars and the [[hole]] array only)."""
    data = {**base, **tables}
    lines = [f'title = "{data["title"]}"']
    for name, table in data.items():
        if name == "title":
            continue
        if name == "hole":
            for hole in table:
                lines += ["[[hole]]", f"center = {list(hole['center'])}", f"diameter = {hole['diameter']!r}"]
            continue
        lines.append(f"[{name}]")
        lines += [f"{k} = {json.dumps(v)}" for k, v in table.items()]
    return "\n".join(lines) + "\n"


def test_peak_at_no_raiser_takes_q_1() -> None:
    # no root radius (the peak is at no curved raiser): q = 1, so Kf = Kt (conservative, common practice).
    # hand-computed: Kt 2 -> Kf 2; Se' = 0.5 x 600 = 300 MPa (common practice); sa = 5000 N / 100 mm² = 50 MPa;
    # fully reversed n_f = 300 / (2 x 50) = 3
    from stressraiser.compare.fatigue import fatigue_screen, scaled_cycle

    s = fatigue_screen(scaled_cycle(50.0, 100.0, -1.0, 1.0), None, 600.0, "steel", 1.5)
    assert (s.q, s.method, s.kf) == (1.0, "unity", 2.0)
    assert s.n_f == pytest.approx(3.0, rel=1e-12)
    assert "no root radius" in s.statements[1]
