"""A drawn part held and loaded through fastener groups, used carelessly or with hostile intent: what
once printed a wrong or absurd line, checked against an independent value (statics, the drawn width).
"""

from __future__ import annotations

import pytest

from stressraiser.compare.check import check_part
from stressraiser.geometry.partfile import parse_part
from test_cut_part_joints import CENTRES, D, L, T, W, splice_dxf  # the drawn splice plate and its cut file

MOMENT = 1.0e6  # N mm: a pure couple on the loaded group


def splice(loads: str) -> str:
    points = [[-L / 2, -W / 2], [L / 2, -W / 2], [L / 2, W / 2], [-L / 2, W / 2]]
    holes = "".join(f"[[hole]]\ncenter = [{x}, {y}]\ndiameter = {D}\n" for x, y in CENTRES)
    return (f"title = \"splice, drawn\"\n[plate]\nthickness = {T}\n[outline]\npoints = {points}\n{holes}"
            "[material]\nE = 205000.0\nnu = 0.3\nyield = 355.0\nfamily = \"steel\"\n"
            "[[fasteners]]\nname = \"held\"\nholes = [1, 2]\ndiameter = 12.8\nholds = true\n"
            "[[fasteners]]\nname = \"pulled\"\nholes = [3, 4]\ndiameter = 12.8\n"
            f"{loads}[mesh]\ntolerance = 0.1\n")


@pytest.fixture(scope="module")
def couple():
    return check_part(parse_part(splice(
        f"[[load]]\nname = \"twist\"\n[[load.fasteners]]\ngroup = \"pulled\"\nforce = 0.0\n"
        f"direction = 0.0\nmoment = {MOMENT}\n")))


def group(result, name):
    (rows,) = [g for g in result.joints.groups if g.name == name]
    return rows


def test_a_holding_group_that_takes_a_pure_couple_has_no_reaction_force_and_no_averages(couple):
    # Statics: the loaded group applies a couple and no force, so the holding group's reaction is a
    # couple of -MOMENT and no force. Its FE resultant is round-off (~1e-8 N against 25 kN per bolt);
    # it once set the simple connection's averages (F / (d t) of 1e-11 MPa: "the peak is 5.7e+12 x the
    # average") and the net path's direction (a gross width of 80.2 mm on an 80 mm plate).
    held = group(couple, "held")
    assert held.load[:2] == (0.0, 0.0)
    assert held.load[2] == pytest.approx(-MOMENT, rel=1e-6)
    assert held.averages == ()
    # with no force, the net path is taken across +x: the plate's drawn width W, less one hole
    assert held.net_path.gross == pytest.approx(W, rel=1e-9)
    assert held.net_path.width == pytest.approx(W - D, rel=1e-9)
    # the loaded group (force exactly 0) agrees: no averages either
    assert group(couple, "pulled").averages == ()


BEARING_FORCE = 70000.0  # N on the loaded group: its bearing fails, the net section passes


@pytest.fixture(scope="module")
def bearing_fails():
    text = splice(f"[[load]]\nname = \"pull\"\n[[load.fasteners]]\ngroup = \"pulled\"\nforce = {BEARING_FORCE}\n"
                  "direction = 0.0\n[design]\nyield_factor = 1.5\n")
    text = text.replace("E = 205000.0\nnu = 0.3\nyield = 355.0\nfamily = \"steel\"\n", "grade = \"s355\"\n")
    return check_part(parse_part(text))


def test_a_design_headline_that_fails_on_bearing_names_the_bearing_and_its_margin(bearing_fails):
    # A ductile part: the net-section check governs and passes, but the most loaded fastener's bearing
    # must pass as well and does not. The headline once read "FAILS — ..., net-section check governs,
    # margin +1.2": a failing verdict beside a positive margin alone.
    from stressraiser.cli.signoff_summary import also_failing

    c = bearing_fails.design.check
    assert c.hand.passes and not c.passes
    # the bearing margin from the FE fastener forces by hand: allowable / (F_max / (d t)) - 1, d the
    # fastener's 12.8 mm shank (common practice bearing area), allowable = bearing strength / 1.5
    forces = [f.magnitude for g in bearing_fails.joints.groups for f in g.fasteners]
    actual = max(forces) / (12.8 * T)
    margin = c.bearing_strength_mpa / 1.5 / actual - 1.0
    assert margin < 0.0
    words = also_failing(c)
    assert words.startswith("; pin bearing FAILS, margin ")
    assert float(words.rsplit(" ", 1)[1]) == pytest.approx(margin, abs=1.5e-3)


@pytest.mark.parametrize("wrong, key", [
    ("holes = [3, 4]\ndiameter = 12.8\n", "fasteners 2.holes: 5"),
    ("[[hold]]\npin = 5\n", "hold 1.pin: 5"),
])
def test_a_hole_number_past_a_cut_files_circles_is_refused_counting_the_circles(tmp_path, capsys, wrong, key):
    # The cut file gives 4 holes (its 4 circles) and the part file no [[hole]] table: the refusal once
    # said "the part has 4 [[hole]] entries", sending the user to look for tables that are not there.
    from conftest import assert_refused

    splice_dxf(tmp_path / "splice.dxf")
    text = splice("").replace(f"[outline]\npoints", "[outline]\nfile = \"splice.dxf\"\n#")
    text = "".join(text.split("[[hole]]\n")[0:1]) + text[text.index("[material]"):]
    if wrong.startswith("[[hold]]"):
        text = text.replace("[material]", wrong + "[material]", 1)
    else:
        text = text.replace(wrong, "holes = [3, 5]\ndiameter = 12.8\n")
    text += "[[load]]\nname = \"pull\"\n[[load.fasteners]]\ngroup = \"pulled\"\nforce = 1000.0\ndirection = 0.0\n"
    assert_refused(tmp_path, capsys, text, [key, "4 holes", "4 from the cut file's circles", "0 [[hole]] entries"])


def test_the_quiet_verdict_line_says_when_the_design_check_fails(tmp_path, capsys):
    # --quiet prints only the verdict line; it once ended at the Kt, so a bolted part whose bearing fails
    # (margin < 0 by hand from the FE forces: the test above) printed no word of it.
    from stressraiser.cli.main import main

    text = splice(f"[[load]]\nname = \"pull\"\n[[load.fasteners]]\ngroup = \"pulled\"\nforce = {BEARING_FORCE}\n"
                  "direction = 0.0\n[design]\nyield_factor = 1.5\n")
    part = tmp_path / "part.toml"
    part.write_text(text.replace("E = 205000.0\nnu = 0.3\nyield = 355.0\nfamily = \"steel\"\n", "grade = \"s355\"\n"))
    assert main(["check", str(part), "--quiet"]) == 0
    (line,) = capsys.readouterr().out.strip().splitlines()
    assert line.startswith("Kt(net)") and line.endswith("; design check FAILS")
