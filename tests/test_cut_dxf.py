"""DXF cut files read into exact loops (geometry/dxffile.py, geometry/cutloops.py).

Every drawing here is written with ezdxf and read back. Lengths, radii and areas are checked against
closed forms of plane geometry (common practice: Green's theorem, the area of a circular segment
r²/2 (θ - sin θ), a corner of turn φ rounded by radius r losing r² (tan φ/2 - φ/2)); the DXF conventions
(bulge, $INSUNITS codes, mirrored entities, layer "0" in blocks) are those of docs/references.md [DXF];
unit factors are exact by definition (NIST SP 811, docs/references.md [DXF]) and cross-checked with pint.
"""

from __future__ import annotations

import math

import ezdxf
import numpy as np
import pytest
import shapely
from scipy.integrate import quad

from stressraiser.geometry.cutloops import CutLoops, cut_polygon, loop_area, segment_length
from stressraiser.geometry.dxffile import UNIT_NAMES, read_dxf
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.outline import segment_coords
from stressraiser.geometry.shapes import Arc, Line, segment_points


def drawing(units: int = ezdxf.units.MM):
    doc = ezdxf.new("R2010")
    doc.units = units
    return doc, doc.modelspace()


def save(doc, tmp_path, name: str = "part.dxf"):
    path = tmp_path / name
    doc.saveas(path)
    return path


def rounded_rectangle(msp, w: float, h: float, r: float, at=(0.0, 0.0), layer: str = "0", scale: float = 1.0,
                      backwards: bool = False) -> None:
    """A w x h rectangle with corners of radius r as LINE and ARC entities (lines drawn backwards if asked)."""
    x, y = at
    k = scale
    on = {"layer": layer}
    lines = [((x + r, y), (x + w - r, y)), ((x + w, y + r), (x + w, y + h - r)), ((x + w - r, y + h), (x + r, y + h)),
             ((x, y + h - r), (x, y + r))]
    for a, b in lines:
        a, b = (b, a) if backwards else (a, b)
        msp.add_line((a[0] * k, a[1] * k), (b[0] * k, b[1] * k), dxfattribs=on)
    for (cx, cy), start in (((x + w - r, y + r), 270), ((x + w - r, y + h - r), 0), ((x + r, y + h - r), 90), ((x + r, y + r), 180)):
        msp.add_arc((cx * k, cy * k), r * k, start, start + 90, dxfattribs=on)


def refused(path, *words, **options) -> str:
    """read_dxf must refuse the drawing: one line starting with the file's name and naming every word."""
    with pytest.raises(PartError) as info:
        read_dxf(path, **options)
    message = str(info.value)
    assert "\n" not in message and message.startswith(f"{path.name}: "), message
    for word in words:
        assert word in message, message
    return message


def rounded_rectangle_area(w, h, r):
    return w * h - (4.0 - math.pi) * r * r  # four corners each lose r² (1 - pi/4) (common practice)


def assert_closed(loop, exact: bool = True):
    """Each piece ends where the next starts (exactly for lines; arcs within 1e-9 mm)."""
    for a, b in zip(loop, loop[1:] + loop[:1]):
        assert math.dist(segment_points(a)[1], segment_points(b)[0]) <= 1e-9


# --- exact round trips -------------------------------------------------------------------------------------

