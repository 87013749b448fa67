"""A drawn outline in the part file: by points, from a DXF cut file, and against the parametric bar.

Sources (docs/references.md): [Howland] the strip with a central hole in tension; [Lame] the thick ring
under internal pressure; [NAFEMS-LE1] the elliptic membrane; [DXF] the bulge and $INSUNITS codes.
"""

from __future__ import annotations

import json
import math

import ezdxf
import numpy as np
import pytest

from conftest import assert_refused
from stressraiser.compare.check import check_part
from stressraiser.compare.edge_cut import EDGE_NORMAL
from stressraiser.geometry.kinds.base import RaiserId
from stressraiser.geometry.partfile import load_part, part_from_dict

STEEL = {"E": 200000.0, "nu": 0.3}
L, W, D, T = 300.0, 50.0, 15.0, 5.0  # the strap: length, width, hole diameter, thickness (mm)
FORCE = 25000.0  # N

# The strap held by a roller on its left end and a short roller on its top edge next to it (held across,
# free along), pulled by a uniform force on its right end: the same [[hold]] and [[load.edge]] keys for
# every form of the part (points picked on its own boundary, mm).
STRAP_HOLDS = [{"at": [-L / 2, 10.0], "mode": "roller"}, {"from": [-L / 2 + 10.0, W / 2], "to": [-L / 2, W / 2],
                                                           "mode": "roller"}]
STRAP_LOAD = {"edge": [{"at": [L / 2, 10.0], "force": FORCE, "direction": 0.0}]}
STRAP_POINTS = [[-L / 2, -W / 2], [L / 2, -W / 2], [L / 2, W / 2], [-L / 2, W / 2]]


def toml_text(part: dict) -> str:
    """TOML of a part-file dictionary: every table written [name] or [[name]], values inline."""
    def value(v) -> str:
        if isinstance(v, dict):
            return "{ " + ", ".join(f"{k} = {value(x)}" for k, x in v.items()) + " }"
        if isinstance(v, list):
            return "[" + ", ".join(value(x) for x in v) + "]"
        return json.dumps(v)

    lines = []
    for key, v in part.items():
        if isinstance(v, dict):
            lines += [f"[{key}]"] + [f"{k} = {value(x)}" for k, x in v.items()]
        else:
            for item in v:
                lines += [f"[[{key}]]"] + [f"{k} = {value(x)}" for k, x in item.items()]
    return "\n".join(lines) + "\n"


def drawn_strap(outline: dict, hole: bool = True, tolerance: float = 0.005) -> dict:
    part = {"plate": {"thickness": T}, "outline": outline, "material": STEEL, "hold": STRAP_HOLDS,
            "load": STRAP_LOAD, "mesh": {"tolerance": tolerance}}
    if hole:
        part["hole"] = [{"center": [0.0, 0.0], "diameter": D}]
    return part


def strap_dxf(path, inch: bool = False, frame: bool = False) -> None:
    """The strap as a DXF: its outline as LINEs on layer CUT, its hole a CIRCLE on layer HOLES, in mm or in
    inches ($INSUNITS 4 or 1, docs/references.md [DXF]); with `frame` a drawing border on layer BORDER and
    a note on NOTES around it."""
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.IN if inch else ezdxf.units.MM
    msp = doc.modelspace()
    k = 1.0 / 25.4 if inch else 1.0
    corners = [(x * k, y * k) for x, y in STRAP_POINTS]
    for a, b in zip(corners, corners[1:] + corners[:1]):
        msp.add_line(a, b, dxfattribs={"layer": "CUT"})
    msp.add_circle((0.0, 0.0), 0.5 * D * k, dxfattribs={"layer": "HOLES"})
    if frame:
        msp.add_lwpolyline([(-200 * k, -60 * k), (200 * k, -60 * k), (200 * k, 60 * k), (-200 * k, 60 * k)], close=True,
                           dxfattribs={"layer": "BORDER"})
        msp.add_text("STRAP, 5 MM S355", dxfattribs={"layer": "NOTES"}).set_placement((-190 * k, 50 * k))
    doc.saveas(path)


