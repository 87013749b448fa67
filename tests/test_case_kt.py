"""Batches, suites and sweeps compare a handbook case with the Kt of the raiser the case describes
(compare/case_kt.py): the middle hole of a row of holes against the infinite row, with the part's governing
Kt (an outer hole beside a free side) shown beside it; for every other part the two are the same."""

from __future__ import annotations

import csv
import dataclasses
import json

import pytest

from stressraiser.cli.batch import ROW_FIELDS, run_case, summary_row
from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.compare.handbook import build_central_hole
from stressraiser.compare.raiser_cases import build_row
from stressraiser.compare.suite import builtin_suite, judge, load_suite
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RaiserId

FAST = 0.02  # mesh.tolerance of these checks (the built-in suite's for a curve fit)
CASE_COLUMNS = ("case_raiser", "case_kt_net", "case_kt_gross", "case_kt_error", "case_converged")


def schulz_row(x: float) -> float:
    """Ktn of an infinite row of holes across the load, x = d/l: W. D. Pilkey and D. F. Pilkey, Peterson's
    Stress Concentration Factors, 3rd ed. (2008), fit after Schulz (from memory; chart number not recalled)."""
    return 3.000 - 3.095 * x + 0.309 * x * x + 0.786 * x ** 3


def peterson_chart_4_1(x: float) -> float:
    """Ktn of a central hole, x = d/W: Pilkey & Pilkey, Peterson's SCF, 3rd ed. (2008), chart 4.1 curve fit
    (from memory; docs/references.md [Howland], [Peterson])."""
    return 2 + 0.284 * (1 - x) - 0.600 * (1 - x) ** 2 + 1.32 * (1 - x) ** 3


def row_part(d_l: float) -> dict:
    part = build_row({"d/l": d_l, "holes": 7})
    part["mesh"] = {"tolerance": FAST}
    return part


@pytest.fixture(scope="module")
def row_result():
    return check_part(part_from_dict(row_part(0.4)))


def test_central_hole_row_has_case_values_equal_to_the_governing_ones():
    part = build_central_hole({"d/W": 0.3})
    part["mesh"] = {"tolerance": FAST}
    row = run_case(part)
    assert row["status"] == "ok" and set(CASE_COLUMNS) <= set(ROW_FIELDS) <= set(row)
    assert row["case_raiser"] == row["feature"] == "hole 1"
    for case_key, own in (("case_kt_net", "kt_net"), ("case_kt_gross", "kt_gross"), ("case_kt_error", "kt_error"),
                          ("case_converged", "converged")):
        assert row[case_key] == row[own]
    # Peterson's chart 4.1 fit (Pilkey & Pilkey, 3rd ed., 2008; from memory), curve fit: 3 %
    assert row["case_kt_net"] == pytest.approx(peterson_chart_4_1(0.3), rel=0.03)


def test_row_of_holes_case_kt_is_the_middle_holes_own(row_result):
    row = summary_row(row_result)
    middle = next(p for p in row_result.peaks if p.feature == RaiserId("hole", 4))
    assert row["case_raiser"] == "hole 4" and row["feature"] in ("hole 1", "hole 7")
    assert (row["case_kt_net"], row["case_kt_gross"], row["case_kt_error"]) == (middle.kt_net, middle.kt_gross,
                                                                                  middle.error)
    assert row["case_converged"] and middle.error <= FAST
    # gross / net of the middle hole's section is W / (W - 7 d) = l / (l - d) = 1 / 0.6 (geometry, exact)
    assert row["case_kt_gross"] == pytest.approx(row["case_kt_net"] / 0.6, rel=1e-6)
    # the middle hole against the infinite row: Pilkey & Pilkey, Peterson's SCF, 3rd ed. (2008), fit after
    # Schulz (from memory); curve fit: the built-in suite's 3 %
    assert row["case_kt_net"] == pytest.approx(schulz_row(0.4), rel=0.03)
    # the part's governing Kt is an outer hole's, beside a free side: well above the middle one (13 % measured)
    assert row["kt_net"] > 1.05 * row["case_kt_net"]


def test_suite_judges_the_case_raiser_and_keeps_the_governing_kt(row_result):
    row = summary_row(row_result)
    case = next(c for c in builtin_suite().cases if c.name == "row-of-holes-schulz at d/l = 0.4, holes = 7")
    assert case.kt_of == "case" and case.reference == pytest.approx(schulz_row(0.4), rel=1e-12)
    verdict = judge(case, row)
    assert verdict.passed and verdict.kt == row["case_kt_net"] and verdict.raiser == "hole 4"
    assert verdict.governing_kt == row["kt_net"] and verdict.governing_feature == row["feature"]
    assert "hole 4, the raiser the handbook case describes; the part's peak is at hole" in verdict.reason
    # the same reference against the part's governing Kt fails: the outer hole is no infinite-row hole
    governing = judge(dataclasses.replace(case, kt_of="part"), row)
    assert not governing.passed and governing.kt == row["kt_net"] and governing.raiser == row["feature"]