def test_lines_arcs_and_circles_round_trip_exactly(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 120.0, 60.0, 8.0)
    msp.add_circle((30.0, 30.0), 6.0)
    msp.add_circle((90.0, 25.0), 5.0)
    cut = read_dxf(save(doc, tmp_path))
    assert isinstance(cut, CutLoops) and cut.units == "mm"
    assert len(cut.outline) == 8 and cut.cutouts == ()
    assert sorted(type(s).__name__ for s in cut.outline) == ["Arc"] * 4 + ["Line"] * 4
    assert all(s.radius == 8.0 for s in cut.outline if isinstance(s, Arc))  # radius kept exact
    assert [(h.center, h.diameter) for h in cut.holes] == [((30.0, 30.0), 12.0), ((90.0, 25.0), 10.0)]
    assert_closed(list(cut.outline))
    # closed forms: area W H - (4 - pi) r², perimeter 2 (W + H) - 8 r + 2 pi r (common practice)
    assert loop_area(cut.outline) == pytest.approx(rounded_rectangle_area(120.0, 60.0, 8.0), rel=1e-12)
    assert sum(segment_length(s) for s in cut.outline) == pytest.approx(2 * 180.0 - 64.0 + 16.0 * math.pi, rel=1e-12)
    # the shapely polygon: outline less holes (fine polygons, chord error ~2e-5 r: area to 1e-5)
    expected = rounded_rectangle_area(120.0, 60.0, 8.0) - math.pi * (36.0 + 25.0)
    assert cut_polygon(cut).area == pytest.approx(expected, rel=1e-5)


def test_orientation_start_and_provenance(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0, backwards=True)  # reversed entities
    msp.add_lwpolyline([(20, 20), (40, 20), (40, 30), (20, 30)], close=True)  # drawn counter-clockwise
    cut = read_dxf(save(doc, tmp_path))
    assert loop_area(cut.outline) > 0.0  # the outline counter-clockwise
    assert loop_area(cut.cutouts[0]) == pytest.approx(-200.0, rel=1e-12)  # a cut-out clockwise
    assert segment_points(cut.outline[0])[0] == pytest.approx((0.0, 5.0), abs=1e-12)  # starts lowest-left
    assert segment_points(cut.cutouts[0][0])[0] == (20.0, 20.0)
    assert len(cut.outline_from) == len(cut.outline) and all("on layer 0" in w for w in cut.outline_from)
    assert all(w.startswith("LWPOLYLINE #") for w in cut.cutouts_from[0])


def test_drawing_order_does_not_change_the_loops(tmp_path):
    a, msp_a = drawing()
    rounded_rectangle(msp_a, 100.0, 50.0, 5.0)
    b, msp_b = drawing()
    rounded_rectangle(msp_b, 100.0, 50.0, 5.0, backwards=True)
    centres = [(20.0, 40.0), (20.0, 10.0), (80.0, 25.0), (50.0, 25.0), (20.000001, 25.0)]
    for x, y in centres:
        msp_a.add_circle((x, y), 3.0)
    for x, y in reversed(centres):
        msp_b.add_circle((x, y), 3.0)
    first, second = read_dxf(save(a, tmp_path, "a.dxf")), read_dxf(save(b, tmp_path, "b.dxf"))
    assert first.holes == second.holes
    for s, t in zip(first.outline, second.outline):
        assert type(s) is type(t)
        assert np.allclose(segment_coords(s), segment_coords(t), atol=1e-12)
    # numbering: left to right; centres within the gap tolerance of one x bottom to top
    assert [h.center for h in first.holes] == [(20.0, 10.0), (20.000001, 25.0), (20.0, 40.0), (50.0, 25.0), (80.0, 25.0)]


def test_bulge_arcs_of_both_signs(tmp_path):
    """A 40 x 20 plate: the right end a half circle out (bulge +1, counter-clockwise), the left end a bite of
    bulge -0.5 into the plate (clockwise)."""
    w, h = 40.0, 20.0
    doc, msp = drawing()
    msp.add_lwpolyline([(0, 0, 0), (w, 0, 1.0), (w, h, 0), (0, h, -0.5)], format="xyb", close=True)
    cut = read_dxf(save(doc, tmp_path))
    arcs = [s for s in cut.outline if isinstance(s, Arc)]
    bump = next(a for a in arcs if a.center[0] > w / 2)
    bite = next(a for a in arcs if a.center[0] < w / 2)
    theta = 4.0 * math.atan(0.5)  # included angle of bulge 0.5 ([DXF]: bulge = tan(theta / 4))
    radius = (h / 2.0) / math.sin(theta / 2.0)
    assert bump.radius == pytest.approx(h / 2.0, rel=1e-12) and bump.end - bump.start == pytest.approx(math.pi, rel=1e-12)
    assert bite.radius == pytest.approx(radius, rel=1e-12) and bite.end - bite.start == pytest.approx(-theta, rel=1e-12)
    assert bite.center[0] == pytest.approx(-radius * math.cos(theta / 2.0), rel=1e-12)  # under a half turn: centre
    # on the far side of the chord from the arc, outside the plate
    segment = radius ** 2 / 2.0 * (theta - math.sin(theta))  # circular segment (common practice)
    assert loop_area(cut.outline) == pytest.approx(w * h + math.pi * (h / 2) ** 2 / 2 - segment, rel=1e-12)


