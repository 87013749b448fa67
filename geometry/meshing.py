"""Build the part in gmsh's OpenCASCADE kernel and mesh it with graded linear triangles.

Around every curved raiser edge the mesh has a band of structured layers (concentric arcs joined by
radial lines, meshed transfinite): regular triangles along the edge make the recovered peak converge
smoothly, which Richardson extrapolation needs, and the band is the same every run. Outside the bands
the Frontal-Delaunay mesher fills the part under a size field that grows linearly with the distance
from each raiser edge.

gmsh is a global C library: `mesh_part` initialises and finalises it inside one call, so nothing leaks
between calls and the result is plain arrays.
"""

from __future__ import annotations

import math
from contextlib import contextmanager
from dataclasses import dataclass

import gmsh
import numpy as np

from shapely.geometry import Point

from .far_field import FarGrading, across_cut, far_cuts, grown_size_expression
from .bands import Piece, add_tools, ellipse_layers, make_transfinite, raiser_pieces
from .boundary import split_points
from .mesh import EdgeName, Feature, Mesh
from .quadratic import QUADRATIC_SIZE, elevate_and_extract, sub_edges, sub_triangles
from .mesh_guard import check_finite, check_mesh, checked_expression
from .outline import feature_edges, plate_polygon
from .raisers import Raiser, distance_expression, part_raisers
from .registry import kind_of, named, outline_of, outline_size, raiser_ids
from .shapes import EllipseShape, Line, Loop, full_circle, segment_points, split_arc
from .spec import PartSpec
from .sharp_corners import sharp_corners
from .symmetry import modelled_box, on_plane
from .validate import min_ligament

ON_OUTLINE = 1e-7  # fraction of the width within which a band line lies along the outline
PIECE_TOLERANCE = 1e-7  # fraction of the part's size within which a point lies on a raiser edge
FEATURE_TOLERANCE = 1e-4  # fraction of the width within which a curve lies on a raiser's edge


@dataclass(frozen=True)
class Sizing:
    """How the element size is graded (all dimensionless).

    edge_fraction: element size along a raiser edge as a fraction of its radius of curvature.
    ligament_share: at most this fraction of the raiser's thinnest ligament.
    growth: increase of element size per unit distance from the raiser edge (at scale 1).
    far_fraction: largest element size as a fraction of the plate width.
    layer_first: thickness of the first structured layer as a fraction of the edge size.
    layer_ratio: thickness ratio of successive layers.
    layers: number of structured layers (fewer where the ligament is thin).
        Eight layers growing by 1.15 (a band about seven edge sizes deep) keep the Delaunay mesh's noise
        away from the peak: the differences between successive level peaks then shrink steadily (measured
        on a hole, a semicircular and a U notch pair and a shoulder fillet, benchmarks/feature_families.py),
        which Richardson extrapolation needs; four layers growing by 1.2 left them irregular.
    band_share: the layered band takes at most this fraction of the raiser's thinnest ligament.
    bending_far_fraction: under bending, shear or a pin load, the far-field size at scale 1 as a fraction
        of the plate width; it follows `scale` (see `far_size`).
    far_grading: how the size grows along the far zones of a long plate (geometry/far_field.py).
    """

    edge_fraction: float = 0.12
    ligament_share: float = 0.25
    growth: float = 0.3
    far_fraction: float = 0.15
    layer_first: float = 0.5
    layer_ratio: float = 1.15
    layers: int = 8
    band_share: float = 0.3
    bending_far_fraction: float = 0.1
    far_grading: FarGrading = FarGrading()
    corner_fraction: float = 0.25  # element size at a sharp inside corner as a fraction of its zone's radius


from .errors import MeshError  # noqa: E402  (defined with PartError; kept importable from here)


@contextmanager
def _gmsh_session():
    # interruptible=False: gmsh would otherwise install a SIGINT handler, which fails outside the main
    # thread (a Dask worker runs checks in a thread) and turns Ctrl-C into an abrupt kill.
    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 0)
        gmsh.option.setNumber("General.NumThreads", 1)
        gmsh.option.setNumber("Mesh.Algorithm", 6)  # Frontal-Delaunay
        gmsh.option.setNumber("Mesh.MeshSizeFromPoints", 0)
        gmsh.option.setNumber("Mesh.MeshSizeFromCurvature", 0)
        gmsh.option.setNumber("Mesh.MeshSizeExtendFromBoundary", 0)
        yield
    finally:
        gmsh.finalize()


