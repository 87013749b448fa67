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

from .mesh import Feature, Mesh
from .spec import PartSpec
from .validate import hole_gaps, min_ligament


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
    band_share: the layered band takes at most this fraction of the raiser's thinnest ligament.
    """

    edge_fraction: float = 0.12
    ligament_share: float = 0.25
    growth: float = 0.3
    far_fraction: float = 0.15
    layer_first: float = 0.5
    layer_ratio: float = 1.2
    layers: int = 4
    band_share: float = 0.3


class MeshError(RuntimeError):
    """The mesher failed on a geometry that passed validation."""


@contextmanager
def _gmsh_session():
    gmsh.initialize(readConfigFiles=False)
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


def raiser_features(spec: PartSpec, scale: float = 1.0, sizing: Sizing = Sizing()) -> tuple[Feature, ...]:
    """The raisers to grade the mesh at, with their edge element size (mm) at this scale."""
    floor = min_ligament(spec) / 4.0
    features = []
    for n, hole in enumerate(spec.holes, start=1):
        ligament = min(hole_gaps(spec, n).values())
        size = scale * min(sizing.edge_fraction * hole.radius, sizing.ligament_share * ligament)
        features.append(Feature(name=f"hole {n}", radius=hole.radius, edge_size=max(size, floor)))
    return tuple(features)


@dataclass(frozen=True)
class Band:
    """Structured layers around a circular raiser edge: centre, inner radius, layer thicknesses (mm)
    and the number of arc divisions per quarter turn."""

    center: tuple[float, float]
    radius: float
    thicknesses: tuple[float, ...]
    divisions: int

    @property
    def depth(self) -> float:
        return float(sum(self.thicknesses))


def hole_bands(spec: PartSpec, features: tuple[Feature, ...], sizing: Sizing) -> list[Band | None]:
    """The layered band of each hole (None where the ligament leaves no room for two layers)."""
    bands: list[Band | None] = []
    for n, (hole, feature) in enumerate(zip(spec.holes, features), start=1):
        room = sizing.band_share * min(hole_gaps(spec, n).values())
        first = sizing.layer_first * feature.edge_size
        thick = [first * sizing.layer_ratio ** k for k in range(sizing.layers)]
        while thick and sum(thick) > room:
            thick.pop()
        divisions = 2 * max(1, math.ceil(0.25 * math.pi * hole.radius / feature.edge_size))  # even: same pattern at every level
        bands.append(Band(hole.center, hole.radius, tuple(thick), divisions) if len(thick) >= 2 else None)
    return bands


def mesh_part(spec: PartSpec, scale: float = 1.0, sizing: Sizing = Sizing()) -> Mesh:
    """Mesh the part; `scale` multiplies every raiser element size (scale 0.5 halves them)."""
    features = raiser_features(spec, scale, sizing)
    bands = hole_bands(spec, features, sizing)
    with _gmsh_session():
        boundary = _build(spec, bands)
        curves = _name_curves(spec, boundary)
        _size_field(spec, features, scale, sizing)
        try:
            gmsh.model.mesh.generate(2)
        except Exception as exc:  # gmsh raises a bare Exception carrying its log line
            raise MeshError(f"gmsh could not mesh the part: {exc}") from None
        nodes, triangles, edges = _extract(curves)
    if triangles.shape[0] == 0:
        raise MeshError("gmsh produced no triangles")
    return Mesh(nodes=nodes, triangles=triangles, edges=edges, features=features)


def _build(spec: PartSpec, bands: list[Band | None]) -> list[int]:
    """Create the OCC surfaces (the part split by the bands' arcs and radial lines); set the bands
    transfinite; return the tags of the curves on the part's outer boundary."""
    occ = gmsh.model.occ
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    plate = occ.addRectangle(-half_l, -half_w, 0.0, spec.plate.length, spec.plate.width)
    disks = [(2, occ.addDisk(h.center[0], h.center[1], 0.0, h.radius, h.radius)) for h in spec.holes]
    part = occ.cut([(2, plate)], disks)[0] if disks else [(2, plate)]
    tools = []
    for band in bands:
        if band is None:
            continue
        cx, cy = band.center
        outer = band.radius + band.depth
        tools.append((1, occ.addCircle(cx, cy, 0.0, outer)))
        for k in range(4):
            c, s = math.cos(0.5 * math.pi * k), math.sin(0.5 * math.pi * k)
            a = occ.addPoint(cx + band.radius * c, cy + band.radius * s, 0.0)
            b = occ.addPoint(cx + outer * c, cy + outer * s, 0.0)
            tools.append((1, occ.addLine(a, b)))
    if tools:
        occ.fragment(part, tools)
    occ.synchronize()
    surfaces = gmsh.model.getEntities(2)
    _check_one_piece(surfaces, bands)
    for band in bands:
        if band is not None:
            _make_transfinite(band, surfaces)
    return [abs(t) for _, t in gmsh.model.getBoundary(surfaces, combined=True, oriented=False)]


def _check_one_piece(surfaces: list[tuple[int, int]], bands: list[Band | None]) -> None:
    expected = 1 + 4 * sum(b is not None for b in bands)
    if len(surfaces) != expected:
        raise MeshError(f"the part split into {len(surfaces) - 4 * sum(b is not None for b in bands)} pieces; "
                        "features must leave it in one piece")


def _make_transfinite(band: Band, surfaces: list[tuple[int, int]]) -> None:
    """Quarter-annulus surfaces of the band: arcs with `divisions` segments, radial lines graded by
    the band's layer thicknesses (thin at the raiser edge), triangles in alternating diagonals."""
    cx, cy = band.center
    ratio = band.thicknesses[1] / band.thicknesses[0] if len(band.thicknesses) > 1 else 1.0
    reach = (band.radius + band.depth) * (1 + 1e-6)
    for _, tag in surfaces:
        x0, y0, _, x1, y1, _ = gmsh.model.getBoundingBox(2, tag)
        if max(abs(x0 - cx), abs(x1 - cx), abs(y0 - cy), abs(y1 - cy)) > reach:
            continue
        for _, curve in gmsh.model.getBoundary([(2, tag)], oriented=False):
            start, end = (gmsh.model.getValue(0, abs(p[1]), []) for p in gmsh.model.getBoundary([(1, curve)]))
            r0, r1 = math.hypot(start[0] - cx, start[1] - cy), math.hypot(end[0] - cx, end[1] - cy)
            if abs(r1 - r0) < 1e-9 * band.radius:  # an arc
                gmsh.model.mesh.setTransfiniteCurve(abs(curve), band.divisions + 1)
            else:  # a radial line, graded away from the raiser edge
                coef = ratio if r1 > r0 else 1.0 / ratio
                gmsh.model.mesh.setTransfiniteCurve(abs(curve), len(band.thicknesses) + 1, "Progression", coef)
        gmsh.model.mesh.setTransfiniteSurface(tag, "Alternate")


def _name_curves(spec: PartSpec, tags: list[int]) -> dict[str, list[int]]:
    """Group outer-boundary curves by what they lie on, tested at the curve's parametric midpoint."""
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    tol = 1e-6 * max(spec.plate.length, spec.plate.width)
    named: dict[str, list[int]] = {}
    for tag in tags:
        lo, hi = gmsh.model.getParametrizationBounds(1, tag)
        x, y, _ = gmsh.model.getValue(1, tag, [0.5 * (lo[0] + hi[0])])
        if abs(x + half_l) < tol:
            name = "held"
        elif abs(x - half_l) < tol:
            name = "loaded"
        elif abs(abs(y) - half_w) < tol:
            name = "side"
        else:
            name = _hole_name(spec, x, y)
        named.setdefault(name, []).append(tag)
    return named


def _hole_name(spec: PartSpec, x: float, y: float) -> str:
    for n, hole in enumerate(spec.holes, start=1):
        if abs(math.hypot(x - hole.center[0], y - hole.center[1]) - hole.radius) < 1e-6 * hole.radius + 1e-9:
            return f"hole {n}"
    raise MeshError(f"a boundary curve through ({x:g}, {y:g}) matches no feature")


def _size_field(spec: PartSpec, features: tuple[Feature, ...], scale: float, sizing: Sizing) -> None:
    """Element size grows linearly with distance from each raiser edge, capped far away.

    The far-field cap does not follow `scale`: the far field carries a near-uniform stress that linear
    triangles represent exactly, so refining it costs time and buys nothing.
    """
    field = gmsh.model.mesh.field
    far = sizing.far_fraction * spec.plate.width
    graded = []
    for feature, distance in zip(features, _distance_expressions(spec)):
        grade = field.add("MathEval")
        field.setString(grade, "F", f"{feature.edge_size!r} + {scale * sizing.growth!r} * {distance}")
        graded.append(grade)
    cap = field.add("MathEval")
    field.setString(cap, "F", repr(far))
    smallest = field.add("Min")
    field.setNumbers(smallest, "FieldsList", graded + [cap])
    field.setAsBackgroundMesh(smallest)


def _distance_expressions(spec: PartSpec) -> list[str]:
    """Exact distance to each raiser edge as a gmsh MathEval expression in x, y (far cheaper to
    evaluate than a sampled Distance field). Numbers are parenthesised: the parser rejects "x - -1"."""
    return [f"Fabs(Sqrt((x - ({h.center[0]!r}))^2 + (y - ({h.center[1]!r}))^2) - ({h.radius!r}))" for h in spec.holes]


def _extract(curves: dict[str, list[int]]) -> tuple[np.ndarray, np.ndarray, dict[str, np.ndarray]]:
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
