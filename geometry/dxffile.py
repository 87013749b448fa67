"""A DXF cut file read into exact loops (geometry/cutloops.py `CutLoops`), with ezdxf.

What is read, from the model space only (paper space is a sheet layout, not the part):
- LINE, ARC, CIRCLE, LWPOLYLINE and 2-D POLYLINE (open or closed, bulges of either sign), 3-D POLYLINE
  drawn flat: exact lines and arcs. A closed polyline whose last vertex repeats its first is read as
  closed once. Polyline widths are ignored (a cut path has no width).
- ELLIPSE and SPLINE: replaced by tangent-continuous circular arcs within `tolerance` mm
  (geometry/arcfit.py); an ellipse with equal axes, or a spline that is a line or circular arc, is kept
  as that exact piece. Each replacement is listed in `CutLoops.fitted` with its arc count and deviation.
- INSERT (a block reference, MINSERT arrays included) is exploded with its scale, rotation and mirror;
  its entities on layer "0" take the INSERT's layer, as drawing programs show them.
- Arcs, circles and polylines must lie in the drawing plane (extrusion +z, or -z: a mirrored entity).
- Text, dimensions, leaders, hatches, points, images, viewports and construction lines (XLINE, RAY)
  are annotation: left out and counted in `CutLoops.ignored`.
- Anything else (3-D solids and faces, regions, multilines, meshes, spline-fitted polylines) is refused,
  naming each entity type and its layer.

Units: the header's $INSUNITS, or `units` given explicitly (which wins; `CutLoops.units_source` says what
the header said). A drawing that says neither is refused: a part is never guessed into millimetres.
"""

from __future__ import annotations

import logging
import math
from collections import Counter
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from pathlib import Path

import ezdxf
import numpy as np
from ezdxf.math import bulge_to_arc
from scipy.interpolate import BSpline

from .arcfit import fit_curve
from .cutloops import (CHORD_TOLERANCE, GAP_TOLERANCE, CutLoops, DrawingUnits, FittedCurve, Piece, check_positive,
                       curve_pieces, cut_loops)
from .errors import PartError
from .shapes import Arc, Line, Segment

# $INSUNITS codes of the lengths a flat part is drawn in: (name, millimetres per unit), exact by definition
# (1 in = 25.4 mm; docs/references.md [DXF] for the codes).
INSUNITS: dict[int, tuple[str, float]] = {
    1: ("in", 25.4), 2: ("ft", 304.8), 4: ("mm", 1.0), 5: ("cm", 10.0), 6: ("m", 1000.0), 8: ("µin", 2.54e-5),
    9: ("mil", 0.0254), 10: ("yd", 914.4), 13: ("µm", 1e-3), 14: ("dm", 100.0),
}
UNIT_NAMES: dict[str, float] = {name: mm for name, mm in INSUNITS.values()}

ANNOTATION = frozenset({
    "TEXT", "MTEXT", "DIMENSION", "ARC_DIMENSION", "LARGE_RADIAL_DIMENSION", "LEADER", "MULTILEADER", "MLEADER",
    "HATCH", "MPOLYGON", "POINT", "ATTDEF", "ATTRIB", "VIEWPORT", "IMAGE", "WIPEOUT", "TOLERANCE", "OLE2FRAME",
    "PDFUNDERLAY", "DWFUNDERLAY", "DGNUNDERLAY", "XLINE", "RAY", "ACAD_TABLE", "SHAPE",
})
GEOMETRY = frozenset({"LINE", "ARC", "CIRCLE", "LWPOLYLINE", "POLYLINE", "ELLIPSE", "SPLINE"})
FLAT = 1e-9  # largest in-plane part of a unit extrusion vector for an entity lying in the drawing plane

# ezdxf logs what it skips in a damaged file; with no logging configured Python would print those lines on
# stderr beside the reader's own one-line refusal. A null handler keeps them for a configured log only.
logging.getLogger("ezdxf").addHandler(logging.NullHandler())