@pytest.fixture(scope="module")
def parametric_strap():
    part = {"plate": {"length": L, "width": W, "thickness": T}, "hole": [{"center": [0.0, 0.0], "diameter": D}],
            "material": STEEL, "hold": STRAP_HOLDS, "load": STRAP_LOAD, "mesh": {"tolerance": 0.005}}
    return check_part(part_from_dict(part))


def test_strap_drawn_by_points_from_a_dxf_and_parametric_give_one_kt(tmp_path, parametric_strap):
    # The same strap three ways: today's bar with a [[hole]], an [outline] drawn by points with a [[hole]],
    # and a DXF whose circle becomes hole 1. One mesh and one answer: the Kt agree to 0.1 %, and Howland's
    # gross Kt at d/W = 0.3, 3.36, to his table's 1 % (docs/references.md [Howland]).
    by_points = check_part(part_from_dict(drawn_strap({"points": STRAP_POINTS})))
    strap_dxf(tmp_path / "strap.dxf")
    (tmp_path / "strap.toml").write_text(toml_text(drawn_strap({"file": "strap.dxf"}, hole=False)))
    spec = load_part(tmp_path / "strap.toml")  # the file's path is relative to the part file
    assert spec.holes[0].center == pytest.approx((0.0, 0.0), abs=1e-9) and spec.holes[0].diameter == pytest.approx(D)
    from_dxf = check_part(spec)
    reference = parametric_strap.kt.net
    for result in (by_points, from_dxf):
        assert result.kt.converged and result.net_section.kind == EDGE_NORMAL
        assert result.peak.feature == RaiserId("hole", 1)
        assert result.kt.net == pytest.approx(reference, rel=1e-3)
    assert parametric_strap.kt.gross == pytest.approx(3.36, rel=0.01)  # [Howland], d/W = 0.3
    # the edge-normal cut through the hole's peak is the net section: N / ((W - d) t)
    assert from_dxf.nominal.net.stress == pytest.approx(FORCE / ((W - D) * T), rel=1e-6)


def test_dxf_in_inches_and_in_mm_give_the_same_kt(tmp_path, parametric_strap):
    # 1 in = 25.4 mm exactly ($INSUNITS 1, docs/references.md [DXF]): the inch drawing read into mm is the
    # same part, so the same Kt to 0.1 %.
    strap_dxf(tmp_path / "inch.dxf", inch=True)
    spec = part_from_dict(drawn_strap({"file": str(tmp_path / "inch.dxf")}, hole=False))
    assert spec.drawing.units == "in"
    assert spec.plate.length == pytest.approx(L, rel=1e-12) and spec.holes[0].diameter == pytest.approx(D, rel=1e-12)
    assert check_part(spec).kt.net == pytest.approx(parametric_strap.kt.net, rel=1e-3)


def test_layer_filter_picks_the_right_loops(tmp_path):
    # A border on its own layer around the strap: read whole, it is a loop round the outline (refused);
    # with layers = ["CUT", "HOLES"] the border and the note are left out and the strap is the part.
    strap_dxf(tmp_path / "framed.dxf", frame=True)
    whole = drawn_strap({"file": str(tmp_path / "framed.dxf")}, hole=False)
    with pytest.raises(Exception) as info:
        part_from_dict(whole)
    assert "outline.file" in str(info.value) and "layers" in str(info.value)
    picked = part_from_dict(drawn_strap({"file": str(tmp_path / "framed.dxf"), "layers": ["CUT", "HOLES"]}, hole=False))
    assert picked.plate.length == pytest.approx(L) and picked.plate.width == pytest.approx(W)
    assert len(picked.holes) == 1 and picked.drawing.layers == ("CUT", "HOLES")
    only_cut = part_from_dict(drawn_strap({"file": str(tmp_path / "framed.dxf"), "layers": ["cut"]}, hole=False))
    assert len(only_cut.holes) == 0  # layer names are case-insensitive; the hole's layer left out