def test_polyline_outline_equals_lines_and_arcs(tmp_path):
    """The same rounded rectangle as LINE/ARC entities, as a closed LWPOLYLINE drawn clockwise (negative
    bulges) whose last vertex repeats its first, and as an old-style 2-D POLYLINE."""
    w, h, r = 90.0, 40.0, 6.0
    b = math.tan(math.pi / 8.0)  # a quarter turn
    ccw = [(r, 0, 0), (w - r, 0, b), (w, r, 0), (w, h - r, b), (w - r, h, 0), (r, h, b), (0, h - r, 0), (0, r, b)]
    # reversed: vertex k carries minus the bulge of the piece that ended at it
    cw = [(ccw[k][0], ccw[k][1], -ccw[k - 1][2]) for k in reversed(range(len(ccw)))]
    cw.append((cw[0][0], cw[0][1], 0.0))
    doc, msp = drawing()
    rounded_rectangle(msp, w, h, r)
    reference = read_dxf(save(doc, tmp_path, "lines.dxf")).outline
    doc, msp = drawing()
    msp.add_lwpolyline(cw, format="xyb", close=True)
    clockwise = read_dxf(save(doc, tmp_path, "clockwise.dxf")).outline
    doc, msp = drawing()
    poly = msp.add_polyline2d([(x, y) for x, y, _ in ccw], close=True)
    for vertex, (_, _, bulge) in zip(poly.vertices, ccw):
        vertex.dxf.bulge = bulge
    old = read_dxf(save(doc, tmp_path, "polyline.dxf")).outline
    for outline in (clockwise, old):
        assert len(outline) == 8
        for s, t in zip(reference, outline):
            assert np.allclose(segment_coords(s), segment_coords(t), atol=1e-9)
    assert loop_area(clockwise) == pytest.approx(rounded_rectangle_area(w, h, r), rel=1e-12)


def test_open_polylines_chain_with_other_entities(tmp_path):
    """An open LWPOLYLINE (bottom, a bulge-1 right end, top), an open flat 3-D POLYLINE and a LINE close one
    outline: a 60 x 20 plate with a half-circle end, area 1200 + pi 10² / 2."""
    doc, msp = drawing()
    msp.add_lwpolyline([(0, 0, 0), (60, 0, 1.0), (60, 20, 0), (30, 20, 0)], format="xyb")
    msp.add_polyline3d([(30, 20, 5), (10, 20, 5), (0, 20, 5)])  # flat, at z = 5
    msp.add_line((0, 20), (0, 0))
    cut = read_dxf(save(doc, tmp_path))
    assert len(cut.outline) == 6
    assert loop_area(cut.outline) == pytest.approx(1200.0 + math.pi * 100.0 / 2.0, rel=1e-12)
    assert sum(w.startswith("POLYLINE #") for w in cut.outline_from) == 2


