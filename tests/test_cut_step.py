"""STEP files of flat parts read into exact loops (geometry/stepfile.py).

Each file is written by gmsh's OpenCASCADE kernel (a plate with holes extruded, `gmsh.write`) and read
back. Lengths, radii, areas and the thickness are checked against the closed forms of the shapes built
(common practice) and against OpenCASCADE's own face area (an independent evaluator); the unit handling
against a copy of the file that declares metres (docs/references.md [STEP]).
"""

from __future__ import annotations

import math
import subprocess

import gmsh
import pytest

from stressraiser.geometry.cutloops import cut_polygon, loop_area
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.shapes import Arc
from stressraiser.geometry import stepfile
from stressraiser.geometry.stepfile import read_step

from conftest import damaged_copies

W, H, R, T = 100.0, 60.0, 5.0, 6.0  # plate, corner radius, thickness (mm)


def write_step(path, build) -> None:
    """Run `build(occ)` in a fresh gmsh model (it returns the entities to keep) and write them as STEP."""
    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 0)
        build(gmsh.model.occ)
        gmsh.model.occ.synchronize()
        gmsh.write(str(path))
    finally:
        gmsh.finalize()


def drilled_plate(occ, thickness: float | None = T, turn: bool = False):
    """A W x H plate with corners of radius R, a 16 mm hole, a 10 x 24 mm slot and a 20 x 10 mm ellipse."""
    plate = occ.addRectangle(0, 0, 0, W, H, roundedRadius=R)
    hole = occ.addDisk(25, 30, 0, 8, 8)
    slot = _slot(occ, (50.0, 30.0), (64.0, 30.0), 5.0)
    ellipse = occ.addDisk(82, 30, 0, 10, 5)
    face, _ = occ.cut([(2, plate)], [(2, hole), (2, slot), (2, ellipse)])
    if thickness is not None:
        out = occ.extrude(face, 0, 0, thickness)
        face = [e for e in out if e[0] == 3]
    if turn:
        occ.rotate(face, 0, 0, 0, 1, 0, 0, math.pi / 2)  # into the x-z plane
    return face


def _slot(occ, a, b, r) -> int:
    """A plane surface bounded by two half circles of radius r about a and b (on one horizontal line)."""
    p = [occ.addPoint(x, y, 0) for x, y in ((a[0], a[1] - r), (b[0], b[1] - r), (b[0], b[1] + r), (a[0], a[1] + r))]
    ca, cb = occ.addPoint(a[0], a[1], 0), occ.addPoint(b[0], b[1], 0)
    mid_a, mid_b = occ.addPoint(a[0] - r, a[1], 0), occ.addPoint(b[0] + r, b[1], 0)
    curves = [occ.addLine(p[0], p[1]), occ.addCircleArc(p[1], cb, mid_b), occ.addCircleArc(mid_b, cb, p[2]),
              occ.addLine(p[2], p[3]), occ.addCircleArc(p[3], ca, mid_a), occ.addCircleArc(mid_a, ca, p[0])]
    return occ.addPlaneSurface([occ.addCurveLoop(curves)])


def refused(path, *words) -> str:
    with pytest.raises(PartError) as info:
        read_step(path)
    message = str(info.value)
    assert "\n" not in message and message.startswith(f"{path.name}: "), message
    for word in words:
        assert word in message, message
    return message


PLATE_AREA = W * H - (4.0 - math.pi) * R * R - math.pi * 64.0 - (14.0 * 10.0 + math.pi * 25.0) - math.pi * 50.0


