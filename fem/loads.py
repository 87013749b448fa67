"""The loads a part file applies, as tractions on named boundaries, and their consistent nodal forces.

`applied_loads(spec)` describes every traction on the FULL part (its exact boundary curves and a
traction function), whatever symmetry planes the model uses: the mesh takes the share on the edges it
has, and the method of sections integrates the same descriptions exactly for statics.

Sign conventions (mm, N, MPa): tractions are forces per area on the part's boundary, positive along +x /
+y. End loads act on the loaded end x = +L/2 (area A = W t, I = t W^3 / 12):
  axial P:   t_x = P / A
  bending M: t_x = M y / I (positive M stretches the +y edge)
  shear V:   t_y = 3 V / (2 A) (1 - 4 y^2 / W^2) (parabolic, the elasticity solution's end shear)
With the held end held in x only, the transverse force of the loads is reacted at the held end by the
same parabolic traction (the rollers cannot carry it). A remote state (sx, sy, txy) loads every outer
edge with s.n. A pin presses on the half of its hole facing its direction phi with the cosine pressure
p = p0 cos(a - phi), p0 = 4 P / (pi d t), pushing the material radially away from the hole centre. A rigid
pin (load.pin.contact = "rigid") applies no traction known beforehand: its contact forces come out of the
solve (fem/contact.py), so it is not among the applied loads here.

Loads on stretches of the boundary ([[load.edge]], geometry.boundary): a force F in the direction phi
spread uniformly over the stretch's length L, t = F / (L t) (cos phi, sin phi); a pressure p normal to the
edge, t = -p n with n the outward normal (positive p presses into the material). Each piece of the
stretch is one BoundaryLoad on the mesh edges that lie on it (fem/stretches.py). With the held end held in
x only, their transverse resultant is reacted at the held end like a shear's.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from ..geometry.boundary import outward_normals, stretch
from ..geometry.kinds.bar import end_half_width, straight_held_end
from ..geometry.kinds.hole import named as named_hole
from ..geometry.mesh import EdgeName, Mesh
from ..geometry.registry import outline_size
from ..geometry.shapes import Arc as GeometryArc, Line
from ..geometry.spec import NO_HELD_END, PartSpec
from ..geometry.symmetry import mirror_hole, modelled_box
from .quadratic import quadratic_edge_forces
from .stretches import segment_edges

Traction = Callable[[np.ndarray], np.ndarray]  # (k, 2) points in mm -> (k, 2) traction in MPa

GAUSS_POINTS = 3  # per mesh edge: exact for tractions up to quadratic along the edge
SAMPLES_PER_CURVE = 20_000  # midpoint-rule samples per curve when integrating a load exactly


@dataclass(frozen=True)
class Segment:
    """A straight boundary piece from a to b (mm)."""

    a: tuple[float, float]
    b: tuple[float, float]

    def samples(self, n: int) -> tuple[np.ndarray, np.ndarray]:
        """Midpoints of n equal pieces (n, 2) and their lengths (n,) in mm."""
        s = (np.arange(n) + 0.5) / n
        a, b = np.asarray(self.a), np.asarray(self.b)
        return a + s[:, None] * (b - a), np.full(n, math.dist(self.a, self.b) / n)


@dataclass(frozen=True)
class Arc:
    """A circular boundary piece: centre, radius (mm), from angle start to stop (radians, counter-clockwise)."""

    center: tuple[float, float]
    radius: float
    start: float
    stop: float

    def samples(self, n: int) -> tuple[np.ndarray, np.ndarray]:
        a = self.start + (np.arange(n) + 0.5) / n * (self.stop - self.start)
        points = np.column_stack([self.center[0] + self.radius * np.cos(a), self.center[1] + self.radius * np.sin(a)])
        return points, np.full(n, self.radius * abs(self.stop - self.start) / n)


@dataclass(frozen=True)
class BoundaryLoad:
    """A traction on the named boundary `edge` of the full part over the exact `curves`; `what` says what
    it is, for reports."""

    edge: EdgeName
    curves: tuple[Segment | Arc, ...]
    traction: Traction
    what: str
    piece: Line | GeometryArc | None = None  # a stretch's piece (geometry.boundary): the load acts on the mesh
                                             # edges on it; None: on every edge of the named set `edge`
    pressure: float = 0.0  # MPa, for a normal pressure (the exact edge state under it: fem.analysis)


def applied_loads(spec: PartSpec) -> tuple[BoundaryLoad, ...]:
    """Every traction the part file applies to the full part (see the module docstring)."""
    load = spec.load
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    half_loaded, half_held = end_half_width(spec, "loaded"), end_half_width(spec, "held")  # a step narrows an end
    loaded = (Segment((half_l, -half_loaded), (half_l, half_loaded)),)
    held = (Segment((-half_l, half_held), (-half_l, -half_held)),)
    out: list[BoundaryLoad] = []
    if load.remote is not None:
        sx, sy, txy = load.remote.sx, load.remote.sy, load.remote.txy
        sides = (Segment((-half_l, -half_w), (half_l, -half_w)), Segment((half_l, half_w), (-half_l, half_w)))
        out += [
            BoundaryLoad("loaded", loaded, _constant(sx, txy), "remote stress on the end x = +L/2"),
            BoundaryLoad("held", held, _constant(-sx, -txy), "remote stress on the end x = -L/2"),
            BoundaryLoad("side", sides, lambda p: np.sign(p[:, 1])[:, None] * np.array([txy, sy]),
                         "remote stress on the sides"),
        ]
        return tuple(out)
    end = _end_traction(spec)
    if load.has_end_loads:
        out.append(BoundaryLoad("loaded", loaded, end, "end loads on the loaded end"))
        if "x" in spec.support.symmetry:  # the mirror image loads the other end
            out.append(BoundaryLoad("held", held, lambda p: end(p * [-1.0, 1.0]) * [-1.0, 1.0],
                                    "mirrored end loads on the end x = -L/2"))
    if load.pin is not None and load.pin.contact == "cosine":
        out += _pin_loads(spec)
    edges = edge_loads(spec)
    out += edges
    transverse = load.shear + (load.pin.force * math.sin(load.pin.angle) if load.pin is not None else 0.0)
    transverse += sum(load_resultant(bl, spec.plate.thickness)[1] for bl in edges)
    if transverse != 0.0 and spec.support.held == "x" and "x" not in spec.support.symmetry and straight_held_end(spec):
        out.append(BoundaryLoad("held", held, _parabolic(-transverse, spec, "held"), "transverse reaction on the held end"))
    return tuple(out)


def edge_loads(spec: PartSpec) -> list[BoundaryLoad]:
    """The [[load.edge]] loads of spec.load: one BoundaryLoad per piece of each load's stretch."""
    out = []
    thickness = spec.plate.thickness
    for edge in spec.load.edges:
        picked = stretch(spec, edge.where)
        if edge.pressure != 0.0:
            for seg, name in zip(picked.pieces, picked.names):
                out.append(BoundaryLoad(name, (_curve(seg),), _pressure(seg, edge.pressure),
                                        f"pressure of {edge.where.key} on {name}", seg, edge.pressure))
            continue
        angle = math.radians(edge.direction)
        stress = edge.force / (picked.length * thickness)
        traction = _constant(stress * math.cos(angle), stress * math.sin(angle))
        out += [BoundaryLoad(name, (_curve(seg),), traction, f"force of {edge.where.key} on {name}", seg)
                for seg, name in zip(picked.pieces, picked.names)]
    return out