def test_mirrored_entities_and_exploded_blocks(tmp_path):
    """Arcs with the extrusion (0, 0, -1) mirror x ([DXF] arbitrary axis); a block of circles on layer "0",
    inserted mirrored and turned, gives its holes where the transform puts them, on the INSERT's layer."""
    doc, msp = drawing()
    w, h, r = 100.0, 60.0, 10.0
    for a, b in (((r, 0), (w - r, 0)), ((w, r), (w, h - r)), ((w - r, h), (r, h)), ((0, h - r), (0, r))):
        msp.add_line(a, b, dxfattribs={"layer": "CUT"})
    for (cx, cy), start in (((w - r, r), 270), ((w - r, h - r), 0), ((r, h - r), 90), ((r, r), 180)):
        # the same arc in the mirrored system: centre x and the angles reflected, x -> -x
        msp.add_arc((-cx, cy), r, 180 - (start + 90), 180 - start, dxfattribs={"layer": "CUT", "extrusion": (0, 0, -1)})
    pattern = doc.blocks.new("PATTERN")
    pattern.add_circle((10.0, 0.0), 2.0)
    pattern.add_circle((0.0, 5.0), 3.0)
    msp.add_blockref("PATTERN", (50.0, 30.0), dxfattribs={"layer": "HOLES", "xscale": -1.0, "rotation": 90.0})
    cut = read_dxf(save(doc, tmp_path), layers=["cut", "HOLES"])  # layer names case-insensitive
    assert loop_area(cut.outline) == pytest.approx(rounded_rectangle_area(w, h, r), rel=1e-12)
    # mirror x then turn 90 deg: (10, 0) -> (-10, 0) -> (0, -10); (0, 5) -> (0, 5) -> (-5, 0)
    found = {(round(hole.center[0], 9), round(hole.center[1], 9)): hole.diameter for hole in cut.holes}
    assert found == {(50.0, 20.0): 4.0, (45.0, 30.0): 6.0}
    assert all("in block PATTERN" in w and "on layer HOLES" in w for w in cut.holes_from)


def test_circles_drawn_in_pieces_and_block_arrays_become_holes(tmp_path):
    """Two half-circle ARCs, a closed polyline of two bulge-1 pieces, and a MINSERT array of a circle block
    (3 rows 10 mm apart, 2 columns 12 mm apart) are all circular holes."""
    doc, msp = drawing()
    rounded_rectangle(msp, 120.0, 60.0, 5.0)
    msp.add_arc((15, 30), 4, 90, 270)
    msp.add_arc((15, 30), 4, 270, 90)
    msp.add_lwpolyline([(100, 30, 1.0), (110, 30, 1.0)], format="xyb", close=True)  # a 10 mm circle
    block = doc.blocks.new("PIN")
    block.add_circle((0, 0), 2.5)
    msp.add_blockref("PIN", (40, 20)).grid(size=(3, 2), spacing=(10, 12))  # 3 rows 10 apart, 2 columns 12 apart
    cut = read_dxf(save(doc, tmp_path))
    assert cut.cutouts == ()
    found = [(round(h.center[0], 9), round(h.center[1], 9), round(h.diameter, 9)) for h in cut.holes]
    assert found == [(15.0, 30.0, 8.0), (40.0, 20.0, 5.0), (40.0, 30.0, 5.0), (40.0, 40.0, 5.0),
                     (52.0, 20.0, 5.0), (52.0, 30.0, 5.0), (52.0, 40.0, 5.0), (105.0, 30.0, 10.0)]


def test_ellipse_fitted_by_tangent_arcs(tmp_path):
    """A full ellipse window: arcs within the stated tolerance of it, tangent-continuous, with the tip
    radius b²/a, and the area pi a b (to the perimeter times the tolerance: the bound the tolerance
    implies)."""
    a, b, tol = 8.0, 3.2, 0.01
    doc, msp = drawing()
    rounded_rectangle(msp, 60.0, 40.0, 4.0)
    msp.add_ellipse((30.0, 20.0), major_axis=(a, 0.0), ratio=b / a)
    cut = read_dxf(save(doc, tmp_path), tolerance=tol)
    (window,) = cut.cutouts
    assert all(isinstance(s, Arc) for s in window)
    assert len(cut.fitted) == 1 and cut.fitted[0].pieces == len(window) and cut.fitted[0].deviation <= tol
    perimeter = quad(lambda t: math.hypot(a * math.sin(t), b * math.cos(t)), 0.0, 2.0 * math.pi)[0]  # scipy
    assert -loop_area(window) == pytest.approx(math.pi * a * b, abs=perimeter * tol)
    assert min(s.radius for s in window) == pytest.approx(b * b / a, rel=0.02)  # curvature within 2 % (arcfit.BEND)
    t = np.linspace(0.0, 2.0 * math.pi, 4001)
    true = shapely.LinearRing(np.column_stack([30.0 + a * np.cos(t), 20.0 + b * np.sin(t)]))
    fitted = shapely.LinearRing(np.concatenate([segment_coords(s)[:-1] for s in window]))
    assert shapely.hausdorff_distance(true, fitted, densify=0.01) <= tol + 1e-4  # shapely, polygons to ~1e-4
    for s, u in zip(window, window[1:] + window[:1]):  # one tangent where two arcs meet (G1)
        d0 = math.copysign(1.0, s.end - s.start) * np.array([-math.sin(s.end), math.cos(s.end)])
        d1 = math.copysign(1.0, u.end - u.start) * np.array([-math.sin(u.start), math.cos(u.start)])
        assert float(d0 @ d1) == pytest.approx(1.0, abs=1e-9)