def test_file_holes_come_before_hole_tables_and_cutouts_are_numbered(tmp_path):
    # Circles of the drawing are holes 1..n left to right, then bottom to top; a [[hole]] table follows
    # them; a non-circular inner loop is cut-out 1, before any [[cutout]] table.
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.MM
    msp = doc.modelspace()
    msp.add_lwpolyline([(0, 0), (200, 0), (200, 80), (0, 80)], close=True)
    for x, y in ((150, 20), (40, 60), (40, 20)):
        msp.add_circle((x, y), 5.0)
    msp.add_lwpolyline([(90, 30, 0.0), (110, 30, 1.0), (110, 50, 0.0), (90, 50, 1.0)], format="xyb", close=True)
    doc.saveas(tmp_path / "plate.dxf")
    part = {"plate": {"thickness": 6.0}, "outline": {"file": str(tmp_path / "plate.dxf")}, "material": STEEL,
            "hole": [{"center": [170.0, 60.0], "diameter": 8.0}],
            "cutout": [{"points": [[140, 50], [150, 50], [150, 60]]}],
            "hold": [{"pin": 1}, {"pin": 2}], "load": {"pin": {"hole": 4, "force": 1000.0, "direction": 0.0}}}
    spec = part_from_dict(part)
    assert [h.center for h in spec.holes] == [(40.0, 20.0), (40.0, 60.0), (150.0, 20.0), (170.0, 60.0)]
    cutouts = [r for r in spec.raisers if r.KIND == "cutout"]
    assert len(cutouts) == 2 and cutouts[0].drawn == str(tmp_path / "plate.dxf") and cutouts[1].drawn == "points"


def shape(points: list) -> dict:
    """A part drawn by `points` whose left edge x = 0 is fixed and whose bottom edge takes a pressure."""
    return {"plate": {"thickness": 5.0}, "outline": {"points": points}, "material": STEEL,
            "hold": [{"at": [0.0, 20.0]}], "load": {"edge": [{"at": [50.0, 0.0], "pressure": 1.0}]}}


def test_arcs_by_bulge_radius_and_centre_draw_one_shape():
    # A 100 x 40 rectangle with its right end a half circle of radius 20, drawn three ways: the area is
    # 100 x 40 + pi 20² / 2 (plane geometry), and the three outlines coincide.
    from stressraiser.geometry.cutloops import loop_area

    ways = [{"to": [100, 40], "bulge": 1.0}, {"to": [100, 40], "center": [100, 20], "turn": "left"},
            {"to": [100, 40], "radius": 20.0, "turn": "left"}]
    areas = []
    for arc in ways[:2]:
        spec = part_from_dict(shape([[0, 0], [100, 0], arc, [0, 40]]))
        areas.append(loop_area(spec.drawing.outline))
    assert areas == pytest.approx([100 * 40 + math.pi * 200] * 2, rel=1e-12)
    # a radius draws the shorter arc: radius 20 over a chord of 40 is the half circle too
    spec = part_from_dict(shape([[0, 0], [100, 0], ways[2], [0, 40]]))
    assert loop_area(spec.drawing.outline) == pytest.approx(100 * 40 + math.pi * 200, rel=1e-12)
    # turning right instead cuts the half circle out of the end: a concave arc, the part's corner 1
    inward = part_from_dict(shape([[0, 0], [100, 0], {"to": [100, 40], "bulge": -1.0}, [0, 40]]))
    assert loop_area(inward.drawing.outline) == pytest.approx(100 * 40 - math.pi * 200, rel=1e-12)
    from stressraiser.geometry.registry import outline_raisers

    assert [r.id for r in outline_raisers(inward)] == [RaiserId("corner", 1)]


def _bad_dxf(tmp_path, what: str) -> str:
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.MM
    msp = doc.modelspace()
    square = [(0, 0), (100, 0), (100, 50), (0, 50)]
    if what == "open chain":
        for a, b in zip(square, square[1:]):
            msp.add_line(a, b)
        msp.add_line((0, 50), (0, 2))
        msp.add_circle((50, 25), 5.0)
    elif what == "text only":
        msp.add_text("NOTHING TO CUT")
    else:
        msp.add_lwpolyline(square, close=True)
        if what == "crossing loops":
            msp.add_lwpolyline([(90, 10), (120, 10), (120, 40), (90, 40)], close=True)
        elif what == "duplicate":
            msp.add_line((0, 0), (100, 0))
        elif what == "zero length":
            msp.add_line((50, 50), (50, 50.001))
        elif what == "outside":
            msp.add_circle((200, 20), 5)
    path = tmp_path / "bad.dxf"
    doc.saveas(path)
    return str(path)


