"""A STEP file of a flat part read into exact loops (geometry/cutloops.py `CutLoops`), through gmsh's
OpenCASCADE import.

The file must hold one solid plate of constant thickness, or one flat face (a sheet). The part is the
largest planar face: its outer loop is the outline, its inner loops the holes and cut-outs. Edges that
are straight lines or circular arcs (however the file describes them: a circle, an ellipse with equal
axes, a rational B-spline) are kept exact; other edges (ellipses, B-splines) are replaced by
tangent-continuous arcs within `tolerance` mm (geometry/arcfit.py), listed in `CutLoops.fitted`.

The face's plane gives the 2-D frame: its unit normal n is taken with its largest component positive; the
x axis is the first global axis (x, then y, then z) least aligned with n, made square to n, and the y axis
completes a right-handed frame with n. A plate modelled in the x-y plane keeps its own x and y.

The thickness of a solid is its extent along n. A solid is accepted only as a straight prism of that face:
every face parallel or square to it, and its volume equal to the face's area times the thickness (to
1e-5): a bend, a chamfered or drafted edge, a pocket, a boss or a step is refused, since a plane-stress
model of the face would misrepresent it.

Lengths: OpenCASCADE converts the file's declared length unit to millimetres on import
(`Geometry.OCCTargetUnit` = "MM", set here rather than left to the default).

The reading runs in a child Python process (`python -m stressraiser.geometry.stepfile`), in one gmsh
session initialised and finalised inside `read_session`: OpenCASCADE's reader can crash on a damaged file
and prints its complaints on standard output, and neither may reach the caller.
"""

from __future__ import annotations

import os
import pickle
import re
import subprocess
import sys
import tempfile
from pathlib import Path

import gmsh
import numpy as np

from .arcfit import fit_curve
from .cutloops import (CHORD_TOLERANCE, GAP_TOLERANCE, MM, CutLoops, FittedCurve, Piece, check_positive, curve_pieces,
                       cut_loops)
from .errors import PartError
from .shapes import Line

PRISM = 1e-5  # relative: volume against area x thickness, and the sine of a face's tilt off square/parallel
UNITS_SOURCE = "the STEP file's own length unit, converted to mm on import by OpenCASCADE"
USER_ERROR = 2  # the child's exit code for a PartError (its one line on stderr)
CHILD_SECONDS = 900.0  # a file the reader has not finished with by then is refused as too large or hung


def read_step(path: str | Path, tolerance: float = CHORD_TOLERANCE, gap: float = GAP_TOLERANCE) -> CutLoops:
    """The flat part in the STEP file at `path` as exact loops in mm, with its thickness when the file holds a
    solid (module docstring). tolerance and gap as for geometry/dxffile.py `read_dxf`.

    Raises PartError (one line, starting with the file's name) for a file it cannot read (OpenCASCADE's
    first complaint quoted), a file with more than one body, a part with no planar face, a solid that is
    not a flat plate of one thickness, and a file on which the reader crashes."""
    path = Path(path)
    try:
        check_positive("tolerance", tolerance)
        check_positive("gap", gap)
        if not path.is_file():
            raise PartError("no such file")
        pieces, fitted, thickness = _read_apart(path, tolerance, gap)
        return cut_loops(pieces, MM, UNITS_SOURCE, tolerance, gap, fitted, thickness=thickness)
    except PartError as error:
        raise PartError(f"{path.name}: {error}") from None