def test_partial_ellipse_and_circular_ellipse(tmp_path):
    """A plate with an elliptical end (half an ellipse, a = 15 along x, b = 10), and an ellipse with equal
    axes: an exact circle, hence a hole."""
    doc, msp = drawing()
    msp.add_line((0, -10), (50, -10))
    msp.add_ellipse((50.0, 0.0), major_axis=(15.0, 0.0), ratio=10.0 / 15.0, start_param=-math.pi / 2, end_param=math.pi / 2)
    msp.add_line((50, 10), (0, 10))
    msp.add_line((0, 10), (0, -10))
    msp.add_ellipse((20.0, 0.0), major_axis=(0.0, 4.0), ratio=1.0)
    cut = read_dxf(save(doc, tmp_path))
    assert loop_area(cut.outline) == pytest.approx(50.0 * 20.0 + math.pi * 15.0 * 10.0 / 2.0, abs=0.01 * 40.0)
    assert [(h.center, h.diameter) for h in cut.holes] == [(pytest.approx((20.0, 0.0), abs=1e-12), pytest.approx(8.0, rel=1e-12))]
    assert len(cut.fitted) == 1  # the circle needed no fitting


def test_splines(tmp_path):
    """A rational spline that is a circle stays an exact circle (a hole); a cubic spline edge is followed
    within the tolerance of ezdxf's own evaluation of it (an independent evaluator); a degree-1 spline is
    its straight lines."""
    doc, msp = drawing()
    msp.add_line((0, 0), (60, 0))
    msp.add_line((60, 0), (60, 30))
    edge = msp.add_spline(fit_points=[(60, 30), (45, 36), (30, 28), (15, 38), (0, 30)])
    msp.add_spline(degree=1).apply_construction_tool(
        ezdxf.math.BSpline([(0, 30), (-5, 15), (0, 0)], order=2))  # a kinked two-line left edge
    circle = msp.add_spline()
    circle.apply_construction_tool(ezdxf.math.rational_bspline_from_arc((30, 12), 4.0, 0, 360))
    cut = read_dxf(save(doc, tmp_path), tolerance=0.005)
    assert [(h.center, h.diameter) for h in cut.holes] == [(pytest.approx((30.0, 12.0), abs=1e-9), pytest.approx(8.0, rel=1e-9))]
    lines = [s for s, w in zip(cut.outline, cut.outline_from) if w.startswith("SPLINE") and isinstance(s, Line)]
    assert len(lines) == 2 and sum(segment_length(s) for s in lines) == pytest.approx(2 * math.hypot(5, 15), rel=1e-12)
    dense = np.array([(p.x, p.y) for p in edge.flattening(0.0001)])
    ours = [s for s, w in zip(cut.outline, cut.outline_from) if w == f"SPLINE #{edge.dxf.handle} on layer 0"]
    assert ours and all(isinstance(s, Arc) for s in ours)
    chain = shapely.LineString(np.concatenate([segment_coords(s) for s in ours]))
    assert shapely.hausdorff_distance(chain, shapely.LineString(dense), densify=0.01) <= 0.005 + 2e-4


