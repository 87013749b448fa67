"""Write the cut file of an invented conveyor motor-mount bracket (6 mm plate, millimetres) as a DXF drawing.

    python examples/motor_mount_bracket_dxf.py [OUT.dxf]      (default: motor_mount_bracket.dxf)

An L-shaped plate: a base flange 260 x 70 mm bolted to the conveyor frame through two open adjusting
slots and six holes, with a lightening window; an upright arm carrying the motor flange (a block of four
bolt holes and a pilot hole), a belt-tension slot and a pivot hole in its rounded head. The outline is
drawn with LINE and ARC entities on layer CUT; the window and the slot are closed polylines with bulges
(the window drawn clockwise, so its bulges are negative); the holes are circles on layer HOLES, the motor
flange's as a block reference; dimensions and notes on layer NOTES are annotation, which readers skip.
Every inside corner is rounded: a sharp one would be an unbounded elastic peak.
"""

from __future__ import annotations

import sys
from pathlib import Path

import ezdxf

from stressraiser.cli.files import atomic_path

CUT, HOLES, NOTES = "CUT", "HOLES", "NOTES"


def outline(msp) -> None:
    """The outer boundary, counter-clockwise from the lower-left corner (24 pieces)."""
    on = {"layer": CUT}
    msp.add_arc((6, 6), 6, 180, 270, dxfattribs=on)                  # lower-left corner
    msp.add_line((6, 0), (132, 0), dxfattribs=on)
    for x in (140, 220):                                              # open adjusting slots, 12 wide, 22 deep
        msp.add_arc((x - 8, 2), 2, 270, 360, dxfattribs=on)          # mouth round
        msp.add_line((x - 6, 2), (x - 6, 16), dxfattribs=on)
        msp.add_arc((x, 16), 6, 0, 180, dxfattribs=on)               # slot end
        msp.add_line((x + 6, 16), (x + 6, 2), dxfattribs=on)
        msp.add_arc((x + 8, 2), 2, 180, 270, dxfattribs=on)          # mouth round
    msp.add_line((148, 0), (212, 0), dxfattribs=on)
    msp.add_line((228, 0), (254, 0), dxfattribs=on)
    msp.add_arc((254, 6), 6, 270, 360, dxfattribs=on)                # lower-right corner
    msp.add_line((260, 6), (260, 46), dxfattribs=on)
    msp.add_line((260, 46), (236, 70), dxfattribs=on)                # 24 mm chamfer
    msp.add_line((236, 70), (105, 70), dxfattribs=on)
    msp.add_arc((105, 85), 15, 180, 270, dxfattribs=on)              # inside fillet where the arm rises
    msp.add_line((90, 85), (90, 120), dxfattribs=on)
    msp.add_arc((130, 150), 50, 143.13010235415598, 216.86989764584402, dxfattribs=on)  # weight-saving scallop
    msp.add_line((90, 180), (90, 230), dxfattribs=on)
    msp.add_arc((45, 230), 45, 0, 180, dxfattribs=on)                # rounded head
    msp.add_line((0, 230), (0, 6), dxfattribs=on)


def cutouts(msp) -> None:
    """The lightening window (clockwise, corners R6) and the belt-tension slot (10 wide)."""
    b = -0.41421356237309503  # tan(22.5 deg): a quarter turn, clockwise
    window = [(100, 38, 0), (100, 52, b), (106, 58, 0), (174, 58, b), (180, 52, 0), (180, 38, b), (174, 32, 0), (106, 32, b)]
    msp.add_lwpolyline(window, format="xyb", close=True, dxfattribs={"layer": CUT})
    slot = [(30, 200, 0), (60, 200, 1), (60, 210, 0), (30, 210, 1)]
    msp.add_lwpolyline(slot, format="xyb", close=True, dxfattribs={"layer": CUT})


def holes(doc, msp) -> None:
    """Fourteen holes: six in the base, two guard holes, the pivot, and the motor flange as a block."""
    for x, y in ((20, 35), (60, 35), (120, 15), (175, 15), (195, 50), (245, 25)):
        msp.add_circle((x, y), 4.5, dxfattribs={"layer": HOLES})    # 9 mm frame bolts
    for x in (20, 70):
        msp.add_circle((x, 95), 3, dxfattribs={"layer": HOLES})     # belt-guard screws
    msp.add_circle((45, 230), 10, dxfattribs={"layer": HOLES})      # pivot pin
    flange = doc.blocks.new("MOTOR_FLANGE")
    for dx in (-20, 20):
        for dy in (-20, 20):
            flange.add_circle((dx, dy), 3.5)                         # on layer "0": takes the INSERT's layer
    flange.add_circle((0, 0), 15)                                    # motor pilot
    msp.add_blockref("MOTOR_FLANGE", (40, 150), dxfattribs={"layer": HOLES})


def notes(msp) -> None:
    msp.add_text("MOTOR MOUNT BRACKET - 6 MM S355 - DEBURR ALL EDGES", height=4,
                 dxfattribs={"layer": NOTES}).set_placement((0, -20))
    msp.add_linear_dim(base=(0, -10), p1=(0, 0), p2=(260, 0), dxfattribs={"layer": NOTES}).render()


def draw(path: str | Path) -> Path:
    """Write the drawing to `path` (whole or not at all) and return the path."""
    doc = ezdxf.new("R2010", setup=True)
    doc.units = ezdxf.units.MM
    for name in (CUT, HOLES, NOTES):
        doc.layers.add(name)
    msp = doc.modelspace()
    outline(msp)
    cutouts(msp)
    holes(doc, msp)
    notes(msp)
    with atomic_path(path) as tmp:
        doc.saveas(tmp)
    return Path(path)


if __name__ == "__main__":
    print(draw(sys.argv[1] if len(sys.argv) > 1 else "motor_mount_bracket.dxf"))