HELD = {"hold": [{"at": [0.0, 25.0], "mode": "fixed"}],
        "load": {"edge": [{"at": [100.0, 25.0], "force": 1000.0, "direction": 0.0}]}}
SQUARE = [[0, 0], [100, 0], [100, 50], [0, 50]]

DXF_REFUSALS = [
    ("open chain", ["outline.file", "bad.dxf", "open chain", "gap of 2 mm"]),
    ("crossing loops", ["outline.file", "crossing loops"]),
    ("duplicate", ["outline.file", "duplicate pieces"]),
    ("zero length", ["outline.file", "zero length", "(50, 50) mm"]),
    ("outside", ["outline.file", "outside the largest loop"]),
    ("text only", ["outline.file", "only text"]),
]


@pytest.mark.parametrize("what, words", DXF_REFUSALS, ids=[c[0] for c in DXF_REFUSALS])
def test_every_cut_file_refusal_is_one_line_exit_2_nothing_written(tmp_path, capsys, what, words):
    part = {"plate": {"thickness": 5.0}, "outline": {"file": _bad_dxf(tmp_path, what)}, "material": STEEL, **HELD}
    assert_refused(tmp_path, capsys, toml_text(part), words)


PART_REFUSALS = [
    ("both points and file", {"outline": {"points": SQUARE, "file": "x.dxf"}}, ["outline", "either points"]),
    ("no such file", {"outline": {"file": "nowhere.dxf"}}, ["outline.file", "no such file"]),
    ("not a cut file", {"outline": {"file": "part.txt"}}, ["outline.file", "neither a DXF"]),
    ("layers with points", {"outline": {"points": SQUARE, "layers": ["A"]}}, ["outline.layers", "cut file only"]),
    ("unknown drawing unit", {"outline": {"file": "x.dxf", "units": "furlong"}}, ["outline.units", "furlong"]),
    ("too few points", {"outline": {"points": [[0, 0]]}}, ["outline.points", "2 to"]),
    ("self-crossing points", {"outline": {"points": [[0, 0], [100, 50], [100, 0], [0, 50]]}},
     ["crossing loops", "outline.points"]),
    ("repeated point", {"outline": {"points": [[0, 0], [100, 0], [100, 0], [100, 50], [0, 50]]}},
     ["outline.points[3]", "zero length"]),
    ("arc radius too small", {"outline": {"points": [[0, 0], [100, 0], {"to": [100, 50], "radius": 10.0, "turn": "left"},
                                                     [0, 50]]}}, ["outline.points[3].radius", "less than half"]),
    ("arc without a turn", {"outline": {"points": [[0, 0], [100, 0], {"to": [100, 50], "radius": 30.0}, [0, 50]]}},
     ["outline.points[3].turn", "left"]),
    ("arc given twice", {"outline": {"points": [[0, 0], [100, 0], {"to": [100, 50], "radius": 30.0, "bulge": 0.5},
                                                [0, 50]]}}, ["outline.points[3]", "exactly one"]),
    ("plate length", {"plate": {"thickness": 5.0, "length": 100.0}}, ["plate.length", "drawn outline"]),
    ("no thickness", {"plate": {}}, ["plate.thickness", "missing"]),
    ("step on a drawn outline", {"step": {"x": 0.0, "width": 20.0, "radius": 2.0}}, ["step", "bar outline only"]),
    ("notch on a drawn outline", {"notch": [{"x": 50.0, "side": "top", "shape": "semicircle", "radius": 5.0}]},
     ["notch", "draw it in the outline"]),
    ("not held", {"hold": None}, ["hold", "no held end"]),
    ("end load", {"load": {"axial": 1000.0}}, ["load.axial", "no loaded end"]),
    ("remote load", {"load": {"remote": {"sx": 10.0}}}, ["load.remote", "own boundary"]),
    ("free to turn", {"hold": [{"at": [0.0, 25.0], "mode": "roller"}]}, ["hold", "not held", "translation along y"]),
    ("symmetry plane", {"support": {"symmetry": ["y"]}}, ["support.symmetry", "drawn outline"]),
    ("cut-out across the edge", {"cutout": [{"points": [[90, 10], [110, 10], [110, 20]]}]}, ["cutout 1", "crosses"]),
]