@dataclass(frozen=True)
class _Drawn:
    """A model-space entity (or one exploded from a block) with its effective layer and a name for
    messages."""

    entity: object
    layer: str
    where: str


def read_dxf(path: str | Path, layers: Iterable[str] | None = None, units: str | None = None,
             tolerance: float = CHORD_TOLERANCE, gap: float = GAP_TOLERANCE) -> CutLoops:
    """The part drawn in the DXF file at `path` as exact loops in mm.

    layers: read only entities on these layers (case-insensitive names); None reads every layer.
    units: the drawing's length unit ("mm", "cm", "m", "in", "ft", ...: `UNIT_NAMES`); None takes the
        header's $INSUNITS.
    tolerance: largest distance (mm) between a fitted arc and the ellipse or spline it replaces.
    gap: piece ends closer than this (mm) are joined into one vertex.

    Raises PartError (one line, starting with the file's name) for a file it cannot read and for every
    drawing the module docstring and geometry/cutloops.py refuse."""
    path = Path(path)
    try:
        check_positive("tolerance", tolerance)
        check_positive("gap", gap)
        doc = _open(path)
        drawing_units, source = _drawing_units(doc, units)
        entities = _entities(doc, layers)
        _refuse_unsupported(entities)
        ignored = tuple(sorted(Counter(_kind(d.entity) for d in entities if _kind(d.entity) in ANNOTATION).items()))
        geometry = [d for d in entities if _kind(d.entity) in GEOMETRY]
        if not geometry:
            _refuse_empty(ignored, layers)
        pieces: list[Piece] = []
        fitted: list[FittedCurve] = []
        for drawn in geometry:
            new, fit = _read_entity(drawn, drawing_units.mm, tolerance, gap)
            pieces += new
            fitted += fit
        return cut_loops(pieces, drawing_units, source, tolerance, gap, fitted, ignored)
    except PartError as error:
        raise PartError(f"{path.name}: {error}") from None


def _kind(entity) -> str:
    return entity.dxftype()


def _open(path: Path):
    if not path.is_file():
        raise PartError("no such file")
    try:
        return ezdxf.readfile(path)
    except Exception as error:  # a parser of untrusted input: whatever it raises, the file is unreadable
        raise PartError(f"not a readable DXF drawing ({type(error).__name__}: {error})") from None


def _drawing_units(doc, units: str | None) -> tuple[DrawingUnits, str]:
    """The drawing's length unit and a sentence saying where it came from (module docstring)."""
    code = doc.header.get("$INSUNITS", 0)
    header = INSUNITS.get(code)
    said = header[0] if header else "unitless" if code == 0 else _code_name(code)
    allowed = ", ".join(UNIT_NAMES)
    if units is None:
        if header is None:
            why = "" if code == 0 else ", not a length parts are drawn in"
            raise PartError(f"units: the drawing's header says {said}{why} ($INSUNITS = {code}); give the drawing's "
                            f"units explicitly (one of {allowed})")
        return DrawingUnits(*header), f"the drawing's header ($INSUNITS = {code})"
    if units not in UNIT_NAMES:
        raise PartError(f"units: {units!r} is not a drawing unit; use one of {allowed}")
    agree = "as the header says" if header and header[0] == units else f"the header says {said}"
    return DrawingUnits(units, UNIT_NAMES[units]), f"given explicitly ({agree}, $INSUNITS = {code})"


def _code_name(code: int) -> str:
    """ezdxf's name of a $INSUNITS code ([DXF]: 0 to 24), or "an unknown code"."""
    return ezdxf.units.unit_name(code) if isinstance(code, int) and 0 < code <= 24 else "an unknown code"


def _layer_filter(doc, layers: Iterable[str] | None) -> frozenset[str] | None:
    """The wanted layer names, case-folded; PartError naming a layer the drawing does not have."""
    if layers is None:
        return None
    if isinstance(layers, str):
        layers = [layers]
    known = {layer.dxf.name.casefold(): layer.dxf.name for layer in doc.layers}
    known.update({e.dxf.layer.casefold(): e.dxf.layer for e in doc.modelspace()})
    wanted = frozenset(str(name).casefold() for name in layers)
    for name in layers:
        if str(name).casefold() not in known:
            raise PartError(f"layers: {name!r} is not a layer of the drawing (its layers: {', '.join(sorted(known.values()))})")
    return wanted