def test_suite_fails_loudly_when_the_case_raiser_is_unconverged_or_missing():
    case = next(c for c in builtin_suite().cases if c.name.startswith("row-of-holes-schulz"))
    row = {"status": "ok", "feature": "hole 1", "kt_net": 2.3, "kt_gross": 3.2, "kt_error": 0.01, "converged": True,
           "case_raiser": "hole 4", "case_kt_net": case.reference, "case_kt_gross": 3.0, "case_kt_error": 0.05,
           "case_converged": False}
    verdict = judge(case, row)
    assert not verdict.passed and verdict.reason == ("the peak of hole 4, the raiser the handbook case describes, "
                                                     "did not converge (error band 5.00%)")
    missing = judge(case, {**row, "case_kt_net": None, "case_kt_gross": None, "case_kt_error": None})
    assert not missing.passed and "gave no Kt of hole 4" in missing.reason


def test_kt_of_follows_the_row_kind_and_is_validated(tmp_path, capsys):
    (tmp_path / "row.toml").write_text(row_toml(0.4))
    head = 'definition = "net"\ntolerance = 0.03\nsource = "s"\nreference = 1.9\n'
    (tmp_path / "s.toml").write_text(
        f'[[case]]\nname = "a"\nfamily = "row-of-holes"\nparameters = {{ "d/l" = 0.4 }}\n{head}'
        f'[[case]]\nname = "b"\npart = "row.toml"\n{head}'
        f'[[case]]\nname = "c"\npart = "row.toml"\nkt_of = "case"\n{head}')
    assert [c.kt_of for c in load_suite(tmp_path / "s.toml").cases] == ["case", "part", "case"]
    (tmp_path / "bad.toml").write_text(f'[[case]]\nname = "a"\npart = "row.toml"\nkt_of = "middle"\n{head}')
    assert main(["regress", str(tmp_path / "bad.toml")]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "case 1 (a): kt_of: 'middle' is not allowed" in err


def row_toml(d_l: float) -> str:
    part = row_part(d_l)
    holes = "".join(f"[[hole]]\ncenter = [{h['center'][0]!r}, {h['center'][1]!r}]\ndiameter = {h['diameter']!r}\n"
                    for h in part["hole"])
    plate = part["plate"]
    return (f'title = "seven-hole row"\n[plate]\nlength = {plate["length"]!r}\nwidth = {plate["width"]!r}\n'
            f'thickness = 10.0\n{holes}[material]\nE = 210000.0\nnu = 0.3\n[load]\naxial = 100000.0\n'
            f'[mesh]\ntolerance = {FAST!r}\n')


def test_row_sweep_varies_every_hole_and_writes_both_kts(tmp_path, capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "200")  # the terminal table on one line per row
    path, out = tmp_path / "row.toml", tmp_path / "sweep"
    path.write_text(row_toml(0.4))
    assert main(["sweep", str(path), "--vary", "hole.*.diameter=6,10", "--out", str(out), "--workers", "2"]) == 0
    with open(out / "sweep.csv", newline="") as handle:
        rows = list(csv.DictReader(handle))
    table = json.loads((out / "sweep.json").read_text())
    assert set(CASE_COLUMNS) <= set(rows[0]) and all(set(CASE_COLUMNS) <= set(r) for r in table["rows"])
    for record, pitch_fraction in zip(table["rows"], (0.3, 0.5)):  # d / pitch, pitch 20 mm
        assert record["handbook_case"] == "row-of-holes-schulz" and record["case_raiser"] == "hole 4"
        assert record["feature"] in ("hole 1", "hole 7") and record["kt_net"] > record["case_kt_net"]
        # the middle hole against Pilkey & Pilkey, Peterson's SCF, 3rd ed. (2008), Schulz fit (from memory), 3 %
        assert record["case_kt_net"] == pytest.approx(schulz_row(pitch_fraction), rel=0.03)
        assert record["handbook_kt_net"] == pytest.approx(schulz_row(pitch_fraction), rel=1e-12)
        assert record["handbook_difference"] == pytest.approx(record["case_kt_net"] / record["handbook_kt_net"] - 1)
    printed = capsys.readouterr().out
    assert "part Kt net" in printed and "case raiser" in printed and "its Kt vs handbook" in printed
    svg = (out / "kt.svg").read_text()
    assert "of hole 4, the raiser the handbook case describes" in svg and "the part's peak Kt net (governing" in svg


@pytest.mark.parametrize("key, words", [
    ("plate.*.width", "* stands for every entry of an array of tables"),
    ("hole.*.center.*", "a key may hold one *"),
])
def test_bad_star_key_is_refused_in_one_line(tmp_path, capsys, key, words):
    path = tmp_path / "row.toml"
    path.write_text(row_toml(0.4))
    assert main(["sweep", str(path), "--vary", f"{key}=1,2", "--out", str(tmp_path / "s")]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and words in err
