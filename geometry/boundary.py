"""The part's own boundary as exact lines and arcs, and the stretches of it that a part file holds or loads.

The boundary is a set of closed loops, each a chain of pieces traversed with the material on the left:
the outline counter-clockwise, every cut-out clockwise. A piece is a maximal straight line or circular arc
(a notch root, a slot end, a lug's rounded end, a whole hole); an elliptical hole is one piece kept for
naming only. Pieces come from the same exact geometry as the mesh (geometry/shapes.py); a notch splits the
edge it is cut from.

A part file picks a stretch (a BoundaryPick) either by a point on one piece (`at`: the whole piece nearest
it, within ON_BOUNDARY of the plate's width) or by two points (`start`, `end`: the boundary between them,
walking along one loop with the material on the left, possibly over several pieces). Every refusal raises
PartError naming the part-file key, the point and the nearest piece. Lengths in mm, angles in radians.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
from shapely.geometry import Point as ShapelyPoint

from .errors import PartError
from .kinds.base import CurvedEdges, RaiserId
from .mesh import EdgeName
from .outline import loop_polygon, part_polygon, plate_polygon
from .registry import kind_of, named, outline_of, outline_size
from .shapes import Arc, EllipseShape, Line, Point, Segment, segment_points
from .spec import BoundaryPick, PartSpec
from .units import format_point, format_quantity

ON_BOUNDARY = 0.005  # of the plate's width: how far a picked point may lie from the piece it picks
SAME_POINT = 1e-9  # of the part's larger dimension: two points this close are one point
RAISER_PREFIXES = ("hole ", "ellipse ", "slot ", "notch ", "fillet at ")  # pieces that are raiser edges


@dataclass(frozen=True)
class Piece:
    """One maximal line or arc of a boundary loop, traversed with the material on the left.

    segment: the exact line or arc (an Arc runs from angle `start` to `end`, clockwise when end < start),
    or None for an elliptical hole's edge (`ellipse` then holds it); name: what it lies on, as the mesh's
    edge sets name it ("side", "held", an outline raiser's or a cut-out's RaiserId); label: the words
    that name it in a message ("the side y = 40", "hole 2"); loop: 0 for the outline, 1... for the cut-outs;
    banded: the mesh follows it with structured layers (a raiser's curved edge or a slot's side), so a
    stretch may not end inside it.
    """

    segment: Segment | None
    name: EdgeName
    label: str
    loop: int
    banded: bool
    ellipse: EllipseShape | None = None

    @property
    def length(self) -> float:
        return segment_length(self.segment) if self.segment is not None else math.inf


@dataclass(frozen=True)
class Stretch:
    """A picked stretch of the boundary: its pieces (whole or in part) in walking order, each with the
    material on the left, what each lies on (`names`, as the mesh's edge sets name them) and in words
    (`labels`); `key` is the part-file key that picked it and `closed` whether it is a whole loop (a
    hole's edge)."""

    key: str
    pieces: tuple[Segment, ...]
    names: tuple[EdgeName, ...]
    labels: tuple[str, ...]
    closed: bool

    @property
    def length(self) -> float:
        """Total length (mm)."""
        return float(sum(segment_length(s) for s in self.pieces))

    @property
    def ends(self) -> tuple[Point, ...]:
        """Its two end points (mm); none for a closed stretch."""
        if self.closed:
            return ()
        return (segment_points(self.pieces[0])[0], segment_points(self.pieces[-1])[1])

    def samples(self, per_piece: int = 5) -> np.ndarray:
        """(k, 2) points along every piece, ends included (mm)."""
        return np.concatenate([segment_samples(s, per_piece) for s in self.pieces])


# --- lines and arcs ----------------------------------------------------------------------------------


def segment_length(seg: Segment) -> float:
    """Length (mm) of a line or arc."""
    if isinstance(seg, Line):
        return math.dist(seg.start, seg.end)
    return seg.radius * seg.span


def segment_point(seg: Segment, s: float) -> Point:
    """The point at distance s (mm) from the segment's start along it."""
    if isinstance(seg, Line):
        length = segment_length(seg)
        f = s / length if length > 0.0 else 0.0
        return (seg.start[0] + f * (seg.end[0] - seg.start[0]), seg.start[1] + f * (seg.end[1] - seg.start[1]))
    return seg.at(seg.start + math.copysign(s / seg.radius, seg.end - seg.start))


def segment_samples(seg: Segment, n: int) -> np.ndarray:
    """(n, 2) points along a segment, from its start to its end (mm)."""
    length = segment_length(seg)
    return np.array([segment_point(seg, length * k / (n - 1)) for k in range(n)])


def project(seg: Segment, p: Point) -> tuple[float, float]:
    """(distance from p to the segment, distance along it from its start to the nearest point), mm."""
    if isinstance(seg, Line):
        (x0, y0), (x1, y1) = seg.start, seg.end
        dx, dy = x1 - x0, y1 - y0
        length = math.hypot(dx, dy)
        t = min(length, max(0.0, ((p[0] - x0) * dx + (p[1] - y0) * dy) / length))
        return math.hypot(p[0] - x0 - t * dx / length, p[1] - y0 - t * dy / length), t
    sense = 1.0 if seg.end >= seg.start else -1.0
    turn = (sense * (math.atan2(p[1] - seg.center[1], p[0] - seg.center[0]) - seg.start)) % (2.0 * math.pi)
    if turn <= seg.span:
        return abs(math.dist(p, seg.center) - seg.radius), seg.radius * turn
    first, last = math.dist(p, seg.first), math.dist(p, seg.last)
    return (first, 0.0) if first <= last else (last, segment_length(seg))


def sub_segment(seg: Segment, s0: float, s1: float) -> Segment:
    """The part of a segment between distances s0 < s1 (mm) from its start, in the same sense."""
    if isinstance(seg, Line):
        return Line(segment_point(seg, s0), segment_point(seg, s1))
    sense = math.copysign(1.0, seg.end - seg.start)
    return Arc(seg.center, seg.radius, seg.start + sense * s0 / seg.radius, seg.start + sense * s1 / seg.radius)


def outward_normals(seg: Segment, points: np.ndarray) -> np.ndarray:
    """(k, 2) unit normals pointing out of the material at `points` on a segment traversed with the
    material on the left (the normal to the right of the direction of travel)."""
    if isinstance(seg, Line):
        d = np.subtract(seg.end, seg.start) / segment_length(seg)
        return np.tile([d[1], -d[0]], (len(points), 1))
    radial = (points - np.asarray(seg.center)) / seg.radius
    # counter-clockwise: the centre is on the left (material inside the circle); clockwise: outside
    return radial if seg.end > seg.start else -radial


def _left_probe(seg: Segment, size: float) -> Point:
    """A point just to the left of the segment's middle (mm)."""
    length = segment_length(seg)
    mid = segment_point(seg, 0.5 * length)
    normal = outward_normals(seg, np.array([mid]))[0]
    step = 1e-3 * min(length, size)
    return (mid[0] - step * normal[0], mid[1] - step * normal[1])


def _reverse(seg: Segment) -> Segment:
    return seg.reversed()


# --- the loops ---------------------------------------------------------------------------------------


def boundary_loops(spec: PartSpec) -> tuple[tuple[Piece, ...], ...]:
    """Every boundary loop of the part, the outline first, each piece with the material on its left: the
    outline kind's path, less the mouths of the raisers that open onto its edges (a notch) and with their
    edges inside the plate spliced in; then each cut-out's loop (geometry/registry.py: every kind's exact
    loops)."""
    material = part_polygon(spec)
    size = max(outline_size(spec))
    tol = SAME_POINT * size
    edge_raisers = [(rid, item) for rid, item in named(spec) if kind_of(item).mouths(spec, item)]
    openings = [(rid, item, loop) for rid, item in edge_raisers for loop in kind_of(item).loops(spec, item)]
    cut_regions = [loop_polygon(loop) for _, _, loop in openings]
    plate = plate_polygon(spec)
    pieces: list[Piece] = []
    for edge in outline_of(spec).path(spec):
        label = edge.label or str(edge.name)
        for seg in _split(edge.segment, [loop for _, _, loop in openings]):
            if not any(region.contains(ShapelyPoint(_middle(seg))) for region in cut_regions):
                pieces.append(Piece(seg, edge.name, label, 0, isinstance(edge.name, RaiserId)))
    outline_edges = [e.segment for e in outline_of(spec).path(spec)]
    for rid, item, loop in openings:
        curved = kind_of(item).curved(spec, item)
        for seg in loop:
            for part in _split(seg, [tuple(outline_edges)]):
                if plate.contains(ShapelyPoint(_middle(part))):
                    oriented = _oriented([part], material, size)[0]
                    pieces.append(Piece(oriented, rid, str(rid), 0, _banded(oriented, curved, tol)))
    loops = [_merged(_chained(pieces, tol), tol)]
    for rid, item in named(spec):
        if kind_of(item).mouths(spec, item):
            continue
        curved = kind_of(item).curved(spec, item)
        for loop in kind_of(item).loops(spec, item):
            if isinstance(loop, EllipseShape):
                loops.append((Piece(None, rid, str(rid), 0, True, loop),))
                continue
            wire = _oriented(list(loop), material, size)
            loops.append(_merged([Piece(seg, rid, str(rid), 0, _banded(seg, curved, tol)) for seg in wire], tol))
    return tuple(tuple(replace(p, loop=k) for p in loop) for k, loop in enumerate(loops))


def _middle(seg: Segment) -> Point:
    return segment_point(seg, 0.5 * segment_length(seg))


def _split(seg: Segment, loops) -> list[Segment]:
    """A line (or arc) cut where it crosses the lines and arcs of `loops`, its parts in order."""
    cuts = sorted({s for loop in loops if isinstance(loop, tuple) for other in loop
                   for s in _crossings(seg, other)})
    length = segment_length(seg)
    bounds = [0.0] + [s for s in cuts if 1e-12 * length < s < length * (1.0 - 1e-12)] + [length]
    if len(bounds) == 2:
        return [seg]
    return [sub_segment(seg, a, b) for a, b in zip(bounds, bounds[1:]) if b - a > 1e-12 * length]


def _crossings(seg: Segment, other: Segment) -> list[float]:
    """Distances along `seg` (mm) where it meets `other` (exact: line-line and line-arc; an arc meets only
    lines here)."""
    if isinstance(seg, Arc) and isinstance(other, Arc):
        return []
    if isinstance(seg, Arc):
        points = _line_arc(other, seg)
    elif isinstance(other, Arc):
        points = _line_arc(seg, other)
    else:
        points = _line_line(seg, other)
    out = []
    for p in points:
        distance, along = project(seg, p)
        if distance <= 1e-9 * (segment_length(seg) + 1.0):
            out.append(along)
    return out


def _line_line(a: Line, b: Line) -> list[Point]:
    """The point where two line segments cross (none when parallel or apart)."""
    (x1, y1), (x2, y2) = a.start, a.end
    (x3, y3), (x4, y4) = b.start, b.end
    den = (x2 - x1) * (y4 - y3) - (y2 - y1) * (x4 - x3)
    if abs(den) <= 1e-15 * (abs(x2 - x1) + abs(y2 - y1)) * (abs(x4 - x3) + abs(y4 - y3)):
        return []
    t = ((x3 - x1) * (y4 - y3) - (y3 - y1) * (x4 - x3)) / den
    u = ((x3 - x1) * (y2 - y1) - (y3 - y1) * (x2 - x1)) / den
    if -1e-12 <= t <= 1.0 + 1e-12 and -1e-12 <= u <= 1.0 + 1e-12:
        return [(x1 + t * (x2 - x1), y1 + t * (y2 - y1))]
    return []


def _line_arc(line: Line, arc: Arc) -> list[Point]:
    """The points where a line segment meets a circular arc."""
    (x1, y1), (x2, y2) = line.start, line.end
    dx, dy = x2 - x1, y2 - y1
    fx, fy = x1 - arc.center[0], y1 - arc.center[1]
    a, b, c = dx * dx + dy * dy, 2.0 * (fx * dx + fy * dy), fx * fx + fy * fy - arc.radius ** 2
    disc = b * b - 4.0 * a * c
    if disc < 0.0 or a == 0.0:
        return []
    root = math.sqrt(disc)
    out = []
    for t in ((-b - root) / (2.0 * a), (-b + root) / (2.0 * a)):
        if -1e-12 <= t <= 1.0 + 1e-12:
            p = (x1 + t * dx, y1 + t * dy)
            if project(arc, p)[0] <= 1e-9 * arc.radius:
                out.append(p)
    return out


def _banded(seg: Segment, curved: CurvedEdges, tol: float) -> bool:
    """Whether a piece lies on one of the raiser's curved edges (meshed in layers)."""
    if isinstance(seg, Arc):
        return any(math.dist(seg.center, a.center) <= tol and abs(seg.radius - a.radius) <= tol for a in curved.arcs)
    mid = _middle(seg)
    return any(project(line, mid)[0] <= tol for line, _ in curved.strips)


def _oriented(segments: list[Segment], material, size: float) -> list[Segment]:
    """A chain of segments (in order) turned round if the material is on its right, judged beside its
    longest segment."""
    if not segments:
        return segments
    longest = max(segments, key=segment_length)
    if material.covers(ShapelyPoint(_left_probe(longest, size))):
        return segments
    return [_reverse(s) for s in reversed(segments)]


def _chained(pieces: list[Piece], tol: float) -> list[Piece]:
    """The pieces in walking order, starting from the first: each starts where the one before ends."""
    starts = np.array([segment_points(p.segment)[0] for p in pieces])
    left = list(range(1, len(pieces)))
    order = [0]
    while left:
        end = np.asarray(segment_points(pieces[order[-1]].segment)[1])
        gaps = np.linalg.norm(starts[left] - end, axis=1)
        k = int(np.argmin(gaps))
        if gaps[k] > 1e3 * tol:
            raise PartError("the part's outline does not close where a raiser opens onto its edge; check the "
                            "raisers cut from the edges (notches)")
        order.append(left.pop(k))
    return [pieces[k] for k in order]


def _merged(pieces: list[Piece], tol: float) -> tuple[Piece, ...]:
    """Consecutive arcs of one circle, turning the same way, joined into one piece (cyclically)."""
    def joins(a: Piece, b: Piece) -> bool:
        s, t = a.segment, b.segment
        return (isinstance(s, Arc) and isinstance(t, Arc) and math.dist(s.center, t.center) <= tol
                and abs(s.radius - t.radius) <= tol and (s.end - s.start) * (t.end - t.start) > 0.0
                and a.name == b.name)

    def join(a: Piece, b: Piece) -> Piece:
        s, t = a.segment, b.segment
        return replace(a, segment=Arc(s.center, s.radius, s.start, s.end + (t.end - t.start)))

    out: list[Piece] = []
    for piece in pieces:
        if out and joins(out[-1], piece):
            out[-1] = join(out[-1], piece)
        else:
            out.append(piece)
    if len(out) > 1 and joins(out[-1], out[0]):
        out[0] = join(out.pop(), out[0])
    return tuple(out)


# --- picking a stretch -------------------------------------------------------------------------------


def describe(piece: Piece, units: str) -> str:
    """A piece in words, lengths in `units`: "the side y = 40, line from (150, 40) mm to (-150, 40) mm"."""
    seg = piece.segment
    if seg is None:
        return f"{piece.label}'s edge"
    if isinstance(seg, Line):
        return f"{piece.label}, line from {format_point(seg.start, units)} to {format_point(seg.end, units)}"
    what = "circle" if seg.span >= 2.0 * math.pi - 1e-9 else "arc"
    return (f"{piece.label}, {what} of radius {format_quantity(seg.radius, 'length', units)} about "
            f"{format_point(seg.center, units)}")


def _nearest(spec: PartSpec, loops, p: Point) -> list[tuple[float, float, Piece, int]]:
    """(distance, distance along, piece, index in its loop) for every piece, nearest first."""
    out = []
    for loop in loops:
        for k, piece in enumerate(loop):
            if piece.segment is None:  # an elliptical hole
                shape = loop_polygon(piece.ellipse).exterior
                out.append((float(shape.distance(ShapelyPoint(p))), 0.0, piece, k))
            else:
                dist, along = project(piece.segment, p)
                out.append((dist, along, piece, k))
    return sorted(out, key=lambda item: item[0])


def stretch(spec: PartSpec, pick: BoundaryPick) -> Stretch:
    """The exact stretch a part file picks (see the module docstring); PartError for every refusal."""
    loops = boundary_loops(spec)
    length, width = outline_size(spec)
    tol = ON_BOUNDARY * width
    same = SAME_POINT * max(length, width)
    if pick.at is not None:
        return _whole_piece(spec, loops, pick, tol, same)
    first, i, s0 = _locate(spec, loops, pick, "from", pick.start, tol, same, leaving=True)
    last, j, s1 = _locate(spec, loops, pick, "to", pick.end, tol, same, leaving=False)
    if first.loop != last.loop:
        raise PartError(f"{pick.key}.to: {format_point(pick.end, spec.units)} is on {_loop_name(last)} but "
                        f"{pick.key}.from is on {_loop_name(first)}; a stretch runs along one boundary")
    for key, point, piece, along in (("from", pick.start, first, s0), ("to", pick.end, last, s1)):
        if piece.banded and (same < along < piece.length - same or len(loops[piece.loop]) == 1):
            raise PartError(f"{pick.key}.{key}: {format_point(point, spec.units)} lies inside {describe(piece, spec.units)}, "
                            "a raiser edge meshed in structured layers; start and end a stretch at a corner of that "
                            "edge, or pick the whole edge with `at`")
    if i == j and abs(s1 - s0) <= same:
        raise PartError(f"{pick.key}.to: the stretch from {format_point(pick.start, spec.units)} to "
                        f"{format_point(pick.end, spec.units)} has no length; give two different points")
    loop = loops[first.loop]

    def part(k: int, lo: float, hi: float) -> tuple[Segment, EdgeName, str]:
        seg = loop[k].segment
        whole = lo <= same and hi >= segment_length(seg) - same
        return (seg if whole else sub_segment(seg, lo, hi)), loop[k].name, loop[k].label

    if i == j and s1 > s0:
        walked = [part(i, s0, s1)]
    else:  # from the start's piece on, round the loop to the end's piece (round the whole loop if need be)
        walked = [part(i, s0, loop[i].length)]
        k = (i + 1) % len(loop)
        while k != j:
            walked.append(part(k, 0.0, loop[k].length))
            k = (k + 1) % len(loop)
        walked.append(part(j, 0.0, s1))
    return Stretch(pick.key, tuple(w[0] for w in walked), tuple(w[1] for w in walked), tuple(w[2] for w in walked),
                   False)


def _loop_name(piece: Piece) -> str:
    return "the outline" if piece.loop == 0 else f"{piece.label}'s edge"


def _whole_piece(spec: PartSpec, loops, pick: BoundaryPick, tol: float, same: float) -> Stretch:
    ranked = _nearest(spec, loops, pick.at)
    dist, _, piece, _ = ranked[0]
    where = f"{pick.key}.at: {format_point(pick.at, spec.units)}"
    if dist > tol:
        raise PartError(f"{where} is on no boundary piece (the nearest is {describe(piece, spec.units)}, "
                        f"{_length(dist, spec)} away; a point may lie at most {_length(tol, spec)} off it)")
    if len(ranked) > 1 and ranked[1][0] - dist <= same and ranked[1][2] is not piece:
        raise PartError(f"{where} is where two pieces meet ({describe(piece, spec.units)}; and "
                        f"{describe(ranked[1][2], spec.units)}); give a point inside the piece you mean")
    _usable(spec, pick, "at", piece)
    closed = len(loops[piece.loop]) == 1
    return Stretch(pick.key, (piece.segment,), (piece.name,), (piece.label,), closed)


def _usable(spec: PartSpec, pick: BoundaryPick, key: str, piece: Piece) -> None:
    if piece.segment is None:
        raise PartError(f"{pick.key}.{key}: the nearest boundary piece is {piece.label}'s edge; loads and supports "
                        "on an elliptical edge are not available (pick a line or a circular arc)")


def _locate(spec: PartSpec, loops, pick: BoundaryPick, key: str, p: Point, tol: float, same: float,
            leaving: bool) -> tuple[Piece, int, float]:
    """(piece, index in its loop, distance along it) of a stretch's end point; at a corner, the piece
    the stretch leaves by (`leaving`, for its start) or arrives by (for its end)."""
    ranked = _nearest(spec, loops, p)
    dist, along, piece, k = ranked[0]
    where = f"{pick.key}.{key}: {format_point(p, spec.units)}"
    if dist > tol:
        raise PartError(f"{where} is on no boundary piece (the nearest is {describe(piece, spec.units)}, "
                        f"{_length(dist, spec)} away; a point may lie at most {_length(tol, spec)} off it)")
    _usable(spec, pick, key, piece)
    loop = loops[piece.loop]
    if leaving and along >= piece.length - same:  # the end of a piece is the start of the next
        k = (k + 1) % len(loop)
        piece, along = loop[k], 0.0
    if not leaving and along <= same:  # the start of a piece is the end of the one before
        k = (k - 1) % len(loop)
        piece = loop[k]
        along = piece.length
    return piece, k, along


def _length(value: float, spec: PartSpec) -> str:
    return format_quantity(value, "length", spec.units)


def split_points(spec: PartSpec) -> list[Point]:
    """The end points of every picked stretch (holds and edge loads of every case) that lie inside a
    piece, where the mesh needs a node (mm)."""
    loops = boundary_loops(spec)
    size = max(outline_size(spec))
    same = SAME_POINT * size
    corners = [segment_points(p.segment)[0] for loop in loops for p in loop if p.segment is not None]
    out: list[Point] = []
    for pick in boundary_picks(spec):
        for end in stretch(spec, pick).ends:
            if all(math.dist(end, c) > same for c in corners + out):
                out.append(end)
    return out


def boundary_picks(spec: PartSpec) -> list[BoundaryPick]:
    """Every BoundaryPick of the part: its holds, then the edge loads of every load case."""
    picks = [h.where for h in spec.support.holds if h.where is not None]
    for case in spec.load_cases:
        picks += [e.where for e in case.load.edges]
    return picks


