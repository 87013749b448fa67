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
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from ..fem.analysis import Solution
from ..fem.contact import rigid_pin
from ..fem.loads import applied_loads, load_resultant, pin_bearing_loads
from ..geometry.registry import outline_size
from ..geometry.spec import PartSpec

EXACT = "applied loads (exact)"
ON_CUT = 1e-9  # of the part's larger dimension: a contact node this close to a cut lies on it
WITH_REACTIONS = "applied loads and the FE support reactions (the cut crosses the held end)"


@dataclass(frozen=True)
class Statics:
    """N, V (N) and M (N mm) the applied loads require on a cut, and what they were taken from."""

    normal_force: float
    shear_force: float
    moment: float
    basis: str


def cut_statics(spec: PartSpec, solution: Solution, point: tuple[float, float], normal: tuple[float, float],
                about: tuple[float, float]) -> Statics:
    """Statics of the cut through `point` with unit `normal`; moment about the point `about` (mm)."""
    p0, n = np.asarray(point, float), np.asarray(normal, float) / np.hypot(*normal)
    d = np.array([-n[1], n[0]])
    side = _held_end_side(spec, solution, p0, n)
    if side == "minus":  # free body: the +n side, loads only
        fx, fy, mz = _applied(spec, solution, p0, n, about, positive=True)
        basis = EXACT
    elif side == "plus":  # free body: the -n side, loads only; the +n side carries the opposite
        fx, fy, mz = (-v for v in _applied(spec, solution, p0, n, about, positive=False))
        basis = EXACT
    else:
        fx, fy, mz = _applied(spec, solution, p0, n, about, positive=True)
        rx, ry, rm = _reactions(solution, p0, n, about)
        fx, fy, mz = fx + rx, fy + ry, mz + rm
        basis = EXACT if side == "none" else WITH_REACTIONS
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
    return best


def _held_end_side(spec: PartSpec, solution: Solution, p0: np.ndarray, n: np.ndarray) -> str:
    """"minus" / "plus" when the whole held end (the mesh's "held" edge: a straight end or a lug's bearing
    point) lies on that side of the cut, "crossed" when the cut crosses it, "none" when the part has no
    held end (remote state, or the plane x = 0 instead)."""
    if spec.load.remote is not None or "x" in spec.support.symmetry or "held" not in solution.mesh.edges:
        return "none"
    ends = (solution.mesh.nodes[solution.mesh.edge_nodes("held")] - p0) @ n
    if np.all(ends <= 0.0):
        return "minus"
    if np.all(ends >= 0.0):
        return "plus"
    return "crossed"


def _applied(spec: PartSpec, solution: Solution, p0: np.ndarray, n: np.ndarray, about,
             positive: bool) -> tuple[float, float, float]:
    """Resultant (Fx, Fy, Mz about `about`) of the applied tractions, and of a rigid pin's contact forces,
    on one side of the cut."""
    sign = 1.0 if positive else -1.0
    total = np.zeros(3)
    for bl in applied_loads(spec):
        total += load_resultant(bl, spec.plate.thickness, lambda p: sign * ((p - p0) @ n) > 0.0, about)
    if solution.contact is not None:
        total += _contact_resultant(solution, p0, sign * n, about, ON_CUT * max(outline_size(spec)))
    return float(total[0]), float(total[1]), float(total[2])


def _contact_resultant(solution: Solution, p0: np.ndarray, n: np.ndarray, about, tol: float) -> np.ndarray:
    """(Fx, Fy, Mz) of the contact's nodal forces on the +n side of the cut; a node within `tol` (mm) of
    the cut counts half (its force is shared by the elements on both sides)."""
    c = solution.contact
    side = (c.points - p0) @ n
    weight = np.where(side > tol, 1.0, np.where(side >= -tol, 0.5, 0.0))
    f = c.forces * weight[:, None]
    arm = c.points - np.asarray(about, float)
    return np.array([f[:, 0].sum(), f[:, 1].sum(), np.sum(arm[:, 0] * f[:, 1] - arm[:, 1] * f[:, 0])])


def _reactions(solution: Solution, p0: np.ndarray, n: np.ndarray, about) -> tuple[float, float, float]:
    """Resultant of the FE support reactions on the +n side of the cut.

    Along the held end the nodal reactions are turned back into the linear traction whose consistent
    nodal forces they are (solving the edge's mass matrix), and that traction is integrated exactly over
    the part of the end on the +n side, so a cut between two nodes shares their reactions correctly.
    Reactions at nodes off the held end (rigid-body restraints, near zero) count by node.
    """
    if solution.reactions is None:
        return 0.0, 0.0, 0.0
    r = solution.reactions.reshape(-1, 2)
    mesh = solution.mesh
    about = np.asarray(about, float)
    total = np.zeros(3)
    on_end = np.zeros(mesh.n_nodes, dtype=bool)
    if "held" in mesh.edges:
        edges = mesh.edges["held"]
        on_end[edges.ravel()] = True
        total += _edge_traction_resultant(mesh.nodes, edges, r, p0, n, about)
    loose = (~on_end) & ((mesh.nodes - p0) @ n > 0.0) & np.any(r != 0.0, axis=1)
    arm = mesh.nodes[loose] - about
    total += [r[loose, 0].sum(), r[loose, 1].sum(), np.sum(arm[:, 0] * r[loose, 1] - arm[:, 1] * r[loose, 0])]
    return float(total[0]), float(total[1]), float(total[2])


def _edge_traction_resultant(nodes: np.ndarray, edges: np.ndarray, forces: np.ndarray, p0: np.ndarray,
                             n: np.ndarray, about: np.ndarray) -> np.ndarray:
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
