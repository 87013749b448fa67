"""Sanity guards on results: each impossible or suspicious result earns a warning, in the terminal summary
and in the JSON record; a sound result earns none.

The guards are applied to a real check of a small strap with one piece of the result replaced by a value
that cannot be right, so each test shows the guard fires on exactly that fault.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace

import pytest

from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.compare.guards import result_warnings

from conftest import EXAMPLES, plate_with_hole


@pytest.fixture(scope="module")
def strap():
    # 200 x 40 x 5 mm strap, 8 mm hole (d/W = 0.2), 20 kN tension
    spec = plate_with_hole(length=200.0, width=40.0, thickness=5.0, holes=((0.0, 0.0, 8.0),), axial=20000.0,
                           tolerance=0.05)
    return check_part(spec)


def warnings_of(result, **changes):
    parts = {"spec": result.spec, "study": result.study, "solution": result.solution, "peak": result.peak,
             "section": result.net_section, "kt": result.kt}
    parts.update(changes)
    return [str(w) for w in result_warnings(**parts)]  # the words in mm-N-MPa


def test_a_sound_result_has_no_guard_warnings(strap):
    assert warnings_of(strap) == []


def test_non_finite_numbers(strap):
    for changes in ({"peak": replace(strap.peak, stress=math.nan)},
                    {"section": replace(strap.net_section, average=math.inf)},
                    {"kt": replace(strap.kt, gross=math.nan)}):
        found = warnings_of(strap, **changes)
        assert any("not a finite number" in w for w in found), changes


def test_compressive_peak_under_tension(strap):
    # Under axial tension alone the governing stress is tensile (statics: the net section carries the
    # whole tensile force, so some point of it is in tension).
    found = warnings_of(strap, peak=replace(strap.peak, stress=-abs(strap.peak.stress)))
    assert any("opposite sign" in w for w in found)


def test_kt_below_one_under_tension(strap):
    # The peak of the part is at least the largest normal stress on the net section, which is at least the
    # section's average (statics), so Kt(net) >= 1 to within the equilibrium error.
    found = warnings_of(strap, kt=replace(strap.kt, net=0.9))
    assert any("below 1" in w for w in found)
    assert not any("below 1" in w for w in warnings_of(strap, kt=replace(strap.kt, net=0.995)))


def test_peak_away_from_every_feature(strap):
    corner = (-100.0, 20.0)  # the held end's corner, 92 mm from the hole's edge
    found = warnings_of(strap, peak=replace(strap.peak, location=corner))
    assert any("away from every feature" in w and "hole 1" in w for w in found)


def test_peak_on_the_feature_is_not_suspicious(strap):
    on_edge = (0.0, 4.0)  # the top of the hole, where the Kirsch peak is
    assert not any("away from" in w for w in warnings_of(strap, peak=replace(strap.peak, location=on_edge)))


def test_stalled_refinement(strap):
    levels = strap.study.levels
    same = replace(levels[1], elements=levels[0].elements, peak=levels[0].peak)
    stalled = replace(strap.study, levels=(levels[0], same) + levels[2:])
    assert any("stalled" in w for w in warnings_of(strap, study=stalled))


def test_guard_warnings_reach_the_summary_and_the_record(tmp_path, capsys, monkeypatch):
    # Force the Kt guard to fire on the bundled example (allow no slack at all, and demand Kt >= 11):
    # the warning must appear in the terminal summary and in the JSON warnings, never only in one.
    import stressraiser.compare.guards as guards

    monkeypatch.setattr(guards, "KT_SLACK", -10.0)
    out = tmp_path / "out.json"
    code = main(["check", str(EXAMPLES / "winch_strap.toml"), "--json", str(out)])
    printed = " ".join(capsys.readouterr().out.split())  # the terminal may wrap a long warning
    assert code == 0  # a warning is not a failure of the numerics
    record = json.loads(out.read_text())
    assert any("below 1" in w for w in record["warnings"])
    assert "warning:" in printed and "below 1" in printed
