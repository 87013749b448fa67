"""A part as it is cut and as it is fastened: a drawn outline or a DXF cut file held and loaded through
fastener groups, under several load cases, signed off (issues 15 and 16 together).

Independent values: the same plate as today's parametric bar with the same groups (a second code path for
the outline, the mesh and the cut), statics of the fastener forces, and a single-load check of each case.
"""

from __future__ import annotations

import ezdxf
import numpy as np
import pytest

from conftest import assert_refused
from stressraiser.compare.check import check_part
from stressraiser.geometry.kinds.base import RaiserId
from stressraiser.geometry.partfile import load_part, parse_part

L, W, T, D = 300.0, 80.0, 8.0, 13.0  # splice plate: length, width, thickness, hole diameter (mm)
CENTRES = [(-110.0, 0.0), (-70.0, 0.0), (70.0, 0.0), (110.0, 0.0)]  # holes 1..4, left to right
FORCE = 20000.0  # N

GROUPS = """
[material]
E = 205000.0
nu = 0.3
yield = 355.0
family = "steel"

[[fasteners]]
name = "held"
holes = [1, 2]
diameter = 12.8
holds = true

[[fasteners]]
name = "pulled"
holes = [3, 4]
diameter = 12.8

[[load]]
name = "working"
[[load.fasteners]]
group = "pulled"
force = 20000.0
direction = 0.0

[[load]]
name = "side"
[[load.fasteners]]
group = "pulled"
force = 8000.0
direction = 90.0

[design]
yield_factor = 1.5

[mesh]
tolerance = 0.02
"""


def holes_text() -> str:
    return "".join(f"[[hole]]\ncenter = [{x}, {y}]\ndiameter = {D}\n" for x, y in CENTRES)


def bar_text() -> str:
    return f"title = \"splice, bar\"\n[plate]\nlength = {L}\nwidth = {W}\nthickness = {T}\n{holes_text()}{GROUPS}"


def drawn_text() -> str:
    points = [[-L / 2, -W / 2], [L / 2, -W / 2], [L / 2, W / 2], [-L / 2, W / 2]]
    return (f"title = \"splice, drawn\"\n[plate]\nthickness = {T}\n[outline]\npoints = {points}\n"
            f"{holes_text()}{GROUPS}")


def splice_dxf(path) -> None:
    """The splice plate as the laser table gets it: outline LINEs, holes as CIRCLEs (mm)."""
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.MM
    msp = doc.modelspace()
    corners = [(-L / 2, -W / 2), (L / 2, -W / 2), (L / 2, W / 2), (-L / 2, W / 2)]
    for a, b in zip(corners, corners[1:] + corners[:1]):
        msp.add_line(a, b)
    for centre in CENTRES:
        msp.add_circle(centre, D / 2)
    doc.saveas(path)


@pytest.fixture(scope="module")
def bar():
    return check_part(parse_part(bar_text()))


@pytest.fixture(scope="module")
def cut(tmp_path_factory):
    folder = tmp_path_factory.mktemp("cut")
    splice_dxf(folder / "splice.dxf")
    (folder / "splice.toml").write_text(
        f"title = \"splice, cut file\"\n[plate]\nthickness = {T}\n[outline]\nfile = \"splice.dxf\"\n{GROUPS}")
    return check_part(load_part(folder / "splice.toml"))


def fastener_forces(result, group: str) -> np.ndarray:
    (rows,) = [g for g in result.joints.groups if g.name == group]
    return np.array([f.force for f in rows.fasteners])


def test_a_cut_file_part_held_and_loaded_by_groups_equals_the_parametric_bar(bar, cut):
    # The DXF's circles are holes 1..4 left to right, so the groups name the same holes as on the bar.
    # The same plate, two outline paths (drawn loops vs the bar kind): the same sharing and the same peak
    # within the two studies' bands (each converged to its own 2 % target).
    for name in ("working", "side"):
        a, b = bar.case_named(name), cut.case_named(name)
        assert a.kt.converged and b.kt.converged
        # holes 2 and 3 (the inner hole of each group) are mirror images about x = 0: either may govern
        assert {a.peak.feature, b.peak.feature} <= {RaiserId("hole", 2), RaiserId("hole", 3)}
        band = a.kt.error + b.kt.error
        assert b.peak.stress == pytest.approx(a.peak.stress, rel=band)
        for group in ("held", "pulled"):
            np.testing.assert_allclose(fastener_forces(b, group), fastener_forces(a, group), rtol=5e-3,
                                       atol=1e-3 * FORCE)


