"""Structured layered bands along curved raiser edges.

A band is a few layers of quadrilaterals (split into triangles) that follow the raiser edge: thin at the
edge, growing outwards. It is made of pieces, each a four-sided patch meshed transfinite:
  - an annular sector of at most a quarter turn outside a circular arc (holes, slot ends, notch roots,
    shoulder fillets),
  - a rectangle along a straight edge (the sides of a slot),
  - a quarter of the ring between an ellipse and a larger confocal ellipse (elliptical holes; the ring is
    thinnest at the sharp ends of the major axis, where the radius of curvature is smallest).
Arcs along the edge get an EVEN number of divisions, so every mesh level has the same pattern at the
piece corners (where the peak of a symmetric raiser sits); lines across the band are graded by the layer
thicknesses. gmsh's own boundary-layer field is not used: it is not deterministic.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import gmsh

from .raisers import Raiser
from .shapes import Arc, EllipseShape, Line, Point, split_arc


@dataclass(frozen=True)
class Piece:
    """One patch of a band. kind "arc": `arc` (counter-clockwise) and the layers outside it; "strip":
    `line` with unit `normal` into the material; "ellipse": `ellipse`, quadrant `quadrant` (parameter
    from quadrant * pi/2 to (quadrant + 1) * pi/2) and the confocal growth `depth` of the major axis."""

    kind: str
    thicknesses: tuple[float, ...]
    divisions: int
    arc: Arc | None = None
    line: Line | None = None
    normal: Point | None = None
    ellipse: EllipseShape | None = None
    quadrant: int = 0

    @property
    def depth(self) -> float:
        return float(sum(self.thicknesses))

    def inner_ends(self) -> tuple[Point, Point]:
        if self.kind == "arc":
            return self.arc.at(self.arc.ccw[0]), self.arc.at(self.arc.ccw[1])
        if self.kind == "strip":
            return self.line.start, self.line.end
        t0, t1 = 0.5 * math.pi * self.quadrant, 0.5 * math.pi * (self.quadrant + 1)
        return self.ellipse.point(t0), self.ellipse.point(t1)

    def outer_ends(self) -> tuple[Point, Point]:
        if self.kind == "arc":
            big = Arc(self.arc.center, self.arc.radius + self.depth, *self.arc.ccw)
            return big.at(big.start), big.at(big.end)
        if self.kind == "strip":
            d = self.depth
            shift = (d * self.normal[0], d * self.normal[1])
            return ((self.line.start[0] + shift[0], self.line.start[1] + shift[1]),
                    (self.line.end[0] + shift[0], self.line.end[1] + shift[1]))
        t0, t1 = 0.5 * math.pi * self.quadrant, 0.5 * math.pi * (self.quadrant + 1)
        return self.ellipse.point(t0, self.depth), self.ellipse.point(t1, self.depth)

    def on_inner(self, p: Point, tol: float) -> bool:
        """Whether p lies on this piece's raiser edge (strictly between its ends)."""
        if self.kind == "arc":
            dx, dy = p[0] - self.arc.center[0], p[1] - self.arc.center[1]
            if abs(math.hypot(dx, dy) - self.arc.radius) > tol:
                return False
            lo, hi = self.arc.ccw
            a = lo + (math.atan2(dy, dx) - lo) % (2.0 * math.pi)
            return a < hi
        if self.kind == "strip":
            (x0, y0), (x1, y1) = self.line.start, self.line.end
            length = math.hypot(x1 - x0, y1 - y0)
            along = ((p[0] - x0) * (x1 - x0) + (p[1] - y0) * (y1 - y0)) / length
            across = ((p[0] - x0) * self.normal[0] + (p[1] - y0) * self.normal[1])
            return abs(across) <= tol and 0.0 < along < length
        e = self.ellipse
        c, s = math.cos(e.angle), math.sin(e.angle)
        X = c * (p[0] - e.center[0]) + s * (p[1] - e.center[1])
        Y = -s * (p[0] - e.center[0]) + c * (p[1] - e.center[1])
        if abs(math.hypot(X / e.major, Y / e.minor) - 1.0) * e.minor > tol:
            return False
        t = math.atan2(Y / e.minor, X / e.major) % (2.0 * math.pi)
        return self.quadrant * 0.5 * math.pi < t < (self.quadrant + 1) * 0.5 * math.pi


def raiser_pieces(raiser: Raiser, edge_size: float, thicknesses: tuple[float, ...]) -> list[Piece]:
    """The band pieces of one raiser with the given layer thicknesses (mm) and edge element size (mm)."""
    def divisions(length: float) -> int:
        return 2 * max(1, math.ceil(length / edge_size))  # even: the same pattern at every level

    pieces = []
    if raiser.ellipse is not None:
        e = raiser.ellipse
        quarter = _quarter_length(e)
        pieces += [Piece("ellipse", thicknesses, divisions(quarter), ellipse=e, quadrant=k) for k in range(4)]
    for arc in raiser.arcs:
        for part in split_arc(Arc(arc.center, arc.radius, *arc.ccw)):
            pieces.append(Piece("arc", thicknesses, divisions(part.radius * part.span), arc=part))
    for line, normal in raiser.strips:
        length = math.dist(line.start, line.end)
        pieces.append(Piece("strip", thicknesses, divisions(length), line=line, normal=normal))
    return pieces