def _entities(doc, layers: Iterable[str] | None) -> list[_Drawn]:
    """The model space's entities on the wanted layers, blocks exploded; a damaged block is a PartError."""
    try:
        return list(_drawn(doc.modelspace(), _layer_filter(doc, layers)))
    except PartError:
        raise
    except Exception as error:  # a reference to a missing or damaged block
        raise PartError(f"a block reference cannot be exploded ({type(error).__name__}: {error})") from None


def _drawn(entities, wanted: frozenset[str] | None, inherited: str | None = None, via: str = "",
           depth: int = 0) -> Iterator[_Drawn]:
    """Every entity with its effective layer, block references exploded (nested ones too)."""
    for entity in entities:
        layer = entity.dxf.get("layer", "0")
        if inherited is not None and layer == "0":
            layer = inherited
        kind = _kind(entity)
        handle = entity.dxf.get("handle")
        where = f"{kind} #{handle}" if handle else f"{kind}{via}"
        if kind == "INSERT":
            if depth > 32:
                raise PartError(f"{where} on layer {layer}: blocks nested more than 32 deep")
            inner = f" in block {entity.dxf.name} ({where})" if handle else via
            for insert in (entity.multi_insert() if entity.mcount > 1 else [entity]):
                yield from _drawn(insert.virtual_entities(), wanted, layer, inner, depth + 1)
            continue
        if wanted is None or layer.casefold() in wanted:
            yield _Drawn(entity, layer, f"{where} on layer {layer}")


def _refuse_unsupported(entities: list[_Drawn]) -> None:
    bad = Counter((_kind(d.entity), d.layer) for d in entities
                  if _kind(d.entity) not in GEOMETRY | ANNOTATION or _unsupported_polyline(d.entity))
    if bad:
        names = ", ".join(f"{kind} on layer {layer} ({n})" for (kind, layer), n in sorted(bad.items()))
        raise PartError(f"unsupported entities: {names}; redraw them as lines, arcs, circles, polylines, ellipses "
                        "or splines, or leave their layers out")


def _unsupported_polyline(entity) -> bool:
    """A POLYLINE that is a mesh, a polyface or smoothed through a spline frame (flag 4)."""
    if _kind(entity) != "POLYLINE":
        return False
    return not (entity.is_2d_polyline or entity.is_3d_polyline) or bool(entity.dxf.flags & 4)


def _refuse_empty(ignored: tuple[tuple[str, int], ...], layers) -> None:
    scope = f" on layers {', '.join(layers) if not isinstance(layers, str) else layers}" if layers is not None else ""
    if ignored:
        names = ", ".join(f"{n} {kind}" for kind, n in ignored)
        raise PartError(f"only text and dimensions{scope}: {names}, and no lines, arcs, circles, polylines, "
                        "ellipses or splines to cut")
    raise PartError(f"no cut geometry{scope}: no lines, arcs, circles, polylines, ellipses or splines")


# --- pieces of each entity type ----------------------------------------------------------------------------

def _read_entity(drawn: _Drawn, mm: float, tolerance: float, gap: float) -> tuple[list[Piece], list[FittedCurve]]:
    """`_pieces`, with anything ezdxf or the numbers of a damaged entity raise turned into a PartError naming it."""
    try:
        return _pieces(drawn, mm, tolerance, gap)
    except PartError:
        raise
    except Exception as error:  # damaged entity data: missing or malformed attributes, overflowing numbers
        raise PartError(f"{drawn.where}: cannot be read ({type(error).__name__}: {error})") from None