def test_layer_filter_picks_the_right_loops(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 80.0, 40.0, 5.0, layer="BRACKET")
    msp.add_circle((20.0, 20.0), 4.0, dxfattribs={"layer": "BRACKET"})
    rounded_rectangle(msp, 50.0, 50.0, 10.0, at=(200.0, 0.0), layer="Washer")
    msp.add_circle((225.0, 25.0), 9.0, dxfattribs={"layer": "Washer"})
    msp.add_text("TWO PARTS", dxfattribs={"layer": "NOTES"})
    path = save(doc, tmp_path)
    refused(path, "two outlines", "(200, 10) mm")  # both parts at once: one drawing, one part
    bracket = read_dxf(path, layers=["BRACKET"])
    washer = read_dxf(path, layers="washer")
    assert loop_area(bracket.outline) == pytest.approx(rounded_rectangle_area(80.0, 40.0, 5.0), rel=1e-12)
    assert [h.diameter for h in bracket.holes] == [8.0] and bracket.ignored == ()
    assert loop_area(washer.outline) == pytest.approx(rounded_rectangle_area(50.0, 50.0, 10.0), rel=1e-12)
    assert [h.center for h in washer.holes] == [(225.0, 25.0)]
    both = read_dxf(path, layers=["BRACKET", "NOTES"])
    assert both.ignored == (("TEXT", 1),) and both.holes == bracket.holes
    refused(path, "layers: 'PLATE' is not a layer of the drawing", "BRACKET", "Washer", layers=["PLATE"])


@pytest.mark.parametrize("unit, code", [("in", ezdxf.units.IN), ("ft", ezdxf.units.FT), ("cm", ezdxf.units.CM)])
def test_same_part_in_other_units_gives_the_same_loops_in_mm(tmp_path, unit, code):
    import pint

    per_unit = pint.UnitRegistry().Quantity(1.0, {"in": "inch", "ft": "foot", "cm": "centimetre"}[unit]).to("mm").magnitude
    assert UNIT_NAMES[unit] == pytest.approx(per_unit, rel=1e-15)  # pint's definitions, exact (NIST SP 811)
    mm_doc, msp = drawing(ezdxf.units.MM)
    rounded_rectangle(msp, 101.6, 50.8, 6.35)
    msp.add_circle((25.4, 25.4), 6.35)
    msp.add_lwpolyline([(50.8, 12.7, 0), (76.2, 12.7, 1), (76.2, 38.1, 0), (50.8, 38.1, 1)], format="xyb", close=True)
    other, msp = drawing(code)
    k = 1.0 / per_unit
    rounded_rectangle(msp, 101.6 * k, 50.8 * k, 6.35 * k)
    msp.add_circle((25.4 * k, 25.4 * k), 6.35 * k)
    msp.add_lwpolyline([(50.8 * k, 12.7 * k, 0), (76.2 * k, 12.7 * k, 1), (76.2 * k, 38.1 * k, 0), (50.8 * k, 38.1 * k, 1)],
                       format="xyb", close=True)
    in_mm, in_other = read_dxf(save(mm_doc, tmp_path, "mm.dxf")), read_dxf(save(other, tmp_path, f"{unit}.dxf"))
    assert in_other.units == unit and "$INSUNITS = " in in_other.units_source
    assert in_other.holes[0].diameter == pytest.approx(in_mm.holes[0].diameter, rel=1e-12)
    for mine, theirs in ((in_mm.outline, in_other.outline), (in_mm.cutouts[0], in_other.cutouts[0])):
        assert len(mine) == len(theirs)
        for s, t in zip(mine, theirs):
            assert np.allclose(segment_coords(s), segment_coords(t), rtol=1e-12, atol=1e-9)