def _curve(seg: Line | GeometryArc) -> Segment | Arc:
    """The exact curve of a stretch's piece, for integration."""
    if isinstance(seg, Line):
        return Segment(seg.start, seg.end)
    return Arc(seg.center, seg.radius, seg.start, seg.end)


def _pressure(seg: Line | GeometryArc, pressure: float) -> Traction:
    """t = -p n on a piece traversed with the material on the left (n its outward normal)."""
    return lambda p: -pressure * outward_normals(seg, p)


def _constant(tx: float, ty: float) -> Traction:
    return lambda p: np.tile([tx, ty], (len(p), 1))


def _parabolic(force: float, spec: PartSpec, end: str = "loaded") -> Traction:
    """t_y = 3 V / (2 W t) (1 - 4 y^2 / W^2) over the end of width W (y from -W/2 to W/2)."""
    W, t = 2.0 * end_half_width(spec, end), spec.plate.thickness
    return lambda p: np.column_stack([np.zeros(len(p)), 1.5 * force / (W * t) * (1.0 - 4.0 * p[:, 1] ** 2 / W ** 2)])


def _end_traction(spec: PartSpec) -> Traction:
    """Axial, bending and shear tractions on the loaded end x = +L/2 (its own width W)."""
    W, t = 2.0 * end_half_width(spec, "loaded"), spec.plate.thickness
    area, inertia = W * t, t * W ** 3 / 12.0
    P, M = spec.load.axial, spec.load.bending
    shear = _parabolic(spec.load.shear, spec)
    return lambda p: np.column_stack([P / area + M * p[:, 1] / inertia, np.zeros(len(p))]) + shear(p)