def raiser_features(spec: PartSpec, scale: float = 1.0, sizing: Sizing = Sizing(),
                    raisers: list[Raiser] | None = None) -> tuple[Feature, ...]:
    """The raisers to grade the mesh at, with their edge element size (mm) at this scale: a fraction of
    each raiser's own smallest radius of curvature, at most a share of its thinnest ligament."""
    # The floor shrinks with the level like every other size: a fixed floor stalls the refinement of a
    # small raiser, and the unchanged peak then reads as converged (a 0.5 mm hole in an 80 mm strap
    # gave Kt 2.71 'converged' instead of about 3).
    raisers = part_raisers(spec) if raisers is None else raisers
    scales = raiser_scales(spec, raisers, scale)
    return tuple(Feature(name=r.id, radius=r.curvature,
                         edge_size=max(s * min(sizing.edge_fraction * r.curvature, sizing.ligament_share * r.ligament),
                                       s * min_ligament(spec) / 4.0))
                 for r, s in zip(raisers, scales))


def raiser_scales(spec: PartSpec, raisers: list[Raiser], scale: float) -> list[float]:
    """Each raiser's own scale: the level's, or the coarser one a settled raiser keeps (MeshControls.settled:
    the study stops refining a raiser that cannot govern, fem.convergence)."""
    settled = dict(spec.mesh.settled)
    return [settled.get(r.id, scale) for r in raisers]


def band_pieces(raisers: list[Raiser], features: tuple[Feature, ...], sizing: Sizing) -> list[Piece]:
    """The layered band pieces of every raiser (none where the ligament leaves no room for two layers)."""
    pieces: list[Piece] = []
    for raiser, feature in zip(raisers, features):
        room = sizing.band_share * raiser.ligament
        first = sizing.layer_first * feature.edge_size
        thick = [first * sizing.layer_ratio ** k for k in range(sizing.layers)]
        while thick and sum(thick) > room:
            thick.pop()
        if raiser.ellipse is not None:
            thick = ellipse_layers(raiser.ellipse, thick, room)
        if len(thick) >= 2:
            pieces += raiser_pieces(raiser, feature.edge_size, tuple(thick))
    return pieces


def mesh_part(spec: PartSpec, scale: float = 1.0, sizing: Sizing = Sizing()) -> Mesh:
    """Mesh the part; `scale` multiplies every raiser element size (scale 0.5 halves them). Quadratic
    triangles (spec.mesh.order 2) are QUADRATIC_SIZE times larger than linear ones at the same scale."""
    check_finite(spec)
    if spec.mesh.order == 2:
        scale *= QUADRATIC_SIZE
    raisers = part_raisers(spec)
    features = raiser_features(spec, scale, sizing, raisers)
    pieces = band_pieces(raisers, features, sizing)
    with _gmsh_session():
        try:
            boundary = _build(spec, pieces, far_cuts(spec, sizing.far_grading))
            curves = _name_curves(spec, boundary)
            _size_field(spec, raisers, features, scale, sizing)
            gmsh.model.mesh.generate(2)
            if spec.mesh.order == 2:  # quadratic triangles, curved on the arcs (geometry/quadratic.py)
                nodes, tri6, edges6 = elevate_and_extract(curves)
            else:
                nodes, triangles, edges = _extract(curves)
        except Exception as exc:
            if type(exc) is not Exception:  # ours (MeshError) or a bug: not a gmsh failure
                raise
            # gmsh raises a bare Exception carrying its last log line, from any call
            raise MeshError(f"gmsh could not mesh the part: {exc}") from None
    if spec.mesh.order == 2:
        mesh = Mesh(nodes=nodes, triangles=sub_triangles(tri6), edges={k: sub_edges(v) for k, v in edges6.items()},
                    features=features, quadratic=tri6, quadratic_edges=edges6)
    else:
        mesh = Mesh(nodes=nodes, triangles=triangles, edges=edges, features=features)
    check_mesh(spec, mesh)
    return mesh


