"""Write the cut file of an invented knee gusset for a steel pole-barn truss (3/8 in plate, inches) as a DXF.

    python examples/truss_knee_gusset_dxf.py [OUT.dxf]      (default: truss_knee_gusset.dxf)

Two legs, 16 in long and 4.5 in wide, bolted to the rafter and the post through two rows of 9/16 in holes
each; a straight brace edge between the legs with rounded inside corners, a clipped corner that clears the
members' weld, a 1 in lifting hole and a rounded triangular lightening window. The outline and the window
are closed polylines whose corners are tangent fillets given by bulges (positive rounding an outside
corner, negative an inside one); the holes are circles. Drawn in inches ($INSUNITS = 1).
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import ezdxf

from stressraiser.cli.files import atomic_path

# Corners of the outline, counter-clockwise, with the fillet radius at each (in).
OUTLINE = ((0.0, 1.0, 0.25), (1.0, 0.0, 0.25), (16.0, 0.0, 0.5), (16.0, 4.5, 0.5), (11.0, 4.5, 1.0),
           (4.5, 11.0, 1.0), (4.5, 16.0, 0.5), (0.0, 16.0, 0.5))
WINDOW = ((4.25, 4.25, 0.5), (9.5, 4.25, 0.5), (4.25, 9.5, 0.5))
BOLT_HOLE = 0.5625  # 9/16 in, for 1/2 in bolts
LIFTING_HOLE = ((2.75, 2.75), 1.0)


def bolt_holes() -> list[tuple[float, float]]:
    """Two rows of three on each leg."""
    along = (7.5, 10.5, 13.5)
    rows = (1.25, 3.25)
    return [(x, y) for y in rows for x in along] + [(x, y) for x in rows for y in along]


def filleted(corners) -> list[tuple[float, float, float]]:
    """Polyline vertices (x, y, bulge) of a closed polygon whose corners (x, y, r) are rounded by tangent
    arcs of radius r: each corner becomes the arc's two tangent points, the first carrying the bulge
    tan(turn / 4) (positive for a left turn)."""
    out = []
    n = len(corners)
    for k, (x, y, r) in enumerate(corners):
        (xa, ya, _), (xb, yb, _) = corners[k - 1], corners[(k + 1) % n]
        into = math.atan2(y - ya, x - xa)
        away = math.atan2(yb - y, xb - x)
        turn = (away - into + math.pi) % (2.0 * math.pi) - math.pi
        cut = r * math.tan(abs(turn) / 2.0)
        out.append((x - cut * math.cos(into), y - cut * math.sin(into), math.tan(turn / 4.0)))
        out.append((x + cut * math.cos(away), y + cut * math.sin(away), 0.0))
    return out


def draw(path: str | Path) -> Path:
    """Write the drawing to `path` (whole or not at all) and return the path."""
    doc = ezdxf.new("R2010", setup=True)
    doc.units = ezdxf.units.IN
    doc.layers.add("PLATE")
    doc.layers.add("NOTES")
    msp = doc.modelspace()
    plate = {"layer": "PLATE"}
    msp.add_lwpolyline(filleted(OUTLINE), format="xyb", close=True, dxfattribs=plate)
    msp.add_lwpolyline(filleted(WINDOW), format="xyb", close=True, dxfattribs=plate)
    for centre in bolt_holes():
        msp.add_circle(centre, BOLT_HOLE / 2.0, dxfattribs=plate)
    msp.add_circle(LIFTING_HOLE[0], LIFTING_HOLE[1] / 2.0, dxfattribs=plate)
    msp.add_mtext("KNEE GUSSET, 3/8 PLATE, 12 + 1 HOLES", dxfattribs={"layer": "NOTES", "char_height": 0.25,
                                                                     "insert": (0.0, -1.0)})
    with atomic_path(path) as tmp:
        doc.saveas(tmp)
    return Path(path)


if __name__ == "__main__":
    print(draw(sys.argv[1] if len(sys.argv) > 1 else "truss_knee_gusset.dxf"))