def test_extruded_plate_reads_back_to_the_same_loops_and_thickness(tmp_path):
    path = tmp_path / "plate.step"
    write_step(path, drilled_plate)
    cut = read_step(path)
    assert cut.thickness == pytest.approx(T, rel=1e-12)
    assert cut.units == "mm" and "converted to mm" in cut.units_source
    assert sorted(type(s).__name__ for s in cut.outline) == ["Arc"] * 4 + ["Line"] * 4
    assert all(s.radius == pytest.approx(R, rel=1e-12) for s in cut.outline if isinstance(s, Arc))
    assert loop_area(cut.outline) == pytest.approx(W * H - (4.0 - math.pi) * R * R, rel=1e-12)
    # the disk of equal radii is an "Ellipse" edge to OpenCASCADE: it is read back as an exact circle
    assert [(h.center, h.diameter) for h in cut.holes] == [(pytest.approx((25.0, 30.0), abs=1e-9), pytest.approx(16.0, rel=1e-12))]
    slot, ellipse = cut.cutouts
    assert sorted(type(s).__name__ for s in slot) == ["Arc"] * 4 + ["Line"] * 2
    assert loop_area(slot) == pytest.approx(-(14.0 * 10.0 + math.pi * 25.0), rel=1e-12)
    (fit,) = cut.fitted
    assert fit.pieces == len(ellipse) and fit.deviation <= cut.tolerance
    assert min(s.radius for s in ellipse) == pytest.approx(5.0 ** 2 / 10.0, rel=0.02)  # tip radius b²/a
    assert cut_polygon(cut).area == pytest.approx(PLATE_AREA, rel=1e-4)


def test_sheet_without_a_solid_has_no_thickness(tmp_path):
    path = tmp_path / "sheet.step"
    write_step(path, lambda occ: drilled_plate(occ, thickness=None))
    cut = read_step(path)
    assert cut.thickness is None
    assert cut_polygon(cut).area == pytest.approx(PLATE_AREA, rel=1e-4)


def test_plate_in_another_plane_uses_the_stated_frame(tmp_path):
    """Turned into the x-z plane (normal -y, taken as +y): the frame's x is the global x and its y is
    n x x = -z, so a point (x, y) of the flat plate reads (x, -y) (stepfile module docstring)."""
    path = tmp_path / "turned.step"
    write_step(path, lambda occ: drilled_plate(occ, turn=True))
    cut = read_step(path)
    assert cut.thickness == pytest.approx(T, rel=1e-12)
    assert [h.center for h in cut.holes] == [pytest.approx((25.0, -30.0), abs=1e-9)]
    assert loop_area(cut.outline) == pytest.approx(W * H - (4.0 - math.pi) * R * R, rel=1e-12)


def test_spline_edge_follows_the_face_within_tolerance(tmp_path):
    """A plate whose top edge is a B-spline: fitted arcs within the tolerance; the area agrees with
    OpenCASCADE's own area of the face to the perimeter times the tolerance."""
    area = {}

    def build(occ):
        pts = [occ.addPoint(x, y, 0) for x, y in ((0, 0), (80, 0), (80, 30))]
        top = [occ.addPoint(x, y, 0) for x, y in ((60, 40), (40, 25), (20, 45))]
        left = occ.addPoint(0, 30, 0)
        curves = [occ.addLine(pts[0], pts[1]), occ.addLine(pts[1], pts[2]),
                  occ.addBSpline([pts[2], *top, left]), occ.addLine(left, pts[0])]
        face = occ.addPlaneSurface([occ.addCurveLoop(curves)])
        occ.synchronize()
        area["occ"] = occ.getMass(2, face)
        return [(2, face)]

    path = tmp_path / "spline.step"
    write_step(path, build)
    cut = read_step(path, tolerance=0.002)
    (fit,) = cut.fitted
    assert fit.deviation <= 0.002 and "BSpline" in fit.where
    perimeter = sum(s.radius * s.span if isinstance(s, Arc) else math.dist(s.start, s.end) for s in cut.outline)
    assert loop_area(cut.outline) == pytest.approx(area["occ"], abs=perimeter * 0.002)


def test_metres_in_the_file_are_read_as_millimetres(tmp_path):
    path = tmp_path / "plate.step"
    write_step(path, drilled_plate)
    metres = tmp_path / "plate_m.step"
    text = path.read_text()
    assert "SI_UNIT(.MILLI.,.METRE.)" in text
    metres.write_text(text.replace("SI_UNIT(.MILLI.,.METRE.)", "SI_UNIT($,.METRE.)"))
    cut = read_step(metres)
    assert cut.thickness == pytest.approx(1000.0 * T, rel=1e-9)
    assert [(h.center, h.diameter) for h in cut.holes] == [(pytest.approx((25000.0, 30000.0), rel=1e-9), pytest.approx(16000.0, rel=1e-9))]


