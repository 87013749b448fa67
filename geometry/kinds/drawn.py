"""A drawn outline: the part's boundary as it is cut, by points in the part file or from a cut file.

    [outline]
    points = [[0, 0], [160, 0], {to = [160, 40], radius = 20, turn = "left"}, ...]   # geometry/point_chain.py

    [outline]
    file = "bracket.dxf"    # or .step / .stp; a relative path is relative to the part file
    layers = ["CUT", "HOLES"]   # DXF only: read these layers (default every layer)
    units = "in"            # DXF only: the drawing's length unit when its header does not say (or to override it)

Both give the same exact loops (geometry/cutloops.py `CutLoops`). From a file, the circles inside the
outline become holes 1..n (left to right, then bottom to top), numbered before any [[hole]] table; every
other inner loop becomes a cut-out (geometry/kinds/cutout.py), numbered before any [[cutout]] table. The
thickness is [plate] thickness; a STEP solid gives it when [plate] does not. The plate's `length` and
`width` are not given: they are the drawing's extents along x and y.

The outline's pieces are named "edge 1", "edge 2", ... in drawing order from its lowest-left vertex; each
concave arc (the material outside its circle: a fillet or an inside radius) is a raiser of its own,
"corner 1", "corner 2", ..., graded, banded and converged on its own. A drawn part has no ends: it is held
by [[hold]] entries and loaded by [[load.edge]] entries or pins (geometry/rigid_body.py refuses one
without them), and its Kt is taken on the cut normal to the edge at each peak (compare/edge_cut.py).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import lru_cache
from pathlib import Path
from typing import TYPE_CHECKING, Any

from ..errors import PartError
from ..readers import known, shown, table
from ..shapes import Arc, Edge, Line, Segment, segment_points
from ..units import format_point, format_quantity
from .base import CurvedEdges, NetCut, OutlineRaiser, RaiserId

if TYPE_CHECKING:
    from ..cutloops import CutLoops
    from ..spec import PartSpec

NAME = "drawn"
TABLE = "outline"
TABLES = (TABLE,)
CORNER = "corner"
DXF_SUFFIXES = (".dxf",)
STEP_SUFFIXES = (".step", ".stp")


@dataclass(frozen=True)
class Drawing:
    """The drawn outline (mm): its closed counter-clockwise chain from its lowest-left vertex, and where it
    came from: `source` "points" or "file"; the file as given, its layers and length unit (and how that
    unit was decided), how many holes and cut-outs it gave, the curves fitted by arcs and the annotation
    left out (geometry/cutloops.py), and whether the thickness came from the file's solid."""

    outline: tuple[Segment, ...]
    source: str = "points"
    file: str | None = None
    layers: tuple[str, ...] | None = None
    units: str | None = None
    units_source: str = ""
    holes: int = 0
    cutouts: int = 0
    fitted: int = 0
    ignored: tuple[tuple[str, int], ...] = ()
    thickness_from_file: bool = False


def read(data: dict[str, Any], spec: PartSpec, base: Path | None = None) -> dict[str, Any]:
    """[outline] as PartSpec fields: the drawing, the plate (its extents; the thickness from [plate] or a
    STEP solid) and the raisers with the file's holes and cut-outs first of their kinds."""
    from ..point_chain import read_points
    from ..registry import RAISER_KINDS
    from .cutout import Cutout

    for other in ("step", "lug"):
        if other in data:
            raise PartError(f"{other}: applies to the bar outline only; a drawn outline draws its own shape")
    t = table(data, TABLE)
    known(t, {"points", "file", "layers", "units"}, TABLE)
    if ("points" in t) == ("file" in t):
        raise PartError("outline: give either points (the outline drawn in the part file) or file (a DXF or "
                        "STEP cut file)")
    if "points" in t:
        for key in ("layers", "units"):
            if key in t:
                raise PartError(f"outline.{key}: applies to a cut file only (outline.file)")
        loops, drawing = read_points(t, TABLE, spec.units), Drawing(())
    else:
        loops, drawing = _read_file(t, base)
    thickness = spec.plate.thickness
    if thickness <= 0.0:
        if loops.thickness is None:
            raise PartError("plate.thickness: missing; a number is required (the outline gives no thickness)")
        thickness = loops.thickness
        drawing = replace(drawing, thickness_from_file=True)
    from ..outline import wire_polygon

    x0, y0, x1, y1 = wire_polygon(loops.outline).bounds
    drawing = replace(drawing, outline=loops.outline, holes=len(loops.holes), cutouts=len(loops.cutouts))
    drawn = {"hole": list(loops.holes), "cutout": [Cutout(c, drawing.file or "points") for c in loops.cutouts]}
    raisers = tuple(item for kind in RAISER_KINDS
                    for item in drawn.get(kind.NAME, []) + [r for r in spec.raisers if r.KIND == kind.NAME])
    for item in raisers:
        if item.KIND == "notch":
            raise PartError("notch: a notch is cut from a bar's long edge; draw it in the outline instead")
    plate = replace(spec.plate, length=float(x1 - x0), width=float(y1 - y0), thickness=thickness)
    return {"drawing": drawing, "plate": plate, "raisers": raisers}


