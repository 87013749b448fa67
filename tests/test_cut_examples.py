"""The example cut-file scripts (examples/*_dxf.py) run as a user runs them and write drawings that read back
into the parts they describe; damaged copies of those drawings are refused cleanly, never crash.

The gusset's area is checked against the closed form of a polygon with rounded corners: the shoelace
area, less r² (tan(φ/2) - φ/2) at each corner turned left by φ and plus the same at each corner turned
right (common practice). The bracket's exact area (Green's theorem over its lines and arcs) is checked
against shapely's area of the same boundary as a fine polygon (an independent library).
"""

from __future__ import annotations

import importlib.util
import math
import subprocess
import sys

import pytest
import shapely

from stressraiser.geometry.cutloops import cut_polygon, loop_area
from stressraiser.geometry.dxffile import read_dxf
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.outline import wire_polygon
from stressraiser.geometry.shapes import Arc, Line

from conftest import EXAMPLES, damaged_copies

SCRIPTS = sorted(EXAMPLES.glob("*_dxf.py"))


def run_script(script, folder):
    out = folder / f"{script.stem}.dxf"
    done = subprocess.run([sys.executable, str(script), str(out)], capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == str(out) and out.is_file()
    return out


def load(script):
    spec = importlib.util.spec_from_file_location(script.stem, script)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def rounded_polygon_area(corners) -> float:
    """Closed form: shoelace area corrected at every rounded corner (x, y, r) (common practice)."""
    n = len(corners)
    area = 0.5 * sum(corners[k][0] * corners[(k + 1) % n][1] - corners[(k + 1) % n][0] * corners[k][1] for k in range(n))
    for k, (x, y, r) in enumerate(corners):
        (xa, ya, _), (xb, yb, _) = corners[k - 1], corners[(k + 1) % n]
        turn = (math.atan2(yb - y, xb - x) - math.atan2(y - ya, x - xa) + math.pi) % (2 * math.pi) - math.pi
        area -= math.copysign(r * r * (math.tan(abs(turn) / 2) - abs(turn) / 2), turn)
    return area


@pytest.mark.parametrize("script", SCRIPTS, ids=lambda p: p.stem)
def test_example_drawing_reads_back(script, tmp_path):
    cut = read_dxf(run_script(script, tmp_path))
    pieces = len(cut.outline) + sum(len(c) for c in cut.cutouts)
    assert 20 <= pieces <= 50 and len(cut.holes) >= 12 and cut.cutouts and cut.fitted == ()
    assert {type(s) for s in cut.outline} == {Line, Arc}  # kept exact, nothing flattened
    exact = loop_area(cut.outline) + sum(loop_area(c) for c in cut.cutouts) - sum(math.pi * h.diameter ** 2 / 4 for h in cut.holes)
    assert cut_polygon(cut).area == pytest.approx(exact, rel=1e-5)  # shapely's fine polygons against Green
    assert shapely.is_valid(cut_polygon(cut))


def test_gusset_in_inches_is_read_in_millimetres(tmp_path):
    script = EXAMPLES / "truss_knee_gusset_dxf.py"
    gusset = load(script)
    cut = read_dxf(run_script(script, tmp_path))
    assert cut.units == "in" and "$INSUNITS = 1" in cut.units_source
    inch2 = 25.4 ** 2
    assert loop_area(cut.outline) == pytest.approx(rounded_polygon_area(gusset.OUTLINE) * inch2, rel=1e-12)
    assert -loop_area(cut.cutouts[0]) == pytest.approx(rounded_polygon_area(gusset.WINDOW) * inch2, rel=1e-12)
    bolts = sorted((round(x * 25.4, 9), round(y * 25.4, 9)) for x, y in gusset.bolt_holes())
    assert sorted((round(h.center[0], 9), round(h.center[1], 9)) for h in cut.holes if h.diameter < 20) == bolts
    assert {round(h.diameter, 9) for h in cut.holes} == {round(0.5625 * 25.4, 9), 25.4}
    assert cut.ignored == (("MTEXT", 1),)


def test_bracket_holes_are_numbered_left_to_right(tmp_path):
    cut = read_dxf(run_script(EXAMPLES / "motor_mount_bracket_dxf.py", tmp_path))
    assert cut.units == "mm" and len(cut.holes) == 14 and len(cut.outline) == 24
    centres = [h.center for h in cut.holes]
    assert centres[:3] == [pytest.approx(p) for p in ((20.0, 35.0), (20.0, 95.0), (20.0, 130.0))]
    assert all(a[0] <= b[0] + cut.gap for a, b in zip(centres, centres[1:]))
    assert sum(h.diameter == pytest.approx(7.0) for h in cut.holes) == 4  # the motor flange's block exploded
    assert all("in block MOTOR_FLANGE" in w for h, w in zip(cut.holes, cut.holes_from) if h.diameter in (7.0, 30.0))
    assert sorted(r.area for r in map(wire_polygon, cut.cutouts)) == pytest.approx(
        [30.0 * 10.0 + math.pi * 25.0, 80.0 * 26.0 - (4.0 - math.pi) * 36.0], rel=1e-4)  # slot, window


@pytest.mark.parametrize("script", SCRIPTS, ids=lambda p: p.stem)
def test_damaged_drawings_are_refused_cleanly(script, tmp_path):
    """Truncated files, lines replaced by junk or by extreme numbers: read or refused with a PartError."""
    text = run_script(script, tmp_path).read_text()
    damaged = tmp_path / "damaged.dxf"
    for copy in damaged_copies(text, 20, 30, ["junk\n", "nan\n", "1e308\n", "-1\n", "0\n", "1e-300\n"]):
        damaged.write_text(copy)
        try:
            read_dxf(damaged)
        except PartError as error:
            assert "\n" not in str(error) and str(error).startswith("damaged.dxf: ")
