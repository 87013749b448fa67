"""Bad part files and options: one line naming the problem, exit code 2, no traceback, no output file."""

from __future__ import annotations

import subprocess
import sys

import pytest

from conftest import STRAP_TEXT, assert_refused
from stressraiser.cli.main import main

GOOD = 'title = "bad-input base"\n' + STRAP_TEXT

CASES = [
    # (what is wrong, replacement of a line of GOOD or full text, words the message must contain)
    ("unknown key", GOOD.replace("thickness = 10.0", "thickness = 10.0\ncolour = 3"), ["plate.colour", "unknown key"]),
    ("missing table", GOOD.replace("[load]\naxial = 120000.0", ""), ["[load]", "missing"]),
    ("negative width", GOOD.replace("width = 80.0", "width = -80.0"), ["plate.width", "greater than zero"]),
    ("zero thickness", GOOD.replace("thickness = 10.0", "thickness = 0.0"), ["plate.thickness", "greater than zero"]),
    ("nu too large", GOOD.replace("nu = 0.3", "nu = 0.5"), ["material.nu", "-1 < nu < 0.5"]),
    ("text for a number", GOOD.replace("E = 210000.0", 'E = "stiff"'), ["material.E"]),
    ("boolean for a number", GOOD.replace("length = 300.0", "length = true"), ["plate.length", "number"]),
    ("not a number", GOOD.replace("axial = 120000.0", "axial = nan"), ["load.axial", "finite"]),
    ("infinite", GOOD.replace("width = 80.0", "width = inf"), ["plate.width", "finite"]),
    ("zero load", GOOD.replace("axial = 120000.0", "axial = 0.0"), ["load.axial", "non-zero"]),
    ("hole crossing the side", GOOD.replace("center = [0.0, 0.0]", "center = [0.0, 35.0]"), ["hole 1", "crosses"]),
    ("holes overlapping", GOOD.replace("diameter = 22.0", "diameter = 22.0\n[[hole]]\ncenter = [10.0, 0.0]\ndiameter = 10.0"),
     ["hole 2", "hole 1", "crosses"]),
    ("ligament too thin", GOOD.replace("diameter = 22.0", "diameter = 79.9"), ["hole 1", "ligament", "at least"]),
    ("centre not a pair", GOOD.replace("center = [0.0, 0.0]", "center = [0.0]"), ["hole 1.center", "pair"]),
    ("invalid TOML", GOOD.replace("[plate]", "[plate"), ["not valid TOML"]),
    ("unknown condition", GOOD.replace("thickness = 10.0", 'thickness = 10.0\ncondition = "shell"'), ["plate.condition"]),
    ("tolerance out of range", GOOD + "[mesh]\ntolerance = 0.9\n", ["mesh.tolerance"]),
    ("hole table not an array", GOOD.replace("[[hole]]", "[hole]"), ["hole", "[[hole]]"]),
]


@pytest.mark.parametrize("what, text, words", CASES, ids=[c[0] for c in CASES])
def test_bad_part_file_exit_2_one_line(tmp_path, capsys, what, text, words):
    assert_refused(tmp_path, capsys, text, words)


def test_missing_file_and_bad_option(tmp_path, capsys):
    assert main(["check", str(tmp_path / "nowhere.toml")]) == 2
    assert "no such part file" in capsys.readouterr().err
    assert main(["check"]) == 2
    assert main(["survey", "x"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert all(line.startswith("stressraiser: command line:") for line in err)


def test_console_script_has_no_traceback(tmp_path):
    part = tmp_path / "part.toml"
    part.write_text(GOOD.replace("nu = 0.3", "nu = 0.7"))
    run = subprocess.run([sys.executable, "-m", "stressraiser", "check", str(part)], capture_output=True, text=True)
    assert run.returncode == 2
    assert "Traceback" not in run.stderr
    assert run.stderr.strip().startswith("stressraiser: material.nu")
