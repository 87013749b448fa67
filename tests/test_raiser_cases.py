"""The raiser handbook formulas at their published check points, their agreement with one another where
two sources describe the same geometry, and the rules that match a part to a case only when it IS that
case."""

from __future__ import annotations

import pytest

from stressraiser.cli.main import main
from stressraiser.compare.handbook import BUILDERS, CASES, evaluate, handbook_matches
from stressraiser.compare.raiser_cases import build_row, inglis_kt
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RaiserId


@pytest.mark.parametrize("h_r, x, expected", [(1.0, 0.2, 2.422), (2.0, 0.3, 2.780), (10.0, 0.4, 4.436)])
def test_roark_opposite_u_notches_check_points(h_r, x, expected):
    # Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory); check points
    # transcribed in docs/references.md [Roark].
    assert evaluate("opposite-u-notches-roark", {"h/r": h_r, "2h/D": x}) == pytest.approx(expected, abs=5e-4)


@pytest.mark.parametrize("D, d, r, expected", [(60.0, 50.0, 2.5, 2.263), (75.0, 50.0, 5.0, 2.235),
                                              (100.0, 50.0, 10.0, 1.999)])
def test_roark_stepped_bar_check_points(D, d, r, expected):
    # Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory); check points
    # (D, d, r -> Kt) transcribed in docs/references.md [Roark].
    h = 0.5 * (D - d)
    assert evaluate("stepped-bar-fillets-roark", {"h/r": h / r, "2h/D": 2 * h / D}) == pytest.approx(expected, abs=5e-4)


@pytest.mark.parametrize("a_b", [1.5, 2.0, 3.0, 5.0])
def test_inglis_inclined_form_reduces_to_the_closed_forms(a_b):
    # Inglis (1913): load across the a axis Kt = 1 + 2a/b, along it Kt = 1 + 2b/a; the inclined-load form
    # recalled from Pilkey & Pilkey (from memory) must give both.
    assert inglis_kt(a_b, 90.0) == pytest.approx(1 + 2 * a_b, rel=1e-6)
    assert inglis_kt(a_b, 0.0) == pytest.approx(1 + 2 / a_b, rel=1e-6)
    # in between it lies between the two (the largest boundary stress rises with the angle)
    values = [inglis_kt(a_b, a) for a in (0.0, 30.0, 60.0, 90.0)]
    assert values == sorted(values)


def test_inglis_circle_is_kirsch():
    # A circular hole (a = b): Kirsch, Kt = 3 (docs/references.md [Kirsch]).
    assert inglis_kt(1.0, 37.0) == 3.0


def test_semicircular_fit_agrees_with_roark_at_h_equal_r():
    # Two sources for opposite semicircular notches: Peterson's chart 2.3 fit (from memory) and Roark's
    # U-notch fit at h/r = 1 (docs/references.md [Roark]). Both are fits to the same data; they agree within
    # 0.5 % for 2r/D up to 0.5 (checked here), and both start from the single-notch 3.065.
    for x in (0.0, 0.1, 0.2, 0.3, 0.4, 0.5):
        peterson = evaluate("opposite-semicircular-notches-peterson", {"2r/D": x})
        roark = evaluate("opposite-u-notches-roark", {"h/r": 1.0, "2h/D": x})
        assert peterson == pytest.approx(roark, rel=0.005)
    assert evaluate("edge-u-notch-semi-infinite", {"h/r": 1.0, "h/W": 0.0}) == pytest.approx(3.065, abs=1e-9)


def test_row_fit_limits():
    # Schulz's row (from memory): tiny holes are Kirsch's single hole (Kt 3); as the holes meet the net
    # ligament carries the load uniformly (Ktn -> 1), as Howland's fit does at d/W -> 1 (docs/references.md [Howland], [Peterson]).
    assert evaluate("row-of-holes-schulz", {"d/l": 0.0, "holes": 7}) == pytest.approx(3.0)
    assert evaluate("row-of-holes-schulz", {"d/l": 1.0, "holes": 7}) == pytest.approx(1.0, abs=1e-9)


def test_every_case_states_source_nominal_and_range():
    for case in CASES:
        assert case.source and case.formula and case.nominal in ("net", "gross") and case.ranges
        if case.checked:
            for name, (lo, hi) in case.checked.items():
                assert case.ranges[name][0] <= lo <= hi <= case.ranges[name][1]


