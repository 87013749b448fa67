"""Statics of a straight cut: the resultant the applied loads require on it (the free body on one side).

A cut is a point p and unit normal n; positions along it run along d = (-n_y, n_x) (compare.sections).
The FE traction s.n integrated over the cut is the force the +n side exerts on the -n side; statics
requires it to equal the total external force on the +n side. So, with F and Mz (counter-clockwise) the
external force and moment on the +n side about the point C of the cut:

    N = F . n      V = F . d      M = -Mz

M is positive when it stretches the material on the +d side, as in `Cut.moment`. Applied tractions are
integrated exactly over the boundary (fem.loads.applied_loads); a rigid pin's contact forces are known
only from the solve (fem.contact): its nodal forces on the +n side count, half for a node on the cut
(frictionless, so their resultant passes through the hole's centre: a cut that misses the hole sees the
pin force there, whatever the contact). The held end's reactions are statically
known when the whole held end lies on one side: then the free body on the other side is used. When the
cut crosses the held end the reaction is shared between the sides in a way statics alone does not fix;
the FE support reactions of the nodes on the +n side are used then, and `basis` says so.

Supports on the part's own boundary ([[hold]] stretches and pin holds) are treated alike: when every one
lies on one side, statics of the other side is exact; when the cut passes between them, the FE reactions
(a held pin's contact forces among them) of the +n side are used.

A cut across only some of the ligaments its line meets (the cut normal to an edge at a peak,
compare/edge_cut.py) bounds a free body that is not a half-plane: `side` then says which points belong
to the +n side (a FreeBody), and every load, reaction and support is sorted by it.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from ..fem.analysis import Solution
from ..fem.contact import rigid_pin
from ..fem.loads import applied_loads, load_resultant, pin_bearing_loads
from ..geometry.kinds.hole import named as named_hole
from ..geometry.registry import outline_size
from ..geometry.spec import PartSpec

EXACT = "applied loads (exact)"
ON_CUT = 1e-9  # of the part's larger dimension: a contact node this close to a cut lies on it
WITH_REACTIONS = "applied loads and the FE support reactions (the cut crosses the held end)"
WITH_SUPPORTS = ("applied loads and the FE support reactions (the cut passes between supports, so statics alone "
                 "cannot share the reactions)")


@dataclass(frozen=True)
class FreeBody:
    """The +n side of a cut: `polygon`, the piece of the part the cut separates on its +n side (shapely,
    grown by a hair so that its own boundary belongs to it), or None for the whole half-plane."""

    polygon: object | None = None

    def contains(self, points: np.ndarray, p0: np.ndarray, n: np.ndarray) -> np.ndarray:
        """(k,) bool: which points (k, 2) lie on the +n side (strictly, for the half-plane)."""
        if self.polygon is None:
            return (points - p0) @ n > 0.0
        import shapely

        return shapely.contains_xy(self.polygon, points[:, 0], points[:, 1]) & ((points - p0) @ n != 0.0)


HALF_PLANE = FreeBody()


@dataclass(frozen=True)
class Statics:
    """N, V (N) and M (N mm) the applied loads require on a cut, and what they were taken from."""

    normal_force: float
    shear_force: float
    moment: float
    basis: str


def cut_statics(spec: PartSpec, solution: Solution, point: tuple[float, float], normal: tuple[float, float],
                about: tuple[float, float], side: FreeBody = HALF_PLANE) -> Statics:
    """Statics of the cut through `point` with unit `normal`; moment about the point `about` (mm). `side`:
    the free body on the +n side (default: the half-plane the normal points into)."""
    p0, n = np.asarray(point, float), np.asarray(normal, float) / np.hypot(*normal)
    d = np.array([-n[1], n[0]])
    where = _support_side(spec, solution, p0, n, side)
    if where == "minus":  # free body: the +n side, loads only
        fx, fy, mz = _applied(spec, solution, p0, n, about, side, positive=True)
        basis = EXACT
    elif where == "plus":  # free body: the -n side, loads only; the +n side carries the opposite
        fx, fy, mz = (-v for v in _applied(spec, solution, p0, n, about, side, positive=False))
        basis = EXACT
    else:
        fx, fy, mz = _applied(spec, solution, p0, n, about, side, positive=True)
        rx, ry, rm = _reactions(spec, solution, p0, n, about, side)
        fx, fy, mz = fx + rx, fy + ry, mz + rm
        basis = EXACT if where == "none" else (WITH_REACTIONS if not spec.support.holds else WITH_SUPPORTS)
    force = np.array([fx, fy])
    return Statics(float(force @ n), float(force @ d), float(-mz), basis)


def reference_stress(spec: PartSpec) -> float:
    """The largest mean traction magnitude (MPa) of any applied load: the stress level the part's loads
    carry, for measuring the errors of cuts that carry little (axial P / (W t), a moment 3 M / (W^2 t),
    a shear V / (W t), a pin (8 / pi^2) P / (d t) whatever its contact model, a remote state its largest
    edge traction)."""
    best = 0.0
    for bl in applied_loads(spec) + (pin_bearing_loads(spec) if rigid_pin(spec) else ()):
        for curve in bl.curves:
            p, ds = curve.samples(4000)
            best = max(best, float(np.sum(np.linalg.norm(bl.traction(p), axis=1) * ds) / ds.sum()))
    groups = {g.name: g for g in spec.fasteners}
    for load in spec.load.fasteners:  # a group's mean bearing F / (n d t), its moment as a force at its radius
        g = groups[load.group]
        centres = np.array([spec.holes[h - 1].center for h in g.holes])
        radius = float(np.sqrt(np.mean(np.sum((centres - centres.mean(axis=0)) ** 2, axis=1))))
        force = load.force + (abs(load.moment) / radius if radius > 0.0 else 0.0)
        best = max(best, force / (len(g.holes) * g.diameter * spec.plate.thickness))
    return best


def _held_end_side(spec: PartSpec, solution: Solution, p0: np.ndarray, n: np.ndarray) -> str:
    """Where the supports lie relative to the half-plane cut (see `_support_side`)."""
    return _support_side(spec, solution, p0, n, HALF_PLANE)


def _support_side(spec: PartSpec, solution: Solution, p0: np.ndarray, n: np.ndarray, side: FreeBody) -> str:
    """"minus" / "plus" when every support (the mesh's "held" edge: a straight end or a lug's bearing
    point; the [[hold]] stretches; the held pins' holes) lies on that side of the cut, "crossed" when the
    cut passes between them, "none" when the part has no support statics must share (a remote state, or
    the plane x = 0 instead of the held end)."""
    points = support_points(spec, solution)
    if points is None:
        return "none"
    plus = side.contains(points, p0, n)
    on_minus = ~plus & ~(side.polygon is None and ((points - p0) @ n >= 0.0))
    if not plus.any():
        return "minus"
    if plus.all() or (side.polygon is None and not on_minus.any()):
        return "plus"
    return "crossed"


def support_points(spec: PartSpec, solution: Solution) -> np.ndarray | None:
    """(k, 2) the nodes of every support that takes a share statics must place, or None without any."""
    mesh = solution.mesh
    holding = [n for g in spec.fasteners if g.holds for n in g.holes]
    if spec.support.holds or holding:
        from ..geometry.boundary import stretch
        from ..fem.stretches import stretch_nodes

        nodes = [stretch_nodes(mesh, stretch(spec, h.where).pieces) for h in spec.support.holds if h.where is not None]
        nodes += [mesh.edge_nodes(named_hole(h.pin)) for h in spec.support.holds if h.pin is not None]
        nodes += [mesh.edge_nodes(named_hole(n)) for n in holding]
        return mesh.nodes[np.concatenate(nodes)]
    if spec.load.remote is not None or "x" in spec.support.symmetry or "held" not in mesh.edges:
        return None
    return mesh.nodes[mesh.edge_nodes("held")]


def _applied(spec: PartSpec, solution: Solution, p0: np.ndarray, n: np.ndarray, about, side: FreeBody,
             positive: bool) -> tuple[float, float, float]:
    """Resultant (Fx, Fy, Mz about `about`) of the applied tractions, and of a rigid loading pin's contact
    forces, on one side of the cut."""
    total = np.zeros(3)

    def keep(p: np.ndarray) -> np.ndarray:
        inside = side.contains(p, p0, n)
        return inside if positive else (~inside & ((p - p0) @ n != 0.0))

    for bl in applied_loads(spec):
        total += load_resultant(bl, spec.plate.thickness, keep, about)
    tol = ON_CUT * max(outline_size(spec))
    for c in (solution.contact, solution.fasteners):  # a rigid loading pin's, the loading fastener groups'
        if c is not None and len(c.points):
            total += _contact_resultant(c, p0, (1.0 if positive else -1.0) * n, about, tol, side, positive)
    return float(total[0]), float(total[1]), float(total[2])


def _contact_resultant(c, p0: np.ndarray, n: np.ndarray, about, tol: float,
                       side: FreeBody = HALF_PLANE, positive: bool = True) -> np.ndarray:
    """(Fx, Fy, Mz) of a contact's nodal forces (`c.points`, `c.forces`: a loading pin's PinContact or the
    fastener groups' PartFasteners) on the +n side of the cut; a node within `tol` (mm) of the cut counts
    half (its force is shared by the elements on both sides). With a FreeBody, a node off the cut counts
    when it is in the body (positive) or out of it (not positive)."""
    distance = (c.points - p0) @ n
    if side.polygon is None:
        weight = np.where(distance > tol, 1.0, np.where(distance >= -tol, 0.5, 0.0))
    else:
        inside = side.contains(c.points, p0, n if positive else -n)
        inside = inside if positive else ~inside
        weight = np.where(np.abs(distance) <= tol, 0.5, inside.astype(float))
    f = c.forces * weight[:, None]
    arm = c.points - np.asarray(about, float)
    return np.array([f[:, 0].sum(), f[:, 1].sum(), np.sum(arm[:, 0] * f[:, 1] - arm[:, 1] * f[:, 0])])


def _reactions(spec: PartSpec, solution: Solution, p0: np.ndarray, n: np.ndarray, about,
               side: FreeBody = HALF_PLANE) -> tuple[float, float, float]:
    """Resultant of the FE support reactions on the +n side of the cut.

    Along the held end (and along every [[hold]] stretch) the nodal reactions are turned back into the
    linear traction whose consistent nodal forces they are (solving the edge's mass matrix), and that
    traction is integrated exactly over the part of the edge on the +n side, so a cut between two nodes
    shares their reactions correctly. Reactions at other nodes (rigid-body restraints, near zero; a held
    pin's contact forces) count by node.
    """
    if solution.reactions is None:
        return 0.0, 0.0, 0.0
    r = solution.reactions.reshape(-1, 2)
    mesh = solution.mesh
    about = np.asarray(about, float)
    total = np.zeros(3)
    on_end = np.zeros(mesh.n_nodes, dtype=bool)
    for edges in _support_edges(spec, mesh):
        on_end[edges.ravel()] = True
        total += _edge_traction_resultant(mesh.nodes, edges, r, p0, n, about, side)
    loose = (~on_end) & side.contains(mesh.nodes, p0, n) & np.any(r != 0.0, axis=1)
    arm = mesh.nodes[loose] - about
    total += [r[loose, 0].sum(), r[loose, 1].sum(), np.sum(arm[:, 0] * r[loose, 1] - arm[:, 1] * r[loose, 0])]
    return float(total[0]), float(total[1]), float(total[2])


def _support_edges(spec: PartSpec, mesh) -> list[np.ndarray]:
    """The boundary edge chains of the supports whose reactions are edge tractions: the held end, and each
    [[hold]] stretch (fem.stretches)."""
    chains = [mesh.edges["held"]] if "held" in mesh.edges and not spec.support.holds else []
    if spec.support.holds:
        from ..geometry.boundary import stretch
        from ..fem.stretches import stretch_edges

        chains += [stretch_edges(mesh, stretch(spec, h.where).pieces) for h in spec.support.holds if h.where is not None]
    return [c for c in chains if c.size]


def _edge_traction_resultant(nodes: np.ndarray, edges: np.ndarray, forces: np.ndarray, p0: np.ndarray,
                             n: np.ndarray, about: np.ndarray, side: FreeBody = HALF_PLANE) -> np.ndarray:
    """(Fx, Fy, Mz) on the +n side of the piecewise-linear edge traction whose consistent nodal forces
    are `forces` (n, 2) at the nodes of `edges` (k, 2)."""
    used = np.unique(edges)
    local = np.full(nodes.shape[0], -1)
    local[used] = np.arange(used.size)
    a, b = local[edges[:, 0]], local[edges[:, 1]]
    length = np.linalg.norm(nodes[edges[:, 1]] - nodes[edges[:, 0]], axis=1)
    rows = np.concatenate([a, a, b, b])
    cols = np.concatenate([a, b, a, b])
    vals = np.concatenate([2 * length, length, length, 2 * length]) / 6.0
    mass = sp.csc_matrix((vals, (rows, cols)), shape=(used.size, used.size))
    traction = np.column_stack([spla.spsolve(mass, forces[used, k]) for k in (0, 1)])  # per unit length
    pa, pb = nodes[edges[:, 0]], nodes[edges[:, 1]]
    sa, sb = (pa - p0) @ n, (pb - p0) @ n
    if side.polygon is not None:  # sides by the free body; an edge split only where it crosses the cut
        ina, inb = side.contains(pa, p0, n), side.contains(pb, p0, n)
        sa = np.where(ina, np.abs(sa) + (sa == 0), -np.abs(sa) - (sa == 0))
        sb = np.where(inb, np.abs(sb) + (sb == 0), -np.abs(sb) - (sb == 0))
    lo = np.where(sa > 0, 0.0, np.clip(sa / np.where(sa == sb, 1.0, sa - sb), 0.0, 1.0))
    hi = np.where(sb > 0, 1.0, np.clip(sa / np.where(sa == sb, 1.0, sa - sb), 0.0, 1.0))
    lo, hi = np.minimum(lo, hi), np.maximum(lo, hi)
    keep = (sa > 0) | (sb > 0)
    total = np.zeros(3)
    for xi in (-1.0 / np.sqrt(3.0), 1.0 / np.sqrt(3.0)):  # two-point Gauss on the kept piece: exact here
        s = lo + (hi - lo) * 0.5 * (1.0 + xi)
        t = (1 - s)[:, None] * traction[a] + s[:, None] * traction[b]
        p = (1 - s)[:, None] * pa + s[:, None] * pb
        w = np.where(keep, 0.5 * (hi - lo) * length, 0.0)[:, None]
        f = w * t
        arm = p - about
        total += [f[:, 0].sum(), f[:, 1].sum(), np.sum(arm[:, 0] * f[:, 1] - arm[:, 1] * f[:, 0])]
    return total