def _build(spec: PartSpec, pieces: list[Piece], cuts: tuple[float, ...] = ()) -> list[int]:
    """Create the OCC surfaces (the outline less the cut-outs, split by the bands' curves and by lines
    across the far zones of a long plate at x = each of `cuts`); set the band pieces transfinite; return
    the tags of the curves on the part's boundary."""
    occ = gmsh.model.occ
    plate = _wire_surface([e.segment for e in outline_of(spec).path(spec)])
    part = occ.cut([(2, plate)], _cutouts(spec))[0] if spec.raisers else [(2, plate)]
    part = _split_boundary(spec, part)
    outline = plate_polygon(spec).boundary
    length, width = outline_size(spec)
    on_outline = ON_OUTLINE * width

    def skip(a, b) -> bool:  # a line across a band that lies along the outline is the outline itself
        return outline.distance(Point(0.5 * (a[0] + b[0]), 0.5 * (a[1] + b[1]))) <= on_outline

    tools = add_tools(pieces, skip) + [(1, _line(*across_cut(spec, x))) for x in cuts]
    if tools:
        part = [d for d in occ.fragment(part, tools)[0] if d[0] == 2]
    if spec.support.symmetry:  # keep the positive side of each symmetry plane
        x0, y0, x1, y1 = modelled_box(spec)
        occ.intersect(part, [(2, occ.addRectangle(x0, y0, 0.0, x1 - x0, y1 - y0))])
    occ.synchronize()
    surfaces = gmsh.model.getEntities(2)
    found = make_transfinite(pieces, surfaces, PIECE_TOLERANCE * max(length, width))
    if len(surfaces) != 1 + found + len(cuts):
        raise MeshError(f"the part split into {len(surfaces) - found - len(cuts)} pieces; features must leave it in one piece")
    return [abs(t) for _, t in gmsh.model.getBoundary(surfaces, combined=True, oriented=False)]


def _line(a: tuple[float, float], b: tuple[float, float]) -> int:
    """An OCC line from a to b (mm)."""
    occ = gmsh.model.occ
    return occ.addLine(occ.addPoint(a[0], a[1], 0.0), occ.addPoint(b[0], b[1], 0.0))


def _split_boundary(spec: PartSpec, part: list[tuple[int, int]]) -> list[tuple[int, int]]:
    """The part with a vertex added on its boundary at every end of a held or loaded stretch that lies
    inside a line or arc (geometry.boundary.split_points), so that the stretch ends at a mesh node."""
    x0, y0, x1, y1 = modelled_box(spec)
    tol = PIECE_TOLERANCE * max(outline_size(spec))
    points = [p for p in split_points(spec) if x0 - tol <= p[0] <= x1 + tol and y0 - tol <= p[1] <= y1 + tol]
    if not points:
        return part
    occ = gmsh.model.occ
    tags = [(0, occ.addPoint(p[0], p[1], 0.0)) for p in points]
    return [d for d in occ.fragment(part, tags)[0] if d[0] == 2]


def _cutouts(spec: PartSpec) -> list[tuple[int, int]]:
    """OCC surfaces of every raiser's cut-out loops."""
    return [(2, _loop_surface(loop)) for _, item in named(spec) for loop in kind_of(item).loops(spec, item)]


def _loop_surface(loop: Loop) -> int:
    """A plane OCC surface bounded by a closed loop: a disk for a circle or an ellipse (one closed curve,
    as OCC builds them), else the chain of lines and arcs."""
    occ = gmsh.model.occ
    circle = full_circle(loop)
    if circle is not None:
        return occ.addDisk(circle.center[0], circle.center[1], 0.0, circle.radius, circle.radius)
    if isinstance(loop, EllipseShape):
        disk = occ.addDisk(loop.center[0], loop.center[1], 0.0, loop.major, loop.minor)
        occ.rotate([(2, disk)], loop.center[0], loop.center[1], 0.0, 0.0, 0.0, 1.0, loop.angle)
        return disk
    return _wire_surface(loop)


