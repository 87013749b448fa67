"""Invalid raiser geometry: each rejected with one line naming the feature and the limit, exit code 2,
no output file. Geometry is checked before any meshing, so these run in milliseconds."""

from __future__ import annotations

import pytest


from conftest import assert_refused, strap, toml_text

PLATE = toml_text(strap(title="raiser input base", hole=None, load={"axial": 100000.0}))


def part(*tables: str) -> str:
    return PLATE + "\n".join(tables)


HOLE = "[[hole]]\ncenter = [{x}, {y}]\ndiameter = {d}\n"
ELLIPSE = "[[ellipse]]\ncenter = [{x}, {y}]\nlength = {l}\nwidth = {w}\nangle = {a}\n"
SLOT = "[[slot]]\ncenter = [{x}, {y}]\nlength = {l}\nwidth = {w}\nangle = {a}\n"
NOTCH = '[[notch]]\nx = {x}\nside = "{side}"\nshape = "{shape}"\ndepth = {h}\nradius = {r}\n'
SEMI = '[[notch]]\nx = {x}\nside = "{side}"\nshape = "semicircle"\nradius = {r}\n'
VEE = '[[notch]]\nx = {x}\nside = "{side}"\nshape = "V"\ndepth = {h}\nradius = {r}\nangle = {a}\n'
STEP = '[step]\nx = {x}\nwidth = {w}\nradius = {r}\n'

CASES = [
    # (what is wrong, part file, words the one-line message must contain)
    ("ellipse crosses the side", part(ELLIPSE.format(x=0, y=30, l=30, w=10, a=90)),
     ["ellipse 1", "crosses", "the side y = 40"]),
    ("ellipse overlaps a hole", part(HOLE.format(x=20, y=0, d=10), ELLIPSE.format(x=5, y=0, l=30, w=10, a=0)),
     ["ellipse 1", "hole 1", "crosses"]),
    ("slot overlaps an ellipse", part(ELLIPSE.format(x=-40, y=0, l=20, w=10, a=0), SLOT.format(x=-20, y=0, l=30, w=8, a=0)),
     ["ellipse 1", "slot 1", "crosses"]),
    ("slot too close to the held end", part(SLOT.format(x=-130, y=0, l=40, w=8, a=0)),
     ["slot 1", "crosses", "held end"]),
    ("slot no longer than wide", part(SLOT.format(x=0, y=0, l=8, w=8, a=0)), ["slot 1.length", "must exceed"]),
    ("slot thin ligament to the side", part(SLOT.format(x=0, y=35.9, l=30, w=8, a=0)),
     ["slot 1", "ligament", "the side y = 40", "at least 0.32 mm"]),
    ("notch deeper than half the width", part(NOTCH.format(x=0, side="top", shape="U", h=41, r=3)),
     ["notch 1.depth", "half the width", "40"]),
    ("opposite notches meet", part(NOTCH.format(x=0, side="both", shape="U", h=39.9, r=3)),
     ["notch 1", "ligament", "its opposite notch"]),
    ("notch overlaps a hole", part(HOLE.format(x=0, y=25, d=12), NOTCH.format(x=0, side="top", shape="U", h=12, r=2)),
     ["notch 1", "hole 1", "crosses"]),
    ("notches overlap on one edge", part(SEMI.format(x=0, side="bottom", r=6), SEMI.format(x=10, side="bottom", r=6)),
     ["notch 1", "notch 2", "crosses"]),
    ("notch touches the loaded end", part(SEMI.format(x=144, side="top", r=6)),
     ["notch 1", "crosses", "loaded end x = 150"]),
    # placement: a raiser off the plate is refused naming it, never ignored (a notch at x = 160 on a plate
    # ending at 150 gave Kt 1; one at 155 a mesher failure)
    ("notch beyond the loaded end", part(SEMI.format(x=160, side="top", r=4)),
     ["notch 1.x", "160 mm lies off the plate", "x = -150 mm to 150 mm"]),
    ("notch axis past the end, mouth across it", part(NOTCH.format(x=155, side="both", shape="U", h=8, r=8)),
     ["notch 1.x", "155 mm lies off the plate"]),
    ("notch mouth across the held end", part(NOTCH.format(x=-146, side="bottom", shape="U", h=8, r=6)),
     ["notch 1", "crosses", "held end x = -150"]),
    ("slot off the plate", part(SLOT.format(x=400, y=0, l=30, w=8, a=0)), ["slot 1", "off the plate"]),
    ("ellipse off the plate", part(ELLIPSE.format(x=0, y=90, l=20, w=8, a=0)), ["ellipse 1", "off the plate"]),
    ("slot across the loaded end", part(SLOT.format(x=145, y=0, l=30, w=8, a=0)),
     ["slot 1", "crosses", "loaded end x = 150"]),
    ("ellipse across the side", part(ELLIPSE.format(x=0, y=-38, l=20, w=8, a=0)),
     ["ellipse 1", "crosses", "the side y = -40"]),
    ("V notch shallower than its root", part(VEE.format(x=0, side="top", h=2, r=3, a=60)),
     ["notch 1.depth", "at least as deep as its root radius"]),
    ("V angle out of range", part(VEE.format(x=0, side="top", h=5, r=1, a=180)), ["notch 1.angle", "0 < angle < 180"]),
    ("unknown notch shape", part(NOTCH.format(x=0, side="top", shape="W", h=5, r=1)), ["notch 1.shape", "U, V, semicircle"]),
    ("semicircle given a depth", part(NOTCH.format(x=0, side="top", shape="semicircle", h=5, r=5)),
     ["notch 1.depth", "as deep as its radius"]),
    ("notch on the shoulder fillet", part(STEP.format(x=0, w=60, r=8), SEMI.format(x=4, side="top", r=2)),
     ["notch 1.x", "shoulder fillet", "straight edge"]),
    ("step wider than the plate", part(STEP.format(x=0, w=90, r=5)), ["step.width", "less than plate.width"]),
    ("fillet larger than the narrow part allows", part(STEP.format(x=120, w=40, r=40)),
     ["step.radius", "narrow part", "loaded end"]),
    ("hole across a fillet", part(STEP.format(x=0, w=40, r=10), HOLE.format(x=6, y=22, d=8)),
     ["hole 1", "crosses"]),
    ("lug names a missing hole", part(HOLE.format(x=110, y=0, d=12), "[lug]\nhole = 2\n"), ["lug.hole", "1 to 1"]),
    ("lug hole off the end's centre", part(HOLE.format(x=100, y=0, d=12), "[lug]\nhole = 1\n"
                                          "[load.pin]\nhole = 1\nforce = 1000.0\n").replace("axial = 100000.0\n", ""),
     ["lug.hole", "(110, 0)"]),
    ("lug without a pin load", part(HOLE.format(x=110, y=0, d=12), "[lug]\nhole = 1\n"), ["lug", "[load.pin]"]),
    ("lug pin hole too big", part(HOLE.format(x=110, y=0, d=79.9), "[lug]\nhole = 1\n"
                                  "[load.pin]\nhole = 1\nforce = 1000.0\n").replace("axial = 100000.0\n", ""),
     ["hole 1", "ligament", "at least"]),
]


@pytest.mark.parametrize("what, text, words", CASES, ids=[c[0] for c in CASES])
def test_invalid_raiser_geometry_exit_2_names_the_feature(tmp_path, capsys, what, text, words):
    assert_refused(tmp_path, capsys, text, words)