@pytest.mark.parametrize("what, change, words", PART_REFUSALS, ids=[c[0] for c in PART_REFUSALS])
def test_every_drawn_outline_refusal_is_one_line_exit_2_nothing_written(tmp_path, capsys, what, change, words):
    part = {"plate": {"thickness": 5.0}, "outline": {"points": SQUARE}, "material": STEEL, **HELD}
    for key, value in change.items():
        if value is None:
            part.pop(key)
        else:
            part[key] = value
    assert_refused(tmp_path, capsys, toml_text(part), words)


def l_bracket(corner: list, tolerance: float = 0.01) -> dict:
    """An L-shaped plate, arms 100 long and 30 wide, fixed across the top of its upright arm and pulled
    down at the end of its foot: the inside corner at (30, 30) is in tension. `corner` draws that corner."""
    points = [[0, 0], [100, 0], [100, 30]] + corner + [[30, 100], [0, 100]]
    return {"plate": {"thickness": 5.0}, "outline": {"points": points}, "material": STEEL,
            "hold": [{"at": [15.0, 100.0]}], "load": {"edge": [{"at": [100.0, 15.0], "force": 2000.0, "direction": -90.0}]},
            "mesh": {"tolerance": tolerance}}


SHARP = [[30, 30]]
ROUNDED = [[32, 30], {"to": [30, 32], "center": [32, 32], "turn": "right"}]  # r = 2 mm


def test_a_sharp_inside_corner_is_reported_not_turned_into_a_kt():
    # The corner's elastic stress is unbounded (Williams: r^(lambda - 1), lambda = 0.5445 for a 270-degree
    # corner of a free plate, docs/references.md [Williams]). It is found, a zone of 5 % of the shorter
    # adjoining piece (70 mm here: 3.5 mm) is left out of the peak search, and its zone's peak is
    # reported on every level: it grows with each refinement, overall within 20 % of the growth Williams'
    # exponent gives for the levels' size ratio, and ends above the governing peak.
    result = check_part(part_from_dict(l_bracket(SHARP)))
    [sharp] = result.sharp_corners
    assert sharp.corner.point == (30.0, 30.0) and sharp.corner.on == "the outline"
    assert sharp.corner.angle == pytest.approx(270.0) and sharp.corner.zone == pytest.approx(3.5)
    peaks = sharp.peaks
    assert len(peaks) == len(result.study.levels) >= 4 and all(b > a for a, b in zip(peaks, peaks[1:]))
    levels = result.study.levels
    williams = (levels[0].scale / levels[-1].scale) ** (1.0 - 0.5445)  # [Williams], from memory
    assert sharp.growth == pytest.approx(williams, rel=0.2)
    assert sharp.exceeds and peaks[-1] > result.peak.stress
    assert math.dist(result.peak.location, (30.0, 30.0)) >= 3.5 * (1.0 - 1e-9)  # no peak from inside the zone
    assert any("sharp inside corner" in c for c in result.cautions)


def test_the_same_corner_with_a_2_mm_radius_converges_as_corner_1():
    # The corner rounded to r = 2 mm: no sharp corner is left, the concave arc is the candidate "corner 1",
    # and its own peak converges to the 1 % target, well above the sharp corner's excluded-zone peak.
    result = check_part(part_from_dict(l_bracket(ROUNDED)))
    assert result.sharp_corners == ()
    assert result.study.governing == RaiserId("corner", 1) and result.peak.feature == RaiserId("corner", 1)
    assert result.kt.converged and result.study.estimate.error <= 0.01
    assert result.net_section.kind == EDGE_NORMAL
    # the cut normal to the arc at its peak runs along a radius, through the arm's whole width: its
    # nominal is N/A + M c/I on that cut, statics of the free body beyond it ([Practice])
    assert abs(result.net_section.equilibrium_error) < 0.01