def _read_apart(path: Path, tolerance: float, gap: float) -> tuple[list[Piece], list[FittedCurve], float | None]:
    """`read_session` in a child Python process. OpenCASCADE's STEP reader can crash outright on a damaged
    file (a junk line in place of a direction is enough) and prints its complaints on the process's
    standard output; a child keeps both away from the caller: a crash becomes a PartError, the complaints
    a quote in one. Costs a second or so of start-up per file."""
    with tempfile.TemporaryDirectory(prefix="stressraiser-step-") as folder:
        result = Path(folder) / "loops.pickle"
        env = dict(os.environ, PYTHONPATH=os.pathsep.join(p for p in sys.path if p))
        try:
            done = subprocess.run([sys.executable, "-m", __name__, str(path), repr(tolerance), repr(gap), str(result)],
                                  capture_output=True, text=True, errors="replace", env=env, timeout=CHILD_SECONDS)
        except subprocess.TimeoutExpired:
            raise PartError(f"the STEP reader had not finished after {CHILD_SECONDS:g} s; the file is too large or "
                            "the reader hung on it") from None
        if done.returncode == 0:
            with open(result, "rb") as handle:
                return pickle.load(handle)
    complaint = next((" ".join(re.sub(r"\x1b\[[0-9;]*m|\*+", " ", line).split())
                      for line in done.stdout.splitlines() if "ERR" in line), "")
    quoted = f"; OpenCASCADE: {complaint}" if complaint else ""
    if done.returncode == USER_ERROR:
        raise PartError(done.stderr.strip().splitlines()[-1] + (quoted if "STEP file" in done.stderr else ""))
    if done.returncode < 0:
        raise PartError(f"the STEP reader crashed on this file (signal {-done.returncode}): it is damaged or holds "
                        f"shapes the reader cannot handle; export it again{quoted}")
    raise RuntimeError(f"the STEP reader's process failed (exit {done.returncode}): {done.stderr.strip()[-2000:]}")


def read_session(path: str, tolerance: float, gap: float) -> tuple[list[Piece], list[FittedCurve], float | None]:
    """Pieces of the largest planar face (mm, in the face's frame), the fitted curves and the thickness, in
    one gmsh session initialised and finalised here. Runs in the child process of `_read_apart`."""
    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 0)
        gmsh.option.setString("Geometry.OCCTargetUnit", "MM")
        return _read(path, tolerance, gap)
    except PartError:
        raise
    except Exception as error:  # gmsh raises a bare Exception when OpenCASCADE cannot evaluate the shapes
        raise PartError(f"its geometry cannot be evaluated ({error})") from None
    finally:
        gmsh.finalize()


def _read(path: str, tolerance: float, gap: float) -> tuple[list[Piece], list[FittedCurve], float | None]:
    occ = gmsh.model.occ
    try:
        occ.importShapes(path)
        occ.synchronize()
    except Exception as error:  # gmsh raises a bare Exception carrying its own message
        raise PartError(f"not a readable STEP file ({error})") from None
    solids = gmsh.model.getEntities(3)
    if len(solids) > 1:
        raise PartError(f"multi-body: {len(solids)} solids; a flat part is one solid plate (export one body)")
    if solids:
        faces = [tag for _, tag in gmsh.model.getBoundary(solids, combined=False, oriented=False)]
    else:
        faces = [tag for _, tag in gmsh.model.getEntities(2)]
        if len(faces) > 1:
            raise PartError(f"multi-body: {len(faces)} separate faces and no solid; a flat part is one solid "
                            "plate or one flat face")
    if not faces:
        raise PartError("no solid and no face in the file")
    planar = [f for f in faces if gmsh.model.getType(2, f) == "Plane"]
    if not planar:
        raise PartError("non-planar: no face of the part is flat")
    area = {f: occ.getMass(2, f) for f in planar}
    face = max(sorted(planar), key=lambda f: area[f])
    normal = _unit_normal(face)
    frame = _frame(normal)
    thickness = None
    if solids:
        thickness = _thickness(solids[0][1], faces, area[face], normal)
    pieces: list[Piece] = []
    fitted: list[FittedCurve] = []
    for _, tag in gmsh.model.getBoundary([(2, face)], combined=False, oriented=False):
        new, fit = _edge_pieces(abs(tag), frame, tolerance, gap)
        pieces += new
        fitted += fit
    return pieces, fitted, thickness