def pin_bearing_loads(spec: PartSpec) -> tuple[BoundaryLoad, ...]:
    """The cosine bearing pressure of the part's pin (and its mirror image), whatever its contact model:
    the load level a pin of that force sets (compare.statics.reference_stress); empty without a pin."""
    return tuple(_pin_loads(spec)) if spec.load.pin is not None else ()


def _pin_loads(spec: PartSpec) -> list[BoundaryLoad]:
    pin = spec.load.pin
    loads = [_pin_pressure(spec, pin.hole, pin.force, pin.angle, "pin bearing")]
    if "x" in spec.support.symmetry:
        mirror = mirror_hole(spec, pin.hole, "x")
        loads.append(_pin_pressure(spec, mirror, pin.force, math.pi - pin.angle, "mirrored pin bearing"))
    return loads


def _pin_pressure(spec: PartSpec, hole_number: int, force: float, angle: float, what: str) -> BoundaryLoad:
    hole = spec.holes[hole_number - 1]
    (cx, cy), r = hole.center, hole.radius
    p0 = pin_peak_pressure(force, hole.diameter, spec.plate.thickness)

    def traction(p: np.ndarray) -> np.ndarray:
        a = np.arctan2(p[:, 1] - cy, p[:, 0] - cx)
        return (p0 * np.clip(np.cos(a - angle), 0.0, None))[:, None] * np.column_stack([np.cos(a), np.sin(a)])

    return BoundaryLoad(named_hole(hole_number), (Arc((cx, cy), r, angle - 0.5 * math.pi, angle + 0.5 * math.pi),),
                        traction, what)


def pin_peak_pressure(force: float, diameter: float, thickness: float) -> float:
    """p0 (MPa) of the cosine pin pressure with resultant `force` (N): 4 P / (pi d t) = (4/pi) x bearing."""
    return 4.0 * force / (math.pi * diameter * thickness)


def pin_pressure_at_nodes(spec: PartSpec, mesh: Mesh) -> np.ndarray:
    """(n,) contact pressure (MPa, >= 0) of the cosine pin at each mesh node of the pin's hole (and its
    mirror image), zero elsewhere; used for the exact edge state where the pin bears. A rigid pin's
    pressure comes out of its contact solve instead (fem.contact.contact_pressure): zero here."""
    pressure = np.zeros(mesh.n_nodes)
    if spec.load.pin is None or spec.load.pin.contact != "cosine":
        return pressure
    for bl in _pin_loads(spec):
        if bl.edge not in mesh.edges:
            continue
        nodes = mesh.edge_nodes(bl.edge)
        pressure[nodes] = np.linalg.norm(bl.traction(mesh.nodes[nodes]), axis=1)
    return pressure


