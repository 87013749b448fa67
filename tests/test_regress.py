"""`stressraiser regress`: the built-in handbook suite passes, a wrong reference fails loudly and names its
row, suite files are validated, and the bundled example suite runs."""

from __future__ import annotations

import json
import math

import pytest

from stressraiser.cli.main import main
from stressraiser.compare import handbook
from stressraiser.compare.suite import (CURVE_FIT_TOLERANCE, POINT_FRACTIONS, TABLE_TOLERANCE, builtin_suite,
                                        case_tolerance, load_suite)
from stressraiser.geometry.errors import PartError

from conftest import EXAMPLES, STRAP_TEXT


@pytest.mark.slow  # every family at three points: the sweep; test_raiser_families.py keeps a fast check of each
def test_builtin_suite_passes(tmp_path, capsys):
    record_path = tmp_path / "builtin.json"
    assert main(["regress", "--builtin", "--workers", "2", "--json", str(record_path)]) == 0
    record = json.loads(record_path.read_text())
    assert record["passed"] is True
    with_builder = [c for c in handbook.CASES if c.family in handbook.BUILDERS]
    assert len(record["cases"]) == len(POINT_FRACTIONS) * len(with_builder)
    assert {c["source"] for c in record["cases"]} == {c.source for c in with_builder}
    for case in record["cases"]:
        # each published value (its source is named in the row, e.g. Howland 1930, Peterson chart 4.1)
        # reproduced within the tolerance its kind of source warrants: 1 % tables, 3 % curve fits
        assert abs(case["difference"]) <= case["tolerance"] and case["converged"]
    rows = [c for c in record["cases"] if c["name"].startswith("row-of-holes-schulz")]
    assert [c["name"] for c in rows] == [f"row-of-holes-schulz at d/l = {x:g}, holes = 7" for x in (0.28, 0.4, 0.52)]
    for case in rows:
        # the middle hole of a seven-hole row against the infinite row: Pilkey & Pilkey, Peterson's SCF, 3rd ed.
        # (2008), fit after Schulz (from memory), within the suite's curve-fit tolerance (3 %); the part's
        # governing Kt (an outer hole beside a free side) is reported beside it and is not what was compared
        assert case["kt_of"] == "case" and case["raiser"] == "hole 4" and case["tolerance"] == CURVE_FIT_TOLERANCE
        assert abs(case["difference"]) <= CURVE_FIT_TOLERANCE
        assert case["governing_feature"] in ("hole 1", "hole 7") and case["governing_kt"] > case["kt"]
    assert f"{len(record['cases'])} passed, 0 failed" in capsys.readouterr().out


def test_builtin_suite_covers_every_family_with_a_builder(monkeypatch):
    # A family added to the handbook library with a builder is picked up without touching the suite.
    central = next(c for c in handbook.CASES if c.key == "central-hole-tension-peterson")
    extra = handbook.Case(key="test-extra", family="test-family", title="t", source="s", formula="Kt = 3",
                          nominal="net", nominal_text="n", ranges={"a": (1.0, 2.0)}, kt=lambda p: 3.0)
    monkeypatch.setattr(handbook, "CASES", (*handbook.CASES, extra))
    monkeypatch.setattr(handbook, "BUILDERS", {**handbook.BUILDERS, "test-family": lambda p: {"a": p["a"]}})
    suite = builtin_suite()
    names = [c.name for c in suite.cases]
    assert [n for n in names if n.startswith("test-extra")] == ["test-extra at a = 1.2", "test-extra at a = 1.5",
                                                               "test-extra at a = 1.8"]
    # the fake builder's part is refused by the reader: its rows cannot run and say why
    assert all(c.problem and "refuses" in c.problem for c in suite.cases if c.name.startswith("test-extra"))
    assert sum(n.startswith(central.key) for n in names) == len(POINT_FRACTIONS)


def test_tolerances_follow_the_kind_of_source():
    # docs/references.md: Howland's table 1 %, handbook curve fits 3 % (tolerances that have served)
    by_key = {c.key: c for c in handbook.CASES}
    assert case_tolerance(by_key["central-hole-tension-howland"]) == TABLE_TOLERANCE == 0.01
    assert case_tolerance(by_key["central-hole-tension-peterson"]) == CURVE_FIT_TOLERANCE == 0.03


WRONG = """title = "central hole, one wrong row"
[defaults]
family = "central-hole-tension"
set = { "mesh.tolerance" = 0.02 }
tolerance = 0.01

[[case]]
name = "Howland d/W 0.2"
parameters = { "d/W" = 0.2 }
reference = 3.14
definition = "gross"
source = "R. C. J. Howland, Phil. Trans. R. Soc. A 229 (1930), d/W = 0.2"

[[case]]
name = "Peterson d/W 0.4, mistyped"
parameters = { "d/W" = 0.4 }
reference = 2.93
definition = "net"
tolerance = 0.03
source = "Pilkey & Pilkey, Peterson's SCF 3rd ed. (2008), chart 4.1 (2.24, entered wrongly)"
"""


def test_wrong_reference_fails_with_exit_1_and_names_the_row(tmp_path, capsys):
    suite = tmp_path / "wrong.toml"
    suite.write_text(WRONG)
    assert main(["regress", str(suite), "--workers", "2"]) == 1
    out = capsys.readouterr().out
    assert "FAILED row 2 'Peterson d/W 0.4, mistyped': off by" in out
    assert "FAILED row 1" not in out
    assert "2 cases: 1 passed, 1 failed" in out