def test_builders_make_parts_their_own_case_recognises():
    for family, build in BUILDERS.items():
        case = next(c for c in CASES if c.family == family)
        params = {k: 0.5 * (lo + hi) for k, (lo, hi) in (case.checked or case.ranges).items()}
        matches = [m for m in handbook_matches(part_from_dict(build(params))) if m.case.family == family]
        assert matches and matches[0].in_range
        assert matches[0].recognised.params == pytest.approx(params)


# --- only the case itself matches -------------------------------------------------------------------------

def _part(**raisers) -> dict:
    return {"title": "match", "plate": {"length": 600.0, "width": 100.0, "thickness": 10.0},
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 100000.0}, **raisers}


NOTCHES = [{"x": 0.0, "side": "both", "shape": "U", "depth": 10.0, "radius": 5.0}]


@pytest.mark.parametrize("part, family", [
    (_part(notch=NOTCHES), "opposite-u-notches"),
    (_part(notch=[{"x": 0.0, "side": "top", "shape": "U", "depth": 10.0, "radius": 5.0},
                  {"x": 0.0, "side": "bottom", "shape": "U", "depth": 10.0, "radius": 5.0}]), "opposite-u-notches"),
    (_part(notch=[{"x": 0.0, "side": "both", "shape": "semicircle", "radius": 8.0}]), "opposite-semicircular-notches"),
    (_part(step={"x": 0.0, "width": 60.0, "radius": 8.0}), "stepped-bar-fillets"),
    (_part(ellipse=[{"center": [0.0, 0.0], "length": 8.0, "width": 4.0, "angle": 90.0}]), "elliptical-hole-wide-plate"),
])
def test_the_case_matches(part, family):
    assert family in {m.case.family for m in handbook_matches(part_from_dict(part))}


@pytest.mark.parametrize("part", [
    _part(notch=NOTCHES, hole=[{"center": [100.0, 0.0], "diameter": 10.0}]),              # another raiser
    _part(notch=[{"x": 0.0, "side": "top", "shape": "U", "depth": 10.0, "radius": 5.0},   # not opposite
                 {"x": 12.0, "side": "bottom", "shape": "U", "depth": 10.0, "radius": 5.0}]),
    _part(notch=[{"x": 0.0, "side": "top", "shape": "U", "depth": 10.0, "radius": 5.0},   # unequal depths
                 {"x": 0.0, "side": "bottom", "shape": "U", "depth": 8.0, "radius": 5.0}]),
    _part(notch=[{"x": 0.0, "side": "both", "shape": "V", "depth": 10.0, "radius": 2.0, "angle": 60.0}]),  # a V
    _part(notch=[{"x": 230.0, "side": "both", "shape": "U", "depth": 10.0, "radius": 5.0}]),  # near the end
    _part(notch=[{"x": 0.0, "side": "top", "shape": "U", "depth": 10.0, "radius": 5.0}]),  # one deep notch
    _part(step={"x": 250.0, "width": 60.0, "radius": 8.0}),                               # short narrow part
    _part(step={"x": 0.0, "width": 60.0, "radius": 8.0}, hole=[{"center": [-150.0, 0.0], "diameter": 10.0}]),
    _part(ellipse=[{"center": [0.0, 10.0], "length": 8.0, "width": 4.0, "angle": 90.0}]),  # off the centre line
    _part(hole=[{"center": [0.0, 0.0], "diameter": 20.0}], notch=NOTCHES),                 # hole beside notches
])
def test_nothing_else_matches(part):
    assert handbook_matches(part_from_dict(part)) == []


def test_row_needs_an_even_pitch_and_seven_holes():
    row = build_row({"d/l": 0.4, "holes": 7})
    assert handbook_matches(part_from_dict(row))[0].recognised.raiser == RaiserId("hole", 4)
    row["hole"][2]["center"][1] += 2.0  # one hole out of pitch by 1/70 of the width (tolerance 1/100)
    assert handbook_matches(part_from_dict(row)) == []
    assert handbook_matches(part_from_dict(build_row({"d/l": 0.4, "holes": 5}))) == []


def test_cases_command_lists_every_case_with_source_and_range(capsys):
    assert main(["cases"]) == 0
    out = " ".join(capsys.readouterr().out.split())
    for case in CASES:
        assert case.key in out and " ".join(case.source.split()) in out
    assert "0.1 ≤ h/r ≤ 50" in out and "FE-checked" in out
    assert main(["cases", "--family", "stepped-bar-fillets"]) == 0
    out = capsys.readouterr().out
    assert "stepped-bar-fillets-roark" in out and "opposite-u-notches-roark" not in out
    assert main(["cases", "--family", "gusset"]) == 2
    assert "--family" in capsys.readouterr().err