def loaded_edge_names(spec: PartSpec) -> set[EdgeName]:
    """Boundary names that carry a traction or a support (not traction-free); a pin's hole is free except
    where the pin presses, which `pin_pressure_at_nodes` describes."""
    names = {"symmetry x", "symmetry y"} | ({"held"} if spec.support.held != NO_HELD_END else set())
    if spec.load.has_end_loads or spec.load.remote is not None:
        names.add("loaded")
    if spec.load.remote is not None:
        names.add("side")
    return names


# --- nodal forces -------------------------------------------------------------------------------------


def edge_lengths(nodes: np.ndarray, edges: np.ndarray) -> np.ndarray:
    """Lengths (mm) of boundary edges given as (k, 2) node pairs."""
    return np.linalg.norm(nodes[edges[:, 1]] - nodes[edges[:, 0]], axis=1)


def edge_forces(nodes: np.ndarray, edges: np.ndarray, traction: Traction, thickness: float) -> np.ndarray:
    """Global force vector (2n,) in N for a traction varying linearly along each edge.

    With end tractions ta, tb on an edge of length L: fa = t L (2 ta + tb) / 6, fb = t L (ta + 2 tb) / 6,
    the exact work-equivalent (consistent) forces for a linear traction on a linear edge.
    """
    a, b = edges[:, 0], edges[:, 1]
    ta, tb = traction(nodes[a]), traction(nodes[b])
    w = (thickness * edge_lengths(nodes, edges) / 6.0)[:, None]
    return _scatter(nodes.shape[0], a, b, w * (2.0 * ta + tb), w * (ta + 2.0 * tb))


def edge_forces_gauss(nodes: np.ndarray, edges: np.ndarray, traction: Traction, thickness: float,
                      points: int = GAUSS_POINTS) -> np.ndarray:
    """Global force vector (2n,) in N: consistent forces f_a = t int N_a traction ds on each straight edge
    by Gauss-Legendre quadrature (3 points: exact for tractions up to quadratic along the edge)."""
    xi, wt = np.polynomial.legendre.leggauss(points)
    s, wt = 0.5 * (xi + 1.0), 0.5 * wt
    a, b = edges[:, 0], edges[:, 1]
    pa, pb = nodes[a], nodes[b]
    length = thickness * edge_lengths(nodes, edges)[:, None]
    fa, fb = np.zeros((len(a), 2)), np.zeros((len(a), 2))
    for sk, wk in zip(s, wt):
        t = traction(pa + sk * (pb - pa))
        fa += wk * (1.0 - sk) * length * t
        fb += wk * sk * length * t
    return _scatter(nodes.shape[0], a, b, fa, fb)


def _scatter(n: int, a: np.ndarray, b: np.ndarray, fa: np.ndarray, fb: np.ndarray) -> np.ndarray:
    f = np.zeros(2 * n)
    for comp in (0, 1):
        f += np.bincount(2 * a + comp, weights=fa[:, comp], minlength=f.size)
        f += np.bincount(2 * b + comp, weights=fb[:, comp], minlength=f.size)
    return f


def uniform_end_traction(nodes: np.ndarray, edges: np.ndarray, force: float, thickness: float) -> Traction:
    """Uniform normal traction (MPa) along x that sums to `force` (N) over the edge set."""
    stress = force / (thickness * edge_lengths(nodes, edges).sum())
    return lambda p: np.column_stack([np.full(len(p), stress), np.zeros(len(p))])