def _pieces(drawn: _Drawn, mm: float, tolerance: float, gap: float) -> tuple[list[Piece], list[FittedCurve]]:
    """The entity's pieces in mm, and the fitted-curve record of an ellipse or spline."""
    e, kind = drawn.entity, _kind(drawn.entity)
    if kind == "LINE":
        start, end = e.dxf.start, e.dxf.end
        _check_level(drawn, (start.z, end.z), mm, gap)
        return [Piece(_scaled(Line((start.x, start.y), (end.x, end.y)), mm), drawn.where)], []
    if kind in ("ARC", "CIRCLE"):
        c, r = e.dxf.center, e.dxf.radius
        if kind == "CIRCLE":
            seg = Arc((c.x, c.y), r, 0.0, 2.0 * math.pi)
        else:
            a0 = math.radians(e.dxf.start_angle)
            seg = Arc((c.x, c.y), r, a0, a0 + math.radians((e.dxf.end_angle - e.dxf.start_angle) % 360.0))
        return [Piece(_scaled(_to_world(seg, _extrusion_sign(drawn)), mm), drawn.where)], []
    if kind == "LWPOLYLINE":
        points = [(x, y, b) for x, y, b in e.get_points("xyb")]
        segs = _polyline(points, e.closed, drawn, mm, gap)
        sign = _extrusion_sign(drawn)
        return [Piece(_scaled(_to_world(s, sign), mm), drawn.where) for s in segs], []
    if kind == "POLYLINE":
        verts = [(v.dxf.location, v.dxf.get("bulge", 0.0)) for v in e.vertices]
        _check_level(drawn, [p.z for p, _ in verts], mm, gap)
        sign = _extrusion_sign(drawn) if e.is_2d_polyline else 1.0
        segs = _polyline([(p.x, p.y, b if e.is_2d_polyline else 0.0) for p, b in verts], e.is_closed, drawn, mm, gap)
        return [Piece(_scaled(_to_world(s, sign), mm), drawn.where) for s in segs], []
    curve, t0, t1, breaks = _ellipse(drawn, mm) if kind == "ELLIPSE" else _spline(drawn, mm, gap)
    return curve_pieces(fit_curve(curve, t0, t1, tolerance, breaks, drawn.where), drawn.where, gap)


def _scaled(seg: Segment, mm: float) -> Segment:
    if isinstance(seg, Line):
        return Line((seg.start[0] * mm, seg.start[1] * mm), (seg.end[0] * mm, seg.end[1] * mm))
    return Arc((seg.center[0] * mm, seg.center[1] * mm), seg.radius * mm, seg.start, seg.end)


def _extrusion_sign(drawn: _Drawn) -> float:
    """+1 for an entity drawn in the plane seen from +z, -1 from -z (its x axis is mirrored, DXF's
    arbitrary-axis rule); PartError for one tilted out of the drawing plane."""
    ex, ey, ez = drawn.entity.dxf.get("extrusion", (0.0, 0.0, 1.0))
    norm = math.sqrt(ex * ex + ey * ey + ez * ez)
    if norm == 0.0 or math.hypot(ex, ey) > FLAT * norm:
        raise PartError(f"{drawn.where}: not in the drawing plane (extrusion ({ex:g}, {ey:g}, {ez:g})); "
                        "a flat part is drawn in the x-y plane")
    return 1.0 if ez > 0.0 else -1.0


def _to_world(seg: Segment, sign: float) -> Segment:
    """From the entity's own coordinates to the drawing's: a -z extrusion mirrors x."""
    return seg if sign > 0.0 else seg.mapped(-1.0, 1.0)


def _check_level(drawn: _Drawn, zs, mm: float, gap: float) -> None:
    zs = [float(z) for z in zs]
    if zs and (max(zs) - min(zs)) * mm > gap:
        raise PartError(f"{drawn.where}: not in the drawing plane (z from {min(zs):g} to {max(zs):g}); a flat "
                        "part is drawn in the x-y plane")


