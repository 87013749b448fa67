"""Converged FE Kt of every raiser family with a published formula, at three geometries each inside the
formula's range, against that formula; and parts no handbook case covers.

Each assertion names its source. The FE runs at mesh.tolerance 0.02 to keep the suite quick; the measured
differences at 0.01 are in the report of issue 3 and in compare/raiser_cases.py.
"""

from __future__ import annotations

import json

import pytest

from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.compare.handbook import BUILDERS
from stressraiser.compare.raiser_cases import build_row
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RaiserId

from conftest import strap, toml_text

FAST = 0.02  # mesh.tolerance for these checks


def check(part: dict, tolerance: float = FAST):
    part = dict(part)
    part["mesh"] = {"tolerance": tolerance}
    return check_part(part_from_dict(part))


def assert_sound(result) -> None:
    """Converged within the band on peaks that rise monotonically level by level (what Richardson
    extrapolation needs), equilibrium on the net section within 0.5 % (common practice)."""
    assert result.kt.converged and result.kt.error < FAST
    peaks = [lv.peak for lv in result.study.levels]
    assert all(b > a for a, b in zip(peaks, peaks[1:])), peaks
    assert abs(result.net_section.equilibrium_error) < 0.005


# --- elliptical hole in a wide plate ------------------------------------------------------------------

@pytest.mark.parametrize("a_b, angle, expected", [
    (2.0, 0.0, 2.0),      # load along the major axis: 1 + 2b/a
    (3.0, 90.0, 7.0),     # load across the major axis: 1 + 2a/b
    (2.0, 45.0, 3.6217),  # inclined: the largest Inglis boundary stress (formula in compare/raiser_cases.py)
])
def test_elliptical_hole_matches_inglis(a_b, angle, expected):
    # C. E. Inglis, Trans. Inst. Naval Architects 55 (1913): Kt = 1 + 2a/b across the a axis (exact for an
    # infinite plate); the inclined-load form as in Pilkey & Pilkey, Peterson's SCF, 3rd ed., section 4
    # (from memory). Hole span 4 % of the width: the finite-width rise is a few tenths of a per cent
    # (measured), so 2 % holds.
    result = check(BUILDERS["elliptical-hole-wide-plate"]({"a/b": a_b, "load angle": angle, "hole span/W": 0.04}))
    assert_sound(result)
    match = result.handbook[0]
    assert match.case.key == "elliptical-hole-inglis" and match.in_range
    assert match.kt_gross == pytest.approx(expected, rel=1e-4)
    assert result.kt.gross == pytest.approx(expected, rel=0.02)
    assert result.peak.feature == RaiserId("ellipse", 1)


# --- edge notches --------------------------------------------------------------------------------------

@pytest.mark.parametrize("h_r, x, expected", [
    (1.0, 0.2, 2.422),   # docs/references.md [Roark] check point
    (2.0, 0.3, 2.780),   # docs/references.md [Roark] check point
    (0.5, 0.2, 1.9309),  # the same formula at h/r = 0.5
])
def test_opposite_u_notches_match_roark(h_r, x, expected):
    # Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory; coefficients
    # and check points in docs/references.md [Roark]), net section; curve fit: 3 %.
    result = check(BUILDERS["opposite-u-notches"]({"h/r": h_r, "2h/D": x}))
    assert_sound(result)
    match = next(m for m in result.handbook if m.case.key == "opposite-u-notches-roark")
    assert match.kt_net == pytest.approx(expected, abs=5e-4)
    assert result.kt.net == pytest.approx(expected, rel=0.03)
    assert result.peak.feature == RaiserId("notch", 1)
    assert result.net_section.width == pytest.approx(100.0 * (1 - x), rel=1e-6)


@pytest.mark.parametrize("part, key, expected", [
    ({"2r/D": 0.2}, "opposite-semicircular-notches-peterson", 3.065 - 3.472 * 0.2 + 1.009 * 0.04 + 0.405 * 0.008),
    ({"2r/D": 0.4}, "opposite-semicircular-notches-peterson", 3.065 - 3.472 * 0.4 + 1.009 * 0.16 + 0.405 * 0.064),
    (None, "edge-u-notch-semi-infinite", 3.065),
])
def test_semicircular_edge_notches(part, key, expected):
    # Opposite pair: Pilkey & Pilkey, Peterson's SCF, 3rd ed. (2008), chart 2.3 fit after Ling (from memory),
    # net section. Single notch in a wide plate: Kt = 3.065 (same handbook, chart 2.2 at h/r = 1, from
    # memory). Curve fits: 3 %.
    if part is None:
        built = {"title": "one semicircular notch", "plate": {"length": 1200.0, "width": 400.0, "thickness": 10.0},
                 "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 100000.0},
                 "notch": [{"x": 0.0, "side": "bottom", "shape": "semicircle", "radius": 4.0}]}
    else:
        built = BUILDERS["opposite-semicircular-notches"](part)
    result = check(built)
    assert_sound(result)
    match = next(m for m in result.handbook if m.case.key == key)
    fe = result.kt.gross if match.case.nominal == "gross" else result.kt.net
    assert (match.kt_gross if match.case.nominal == "gross" else match.kt_net) == pytest.approx(expected, rel=1e-9)
    assert fe == pytest.approx(expected, rel=0.03)