def _wire_surface(segments) -> int:
    """A plane OCC surface bounded by a closed chain of lines and arcs. An arc of half a turn or more (a
    drawn outline's rounded end) is built in quarter turns: three points do not fix which way it goes."""
    occ = gmsh.model.occ
    points: dict[tuple[float, float], int] = {}

    def point(p) -> int:
        key = (round(p[0], 9), round(p[1], 9))
        if key not in points:
            points[key] = occ.addPoint(p[0], p[1], 0.0)
        return points[key]

    curves = []
    for seg in segments:
        a, b = segment_points(seg)
        if isinstance(seg, Line):
            curves.append(occ.addLine(point(a), point(b)))
        else:
            centre = occ.addPoint(seg.center[0], seg.center[1], 0.0)
            for part in split_arc(seg) if seg.span >= math.pi - 1e-9 else (seg,):
                curves.append(occ.addCircleArc(point(part.first), centre, point(part.last)))
    return occ.addPlaneSurface([occ.addCurveLoop(curves)])


def _name_curves(spec: PartSpec, tags: list[int]) -> dict[EdgeName, list[int]]:
    """Group boundary curves by what they lie on, tested at the curve's parametric midpoint: the held
    and loaded ends, sides, a lug's rounded end, a step's shoulder faces and fillets, a symmetry plane,
    or the raiser whose edge it is (by its RaiserId). Every name but "held" and "loaded" is a traction-free
    edge."""
    length, width = outline_size(spec)
    size = max(length, width)
    path = outline_of(spec).path(spec)
    features = feature_edges(spec)
    names: dict[EdgeName, list[int]] = {}
    for tag in tags:
        lo, hi = gmsh.model.getParametrizationBounds(1, tag)
        x, y, _ = gmsh.model.getValue(1, tag, [0.5 * (lo[0] + hi[0])])
        name = on_plane(spec, x, y)
        if name is None:
            name = next((e.name for e in path if _segment_distance(e.segment, (x, y)) <= 1e-6 * size), None)
        if name is None:
            point = Point(x, y)
            gaps = {k: g.distance(point) for k, g in features.items()}
            nearest = min(gaps, key=gaps.get) if gaps else None
            if nearest is None or gaps[nearest] > FEATURE_TOLERANCE * width:
                raise MeshError(f"a boundary curve through ({x:g}, {y:g}) matches no feature")
            name = nearest
        names.setdefault(name, []).append(tag)
    return names


def _segment_distance(seg, p) -> float:
    """Exact distance (mm) from point p to a line segment or circular arc."""
    if isinstance(seg, Line):
        (x0, y0), (x1, y1) = seg.start, seg.end
        dx, dy = x1 - x0, y1 - y0
        t = min(1.0, max(0.0, ((p[0] - x0) * dx + (p[1] - y0) * dy) / (dx * dx + dy * dy)))
        return math.hypot(p[0] - x0 - t * dx, p[1] - y0 - t * dy)
    lo, hi = seg.ccw
    a = lo + (math.atan2(p[1] - seg.center[1], p[0] - seg.center[0]) - lo) % (2.0 * math.pi)
    if a <= hi:
        return abs(math.dist(p, seg.center) - seg.radius)
    return min(math.dist(p, seg.first), math.dist(p, seg.last))


def _size_field(spec: PartSpec, raisers: list[Raiser], features: tuple[Feature, ...], scale: float,
                sizing: Sizing) -> None:
    """Element size grows linearly with distance from each raiser edge, capped far away.

    The far-field cap is `far_size`, growing along the far zones of a long plate (geometry/far_field.py).
    Distances are exact MathEval expressions (far cheaper to evaluate
    than a sampled Distance field).
    """
    field = gmsh.model.mesh.field
    far = far_size(spec, scale, sizing)
    graded = []
    for raiser, feature, own in zip(raisers, features, raiser_scales(spec, raisers, scale)):
        grade = field.add("MathEval")
        field.setString(grade, "F", checked_expression(
            f"{feature.edge_size!r} + {own * sizing.growth!r} * {distance_expression(raiser)}"))
        graded.append(grade)
    for corner in sharp_corners(spec):  # graded like a raiser, so the corner's growing peak shows on every level
        grade = field.add("MathEval")
        (cx, cy), size = corner.point, scale * sizing.corner_fraction * corner.zone
        field.setString(grade, "F", checked_expression(
            f"{size!r} + {scale * sizing.growth!r} * Sqrt((x - ({cx!r}))^2 + (y - ({cy!r}))^2)"))
        graded.append(grade)
    cap = field.add("MathEval")
    field.setString(cap, "F", checked_expression(grown_size_expression(spec, far, sizing.far_grading)))
    smallest = field.add("Min")
    field.setNumbers(smallest, "FieldsList", graded + [cap])
    field.setAsBackgroundMesh(smallest)