def test_sharp_corner_above_the_governing_peak_exits_3_with_the_corner_in_the_record(tmp_path, capsys):
    from stressraiser.cli.main import main

    part = tmp_path / "l.toml"
    part.write_text(toml_text({**l_bracket(SHARP), "mesh": {"tolerance": 0.05, "max_levels": 4}}))
    out = tmp_path / "l.json"
    code = main(["check", str(part), "--json", str(out), "--quiet"])
    err = capsys.readouterr().err
    assert code == 3 and "sharp inside corner at (30.00, 30.00) mm" in err and "radius" in err
    record = json.loads(out.read_text())
    [corner] = record["sharp_corners"]
    assert corner["location"] == [30.0, 30.0] and corner["exceeds_governing"] is True
    assert corner["zone_radius"] == pytest.approx(3.5) and len(corner["zone_peaks"]) == len(record["mesh"]["levels"])
    assert record["part"]["outline"]["source"] == "points" and record["part"]["outline"]["pieces"] == 6


def test_lame_ring_drawn_as_a_quarter_under_internal_pressure():
    # A quarter of a thick ring, a = 50, b = 100 mm, drawn by points with its two arcs about the origin,
    # rollers on its straight cut edges (the symmetry lines) and a pressure of 100 MPa on its bore (the
    # concave arc: corner 1). Quadratic triangles. Lame: hoop stress at the bore p (b² + a²) / (b² - a²)
    # = 166.667 MPa, and along the radial cut p a² / (b² - a²) (1 + b² / r²) (docs/references.md [Lame];
    # Timoshenko & Goodier, Theory of Elasticity, 3rd ed., the thick cylinder). Tolerance 0.1 % at the
    # bore (an analytic solution; measured 0.01 %), 1 % along the cut.
    a, b, p = 50.0, 100.0, 100.0
    part = {"plate": {"thickness": 1.0}, "material": STEEL,
            "outline": {"points": [[a, 0], [b, 0], {"to": [0, b], "center": [0, 0], "turn": "left"}, [0, a],
                                   {"to": [a, 0], "center": [0, 0], "turn": "right"}]},
            "hold": [{"at": [75.0, 0.0], "mode": "roller"}, {"at": [0.0, 75.0], "mode": "roller"}],
            "load": {"edge": [{"at": [a / math.sqrt(2.0), a / math.sqrt(2.0)], "pressure": p}]},
            "mesh": {"tolerance": 0.002, "order": 2}}
    result = check_part(part_from_dict(part))
    assert result.kt.converged and result.study.governing == RaiserId("corner", 1)
    assert result.peak.stress == pytest.approx(p * (b * b + a * a) / (b * b - a * a), rel=1e-3)  # [Lame]
    cut = result.net_section.cut
    assert result.net_section.kind == EDGE_NORMAL
    for r in (60.0, 75.0, 90.0):
        hoop = p * a * a / (b * b - a * a) * (1.0 + b * b / (r * r))
        assert float(np.interp(r - a, cut.positions, cut.normal_stress)) == pytest.approx(hoop, rel=0.01)  # [Lame]


def test_nafems_le1_elliptic_membrane_from_a_dxf_with_ellipses(tmp_path):
    # NAFEMS LE1 (docs/references.md [NAFEMS-LE1], from memory): the quarter membrane between the ellipses
    # (x/2)² + y² = 1 and (x/3.25)² + (y/2.75)² = 1, drawn here at 1 unit = 100 mm as a DXF of two LINEs and
    # two ELLIPSE arcs (fitted by tangent arcs within 0.01 mm), E 210 GPa, nu 0.3, plane stress, an outward
    # pressure of 10 MPa on the outer edge, rollers on the two straight edges; quadratic triangles. Target:
    # sigma_yy = 92.7 MPa at D = (2, 0); stresses do not depend on the scale. Tolerance 1 % (measured 0.1 %).
    k = 100.0
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.MM
    msp = doc.modelspace()
    msp.add_line((2 * k, 0), (3.25 * k, 0))
    msp.add_line((0, 2.75 * k), (0, k))
    msp.add_ellipse((0, 0), major_axis=(3.25 * k, 0), ratio=2.75 / 3.25, start_param=0, end_param=math.pi / 2)
    msp.add_ellipse((0, 0), major_axis=(2 * k, 0), ratio=0.5, start_param=0, end_param=math.pi / 2)
    doc.saveas(tmp_path / "le1.dxf")
    spec = part_from_dict({"plate": {"thickness": 0.1 * k}, "material": {"E": 210000.0, "nu": 0.3},
                           "outline": {"file": str(tmp_path / "le1.dxf")},
                           "hold": [{"at": [2.5 * k, 0.0], "mode": "roller"}, {"at": [0.0, 2 * k], "mode": "roller"}],
                           "load": {"edge": [{"from": [3.25 * k, 0], "to": [0, 2.75 * k], "pressure": -10.0}]},
                           "mesh": {"tolerance": 0.005, "order": 2}})
    assert spec.drawing.fitted == 2
    result = check_part(spec)
    assert result.kt.converged and result.study.governing == RaiserId("corner", 1)  # the inner ellipse, one corner
    assert math.dist(result.peak.location, (2 * k, 0.0)) < 0.02 * k  # the peak is at D
    assert result.peak.stress == pytest.approx(92.7, rel=0.01)  # [NAFEMS-LE1]
    nodes = result.solution.mesh.nodes
    d = int(np.argmin(np.hypot(nodes[:, 0] - 2 * k, nodes[:, 1])))
    assert result.solution.nodal_stress[d, 1] == pytest.approx(92.7, rel=0.01)  # sigma_yy at D, finest mesh