@pytest.mark.parametrize("body, words", [
    ('[[case]]\nname = "a"\nfamily = "central-hole-tension"\nparameters = { "d/W" = 0.2 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\nrefrence = 3\n', "case 1 (a): refrence: unknown key"),
    ('[[case]]\nname = "a"\nfamily = "elliptic-hole"\nparameters = { "a/b" = 2 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\n', "family: 'elliptic-hole' has no part builder"),
    ('[[case]]\nname = "a"\nfamily = "central-hole-tension"\nparameters = { "d/W" = 0.2 }\nreference = 3.1\n'
     'definition = "peak"\ntolerance = 0.01\nsource = "s"\n', "definition: 'peak' is not allowed"),
    ('[[case]]\nname = "a"\nfamily = "central-hole-tension"\nparameters = { "d/W" = 0.2 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 2\nsource = "s"\n', "tolerance: a number between 0 and 1 is required"),
    ('[[case]]\nname = "a"\npart = "nowhere.toml"\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\n', "nowhere.toml: no such part file"),
    ('title = "empty"\n', "the suite needs at least one case"),
    # a family's parameters, checked before any case runs: the published range of the family's cases
    # (Howland's table and Peterson's chart 4.1 fit together cover 0 <= d/W <= 1, compare/handbook.py)
    ('[[case]]\nname = "a"\nfamily = "central-hole-tension"\nparameters = { "d/W" = 1.5 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\n',
     "case 1 (a): parameters: d/W = 1.5 is outside the range of the central-hole-tension family's published "
     "cases, 0 <= d/W <= 1"),
    ('[[case]]\nname = "a"\nfamily = "central-hole-tension"\nparameters = { "d/w" = 0.3 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\n',
     "case 1 (a): parameters: 'd/w' is not a parameter of the central-hole-tension family; it takes d/W"),
    ('[[case]]\nname = "a"\nfamily = "opposite-u-notches"\nparameters = { "h/r" = 2.0 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\n',
     "case 1 (a): parameters: 2h/D is missing; the opposite-u-notches family takes h/r, 2h/D"),
    ('[[case]]\nname = "a"\nfamily = "central-hole-tension"\nparameters = { "d/W" = 0.0 }\nreference = 3.1\n'
     'definition = "net"\ntolerance = 0.01\nsource = "s"\n',
     "case 1 (a): parameters: the central-hole-tension part they make is refused: hole 1.diameter"),
])
def test_bad_suite_is_refused_in_one_line_with_exit_2(tmp_path, capsys, body, words):
    suite = tmp_path / "bad.toml"
    suite.write_text(body)
    assert main(["regress", str(suite)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and words in err


def test_needs_a_suite_or_builtin(capsys):
    assert main(["regress"]) == 2
    assert "give a suite file or --builtin" in capsys.readouterr().err


def test_example_suite_runs(capsys):
    suite_path = EXAMPLES / "suites" / "br_series.toml"
    suite = load_suite(suite_path)
    assert len(suite.cases) == 4 and all(math.isfinite(c.reference) for c in suite.cases)
    assert suite.cases[3].part["hole"][0] == {"center": [0.0, 5.0], "diameter": 21.0}
    # the invented in-house references were recorded at mesh.tolerance 0.005; the suite reruns at 0.02
    assert main(["regress", str(suite_path), "--workers", "2"]) == 0
    assert "4 cases: 4 passed, 0 failed" in capsys.readouterr().out


def test_load_suite_refuses_duplicate_names(tmp_path):
    row = ('[[case]]\nname = "same"\nfamily = "central-hole-tension"\nparameters = { "d/W" = 0.2 }\n'
           'reference = 3.1\ndefinition = "net"\ntolerance = 0.01\nsource = "s"\n')
    (tmp_path / "dup.toml").write_text(row + row)
    with pytest.raises(PartError, match="case 2: name 'same' is used by an earlier case"):
        load_suite(tmp_path / "dup.toml")


def test_suite_set_keys_take_a_star_as_sweeps_do(tmp_path):
    # `set = { "hole.*.diameter" = 8.0 }` sets every hole's diameter, as `--vary hole.*.diameter=...` does
    part = tmp_path / "two_holes.toml"
    part.write_text(STRAP_TEXT + "[[hole]]\ncenter = [60.0, 0.0]\ndiameter = 10.0\n")
    suite = tmp_path / "suite.toml"
    suite.write_text('[[case]]\nname = "both holes 8 mm"\npart = "two_holes.toml"\nset = { "hole.*.diameter" = 8.0 }\n'
                     'reference = 2.6\ndefinition = "net"\ntolerance = 0.05\nsource = "in-house"\n')
    (case,) = load_suite(suite).cases
    assert [h["diameter"] for h in case.part["hole"]] == [8.0, 8.0]
    suite.write_text(suite.read_text().replace("hole.*.diameter", "plate.*.width"))
    with pytest.raises(PartError, match=r"case 1 \(both holes 8 mm\): set: plate.\*.width: \* stands for every entry"):
        load_suite(suite)