def _quarter_length(e: EllipseShape, n: int = 256) -> float:
    pts = [e.point(0.5 * math.pi * k / n) for k in range(n + 1)]
    return sum(math.dist(a, b) for a, b in zip(pts, pts[1:]))


def ellipse_layers(e: EllipseShape, thicknesses: list[float], room: float) -> list[float]:
    """Drop outer layers until the ring's widest part (across the minor axis) fits in `room` (mm)."""
    while thicknesses and e.confocal_minor(sum(thicknesses)) - e.minor > room:
        thicknesses.pop()
    return thicknesses


def add_tools(pieces: list[Piece], skip_line) -> list[tuple[int, int]]:
    """OCC curves that cut the bands out of the part: each piece's outer curve and its two lines across
    the band (shared lines once; lines for which skip_line(a, b) is true, e.g. lying on the outline, are
    left out)."""
    occ = gmsh.model.occ
    tools: list[tuple[int, int]] = []
    seen: set[tuple] = set()
    for piece in pieces:
        tools.append((1, _outer_curve(piece)))
        for a, b in zip(piece.inner_ends(), piece.outer_ends()):
            key = tuple(round(v, 9) for v in (*a, *b))
            if key in seen or skip_line(a, b):
                continue
            seen.add(key)
            tools.append((1, occ.addLine(occ.addPoint(a[0], a[1], 0.0), occ.addPoint(b[0], b[1], 0.0))))
    return tools


def _outer_curve(piece: Piece) -> int:
    occ = gmsh.model.occ
    if piece.kind == "arc":
        lo, hi = piece.arc.ccw
        cx, cy = piece.arc.center
        return occ.addCircle(cx, cy, 0.0, piece.arc.radius + piece.depth, angle1=lo, angle2=hi)
    a, b = piece.outer_ends()
    if piece.kind == "strip":
        return occ.addLine(occ.addPoint(a[0], a[1], 0.0), occ.addPoint(b[0], b[1], 0.0))
    e = piece.ellipse
    big, small = e.major + piece.depth, e.confocal_minor(piece.depth)
    t0, t1 = 0.5 * math.pi * piece.quadrant, 0.5 * math.pi * (piece.quadrant + 1)
    curve = occ.addEllipse(e.center[0], e.center[1], 0.0, big, small, angle1=t0, angle2=t1)
    occ.rotate([(1, curve)], e.center[0], e.center[1], 0.0, 0.0, 0.0, 1.0, e.angle)
    return curve


def make_transfinite(pieces: list[Piece], surfaces: list[tuple[int, int]], tol: float) -> int:
    """Mark each band piece's surface transfinite: curves along the raiser edge with the piece's
    divisions, curves across graded from the edge outwards. Returns the number of pieces found."""
    found = 0
    for _, tag in surfaces:
        curves = [abs(c) for _, c in gmsh.model.getBoundary([(2, tag)], oriented=False)]
        mids = {c: _midpoint(c) for c in curves}
        piece = next((p for p in pieces for c in curves if p.on_inner(mids[c], tol)), None)
        if piece is None:
            continue
        found += 1
        t = piece.thicknesses
        ratio = t[1] / t[0] if len(t) > 1 else 1.0
        for curve in curves:
            start, end = (gmsh.model.getValue(0, abs(p[1]), []) for p in gmsh.model.getBoundary([(1, curve)]))
            on0 = _near_edge(piece, start, tol)
            on1 = _near_edge(piece, end, tol)
            if on0 == on1:  # along the edge (the edge itself or the band's outer curve)
                gmsh.model.mesh.setTransfiniteCurve(curve, piece.divisions + 1)
            else:  # across the band, graded away from the raiser edge
                gmsh.model.mesh.setTransfiniteCurve(curve, len(t) + 1, "Progression", ratio if on0 else 1.0 / ratio)
        gmsh.model.mesh.setTransfiniteSurface(tag, "Alternate")
    return found


def _midpoint(curve: int) -> Point:
    lo, hi = gmsh.model.getParametrizationBounds(1, curve)
    x, y, _ = gmsh.model.getValue(1, curve, [0.5 * (lo[0] + hi[0])])
    return (x, y)


def _near_edge(piece: Piece, p, tol: float) -> bool:
    """Whether a curve end lies on the piece's raiser edge (its ends included)."""
    q = (p[0], p[1])
    if piece.on_inner(q, tol):
        return True
    return any(math.dist(q, end) <= tol for end in piece.inner_ends())