def _read_file(t: dict[str, Any], base: Path | None) -> tuple[CutLoops, Drawing]:
    given = t["file"]
    if not isinstance(given, str) or not given.strip():
        raise PartError(f"outline.file: must be the name of a DXF or STEP file; got {shown(given)}")
    path = Path(given)
    if not path.is_absolute() and base is not None:
        path = base / path
    suffix = path.suffix.lower()
    if suffix not in DXF_SUFFIXES + STEP_SUFFIXES:
        raise PartError(f"outline.file: {shown(given)} is neither a DXF (.dxf) nor a STEP (.step, .stp) file")
    layers = t.get("layers")
    if layers is not None and (not isinstance(layers, list) or not layers
                               or not all(isinstance(n, str) and n for n in layers)):
        raise PartError(f"outline.layers: must be a list of layer names; got {shown(layers)}")
    units = t.get("units")
    from ..dxffile import UNIT_NAMES, read_dxf

    if units is not None and units not in UNIT_NAMES:
        raise PartError(f"outline.units: {shown(units)} is not a drawing unit; use one of {', '.join(UNIT_NAMES)}")
    if not path.is_file():
        raise PartError(f"outline.file: {shown(given)}: no such file")
    try:
        if suffix in DXF_SUFFIXES:
            loops = read_dxf(path, layers, units)
        else:
            for key in ("layers", "units"):
                if key in t:
                    raise PartError(f"{key}: applies to a DXF drawing only (a STEP file carries its own unit)")
            from ..stepfile import read_step

            loops = read_step(path)
    except PartError as error:
        raise PartError(f"outline.file: {error}") from None
    drawing = Drawing((), "file", given, tuple(layers) if layers else None, loops.units, loops.units_source,
                      fitted=len(loops.fitted), ignored=loops.ignored)
    return loops, drawing


# --- the outline kind's members ---------------------------------------------------------------------------

def concave(seg: Segment) -> bool:
    """Whether a piece of the counter-clockwise outline is a concave arc (turning clockwise: the material
    lies outside its circle)."""
    return isinstance(seg, Arc) and seg.end < seg.start


def _smooth(a: Segment, b: Segment) -> bool:
    """Whether piece b continues piece a without a kink (their tangents agree within a degree)."""
    from ..sharp_corners import SHARP_TURN, _tangent

    ta, tb = _tangent(a, True), _tangent(b, False)
    return abs(math.atan2(ta[0] * tb[1] - ta[1] * tb[0], ta[0] * tb[0] + ta[1] * tb[1])) <= SHARP_TURN


@lru_cache(maxsize=64)
def _path(outline: tuple[Segment, ...], units: str) -> tuple[Edge, ...]:
    """The named edges: a run of concave arcs that join without a kink (a fillet, or an ellipse or spline
    fitted by arcs) is one corner; the chain starts at a piece that does not continue such a run."""
    n = len(outline)
    first = next((k for k in range(n) if not (concave(outline[k]) and concave(outline[k - 1])
                                              and _smooth(outline[k - 1], outline[k]))), 0)
    order = [(first + j) % n for j in range(n)]
    names: dict[int, str | RaiserId] = {}
    corners = 0
    for j, k in enumerate(order):
        seg = outline[k]
        if not concave(seg):
            names[k] = f"edge {k + 1}"
        elif j > 0 and concave(outline[order[j - 1]]) and _smooth(outline[order[j - 1]], seg):
            names[k] = names[order[j - 1]]
        else:
            corners += 1
            names[k] = RaiserId(CORNER, corners)
    edges = []
    for k, seg in enumerate(outline):
        name = names[k]
        if isinstance(name, RaiserId):
            label = f"the {name} (radius {format_quantity(seg.radius, 'length', units)} about {format_point(seg.center, units)})"
        else:
            a, b = segment_points(seg)
            what = "line" if isinstance(seg, Line) else "arc"
            label = f"the outline's {what} from {format_point(a, units)} to {format_point(b, units)}"
        edges.append(Edge(seg, name, label))
    return tuple(edges)


