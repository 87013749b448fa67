"""Handbook formulas at their published check points, and the rules that match a part to a case."""

from __future__ import annotations

import pytest

from stressraiser.compare.handbook import evaluate, handbook_matches

from conftest import plate_with_hole

# Howland, Phil. Trans. R. Soc. A 229 (1930), gross Kt at d/W = 0 ... 0.5, written here from
# docs/references.md [Howland] (not imported from the module under test).
HOWLAND_GROSS = ((0.0, 3.00), (0.1, 3.03), (0.2, 3.14), (0.3, 3.36), (0.4, 3.74), (0.5, 4.32))


@pytest.mark.parametrize("x, expected", [(0.2, 2.519), (0.5, 2.157)])
def test_peterson_central_hole_fit_check_points(x, expected):
    # Pilkey & Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chart 4.1 curve fit;
    # check points transcribed in docs/references.md [Howland], [Peterson] (from memory).
    assert evaluate("central-hole-tension-peterson", {"d/W": x}) == pytest.approx(expected, abs=5e-4)


@pytest.mark.parametrize("x, ktg", HOWLAND_GROSS)
def test_howland_table_reproduced_at_its_points(x, ktg):
    # Howland, Phil. Trans. R. Soc. A 229 (1930): the interpolation passes through the table.
    assert evaluate("central-hole-tension-howland", {"d/W": x}) == pytest.approx(ktg, abs=1e-12)


def test_fit_and_table_agree_within_one_percent():
    # The two published sources describe the same geometry: gross Kt from the net fit,
    # Ktg = Ktn / (1 - d/W), agrees with Howland's table within 1 % (docs/references.md [Howland], [Peterson]).
    for x, ktg in HOWLAND_GROSS:
        assert evaluate("central-hole-tension-peterson", {"d/W": x}) / (1 - x) == pytest.approx(ktg, rel=0.01)


def test_central_hole_matches_both_cases():
    matches = handbook_matches(plate_with_hole(width=80.0, holes=((0.0, 0.0, 22.0),)))
    assert [m.case.key for m in matches] == ["central-hole-tension-peterson", "central-hole-tension-howland"]
    m = matches[0]
    assert m.recognised.params["d/W"] == pytest.approx(22.0 / 80.0)
    assert m.kt_gross == pytest.approx(m.kt_net / (1 - 22.0 / 80.0), rel=1e-12)
    assert m.in_range


@pytest.mark.parametrize("holes", [
    ((0.0, 10.0, 20.0),),               # offset hole
    ((-30.0, 0.0, 16.0), (30.0, 0.0, 16.0)),  # two holes
    ((120.0, 0.0, 16.0),),              # hole too close to the loaded end for the chart
])
def test_no_case_for_other_geometries(holes):
    assert handbook_matches(plate_with_hole(holes=holes)) == []


def test_outside_range_flagged():
    # Howland's table stops at d/W = 0.5: a d/W = 0.6 hole still matches the fit, not the table range.
    matches = handbook_matches(plate_with_hole(width=50.0, length=400.0, holes=((0.0, 0.0, 30.0),)))
    ranges = {m.case.key: m.in_range for m in matches}
    assert ranges == {"central-hole-tension-peterson": True, "central-hole-tension-howland": False}


def test_builders_produce_parts_their_family_recognises():
    from stressraiser.compare.handbook import BUILDERS, CASES
    from stressraiser.geometry.partfile import part_from_dict

    for family, build in BUILDERS.items():
        case = next(c for c in CASES if c.family == family)
        params = {k: 0.5 * (lo + hi) for k, (lo, hi) in (case.checked or case.ranges).items()}
        matches = [m for m in handbook_matches(part_from_dict(build(params))) if m.case.family == family]
        assert matches
        assert matches[0].recognised.params == pytest.approx(params)