def test_units_given_explicitly_win_and_unitless_drawings_are_refused(tmp_path):
    doc, msp = drawing(0)  # unitless
    rounded_rectangle(msp, 4.0, 2.0, 0.25)
    path = save(doc, tmp_path)
    refused(path, "units", "unitless", "$INSUNITS = 0", "in")
    cut = read_dxf(path, units="in")
    assert cut.units == "in" and "given explicitly" in cut.units_source
    assert loop_area(cut.outline) == pytest.approx(rounded_rectangle_area(4.0, 2.0, 0.25) * 25.4 ** 2, rel=1e-12)
    doc, msp = drawing(ezdxf.units.MM)
    rounded_rectangle(msp, 4.0, 2.0, 0.25)
    path = save(doc, tmp_path, "header_mm.dxf")
    overridden = read_dxf(path, units="in")
    assert "the header says mm" in overridden.units_source
    assert loop_area(overridden.outline) == pytest.approx(loop_area(read_dxf(path).outline) * 25.4 ** 2, rel=1e-12)
    refused(path, "units: 'furlong' is not a drawing unit", units="furlong")
    doc, msp = drawing(ezdxf.units.MI)
    rounded_rectangle(msp, 4.0, 2.0, 0.25)
    refused(save(doc, tmp_path, "miles.dxf"), "units", "Miles", "$INSUNITS = 3")


def test_gap_tolerance_joins_small_slips_exactly(tmp_path):
    doc, msp = drawing()
    msp.add_line((0, 0), (50, 0))
    msp.add_line((50.004, 0.003), (50, 30))  # 5 micrometres off: within the 0.01 mm default
    msp.add_line((50, 30), (0, 30))
    msp.add_line((0, 30), (0, 0))
    msp.add_circle((20, 15), 5)
    path = save(doc, tmp_path)
    cut = read_dxf(path)
    assert_closed(list(cut.outline))
    corner = [p for s in cut.outline for p in segment_points(s) if p[0] > 49.0 and p[1] < 1.0]
    assert len(set(corner)) == 1 and corner[0] == pytest.approx((50.002, 0.0015), abs=1e-12)  # mean of the two ends
    refused(path, "open chain", "a gap of 0.005 mm between", "(50, 0) mm", "gap tolerance 0.001 mm", gap=0.001)


# --- refusals: one line naming where ------------------------------------------------------------------------

def test_open_chain_names_the_gap(tmp_path):
    doc, msp = drawing(ezdxf.units.IN)
    rounded_rectangle(msp, 4.0, 2.0, 0.25)
    msp.add_line((1.0, 1.0), (1.5, 1.0))
    msp.add_line((1.5, 1.0), (1.5, 1.5))
    msp.add_line((1.5, 1.5), (1.02, 1.5))  # a cut-out left 0.5 in open... and 0.02 in short
    refused(save(doc, tmp_path), "open chain", "a gap of 0.5004 in (12.71 mm)", "between (1, 1) in", "(1.02, 1.5) in",
            "LINE #", "gap tolerance 0.0003937 in (0.01 mm)", "2 free ends")


def test_no_closed_loop_at_all(tmp_path):
    doc, msp = drawing()
    msp.add_line((0, 0), (10, 0))
    msp.add_arc((10, 5), 5, 270, 90)
    refused(save(doc, tmp_path), "no closed loop", "a gap of 14.14 mm", "(0, 0) mm (LINE #", "(10, 10) mm (ARC #")