def far_size(spec: PartSpec, scale: float, sizing: Sizing = Sizing()) -> float:
    """Largest element size (mm). Under axial or remote loads the far field carries a near-uniform stress
    that linear triangles represent exactly, so the cap does not follow `scale`: refining it buys
    nothing. Under bending or shear (or a pin pulling across the part, or loads and supports on the
    boundary, which spread through the part as they will) the far-field stress varies across the width,
    which constant-strain triangles only approximate, so the cap is finer and shrinks with `scale`. With
    several load cases the mesh (one for all) is the finest any case needs. A part with no raiser at all
    has nothing else to refine (its peak is where a support or a load puts it), so there the cap always
    follows `scale`."""
    width = outline_size(spec)[1]
    if spec.support.holds or not raiser_ids(spec) \
            or not all(_uniform_far_field(case.load) for case in spec.load_cases):
        return min(sizing.far_fraction, sizing.bending_far_fraction * scale) * width
    return sizing.far_fraction * width


def _uniform_far_field(load) -> bool:
    """Whether a load leaves a near-uniform stress away from the raisers: axial, remote, or a pin along x."""
    pin = load.pin
    across = pin is not None and abs(math.sin(math.radians(pin.direction))) > 1e-9
    return load.kind in ("axial", "remote") or (load.kind == "pin" and not across)


def _extract(curves: dict[EdgeName, list[int]]) -> tuple[np.ndarray, np.ndarray, dict[EdgeName, np.ndarray]]:
    tags, coords, _ = gmsh.model.mesh.getNodes()
    index = np.full(int(tags.max()) + 1, -1, dtype=np.int64)
    index[tags.astype(np.int64)] = np.arange(tags.size)
    nodes = coords.reshape(-1, 3)[:, :2].copy()
    types, _, elem_nodes = gmsh.model.mesh.getElements(2)
    if any(t != 2 for t in types):
        raise MeshError(f"gmsh produced element types {list(types)}; only 3-node triangles are expected")
    triangles = index[np.concatenate(elem_nodes).astype(np.int64)].reshape(-1, 3).astype(np.int32)
    edges = {}
    for name, tags_ in curves.items():
        pairs = [gmsh.model.mesh.getElements(1, t)[2] for t in tags_]
        flat = np.concatenate([p[0] for p in pairs if len(p)])
        edges[name] = index[flat.astype(np.int64)].reshape(-1, 2).astype(np.int32)
    used = np.unique(triangles)
    if used.size != nodes.shape[0]:
        nodes, triangles, edges = _drop_unused(nodes, triangles, edges, used)
    return nodes, _counter_clockwise(nodes, triangles), edges


def _drop_unused(nodes, triangles, edges, used):
    """Remove nodes no triangle uses (geometry points gmsh keeps) and renumber."""
    renumber = np.full(nodes.shape[0], -1, dtype=np.int64)
    renumber[used] = np.arange(used.size)
    return (nodes[used], renumber[triangles].astype(np.int32),
            {k: renumber[v].astype(np.int32) for k, v in edges.items()})


def _counter_clockwise(nodes: np.ndarray, tris: np.ndarray) -> np.ndarray:
    p = nodes[tris]
    area2 = (p[:, 1, 0] - p[:, 0, 0]) * (p[:, 2, 1] - p[:, 0, 1]) - (p[:, 2, 0] - p[:, 0, 0]) * (p[:, 1, 1] - p[:, 0, 1])
    out = tris.copy()
    flip = area2 < 0
    out[flip] = out[flip][:, [0, 2, 1]]
    return out