def test_refusals(tmp_path):
    two = tmp_path / "two.step"
    write_step(two, lambda occ: [(3, occ.addBox(0, 0, 0, 10, 10, 2)), (3, occ.addBox(20, 0, 0, 10, 10, 2))])
    refused(two, "multi-body: 2 solids")
    ball = tmp_path / "ball.step"
    write_step(ball, lambda occ: [(3, occ.addSphere(0, 0, 0, 10))])
    refused(ball, "non-planar: no face of the part is flat")
    chamfered = tmp_path / "chamfered.step"

    def chamfer(occ):  # a 1 mm chamfer along one edge of the top face
        box = occ.addBox(0, 0, 0, 40, 20, 5)
        occ.synchronize()
        top = max((tag for _, tag in gmsh.model.getBoundary([(3, box)], oriented=False)), key=lambda f: occ.getMass(2, f))
        edge = gmsh.model.getBoundary([(2, top)], oriented=False)[0][1]
        return occ.chamfer([box], [abs(edge)], [top], [1.0])

    write_step(chamfered, chamfer)
    refused(chamfered, "not a flat plate", "neither parallel nor square")
    pocket = tmp_path / "pocket.step"
    write_step(pocket, lambda occ: occ.cut([(3, occ.addBox(0, 0, 0, 40, 20, 5))], [(3, occ.addBox(10, 5, 3, 20, 10, 5))])[0])
    refused(pocket, "not a flat plate of one thickness", "a pocket, boss, step or bend")
    angle = tmp_path / "angle.step"
    write_step(angle, lambda occ: occ.fuse([(3, occ.addBox(0, 0, 0, 40, 30, 4))], [(3, occ.addBox(0, 0, 0, 40, 4, 30))])[0])
    refused(angle, "not a flat plate of one thickness", "its thickness 30 mm")  # an angle section: a bend
    junk = tmp_path / "junk.step"
    junk.write_text("ISO-10303-21;\nnot really\n")
    refused(junk, "not a readable STEP file")
    refused(tmp_path / "missing.step", "no such file")


def test_damaged_step_files_are_refused_cleanly(tmp_path, capfd):
    """Truncated files and lines replaced by junk (one of these copies crashes OpenCASCADE 7.8's reader
    outright): read or refused with one PartError line; the reader's own complaints are not printed."""
    path = tmp_path / "plate.step"
    write_step(path, drilled_plate)
    capfd.readouterr()
    damaged = tmp_path / "damaged.step"
    refusals = []
    junk = ["junk\n", "#5 = NOTHING_KNOWN();\n", "#23 = CARTESIAN_POINT('',(1e308,0.,0.));\n"]
    for copy in damaged_copies(path.read_text(), 3, 6, junk):
        damaged.write_text(copy)
        try:
            read_step(damaged)
        except PartError as error:
            refusals.append(str(error))
    assert len(refusals) >= 2 and all("\n" not in r and r.startswith("damaged.step: ") for r in refusals)
    printed = capfd.readouterr()
    assert "StepFile" not in printed.out and "StepFile" not in printed.err


def test_a_reader_crash_is_a_refusal(tmp_path, monkeypatch):
    """Whatever OpenCASCADE version is installed: a child process killed by a signal is reported as a
    damaged file, quoting the reader's first complaint."""
    path = tmp_path / "plate.step"
    path.write_text("ISO-10303-21;\n")

    def killed(*args, **kwargs):
        return subprocess.CompletedProcess(args, -11, stdout="\x1b[31;1m**** ERR StepFile : Incorrect Syntax ****\n", stderr="")

    monkeypatch.setattr(stepfile.subprocess, "run", killed)
    message = refused(path, "crashed on this file (signal 11)", "export it again", "OpenCASCADE: ERR StepFile : Incorrect Syntax")
    assert "\x1b" not in message and "*" not in message