def load_resultant(bl: BoundaryLoad, thickness: float, keep: Callable[[np.ndarray], np.ndarray] | None = None,
                   about: tuple[float, float] = (0.0, 0.0), samples: int = SAMPLES_PER_CURVE) -> tuple[float, float, float]:
    """(Fx, Fy, Mz) in N and N mm of a boundary load integrated over its exact curves (midpoint rule),
    keeping only the points where keep(points) is True; Mz about `about`, counter-clockwise positive."""
    fx = fy = mz = 0.0
    for curve in bl.curves:
        p, ds = curve.samples(samples)
        if keep is not None:
            mask = keep(p)
            p, ds = p[mask], ds[mask]
        if len(p) == 0:
            continue
        f = bl.traction(p) * (thickness * ds)[:, None]
        fx += float(f[:, 0].sum())
        fy += float(f[:, 1].sum())
        mz += float(np.sum((p[:, 0] - about[0]) * f[:, 1] - (p[:, 1] - about[1]) * f[:, 0]))
    return fx, fy, mz


def part_loads(spec: PartSpec, mesh: Mesh) -> np.ndarray:
    """Global force vector (2n,) in N of every load the part file applies, on the edges this mesh has.

    Straight edges take the consistent forces of the traction (exact for the end loads). A pin's pressure
    acts on the chords of its hole; its forces are scaled so that their resultant along the pin's line is
    the exact resultant of the pressure over the modelled part of the hole.
    """
    t = spec.plate.thickness
    f = np.zeros(2 * mesh.n_nodes)
    box = modelled_box(spec)
    inside = _in_box(box, 1e-9 * max(outline_size(spec)))
    for bl in applied_loads(spec):
        if bl.piece is None and bl.edge not in mesh.edges:
            continue
        if mesh.quadratic_edges is not None:  # 6-node triangles: 3-node (curved) edges, fem/quadratic.py
            edges = mesh.quadratic_edges[bl.edge] if bl.piece is None else segment_edges(mesh, bl.piece, True)
            part = quadratic_edge_forces(mesh.nodes, edges, bl.traction, t)
        else:
            edges = mesh.edges[bl.edge] if bl.piece is None else segment_edges(mesh, bl.piece)
            part = edge_forces_gauss(mesh.nodes, edges, bl.traction, t)
        if any(isinstance(c, Arc) for c in bl.curves):
            part *= _arc_scale(bl, part, t, inside)
        f += part
    return f


def _in_box(box: tuple[float, float, float, float], tol: float) -> Callable[[np.ndarray], np.ndarray]:
    x0, y0, x1, y1 = box
    return lambda p: (p[:, 0] >= x0 - tol) & (p[:, 0] <= x1 + tol) & (p[:, 1] >= y0 - tol) & (p[:, 1] <= y1 + tol)


def _arc_scale(bl: BoundaryLoad, forces: np.ndarray, thickness: float, keep) -> float:
    """Factor making the discrete resultant of `forces` along the exact resultant equal to it (1 for a load
    whose exact resultant vanishes, such as a pressure round a whole hole)."""
    fx, fy, _ = load_resultant(bl, thickness, keep)
    exact = math.hypot(fx, fy)
    if exact <= BALANCED * _magnitude(bl, thickness, keep):
        return 1.0
    discrete = (forces[0::2].sum() * fx + forces[1::2].sum() * fy) / max(exact, 1e-300)
    return exact / discrete if discrete > 0.0 else 1.0


BALANCED = 1e-9  # a load whose resultant is this small a fraction of its total magnitude is self-balanced


def _magnitude(bl: BoundaryLoad, thickness: float, keep, samples: int = SAMPLES_PER_CURVE) -> float:
    """The integral of |traction| x thickness over the load's curves where keep(points) (N)."""
    total = 0.0
    for curve in bl.curves:
        p, ds = curve.samples(samples)
        mask = keep(p)
        total += float(np.sum(np.linalg.norm(bl.traction(p[mask]), axis=1) * ds[mask])) * thickness
    return total