def test_fastener_forces_balance_each_case_to_round_off(cut):
    # statics: the loaded group's forces sum to its load, the holding group's to minus it (1e-9 relative)
    for name, load in (("working", (FORCE, 0.0)), ("side", (0.0, 8000.0))):
        result = cut.case_named(name)
        pulled = fastener_forces(result, "pulled").sum(axis=0)
        held = fastener_forces(result, "held").sum(axis=0)
        np.testing.assert_allclose(pulled, load, atol=1e-9 * FORCE)
        np.testing.assert_allclose(held, -np.asarray(load), atol=1e-9 * FORCE)


def test_the_cut_part_signs_off_under_every_case_and_names_the_governing_one(cut):
    assert {c.case for c in cut.every_case} == {"working", "side"}
    assert cut.case in ("working", "side") and cut.design is not None and all(c.design is not None for c in cut.every_case)
    assert cut.peak.feature in {RaiserId("hole", n) for n in range(1, 5)}


def test_a_drawn_part_with_no_holding_group_or_hold_is_refused(tmp_path, capsys):
    text = drawn_text().replace("holds = true", "")
    assert_refused(tmp_path, capsys, text, ["hold", "holds = true"])


HANGER = """title = "hanger"
[plate]
thickness = 6.0
[outline]
points = [[-25.0, 25.0], { to = [25.0, 25.0], center = [0.0, 25.0], turn = "left" }, [25.0, 60.0], [100.0, 60.0],
          [100.0, 100.0], [-100.0, 100.0], [-100.0, 60.0], [-25.0, 60.0]]
[[hole]]
center = [-70.0, 80.0]
diameter = 13.0
[[hole]]
center = [70.0, 80.0]
diameter = 13.0
[[hole]]
center = [0.0, 25.0]
diameter = 16.0
[material]
grade = "s355"
[[fasteners]]
name = "arm bolts"
holes = [1, 2]
diameter = 12.0
holds = true
[[fasteners]]
name = "shackle"
holes = [3]
diameter = 15.0
[load]
[[load.fasteners]]
group = "shackle"
force = "3 kN"
direction = -60.0
"""


@pytest.mark.parametrize("direction, one_run", [(-90.0, True), (-60.0, False)])
def test_a_hole_net_cut_that_leaves_the_part_and_enters_another_arm_gives_no_net_kt(direction, one_run):
    # A T-shaped hanger: a tab 50 mm wide below a bar 200 mm wide. The straight cut through the tab's hole
    # normal to a pull straight down stays in the tab (its two ligaments beside the hole: a net section);
    # normal to a pull at -60 degrees it leaves the tab at its side and crosses the bar above through air
    # (the line x tan 30 deg from (0, 25) reaches y = 60 at x = 60.6 mm, inside the bar's span 25..100):
    # no straight cut is then the hole's net section, and none is given.
    from stressraiser.compare.joint_result import _one_run, _width_across
    from stressraiser.geometry.outline import plate_polygon

    spec = parse_part(HANGER)
    a = np.radians(direction)
    n = np.array([np.cos(a), np.sin(a)])
    assert _one_run(spec, (0.0, 25.0), n) is one_run
    # the simple connection's width is the one stretch of the outline that holds the hole's centre: the tab's
    # 50 mm straight across; on the tilted line 25 / cos 30 deg = 28.87 mm to where it leaves the tab's side
    # (x = 25 at y = 25 + 25 tan 30 = 39.4 < 60) plus 25 mm the other way to the round end (radius 25)
    width = _width_across(type(plate_polygon(spec))(plate_polygon(spec).exterior), np.array([0.0, 25.0]), n)
    expected = 50.0 if one_run else 25.0 / np.cos(np.radians(30.0)) + 25.0
    assert width == pytest.approx(expected, rel=1e-4)  # the round end is a polygon of chords in the outline