@pytest.mark.parametrize("h_r, h_w", [(1.5, 0.01), (2.5, 0.015), (4.0, 0.01)])
def test_single_edge_u_notch_matches_semi_infinite_fit(h_r, h_w):
    # Pilkey & Pilkey, Peterson's SCF, 3rd ed. (2008), chart 2.2: Kt = 0.855 + 2.21 sqrt(h/r) for a U-notch
    # in a semi-infinite plate (from memory), on the remote (gross) stress; curve fit: 3 %.
    expected = 0.855 + 2.21 * h_r ** 0.5
    result = check(BUILDERS["edge-u-notch-semi-infinite"]({"h/r": h_r, "h/W": h_w}))
    assert_sound(result)
    assert result.handbook[0].kt_gross == pytest.approx(expected, rel=1e-9)
    assert result.kt.gross == pytest.approx(expected, rel=0.03)


# --- stepped flat bar -----------------------------------------------------------------------------------

@pytest.mark.parametrize("D, d, r, expected, tolerance", [
    (100.0, 50.0, 10.0, 1.999, 0.03),  # docs/references.md [Roark] check point
    (75.0, 50.0, 12.5, 1.7501, 0.03),  # the same formula at h/r = 1
    (60.0, 50.0, 10.0, 1.6215, 0.03),  # the same formula at h/r = 0.5
    (75.0, 50.0, 5.0, 2.235, 0.05),    # docs/references.md [Roark] check point; see below
])
def test_stepped_bar_matches_roark(D, d, r, expected, tolerance):
    # Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory; coefficients
    # and check points in docs/references.md [Roark]), nominal P / (d t); curve fit: 3 %. The wide
    # part is three wide widths long. At the sharper fillet (h/r = 2.5, r/d = 0.1) the FE sits 2.8-3.4 %
    # above the fit (measured); docs/references.md warns that the chart data of this family differ by 7-10 %,
    # so that point is held to 5 %.
    part = {"title": "stepped bar", "plate": {"length": 6 * D, "width": D, "thickness": 10.0},
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 100000.0},
            "step": {"x": 0.0, "width": d, "radius": r}}
    result = check(part)
    assert_sound(result)
    match = result.handbook[0]
    assert match.case.key == "stepped-bar-fillets-roark"
    assert match.kt_net == pytest.approx(expected, abs=5e-4)
    assert result.kt.net == pytest.approx(expected, rel=tolerance)
    assert result.peak.feature in (RaiserId("fillet", 1), RaiserId("fillet", 2))  # either mirror-image fillet
    assert result.net_section.width == pytest.approx(d, rel=1e-6)  # the narrow section


# --- row of holes ---------------------------------------------------------------------------------------

@pytest.mark.parametrize("d_l", [0.2, 0.4, 0.6])
def test_middle_of_a_row_matches_infinite_row(d_l):
    # Pilkey & Pilkey, Peterson's SCF, 3rd ed. (2008), fit after Schulz for an infinite row of holes across
    # the load: Ktn = 3.000 - 3.095 x + 0.309 x^2 + 0.786 x^3, x = d/l (from memory); curve fit: 3 %. A row of
    # seven holes: the middle one stands for the infinite row; the outer ones see the free sides.
    expected = 3.000 - 3.095 * d_l + 0.309 * d_l ** 2 + 0.786 * d_l ** 3
    result = check(build_row({"d/l": d_l, "holes": 7}))
    match = result.handbook[0]
    assert match.case.key == "row-of-holes-schulz" and match.recognised.raiser == RaiserId("hole", 4)
    middle = next(p for p in result.peaks if p.feature == RaiserId("hole", 4))
    assert middle.error < 0.03
    assert middle.kt_net == pytest.approx(expected, rel=0.03)
    assert result.kt.net > middle.kt_net  # an outer hole beside a free side governs the part


# --- parts no handbook case covers ------------------------------------------------------------------------

BASE = strap(title="no case", hole=None, load={"axial": 100000.0})