def test_sharp_corners_are_found_on_the_outline_and_on_cut_outs_and_nowhere_else():
    # Plane geometry: an L outline has one inside corner (270 degrees of material); a square cut-out has
    # four (each 270 degrees: the material wraps round it); a cut-out with rounded ends has none; the
    # convex corners of the outline are not inside corners.
    from stressraiser.geometry.sharp_corners import sharp_corners

    part = l_bracket(SHARP)
    part["cutout"] = [{"points": [[5, 5], [15, 5], [15, 15], [5, 15]]},
                      {"points": [[50, 10], [70, 10], {"to": [70, 20], "bulge": 1.0}, [50, 20], {"to": [50, 10], "bulge": 1.0}]}]
    corners = sharp_corners(part_from_dict(part))
    assert [c.on for c in corners] == ["the outline"] + ["cutout 1"] * 4
    assert sorted(c.point for c in corners[1:]) == [(5.0, 5.0), (5.0, 15.0), (15.0, 5.0), (15.0, 15.0)]
    assert all(c.angle == pytest.approx(270.0) for c in corners)
    assert [c.zone for c in corners[1:]] == pytest.approx([0.5] * 4)  # 5 % of the 10 mm sides
    # the bar's own kinds have none: a window's corners and a slot's ends are radii
    from conftest import strap

    assert sharp_corners(part_from_dict(strap(window=[{"center": [60.0, 0.0], "length": 30.0, "width": 14.0,
                                                       "radius": 3.0}]))) == ()


def test_a_drawn_cut_out_with_round_ends_is_its_own_candidate():
    # A strap with a slot 30 mm long across the load and 10 mm wide, drawn by points ([[cutout]]) in place
    # of the hole: its concave ends are where the peak is, so the governing candidate is cutout 1, and the
    # cut normal to its end at the peak is the net section across the load, N / ((W - 30) t) (statics).
    part = drawn_strap({"points": STRAP_POINTS}, hole=False, tolerance=0.02)
    part["cutout"] = [{"points": [[5, -10], [5, 10], {"to": [-5, 10], "center": [0, 10], "turn": "left"}, [-5, -10],
                                  {"to": [5, -10], "center": [0, -10], "turn": "left"}]}]
    result = check_part(part_from_dict(part))
    assert result.kt.converged and result.peak.feature == RaiserId("cutout", 1)
    assert result.nominal.net.stress == pytest.approx(FORCE / ((W - 30.0) * T), rel=1e-6)