def _polyline(points: list[tuple[float, float, float]], closed: bool, drawn: _Drawn, mm: float,
              gap: float) -> list[Segment]:
    """Lines and bulge arcs between successive vertices (x, y, bulge); closed adds the last-to-first piece.
    The bulge is tan(included angle / 4), positive counter-clockwise ([DXF])."""
    if closed and len(points) > 2 and math.dist(points[0][:2], points[-1][:2]) * mm <= gap:
        points = points[:-1]
    if len(points) < 2:
        raise PartError(f"{drawn.where}: a polyline with fewer than two vertices")
    pairs = list(zip(points[:-1], points[1:]))
    if closed:
        pairs.append((points[-1], points[0]))
    segs: list[Segment] = []
    for (x0, y0, bulge), (x1, y1, _) in pairs:
        if bulge == 0.0 or math.dist((x0, y0), (x1, y1)) == 0.0:
            segs.append(Line((x0, y0), (x1, y1)))
            continue
        centre, _, _, radius = bulge_to_arc((x0, y0), (x1, y1), bulge)
        a0 = math.atan2(y0 - centre.y, x0 - centre.x)
        segs.append(Arc((float(centre.x), float(centre.y)), float(radius), a0, a0 + 4.0 * math.atan(bulge)))
    return segs


def _ellipse(drawn: _Drawn, mm: float):
    """The ellipse as a parametric curve in mm: p(t) = centre + major cos t + minor sin t, t from the start
    to the end parameter (counter-clockwise about the extrusion), with breaks at the axis ends."""
    _extrusion_sign(drawn)
    tool = drawn.entity.construction_tool()
    centre = np.array([tool.center.x, tool.center.y]) * mm
    major = np.array([tool.major_axis.x, tool.major_axis.y]) * mm
    minor = np.array([tool.minor_axis.x, tool.minor_axis.y]) * mm
    t0, t1 = float(tool.start_param), float(tool.end_param)
    if t1 <= t0 + 1e-12:
        t1 += 2.0 * math.pi

    def curve(t: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        c, s = np.cos(t)[:, None], np.sin(t)[:, None]
        return centre + c * major + s * minor, -s * major + c * minor, -c * major - s * minor

    quarter = 0.5 * math.pi
    breaks = [k * quarter for k in range(math.ceil(t0 / quarter), math.floor(t1 / quarter) + 1)]
    return curve, t0, t1, breaks


def _spline(drawn: _Drawn, mm: float, gap: float):
    """The spline as a parametric curve in mm (a rational B-spline through scipy in homogeneous
    coordinates), over its valid knot span, with breaks at interior knots of multiplicity >= degree (where
    the curve may turn a corner)."""
    tool = drawn.entity.construction_tool()
    control = np.array([(p.x, p.y, p.z) for p in tool.control_points], dtype=float)
    knots = np.array(tool.knots(), dtype=float)
    weights = np.array(tool.weights() or [1.0] * len(control), dtype=float)
    degree = int(tool.degree)
    n = len(control)
    if n < degree + 1 or len(knots) != n + degree + 1 or len(weights) != n or np.any(weights <= 0.0):
        raise PartError(f"{drawn.where}: a malformed spline ({n} control points, {len(knots)} knots, degree {degree})")
    _check_level(drawn, control[:, 2], mm, gap)
    homogeneous = np.column_stack([control[:, :2] * weights[:, None] * mm, weights])
    spline = BSpline(knots, homogeneous, degree)

    def curve(t: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        h, dh = spline(t), spline(t, 1)
        ddh = spline(t, 2) if degree > 1 else np.zeros_like(h)  # piecewise: one side's value at a knot
        w, dw, ddw = h[:, 2:], dh[:, 2:], ddh[:, 2:]
        p = h[:, :2] / w
        dp = (dh[:, :2] - p * dw) / w
        return p, dp, (ddh[:, :2] - 2.0 * dp * dw - p * ddw) / w

    t0, t1 = float(knots[degree]), float(knots[n])
    inner, counts = np.unique(knots[(knots > t0) & (knots < t1)], return_counts=True)
    return curve, t0, t1, inner[counts >= degree].tolist()