def _unit_normal(face: int) -> np.ndarray:
    """The face's unit normal, signed so that its largest component is positive."""
    lo, hi = gmsh.model.getParametrizationBounds(2, face)
    n = np.array(gmsh.model.getNormal(face, [0.5 * (lo[0] + hi[0]), 0.5 * (lo[1] + hi[1])]))
    n /= np.linalg.norm(n)
    return n if n[np.argmax(np.abs(n))] > 0.0 else -n


def _frame(normal: np.ndarray) -> np.ndarray:
    """Rows: the in-plane x and y axes (module docstring)."""
    axis = np.eye(3)[int(np.argmin(np.abs(normal)))]
    x = axis - (axis @ normal) * normal
    x /= np.linalg.norm(x)
    return np.array([x, np.cross(normal, x)])


def _thickness(solid: int, faces: list[int], face_area: float, normal: np.ndarray) -> float:
    """The solid's extent along the normal (mm), after checking that it is a straight prism of the face."""
    occ = gmsh.model.occ
    for f in faces:
        lo, hi = gmsh.model.getParametrizationBounds(2, f)
        grid = [(lo[0] + a * (hi[0] - lo[0]), lo[1] + b * (hi[1] - lo[1])) for a in (0.2, 0.5, 0.8) for b in (0.2, 0.5, 0.8)]
        normals = np.array(gmsh.model.getNormal(f, [c for uv in grid for c in uv])).reshape(-1, 3)
        cosines = np.abs(normals @ normal) / np.linalg.norm(normals, axis=1)
        square = cosines <= PRISM
        parallel = cosines >= 1.0 - 0.5 * PRISM * PRISM
        if not (np.all(square) or np.all(parallel)):
            raise PartError("not a flat plate: a face is neither parallel nor square to the largest flat face "
                            "(a bend, a chamfered or drafted edge); model the part as a straight plate")
    points = gmsh.model.getBoundary([(3, solid)], combined=False, oriented=False, recursive=True)
    heights = np.array([np.array(gmsh.model.getValue(0, tag, [])) @ normal for _, tag in points])
    thickness = float(np.ptp(heights))
    volume = occ.getMass(3, solid)
    if abs(volume - face_area * thickness) > PRISM * volume:
        raise PartError(f"not a flat plate of one thickness: its volume {volume:.6g} mm³ is not its largest flat "
                        f"face {face_area:.6g} mm² times its thickness {thickness:.6g} mm (a pocket, boss, step or bend)")
    return thickness


def _edge_pieces(tag: int, frame: np.ndarray, tolerance: float, gap: float) -> tuple[list[Piece], list[FittedCurve]]:
    """One edge of the face as exact pieces (a line or circular arc) or fitted arcs, in the face's frame."""
    where = f"edge {tag} ({gmsh.model.getType(1, tag)})"
    lo, hi = (float(b[0]) for b in gmsh.model.getParametrizationBounds(1, tag))

    def curve(t: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        ts = t.tolist()
        values = [np.array(f(1, tag, ts)).reshape(-1, 3) @ frame.T
                  for f in (gmsh.model.getValue, gmsh.model.getDerivative, gmsh.model.getSecondDerivative)]
        return values[0], values[1], values[2]

    if gmsh.model.getType(1, tag) == "Line":
        p = curve(np.array([lo, hi]))[0]
        return [Piece(Line((float(p[0, 0]), float(p[0, 1])), (float(p[1, 0]), float(p[1, 1]))), where)], []
    return curve_pieces(fit_curve(curve, lo, hi, tolerance, (), where), where, gap)


if __name__ == "__main__":  # the child process of `_read_apart`: PATH TOLERANCE GAP RESULT
    try:
        read = read_session(sys.argv[1], float(sys.argv[2]), float(sys.argv[3]))
    except PartError as error:
        print(error, file=sys.stderr)
        sys.exit(USER_ERROR)
    with open(sys.argv[4], "wb") as out:
        pickle.dump(read, out)