def test_step_outline_takes_its_thickness_from_the_solid(tmp_path):
    # A 120 x 60 mm plate 6 mm thick with a 20 mm hole, written by gmsh's OpenCASCADE kernel as STEP: the
    # outline, hole 1 and the thickness come from the file when [plate] gives none (docs/references.md [STEP]).
    import gmsh

    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 0)
        occ = gmsh.model.occ
        face, _ = occ.cut([(2, occ.addRectangle(0, 0, 0, 120, 60))], [(2, occ.addDisk(60, 30, 0, 10, 10))])
        occ.extrude(face, 0, 0, 6.0)
        occ.synchronize()
        gmsh.write(str(tmp_path / "plate.step"))
    finally:
        gmsh.finalize()
    part = {"outline": {"file": str(tmp_path / "plate.step")}, "material": STEEL,
            "hold": [{"at": [0.0, 30.0]}], "load": {"edge": [{"at": [120.0, 30.0], "force": 1000.0, "direction": 0.0}]}}
    spec = part_from_dict(part)
    assert spec.plate.thickness == pytest.approx(6.0, rel=1e-9) and spec.drawing.thickness_from_file
    assert spec.plate.length == pytest.approx(120.0) and spec.holes[0].diameter == pytest.approx(20.0, rel=1e-6)
    given = part_from_dict({**part, "plate": {"thickness": 5.0}})
    assert given.plate.thickness == 5.0 and not given.drawing.thickness_from_file  # [plate] wins


def test_raisers_that_cannot_govern_stop_being_refined(monkeypatch):
    # The rounded L bracket with a 6 mm hole near the loaded end of its foot, where the moment is small:
    # once two levels show the hole's band far below the corner's, the hole settles (its grading stays at
    # that level's) and only the corner is refined further. The corner's converged Kt is the one of the
    # same study refining everything (the independent reference: the same model, every raiser refined), to
    # 0.3 %, on fewer elements; the hole's estimate is that of the levels it was refined on.
    from stressraiser.fem import convergence

    part = l_bracket(ROUNDED)
    part["hole"] = [{"center": [80.0, 15.0], "diameter": 6.0}]
    spec = part_from_dict(part)
    settling = check_part(spec)
    hole = RaiserId("hole", 1)
    levels = settling.study.levels
    assert settling.study.governing == RaiserId("corner", 1) and settling.kt.converged
    assert len(levels) >= 3 and hole not in levels[1].settled and hole in levels[-1].settled
    refined = [lv.raisers[hole][0] for lv in levels if hole not in lv.settled]
    assert settling.study.estimates[hole] == convergence.sequence_estimate(refined, convergence.FORMAL_ORDER[1])
    monkeypatch.setattr(convergence, "settles", lambda spec: False)
    everything = check_part(spec)
    assert all(not lv.settled for lv in everything.study.levels)
    assert settling.kt.net == pytest.approx(everything.kt.net, rel=3e-3)
    assert levels[-1].elements < everything.study.levels[len(levels) - 1].elements


def test_a_sweep_finds_a_cut_file_named_relative_to_its_part_file(tmp_path, capsys):
    # The part file names its DXF by a relative path; the sweep checks its variants away from the file (and
    # from any working folder), so the path is joined to the part file's folder when the file is read. The
    # thickness does not change the Kt of a plate in plane stress (its stresses scale with 1/t: statics).
    from stressraiser.cli.main import main

    strap_dxf(tmp_path / "strap.dxf")
    (tmp_path / "strap.toml").write_text(toml_text(drawn_strap({"file": "strap.dxf"}, hole=False, tolerance=0.02)))
    out = tmp_path / "sweep"
    assert main(["sweep", str(tmp_path / "strap.toml"), "--vary", "plate.thickness=5,10", "--out", str(out),
                 "--workers", "1"]) == 0
    rows = json.loads((out / "sweep.json").read_text())["rows"]
    assert [r["status"] for r in rows] == ["ok", "ok"]
    assert rows[0]["kt_net"] == pytest.approx(rows[1]["kt_net"], rel=1e-6)


def test_a_drawn_part_loaded_on_its_edges_signs_off_on_the_cut_at_the_peak():
    # [design] on a part held and loaded on its own boundary (load kind "boundary") once stopped with an
    # internal error. The hand check is N / A on the cut normal to the edge at the hole's peak, here the net
    # section: F / ((W - d) t) by statics, to round-off.
    part = drawn_strap({"points": STRAP_POINTS}, tolerance=0.03)
    part["design"] = {"yield_factor": 1.5}
    part["material"] = {**STEEL, "yield": 355.0, "family": "steel"}
    result = check_part(part_from_dict(part))
    check = result.design.check
    assert check.load_kind == "boundary"
    assert check.hand.actual_mpa == pytest.approx(FORCE / ((W - D) * T), rel=1e-6)
    assert check.governing_check == "net-section" and check.allowable_mpa == pytest.approx(355.0 / 1.5)