@pytest.mark.parametrize("raisers, governing", [
    ({"hole": [{"center": [0.0, 15.0], "diameter": 20.0}]}, "hole 1"),
    ({"hole": [{"center": [-25.0, 0.0], "diameter": 16.0}, {"center": [25.0, 8.0], "diameter": 16.0}]}, None),
    ({"hole": [{"center": [-20.0, 0.0], "diameter": 20.0}],
      "notch": [{"x": 20.0, "side": "both", "shape": "U", "depth": 5.0, "radius": 5.0}]}, "notch 1"),
], ids=["offset hole", "two holes", "hole near a notch"])
def test_no_handbook_case_converges_and_says_so(tmp_path, capsys, raisers, governing):
    # No published case: the check still converges with an error band, statics holds on the net section
    # within 0.5 % (common practice: a cut must carry the applied force), and the report says plainly that
    # no handbook case covers the geometry.
    path, out = tmp_path / "part.toml", tmp_path / "r.json"
    part = {**BASE, **raisers, "mesh": {"tolerance": FAST}}
    path.write_text(toml_text(part))
    assert main(["check", str(path), "--json", str(out)]) == 0
    assert "no handbook case covers this geometry" in " ".join(capsys.readouterr().out.split())
    record = json.loads(out.read_text())
    assert record["handbook"] is None and record["handbook_note"] == "no handbook case covers this geometry"
    assert record["kt"]["converged"] and 0.0 < record["kt"]["error"] < FAST
    assert abs(record["net_section"]["equilibrium_error"]) < 0.005
    if governing:
        assert record["peak"]["feature"] == governing
    W, t = BASE["plate"]["width"], BASE["plate"]["thickness"]
    for peak in record["peaks"]:  # every competing raiser: its own net section also carries the force
        assert abs(peak["net_section"]["equilibrium_error"]) < 0.005
        # the same peak over the gross P / (W t) and the net P / A_net (definitions): their ratio is A_net / (W t)
        assert peak["kt_gross"] == pytest.approx(peak["kt_net"] * W * t / peak["net_section"]["area"], rel=1e-9)


def test_hole_near_a_notch_reports_both_with_their_own_sections():
    # A 20 mm hole and a pair of semicircular notches of radius 5 mm, 40 mm apart: their peaks compete
    # (within 20 % of each other). Each peak is on its own raiser's edge and its net section passes through that
    # raiser (x of the hole centre, x of the notch axis).
    part = {**BASE, "hole": [{"center": [-20.0, 0.0], "diameter": 20.0}],
            "notch": [{"x": 20.0, "side": "both", "shape": "U", "depth": 5.0, "radius": 5.0}]}
    result = check(part)
    by_name = {str(p.feature): p for p in result.peaks}
    assert set(by_name) == {"hole 1", "notch 1"}
    first = result.peaks[0]
    assert result.peak.feature == first.feature and result.net_section.x == pytest.approx(first.section.x)
    assert result.peaks[1].stress < first.stress
    assert by_name["notch 1"].section.x == pytest.approx(20.0) and by_name["notch 1"].section.width == pytest.approx(70.0)
    assert by_name["hole 1"].section.x == pytest.approx(-20.0) and by_name["hole 1"].section.width == pytest.approx(60.0)
    assert abs(by_name["hole 1"].location[0] + 20.0) < 2.0 and abs(by_name["notch 1"].location[0] - 20.0) < 2.0
    # the average on each section is the force over its own net area (statics)
    for p in result.peaks:
        assert p.section.average == pytest.approx(100000.0 / (p.section.width * 10.0), rel=1e-9)
        assert p.kt_net == pytest.approx(p.stress / p.section.average, rel=1e-9)


def test_lug_pulled_through_its_pin():
    # A round-ended lug pulled through its pin, held at the far end: no handbook case is stated here (the
    # published lug data are another engineer's comparison, issue 4). What must hold: the check converges,
    # the peak is on the pin hole beside the pin's line (the net section through the hole centre, where
    # the hoop stress of a pin-loaded hole peaks; common practice), and the net section carries the pin
    # force within 0.5 %.
    part = {"title": "lug", "plate": {"length": 240.0, "width": 40.0, "thickness": 6.0},
            "material": {"E": 193000.0, "nu": 0.29}, "hole": [{"center": [100.0, 0.0], "diameter": 14.0}],
            "lug": {"hole": 1}, "load": {"pin": {"hole": 1, "force": 25000.0}}}
    result = check(part)
    assert result.kt.converged and result.kt.error < FAST
    assert result.handbook == ()
    assert result.peak.feature == RaiserId("hole", 1)
    x, y = result.peak.location
    assert abs(x - 100.0) < 1.5 and abs(abs(y) - 7.0) < 0.1
    assert abs(result.net_section.equilibrium_error) < 0.005
