"""Closed loops of a part as it is cut: the pieces read from a cut file (DXF, STEP) chained into loops and
sorted into the outline, the holes and the cut-outs.

Conventions (mm, the drawing's own coordinates converted to mm, no shift or turn):
- the outline runs counter-clockwise and every cut-out clockwise, so the material is on the left of every
  loop; each loop starts at its lowest-left vertex (the lowest of those within the gap of the least x);
- a hole is an inner loop that is one full circle (a CIRCLE, or arcs of one centre and radius closing a
  turn); holes are numbered 1, 2, ... from left to right by centre, centres within the gap tolerance of
  the same x from bottom to top; cut-outs are numbered the same way by the centroid of their area;
- lines and circular arcs are kept exact (geometry/shapes.py `Line` and `Arc`); ellipses and splines
  arrive here already replaced by tangent-continuous arcs (geometry/arcfit.py).

Chaining joins piece ends closer than `gap` (mm): each vertex is the mean of the line ends it joins (or
of the arc ends, where only arcs meet), lines end on it exactly, and an arc keeps its centre and radius
and is turned to point at it (its end then lies within the gap of the vertex, radially).

Everything a user must fix raises PartError with one line naming the place, in the drawing's own units,
and the piece (entity and layer) it is on.
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import shapely
from scipy.sparse import coo_matrix
from scipy.sparse.csgraph import connected_components
from scipy.spatial import cKDTree
from shapely.geometry import LinearRing, Polygon

from .arcfit import ArcChain, distance_to
from .errors import PartError
from .kinds.hole import Hole
from .kinds.hole import circle as hole_circle
from .outline import loop_polygon, segment_coords, wire_polygon
from .shapes import Arc, Line, Point, Segment, segment_points

FULL_TURN = 2.0 * math.pi
CHORD_TOLERANCE = 0.01  # mm: default largest distance between a fitted arc and its ellipse or spline
GAP_TOLERANCE = 0.01  # mm: default distance within which piece ends are joined


@dataclass(frozen=True)
class DrawingUnits:
    """The length unit a drawing is in: its name and millimetres per unit. Places and sizes in messages are
    shown in it, so a user finds them in the drawing program."""

    name: str
    mm: float

    def point(self, p: Point) -> str:
        x, y = (_shown(v / self.mm) for v in p)
        return f"({x}, {y}) {self.name}"

    def length(self, value: float) -> str:
        if self.name == "mm":
            return f"{value:.4g} mm"
        return f"{value / self.mm:.4g} {self.name} ({value:.4g} mm)"


MM = DrawingUnits("mm", 1.0)


def _shown(value: float) -> str:
    """A coordinate for a message: 6 significant digits, rounding noise below 1e-9 shown as 0."""
    return f"{0.0 if abs(value) < 1e-9 else value:.6g}"


@dataclass(frozen=True)
class Piece:
    """One drawn piece in mm and where it came from ("LINE #2F on layer CUT"). A full circle is an Arc
    of span 2 pi."""

    segment: Segment
    where: str


@dataclass(frozen=True)
class FittedCurve:
    """An ellipse or spline replaced by `pieces` tangent-continuous arcs: the largest distance (mm) and
    relative curvature mismatch measured between the curve and them (geometry/arcfit.py)."""

    where: str
    pieces: int
    deviation: float
    bend: float


@dataclass(frozen=True)
class CutLoops:
    """A flat part as cut, in mm (module docstring: orientation, numbering).

    outline: the outer loop, counter-clockwise.
    holes: the circular holes (centre and diameter, mm), numbered by their place in this tuple (1-based).
    cutouts: every other inner loop, each clockwise.
    units: the drawing's length unit ("mm", "in", ...); units_source: how it was decided.
    tolerance: largest distance (mm) allowed between a fitted arc and the ellipse or spline it replaces.
    gap: piece ends closer than this (mm) were joined.
    outline_from, holes_from, cutouts_from: where each outline piece, hole and cut-out piece came from
        ("LINE #2F on layer CUT"), parallel to outline, holes and cutouts.
    fitted: the ellipses and splines replaced by arcs, in drawing order.
    ignored: (entity type, count) of annotation left out (text, dimensions, hatches, points).
    thickness: the plate's thickness (mm) when the file holds a solid (STEP), else None.
    """

    outline: tuple[Segment, ...]
    holes: tuple[Hole, ...]
    cutouts: tuple[tuple[Segment, ...], ...]
    units: str
    units_source: str
    tolerance: float
    gap: float
    outline_from: tuple[str, ...]
    holes_from: tuple[str, ...]
    cutouts_from: tuple[tuple[str, ...], ...]
    fitted: tuple[FittedCurve, ...] = ()
    ignored: tuple[tuple[str, int], ...] = ()
    thickness: float | None = None


def cut_loops(pieces: Sequence[Piece], units: DrawingUnits, units_source: str, tolerance: float, gap: float,
              fitted: Sequence[FittedCurve] = (), ignored: Sequence[tuple[str, int]] = (),
              thickness: float | None = None) -> CutLoops:
    """The part from the pieces of a cut file (mm): chained into loops (`chain_loops`), sorted into outline,
    holes and cut-outs (`sort_loops`), with the refusals of both."""
    outline, holes, cutouts = sort_loops(chain_loops(pieces, gap, units), gap, units)
    return CutLoops(outline.segments, tuple(h for h, _ in holes), tuple(c.segments for c in cutouts), units.name,
                    units_source, tolerance, gap, outline.wheres, tuple(w for _, w in holes),
                    tuple(c.wheres for c in cutouts), tuple(fitted), tuple(ignored), thickness)


def curve_pieces(chain: ArcChain, where: str, gap: float) -> tuple[list[Piece], list[FittedCurve]]:
    """The pieces of a curve read through geometry/arcfit.py, and its record when it was fitted. Fitted
    arcs shorter than the gap are left out (their ends lie within the gap, so their neighbours join across
    them), unless the whole curve is that short (then it is refused as a zero-length piece)."""
    kept = list(chain.pieces)
    if sum(segment_length(s) for s in kept) > gap:
        kept = [s for s in kept if segment_length(s) > gap]
    fit = [] if chain.exact else [FittedCurve(where, len(kept), chain.deviation, chain.bend)]
    return [Piece(s, where) for s in kept], fit


def check_positive(key: str, value: float) -> None:
    """PartError naming `key` unless `value` is a positive, finite length (mm)."""
    if isinstance(value, bool) or not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0.0):
        raise PartError(f"{key}: {value!r} is not allowed; give a positive length in mm")


def cut_polygon(loops: CutLoops) -> Polygon:
    """The part's material region as a shapely polygon: the outline less the holes and cut-outs (curves as
    fine polygons, chord error about 2e-5 of the radius, geometry/outline.py)."""
    inner = [loop_polygon((hole_circle(h),)) for h in loops.holes] + [wire_polygon(c) for c in loops.cutouts]
    outline = wire_polygon(loops.outline)
    return outline.difference(shapely.union_all(inner)) if inner else outline


def loop_area(loop: Sequence[Segment]) -> float:
    """Signed area (mm²) enclosed by a closed chain of lines and arcs: positive when it runs
    counter-clockwise. Exact (Green's theorem, A = 1/2 closed integral of x dy - y dx)."""
    total = 0.0
    for seg in loop:
        if isinstance(seg, Line):
            (x0, y0), (x1, y1) = seg.start, seg.end
            total += x0 * y1 - x1 * y0
        else:
            (cx, cy), r, a0, a1 = seg.center, seg.radius, seg.start, seg.end
            total += r * cx * (math.sin(a1) - math.sin(a0)) - r * cy * (math.cos(a1) - math.cos(a0)) + r * r * (a1 - a0)
    return 0.5 * total


def segment_length(seg: Segment) -> float:
    """Length (mm) of a line or arc."""
    if isinstance(seg, Line):
        return math.dist(seg.start, seg.end)
    return seg.radius * seg.span


def circle_of(loop: Sequence[Segment], gap: float) -> Hole | None:
    """The loop as a hole (centre, diameter) when it is one full circle: arcs only, one centre and radius
    within `gap`, turning once."""
    if not all(isinstance(s, Arc) for s in loop):
        return None
    centres = np.array([s.center for s in loop])
    radii = np.array([s.radius for s in loop])
    centre, radius = centres.mean(axis=0), float(radii.mean())
    if np.hypot(*(centres - centre).T).max() > gap or np.abs(radii - radius).max() > gap:
        return None
    if abs(abs(sum(s.end - s.start for s in loop)) - FULL_TURN) > 1e-6:
        return None
    return Hole((float(centre[0]), float(centre[1])), 2.0 * radius)


# --- chaining --------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Loop:
    """A closed chain: its segments end to start, and where each came from."""

    segments: tuple[Segment, ...]
    wheres: tuple[str, ...]


def chain_loops(pieces: Sequence[Piece], gap: float, units: DrawingUnits = MM) -> list[Loop]:
    """Join pieces whose ends lie within `gap` (mm) into closed loops. Refuses (PartError, one line) a piece
    shorter than the gap, a piece drawn twice, pieces that branch (three or more ends at one vertex),
    an open chain, and a drawing with no closed loop at all."""
    if not pieces:
        raise PartError("no cut geometry: no pieces to chain into loops")
    for piece in pieces:
        _check_length(piece, gap, units)
    ends = np.array([p for piece in pieces for p in segment_points(piece.segment)])
    node = _join(ends, gap)
    count = np.bincount(node)
    _check_duplicates(pieces, node, gap, units)
    _check_branches(pieces, ends, node, count, units)
    _check_open(pieces, ends, node, count, gap, units)
    return _walk(pieces, node, _vertices(pieces, ends, node, len(count)))


def _check_length(piece: Piece, gap: float, units: DrawingUnits) -> None:
    seg = piece.segment
    numbers = [*segment_points(seg)[0], *segment_points(seg)[1], segment_length(seg)]
    if not all(math.isfinite(v) for v in numbers):
        raise PartError(f"{piece.where}: a coordinate is not a finite number")
    if isinstance(seg, Arc) and seg.radius <= gap:
        raise PartError(f"{piece.where}: zero radius ({units.length(seg.radius)}) at {units.point(seg.center)}, "
                        f"below the gap tolerance {units.length(gap)}; remove it")
    length = segment_length(seg)
    if length <= gap:
        start = segment_points(seg)[0]
        raise PartError(f"{piece.where}: zero length ({units.length(length)}) at {units.point(start)}, below "
                        f"the gap tolerance {units.length(gap)}; remove it")


def _join(ends: np.ndarray, gap: float) -> np.ndarray:
    """Vertex number of every end: ends within `gap` of each other (transitively) share a vertex."""
    pairs = cKDTree(ends).query_pairs(gap, output_type="ndarray")
    n = len(ends)
    graph = coo_matrix((np.ones(len(pairs)), (pairs[:, 0], pairs[:, 1])), shape=(n, n))
    return connected_components(graph, directed=False)[1]


def _midpoint(seg: Segment) -> Point:
    if isinstance(seg, Line):
        return (0.5 * (seg.start[0] + seg.end[0]), 0.5 * (seg.start[1] + seg.end[1]))
    return seg.at(0.5 * (seg.start + seg.end))


def _check_duplicates(pieces: Sequence[Piece], node: np.ndarray, gap: float, units: DrawingUnits) -> None:
    """Two pieces between the same vertices whose midpoints coincide are the same piece drawn twice."""
    seen: dict[tuple[int, int], list[int]] = {}
    for i in range(len(pieces)):
        key = tuple(sorted((int(node[2 * i]), int(node[2 * i + 1]))))
        for j in seen.get(key, []):
            if math.dist(_midpoint(pieces[i].segment), _midpoint(pieces[j].segment)) <= gap:
                at = units.point(_midpoint(pieces[i].segment))
                raise PartError(f"duplicate pieces: {pieces[j].where} and {pieces[i].where} lie on each other "
                                f"(through {at}); remove one")
        seen.setdefault(key, []).append(i)


def _check_branches(pieces: Sequence[Piece], ends: np.ndarray, node: np.ndarray, count: np.ndarray,
                    units: DrawingUnits) -> None:
    branched = np.flatnonzero(count > 2)
    if branched.size:
        members = np.flatnonzero(node == branched[0])
        names = ", ".join(pieces[m // 2].where for m in members)
        raise PartError(f"crossing loops: {len(members)} piece ends meet at {units.point(tuple(ends[members[0]]))} "
                        f"({names}); a cut loop must not branch or overlap")


def _check_open(pieces: Sequence[Piece], ends: np.ndarray, node: np.ndarray, count: np.ndarray, gap: float,
                units: DrawingUnits) -> None:
    """Refuse free ends: name the smallest gap between two of them (the likeliest slip of the pen)."""
    free = np.flatnonzero(count[node] == 1)
    if free.size == 0:
        return
    # branches are refused already, so free ends come in pairs (a graph has an even number of odd vertices)
    dist, near = cKDTree(ends[free]).query(ends[free], k=2)
    a = int(np.argmin(dist[:, 1]))
    b = int(near[a, 1])
    i, j = free[a], free[b]
    closed = _closed_components(node, count)
    what = "open chain" if closed else "no closed loop"
    raise PartError(f"{what}: a gap of {units.length(float(dist[a, 1]))} between {units.point(tuple(ends[i]))} "
                    f"({pieces[i // 2].where}) and {units.point(tuple(ends[j]))} ({pieces[j // 2].where}), above "
                    f"the gap tolerance {units.length(gap)} ({free.size} free ends in all)")


def _closed_components(node: np.ndarray, count: np.ndarray) -> int:
    """Number of chains (connected groups of pieces) whose every vertex joins exactly two ends."""
    n_pieces = len(node) // 2
    graph = coo_matrix((np.ones(n_pieces), (node[0::2], node[1::2])), shape=(len(count), len(count)))
    label = connected_components(graph, directed=False)[1]
    open_labels = set(label[count == 1].tolist())
    used = set(label[node].tolist())
    return len(used - open_labels)


def _vertices(pieces: Sequence[Piece], ends: np.ndarray, node: np.ndarray, n: int) -> np.ndarray:
    """Each vertex: the mean of the line ends it joins (read from the file as they are), or of the arc ends
    when it joins arcs only (computed from centre, radius and angles)."""
    is_line = np.repeat([isinstance(p.segment, Line) for p in pieces], 2)
    has_line = np.zeros(n, dtype=bool)
    has_line[node[is_line]] = True
    weight = np.where(is_line | ~has_line[node], 1.0, 0.0)
    vertex = np.zeros((n, 2))
    np.add.at(vertex, node, ends * weight[:, None])
    return vertex / np.bincount(node, weights=weight, minlength=n)[:, None]


def _walk(pieces: Sequence[Piece], node: np.ndarray, vertex: np.ndarray) -> list[Loop]:
    """Follow every closed chain end to start (every vertex joins exactly two ends)."""
    at_vertex: dict[int, list[int]] = {}
    for end, v in enumerate(node.tolist()):
        at_vertex.setdefault(v, []).append(end)
    done = np.zeros(len(pieces), dtype=bool)
    loops = []
    for first in range(len(pieces)):
        if done[first]:
            continue
        segs, wheres = [], []
        end = 2 * first  # enter the first piece at its start
        start_vertex = node[end]
        while True:
            i = end // 2
            done[i] = True
            forward = end % 2 == 0
            seg = pieces[i].segment if forward else pieces[i].segment.reversed()
            out = end + 1 if forward else end - 1  # the piece's other end
            segs.append(_snapped(seg, vertex[node[end]], vertex[node[out]]))
            wheres.append(pieces[i].where)
            if node[out] == start_vertex:
                break
            end = next(e for e in at_vertex[node[out]] if e != out)
        loops.append(Loop(tuple(segs), tuple(wheres)))
    return loops


def _snapped(seg: Segment, a: np.ndarray, b: np.ndarray) -> Segment:
    """The segment ending on the vertices a, b: a line exactly, an arc turned to point at them."""
    if isinstance(seg, Line):
        return Line((float(a[0]), float(a[1])), (float(b[0]), float(b[1])))
    if seg.span >= FULL_TURN - 1e-9:
        return seg

    def aim(p: np.ndarray, old: float) -> float:
        new = math.atan2(p[1] - seg.center[1], p[0] - seg.center[0])
        return old + (new - old + math.pi) % FULL_TURN - math.pi

    return Arc(seg.center, seg.radius, aim(a, seg.start), aim(b, seg.end))


# --- outline, holes and cut-outs -------------------------------------------------------------------------

def sort_loops(loops: Sequence[Loop], gap: float, units: DrawingUnits = MM) -> tuple[
        Loop, list[tuple[Hole, str]], list[Loop]]:
    """(outline, holes with where each was drawn, cut-outs) from closed loops, oriented and numbered as the
    module docstring says. Refuses a loop that crosses itself, loops that cross or touch, a second outline,
    a loop outside the outline, and a loop inside a hole or cut-out."""
    rings = [_ring(loop) for loop in loops]
    _check_simple(loops, rings, units)
    _check_apart(loops, rings, units)
    polygons = [Polygon(r) for r in rings]
    areas = np.array([p.area for p in polygons])
    inside = shapely.STRtree(polygons).query(shapely.points([r.coords[0] for r in rings]), predicate="within")
    containers: list[list[int]] = [[] for _ in loops]
    for i, j in inside.T.tolist():
        containers[i].append(j)
    top = [i for i, c in enumerate(containers) if not c]
    outer = max(top, key=lambda i: areas[i])
    for i in top:
        if i != outer:
            _refuse_outside(loops, containers, i, units)
    for i, c in enumerate(containers):
        if len(c) > 1:
            host = min((j for j in c if j != outer), key=lambda j: areas[j])
            raise PartError(f"a loop inside a cut-out: the loop through {_lowest(loops[i], units)} lies inside the "
                            f"loop through {_lowest(loops[host], units)}; islands of material are not a flat "
                            "part (a frame drawn around the part? pick the part's layers)")
    holes, cutouts = [], []
    for i in range(len(loops)):
        if i == outer:
            continue
        hole = circle_of(loops[i].segments, gap)
        if hole is not None:
            holes.append((hole, loops[i].wheres[0]))
        else:
            cutouts.append((polygons[i].centroid.coords[0], _oriented(loops[i], counter_clockwise=False, gap=gap)))
    holes = [holes[k] for k in _reading_order([h.center for h, _ in holes], gap)]
    cutouts = [cutouts[k][1] for k in _reading_order([c[0] for c in cutouts], gap)]
    return _oriented(loops[outer], counter_clockwise=True, gap=gap), holes, cutouts


def _ring(loop: Loop) -> LinearRing:
    return LinearRing(np.concatenate([segment_coords(s)[:-1] for s in loop.segments]))


def _nearest_piece(loop: Loop, p: Point) -> str:
    gaps = [float(distance_to(s, np.array([p]))[0]) for s in loop.segments]
    return loop.wheres[int(np.argmin(gaps))]


def _lowest(loop: Loop, units: DrawingUnits) -> str:
    """The loop named by its lowest-left vertex and the piece that starts there."""
    starts = [segment_points(s)[0] for s in loop.segments]
    k = _lowest_left(starts, 0.0)
    return f"{units.point(starts[k])} ({loop.wheres[k]})"


_AT = re.compile(r"\[\s*([-+0-9.eE]+)\s+([-+0-9.eE]+)")


def _check_simple(loops: Sequence[Loop], rings: Sequence[LinearRing], units: DrawingUnits) -> None:
    for loop, ring in zip(loops, rings):
        if ring.is_simple:
            continue
        found = _AT.search(shapely.is_valid_reason(Polygon(ring)))
        p = (float(found.group(1)), float(found.group(2))) if found else ring.coords[0]
        raise PartError(f"crossing loops: a loop crosses itself at {units.point(p)} (near {_nearest_piece(loop, p)})")


def _check_apart(loops: Sequence[Loop], rings: Sequence[LinearRing], units: DrawingUnits) -> None:
    pairs = shapely.STRtree(rings).query(rings, predicate="intersects")
    for i, j in pairs.T.tolist():
        if i < j:
            meet = rings[i].intersection(rings[j])
            p = shapely.get_coordinates(meet)[0]
            p = (float(p[0]), float(p[1]))
            raise PartError(f"crossing loops: two loops cross or touch at {units.point(p)} "
                            f"({_nearest_piece(loops[i], p)} and {_nearest_piece(loops[j], p)})")


def _refuse_outside(loops: Sequence[Loop], containers: list[list[int]], i: int, units: DrawingUnits) -> None:
    inner = sum(1 for c in containers if c == [i])
    if inner:
        raise PartError(f"two outlines: the loop through {_lowest(loops[i], units)} lies outside the largest loop and "
                        f"has {inner} loop(s) inside it; one drawing must hold one part (pick it by its layers)")
    raise PartError(f"a loop outside the outline: the loop through {_lowest(loops[i], units)} lies outside the "
                    "largest loop; remove it or leave its layer out")


def _oriented(loop: Loop, counter_clockwise: bool, gap: float) -> Loop:
    """The loop in the wanted sense, starting at its lowest-left vertex."""
    segs, wheres = list(loop.segments), list(loop.wheres)
    if (loop_area(segs) > 0.0) != counter_clockwise:
        segs, wheres = [s.reversed() for s in reversed(segs)], wheres[::-1]
    k = _lowest_left([segment_points(s)[0] for s in segs], gap)
    return Loop(tuple(segs[k:] + segs[:k]), tuple(wheres[k:] + wheres[:k]))


def _lowest_left(points: Sequence[Point], gap: float) -> int:
    """Index of the lowest of the points within `gap` of the least x."""
    xy = np.asarray(points, dtype=float)
    left = np.flatnonzero(xy[:, 0] <= xy[:, 0].min() + gap)
    return int(left[np.argmin(xy[left, 1])])


def _reading_order(points: Sequence[Point], gap: float) -> list[int]:
    """Indices of `points` left to right; points whose x lie within `gap` of the previous one's (a column)
    bottom to top."""
    if not points:
        return []
    xy = np.asarray(points, dtype=float)
    by_x = np.argsort(xy[:, 0], kind="stable")
    column = np.concatenate([[0], np.cumsum(np.diff(xy[by_x, 0]) > gap)])
    columns = np.empty(len(xy), dtype=int)
    columns[by_x] = column
    return np.lexsort((xy[:, 1], columns)).tolist()