def path(spec: PartSpec) -> tuple[Edge, ...]:
    return _path(spec.drawing.outline, spec.units)


@lru_cache(maxsize=64)
def _raisers(outline: tuple[Segment, ...], units: str) -> tuple[OutlineRaiser, ...]:
    edges = _path(outline, units)
    n = len(edges)
    out = []
    ids = sorted({e.name for e in edges if isinstance(e.name, RaiserId)})
    for rid in ids:
        own = [k for k, e in enumerate(edges) if e.name == rid]
        near = {(k + d) % n for k in own for d in (-1, 0, 1)}
        clear_of = tuple(e.name for j, e in enumerate(edges) if j not in near and not isinstance(e.name, RaiserId))
        arcs = tuple(edges[k].segment for k in own)
        tightest = min(arcs, key=lambda a: a.radius)
        middle = 0.5 * (tightest.start + tightest.end)
        tangent = (-math.sin(middle), math.cos(middle))
        out.append(OutlineRaiser(rid, CurvedEdges(arcs=tuple(Arc(a.center, a.radius, *a.ccw) for a in arcs),
                                                  curvature=tightest.radius),
                                 NetCut(tightest.at(middle), tangent, tightest.radius), clear_of))
    return tuple(out)


def raisers(spec: PartSpec) -> tuple[OutlineRaiser, ...]:
    """Every concave run of arcs of the outline, "corner 1", "corner 2", ... in drawing order."""
    return _raisers(spec.drawing.outline, spec.units)


def mirrored(spec: PartSpec, raiser: RaiserId, plane: str) -> RaiserId | None:
    """The corner that is this corner's mirror image in the plane, or None."""
    fx, fy = (-1.0, 1.0) if plane == "x" else (1.0, -1.0)
    own = next(r for r in raisers(spec) if r.id == raiser).curved.arcs[0]
    image = own.mapped(fx, fy)
    tol = 1e-6 * max(size(spec))
    for r in raisers(spec):
        arc = r.curved.arcs[0]
        if math.dist(arc.center, image.center) <= tol and abs(arc.radius - image.radius) <= tol \
                and math.dist(arc.at(0.5 * (arc.start + arc.end)), image.at(0.5 * (image.start + image.end))) <= tol:
            return r.id
    return None


def features(spec: PartSpec) -> tuple[str, ...]:
    """"drawn": no handbook case describes a drawn outline, so none is matched to the part."""
    return (NAME,)


def bounds(spec: PartSpec) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) of the outline (mm)."""
    return _bounds(spec.drawing.outline)


@lru_cache(maxsize=64)
def _bounds(outline: tuple[Segment, ...]) -> tuple[float, float, float, float]:
    from ..outline import wire_polygon

    x0, y0, x1, y1 = wire_polygon(outline).bounds
    return float(x0), float(y0), float(x1), float(y1)


def size(spec: PartSpec) -> tuple[float, float]:
    x0, y0, x1, y1 = bounds(spec)
    return x1 - x0, y1 - y0


def check(spec: PartSpec, limit: float) -> None:
    """The outline was checked as it was read (closed, simple, no zero-length or doubled piece); its
    corners' ligaments are checked with every raiser's (geometry/validate.py)."""


def record(spec: PartSpec) -> dict[str, Any]:
    """The outline as given and what it gave: its pieces, corners, and the holes and cut-outs of a file."""
    d = spec.drawing
    out: dict[str, Any] = {"source": d.source, "pieces": len(d.outline), "corners": len(raisers(spec)),
                           "bounds": list(bounds(spec))}
    if d.source == "file":
        out.update({"file": d.file, "layers": list(d.layers) if d.layers else None, "units": d.units,
                    "units_source": d.units_source, "holes": d.holes, "cutouts": d.cutouts,
                    "fitted_curves": d.fitted, "thickness_from_file": d.thickness_from_file})
    return {TABLE: out}
