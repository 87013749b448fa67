"""Reading cut files: the time to turn a DXF or STEP file into exact loops, against the time the library
alone takes to parse the same file (ezdxf's readfile; gmsh's OpenCASCADE import), in the same run.

    python benchmarks/cut_files.py [--repeat N]

Drawings: the two example scripts' (examples/*_dxf.py), a plate with a grid of 1,600 holes (LINE/ARC
outline, CIRCLE holes), and a plate with 100 elliptical windows (each fitted with arcs); a STEP plate with
400 holes extruded by gmsh. Prints best-of-N wall and CPU seconds and the ratio read/parse: how much
chaining, sorting and fitting add to the parse; for STEP also the child process `read_step` runs in (the
parse is gmsh's import in this process). CPU seconds are this process's only (not the STEP child's).
"""

from __future__ import annotations

import argparse
import subprocess
import sys
import tempfile
from pathlib import Path

import ezdxf
import gmsh

from measure import best_of, machine

from stressraiser.geometry.dxffile import read_dxf
from stressraiser.geometry.stepfile import read_step

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"


def grid_plate(path: Path, rows: int, columns: int, ellipses: bool) -> Path:
    """A plate with rounded corners and a grid of circles (or ellipses), pitch 20 mm."""
    doc = ezdxf.new("R2010")
    doc.units = ezdxf.units.MM
    msp = doc.modelspace()
    w, h, r = 20.0 * columns + 20.0, 20.0 * rows + 20.0, 10.0
    for a, b in (((r, 0), (w - r, 0)), ((w, r), (w, h - r)), ((w - r, h), (r, h)), ((0, h - r), (0, r))):
        msp.add_line(a, b)
    for (cx, cy), start in (((w - r, r), 270), ((w - r, h - r), 0), ((r, h - r), 90), ((r, r), 180)):
        msp.add_arc((cx, cy), r, start, start + 90)
    for i in range(rows):
        for j in range(columns):
            centre = (20.0 + 20.0 * j, 20.0 + 20.0 * i)
            if ellipses:
                msp.add_ellipse(centre, major_axis=(6.0, 0.0), ratio=0.4)
            else:
                msp.add_circle(centre, 4.0)
    doc.saveas(path)
    return path


def step_plate(path: Path, rows: int, columns: int) -> Path:
    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 0)
        occ = gmsh.model.occ
        plate = occ.addRectangle(0, 0, 0, 20.0 * columns + 20.0, 20.0 * rows + 20.0, roundedRadius=10.0)
        holes = [(2, occ.addDisk(20.0 + 20.0 * j, 20.0 + 20.0 * i, 0, 4.0, 4.0)) for i in range(rows) for j in range(columns)]
        face, _ = occ.cut([(2, plate)], holes)
        occ.extrude(face, 0, 0, 8.0)
        occ.synchronize()
        gmsh.write(str(path))
    finally:
        gmsh.finalize()
    return path


def occ_import(path: Path) -> None:
    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 0)
        gmsh.model.occ.importShapes(str(path))
        gmsh.model.occ.synchronize()
    finally:
        gmsh.finalize()


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    print(machine())
    folder = Path(tempfile.mkdtemp(prefix="cut_files_"))
    files = []
    for script in sorted(EXAMPLES.glob("*_dxf.py")):
        out = folder / f"{script.stem}.dxf"
        subprocess.run([sys.executable, str(script), str(out)], check=True, capture_output=True)
        files.append((script.stem, out))
    files.append(("grid of 1,600 holes", grid_plate(folder / "holes.dxf", 40, 40, ellipses=False)))
    files.append(("100 elliptical windows", grid_plate(folder / "ellipses.dxf", 10, 10, ellipses=True)))
    print(f"{'drawing':<28} {'pieces':>7} {'holes':>6} {'read s (CPU)':>15} {'ezdxf parse s':>14} {'ratio':>6}")
    for name, path in files:
        wall, cpu, cut = best_of(lambda: read_dxf(path), args.repeat)
        parse, _, _ = best_of(lambda: ezdxf.readfile(path), args.repeat)
        pieces = len(cut.outline) + sum(len(c) for c in cut.cutouts)
        print(f"{name:<28} {pieces:>7} {len(cut.holes):>6} {wall:>7.3f} ({cpu:.3f}) {parse:>14.3f} {wall / parse:>5.1f}x")
    step = step_plate(folder / "plate.step", 20, 20)
    wall, cpu, cut = best_of(lambda: read_step(step), args.repeat)
    parse, _, _ = best_of(lambda: occ_import(step), args.repeat)
    print(f"{'STEP plate, 400 holes':<28} {len(cut.outline):>7} {len(cut.holes):>6} {wall:>7.3f} ({cpu:.3f}) "
          f"{parse:>14.3f} {wall / parse:>5.1f}x   (parse = gmsh OpenCASCADE import)")


if __name__ == "__main__":
    main()