def test_crossing_and_touching_loops(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_circle((30, 25), 10)
    msp.add_circle((45, 25), 10)
    refused(save(doc, tmp_path, "overlap.dxf"), "crossing loops", "two loops cross or touch at", "CIRCLE #")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_circle((97, 25), 5)  # pokes out of the plate's edge
    refused(save(doc, tmp_path, "edge.dxf"), "crossing loops", "LINE #", "CIRCLE #")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_lwpolyline([(20, 20), (40, 30), (40, 20), (20, 30)], close=True)  # a bow tie
    refused(save(doc, tmp_path, "bowtie.dxf"), "crossing loops", "crosses itself at (30, 25) mm", "LWPOLYLINE #")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_line((5, 0), (20, 20))  # a branch from the end of the bottom edge
    refused(save(doc, tmp_path, "branch.dxf"), "crossing loops", "3 piece ends meet at (5, 0) mm", "must not branch")


def test_duplicate_and_zero_length_entities(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    first = msp.add_line((5, 0), (95, 0))
    msp.add_line((95, 0), (5, 0))
    message = refused(save(doc, tmp_path, "twice.dxf"), "duplicate pieces", "lie on each other", "(50, 0) mm")
    assert message.count("LINE #") == 2 and f"#{first.dxf.handle}" in message
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_line((30, 30), (30, 30))
    refused(save(doc, tmp_path, "dot.dxf"), "LINE #", "zero length (0 mm) at (30, 30) mm")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_lwpolyline([(20, 20), (40, 20), (40, 20), (40, 30), (20, 30)], close=True)  # a repeated vertex
    refused(save(doc, tmp_path, "repeat.dxf"), "LWPOLYLINE #", "zero length", "(40, 20) mm")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_circle((30, 30), 0.002)
    refused(save(doc, tmp_path, "speck.dxf"), "CIRCLE #", "zero radius")


def test_loops_outside_inside_and_second_outlines(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_circle((150, 25), 5)
    refused(save(doc, tmp_path, "stray.dxf"), "a loop outside the outline", "(155, 25) mm", "CIRCLE #")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    rounded_rectangle(msp, 60.0, 30.0, 5.0, at=(150.0, 0.0))
    msp.add_circle((180, 15), 5)
    refused(save(doc, tmp_path, "two.dxf"), "two outlines", "(150, 5) mm", "1 loop(s) inside it")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_circle((50, 25), 15)
    msp.add_circle((50, 25), 5)  # an island inside a hole
    refused(save(doc, tmp_path, "island.dxf"), "a loop inside a cut-out", "(55, 25) mm", "(65, 25) mm")


def test_annotation_only_empty_and_unsupported(tmp_path):
    doc, msp = drawing()
    msp.add_text("NOTE", dxfattribs={"layer": "NOTES"})
    msp.add_linear_dim(base=(0, -10), p1=(0, 0), p2=(100, 0), dxfattribs={"layer": "NOTES"}).render()
    refused(save(doc, tmp_path, "notes.dxf"), "only text and dimensions", "1 DIMENSION", "1 TEXT")
    doc, msp = drawing()
    refused(save(doc, tmp_path, "empty.dxf"), "no cut geometry")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0, layer="CUT")
    msp.add_3dface([(0, 0), (1, 0), (1, 1)], dxfattribs={"layer": "MODEL"})
    msp.add_solid([(0, 0), (1, 0), (1, 1)], dxfattribs={"layer": "MODEL"})
    path = save(doc, tmp_path, "solid.dxf")
    refused(path, "unsupported entities: 3DFACE on layer MODEL (1), SOLID on layer MODEL (1)")
    assert len(read_dxf(path, layers=["CUT"]).outline) == 8  # leaving the layer out reads the part


def test_entities_out_of_the_drawing_plane(tmp_path):
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_circle((0, 20, 30), 5, dxfattribs={"extrusion": (1, 0, 0)})
    refused(save(doc, tmp_path, "tilted.dxf"), "CIRCLE #", "not in the drawing plane", "extrusion (1, 0, 0)")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    msp.add_line((20, 20, 0), (30, 20, 5))
    refused(save(doc, tmp_path, "sloped.dxf"), "LINE #", "not in the drawing plane", "z from 0 to 5")


def test_unreadable_files_and_bad_tolerances(tmp_path):
    junk = tmp_path / "junk.dxf"
    junk.write_text("this is not a drawing\n")
    refused(junk, "not a readable DXF drawing")
    refused(tmp_path / "missing.dxf", "no such file")
    doc, msp = drawing()
    rounded_rectangle(msp, 100.0, 50.0, 5.0)
    path = save(doc, tmp_path)
    refused(path, "tolerance: -1.0 is not allowed", tolerance=-1.0)
    refused(path, "gap: nan is not allowed", gap=float("nan"))
