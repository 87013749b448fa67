"""Fastener groups: bolts or pins that share a load between the plate and rigid connecting members.

Model (small displacements; mm, N, MPa; radians inside, degrees in the results). A group is a set of holes
in the plate, one fastener in each, and a rigid connecting member (the other part of the joint: a strap, a
bracket's flange, the ground). The member translates and turns in the plane (Ux, Uy at the group's
reference point, and theta counter-clockwise); a group either carries a load (Fx, Fy, Mz) into the plate
through its member, or holds the plate (its member is fixed). A group of one fastener has a member that
translates only: a frictionless pin carries no moment, so its load must have none about the pin's centre.

Each fastener is a rigid pin body of diameter d in a hole of diameter d + c (c the diametral clearance,
>= 0). The pin translates by V_j; it meets the hole's edge by frictionless contact and its member through
its stiffness k_j (N/mm, the same in every direction: the connection's shear stiffness between the pin's
seat in the plate and the member): rigidly when k_j is infinite (V_j = B_j U exactly, B_j the member's
motion at the pin's centre), else by a spring of energy k_j |V_j - B_j U|^2 / 2. Before loading, each pin
is seated: it touches its hole at the point facing its seat direction phi_j (a clearance taken up), so
that with a seat along the fastener's force the contact starts where it bears.

Contact (as for the single pin of old, now the one-fastener group): a node i of hole j, at distance r_i
and angle a_i from the hole's centre, unit radial e_i into the material, has the gap

    g_i = g0_i + e_i . (u_i - V_j),   g0_i = r_i - s cos(a_i - phi_j) - sqrt(r_p^2 - s^2 sin^2(a_i - phi_j))

(s = c/2, r_p = d/2: the distance from the hole's edge to the seated pin's surface along the radius), which
must stay >= 0 and takes a force lambda_i e_i on the plate with lambda_i >= 0 and lambda_i g_i = 0. The
gap is linear in the displacements: exact for a pin that bears along its seat, first order in c/d for
one whose force turns away from it.

Active set (a primal-dual iteration): the constraints g_i = 0 of the nodes in contact are imposed exactly
by a change of variables, u_i = t_i tau_i + e_i (w_i - g0_i + e_i . V_j) with w_i held at zero and
tau_i the frictionless slip along the edge (t_i = (-e_iy, e_ix)), V_j written in the unknowns of its member
(rigid) or of its own body (flexible). The members' and pins' DOFs join the plate's; a member's rotation is
carried as L theta (L the group's radius of gyration about its reference point) so that every unknown is a
length. The transformed stiffness T^T K T stays symmetric positive definite, so fem.solve.solve_system
solves it unchanged: one factorisation per pass. Contact forces follow from the residual at the contact
nodes, lambda_i = e_i . (K u - f)_i, and each member's equations make its fasteners' forces sum to its load
and moment to round-off. Nodes pulling (lambda_i < 0) leave the set, free nodes penetrating (g_i < 0) join
it, and the pass repeats until no set changes. The first set is the half of each hole facing its seat, or
the arc a coarser mesh's contact settled on.

Symmetry planes (x = 0, y = 0; only the positive side meshed): a group whose reference point lies on a
plane is its own mirror image there: its member cannot cross the plane or turn, the model carries half its
load, and a fastener on the plane is half a fastener (its stiffness halved, its pin held across the plane,
the hole's nodes on the plane sliding along it). A group off the plane has a mirror image that is another
group: the model carries it whole. The results describe whole fasteners and whole groups: a fastener on a
plane reports the force of the whole fastener (its modelled part's force across the plane is cancelled by
its mirror image's), its `portion` saying how much of it the model holds; a self-mirrored group reports
the resultant of all its fasteners, images included; the contact forces on the mesh stay the modelled
part's.

Seats, unless given: a loading group's fasteners are seated along the motion its member would have on a
rigid plate with equal fastener springs (its load through the inverse of sum_j B_j^T B_j: for a concentric
group, the load's direction); a holding group's along the motion that would resist the plate's other loads
(their resultant about all holding fasteners, as if they alone held the plate).
"""

from __future__ import annotations

import math
from collections.abc import Hashable, Sequence
from dataclasses import dataclass, replace

import numpy as np
import scipy.sparse as sp

from ..geometry.errors import PartError
from ..geometry.kinds.hole import named as named_hole
from ..geometry.mesh import Mesh
from .solve import SolveReport, SolverError, rigid_modes, solve_system

RIGID = math.inf  # a fastener stiffness: the pin body moves with its member
MAX_PASSES = 40  # active-set passes before the contact is declared unsettled (seen: 1-3 a level from the
                 # coarser level's arc; up to 8 from the loaded halves, with clearance)
FORCE_TOLERANCE = 1e-9  # of the load scale: a contact force more negative than this is pulling
GAP_TOLERANCE = 1e-9  # of the largest relative displacement at a hole: a gap more negative is penetrating
START_MARGIN = 1e-6  # degrees: a node on the edge of a coarser mesh's contact arc starts in contact
HOLD_LIMIT = 1e-12  # relative stiffness below which a motion counts as not held
MECHANISM_LIMIT = 1e-9  # relative restraint below which a rigid-body motion of the plate is free
FIT_TOLERANCE = 1e-9  # relative: a hole's diameter must equal its fastener's diameter plus clearance
MAX_CLEARANCE = 0.1  # of the hole's diameter: the linearised gap's range (as for the single pin)
MOMENT_TOLERANCE = 1e-9  # relative: the moment a one-fastener group's load may have about the pin


def hole_edge(number: int) -> Hashable:
    """The mesh's edge-set key of the edge of hole `number` (1-based): the hole's RaiserId."""
    return named_hole(number)


@dataclass(frozen=True)
class Fastener:
    """The fastener of a group (all of its fasteners alike).

    diameter: shank diameter d (mm), for bearing F / (d t) and shear F / (n pi d^2 / 4).
    clearance: diametral clearance c (mm, >= 0): the hole's diameter is d + c.
    shear_planes: n, the planes the fastener is sheared on (1 single shear, 2 double shear).
    stiffness: shear stiffness (N/mm) of the connection between the pin body and the member; RIGID (inf)
        by default; fem.fastener_stiffness gives published estimates.
    stiffness_source: where the stiffness came from, in words (for reports).
    """

    diameter: float
    clearance: float = 0.0
    shear_planes: int = 1
    stiffness: float = RIGID
    stiffness_source: str = "rigid"

    @property
    def rigid(self) -> bool:
        return math.isinf(self.stiffness)


@dataclass(frozen=True)
class GroupHole:
    """One hole of a group: the mesh's edge-set key of its edge (opaque), its centre and diameter (mm)."""

    edge: Hashable
    center: tuple[float, float]
    diameter: float


@dataclass(frozen=True)
class FastenerGroup:
    """A group of fasteners and its connecting member (module docstring).

    name: what messages call it (e.g. "group 1").
    holes: its holes, one fastener in each.
    load: (Fx N, Fy N, Mz N mm) that the member applies to the plate, acting at `reference` (Mz
        counter-clockwise); None when the group holds the plate (the member is fixed).
    reference: the member's reference point (mm); None for the centroid of the hole centres.
    seats: each fastener's seat direction (degrees counter-clockwise from +x, the direction its force on
        the plate is expected to point); None for the default (module docstring).
    """

    name: str
    holes: tuple[GroupHole, ...]
    fastener: Fastener
    load: tuple[float, float, float] | None = None
    reference: tuple[float, float] | None = None
    seats: tuple[float, ...] | None = None

    @property
    def holding(self) -> bool:
        return self.load is None

    @property
    def point(self) -> tuple[float, float]:
        """The reference point (mm)."""
        if self.reference is not None:
            return self.reference
        c = np.mean([h.center for h in self.holes], axis=0)
        return float(c[0]), float(c[1])


@dataclass(frozen=True)
class ContactNodes:
    """Every fastener hole's edge nodes on the modelled mesh, in fastener order: node indices (k,), unit
    radials into the material (k, 2), angles from the fastener's seat (k,) in radians within (-pi, pi],
    initial gaps (k,) mm, whether a symmetry plane holds the node's slip (k,) bool, and the index of the
    node's fastener (k,) (groups' fasteners in order)."""

    nodes: np.ndarray
    normal: np.ndarray
    angle: np.ndarray
    gap: np.ndarray
    held: np.ndarray
    fastener: np.ndarray


@dataclass(frozen=True)
class FastenerResult:
    """One fastener after the solve (modelled part; mm, N, MPa, degrees).

    group: index of its group; hole: its hole; portion: how much of the fastener the model holds (1, or
      1/2 on a symmetry plane of a self-mirrored group).
    force: (2,) the whole fastener's force on the plate (N): the sum of its contact forces, a modelled
      part's gathered with its mirror image's.
    share: |force| over the sum of |force| of the group's fasteners, images included.
    bearing: F / (d t) and shear: F / (n pi d^2 / 4) (MPa), F = |force|.
    seat: seat direction (degrees from +x); arcs: each contiguous stretch of contact around the hole,
      (first, last) angle from the seat counter-clockwise (degrees; a stretch across the back of the hole
      ends above 180), in order; contact_nodes: nodes in contact.
    peak_pressure: the largest contact pressure, node force / tributary length / thickness (MPa).
    displacement: (2,) the pin's translation (mm); penetration: largest penetration left (mm, >= 0).
    """

    group: int
    hole: GroupHole
    portion: float
    force: np.ndarray
    share: float
    bearing: float
    shear: float
    seat: float
    arcs: tuple[tuple[float, float], ...]
    contact_nodes: int
    peak_pressure: float
    displacement: np.ndarray
    penetration: float

    @property
    def arc(self) -> tuple[float, float]:
        """(first, last) angle (degrees from the seat) spanning every stretch of contact; (0, 0) for none."""
        return (self.arcs[0][0], self.arcs[-1][1]) if self.arcs else (0.0, 0.0)


@dataclass(frozen=True)
class GroupResult:
    """One group after the solve: its fasteners' force (2,) N and moment N mm about its reference point on
    the plate (all of them, images included: the load of a loading group, the reaction of a holding one),
    and its member's translation (2,) mm at the reference point and rotation (radians, ccw)."""

    group: FastenerGroup
    force: np.ndarray
    moment: float
    displacement: np.ndarray
    rotation: float


@dataclass(frozen=True)
class GroupsSolve:
    """One mesh's solve with fastener groups, on the modelled mesh: displacements (2n,) mm, the contact
    forces on the plate (2n,) N, the contact nodes, which are active, their forces lambda (k,) N (zero off
    contact) and gaps (k,) mm, each fastener's and group's results, the active-set passes and the last
    solve's report (seconds summed over the passes)."""

    displacement: np.ndarray
    forces: np.ndarray
    contact: ContactNodes
    active: np.ndarray
    normal_force: np.ndarray
    gap: np.ndarray
    fasteners: tuple[FastenerResult, ...]
    groups: tuple[GroupResult, ...]
    passes: int
    report: SolveReport


def group_holes(holes: Sequence, numbers: Sequence[int]) -> tuple[GroupHole, ...]:
    """GroupHoles of the part's holes `numbers` (1-based), from `holes` (geometry.spec.Hole: centre,
    diameter)."""
    return tuple(GroupHole(hole_edge(n), tuple(holes[n - 1].center), holes[n - 1].diameter) for n in numbers)


def bearing_stress(force: float, diameter: float, thickness: float) -> float:
    """Average bearing stress F / (d t) (MPa) of a fastener force F (N) on a hole of a plate t thick
    (common practice: the force over the projected contact area)."""
    return force / (diameter * thickness)


def shear_stress(force: float, diameter: float, shear_planes: int) -> float:
    """Average shear stress F / (n pi d^2 / 4) (MPa) of a fastener of diameter d (mm) carrying F (N) on n
    shear planes (common practice)."""
    return force / (shear_planes * math.pi * diameter ** 2 / 4.0)


def initial_gap(distance: np.ndarray, radius: float, angle: np.ndarray, clearance: float) -> np.ndarray:
    """(k,) gap (mm) along the hole's radius from hole-edge points at `distance` (mm) from the centre of a
    hole of `radius` and `angle` (radians from the seat) to the surface of a pin of diameter
    2 radius - clearance touching the hole at angle 0 (module docstring)."""
    s = 0.5 * clearance
    pin_radius = radius - s
    across = s * np.sin(angle)
    return distance - s * np.cos(angle) - np.sqrt(pin_radius ** 2 - across ** 2)


# --- the augmented system: members and pin bodies -------------------------------------------------------


@dataclass(frozen=True)
class _Layout:
    """DOFs of the plate (2n), then per group its member (2, or 4: Ux, Uy, L theta and an unused slot
    that keeps the node pairs whole), then per flexible fastener its pin body (2).

    member: (G,) arrays of each member's DOFs (2 or 3, without the unused slot); length: (G,) L (mm, 0
    for a member that does not turn); pin_cols/pin_coef: (F, 3) DOFs and (F, 2, 3) coefficients with
    V_j = pin_coef[j] @ u[pin_cols[j]]; member_cols/member_coef: the same for B_j U; group_of, portion:
    (F,); free_slots: (G,) the member DOFs neither fixed nor held by a plane; held: held extra DOFs;
    load: (size - 2n,) forces on the extra DOFs; positions: (size/2 - n, 2) a point for each extra DOF
    pair (for rigid-body modes); springs: the flexible fasteners' stiffness, or None; mirrors: (G,) how
    many images of the modelled group the full part has (1, 2 or 4); across: (F, 2) the force components
    of each fastener that its mirror images cancel (across the planes it lies on); own: (G, 2) the same
    for each group (across the planes through its reference point)."""

    size: int
    member: tuple[np.ndarray, ...]
    length: tuple[float, ...]
    pin_cols: np.ndarray
    pin_coef: np.ndarray
    member_cols: np.ndarray
    member_coef: np.ndarray
    group_of: np.ndarray
    portion: np.ndarray
    free_slots: tuple[np.ndarray, ...]
    held: np.ndarray
    load: np.ndarray
    positions: np.ndarray
    springs: sp.csr_matrix | None
    mirrors: np.ndarray
    across: np.ndarray
    own: np.ndarray


def _self_planes(group: FastenerGroup, planes: Sequence[str], tolerance: float) -> tuple[str, ...]:
    """The planes the group is its own mirror image in: those through its reference point."""
    x, y = group.point
    return tuple(p for p in planes if abs(x if p == "x" else y) <= tolerance)


@dataclass(frozen=True)
class _Member:
    """One group's connecting member in the augmented system: its DOFs (2, or 3 when it turns; a fourth,
    unused slot follows a turning member), L (mm; 0 when it does not turn), the planes it is its own
    mirror image in, the slots free to move, the DOFs held and its modelled load (N, N, N)."""

    dofs: np.ndarray
    length: float
    own: tuple[str, ...]
    free: np.ndarray
    held: np.ndarray
    load: np.ndarray


def _member(group: FastenerGroup, first: int, planes: Sequence[str], tolerance: float) -> _Member:
    """The member of `group` with its DOFs from `first`: fixed when the group holds; unable to cross a
    plane through its reference point or to turn there, carrying the modelled share of the load."""
    arms = np.array([h.center for h in group.holes], float) - np.asarray(group.point, float)
    turns = len(group.holes) > 1
    L = float(np.sqrt(np.mean(np.sum(arms ** 2, axis=1)))) if turns else 0.0
    dofs = first + np.arange(3 if turns else 2)
    own = _self_planes(group, planes, tolerance)
    across = [0 if p == "x" else 1 for p in own]
    free = np.array([s for s in range(dofs.size) if s not in across and not (own and s == 2)], dtype=np.int64)
    unused = [first + 3] if turns else []
    if group.holding:
        return _Member(dofs, L, own, np.zeros(0, dtype=np.int64), np.concatenate([dofs, unused]), np.zeros(dofs.size))
    fx, fy, mz = group.load
    load = 0.5 ** len(own) * (np.array([fx, fy, mz / L]) if turns else np.array([fx, fy]))
    return _Member(dofs, L, own, free, np.concatenate([np.setdiff1d(dofs, dofs[free]), unused]), load)


def _member_map(member: _Member, arm: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(3,) DOFs and (2, 3) coefficients B with the member's motion at a fastener `arm` (mm) from its
    reference point = B @ u[DOFs] (a member that does not turn repeats a DOF with coefficient 0)."""
    b = np.zeros((2, 3))
    b[0, 0] = b[1, 1] = 1.0
    if member.dofs.size == 3:
        b[0, 2], b[1, 2] = -arm[1] / member.length, arm[0] / member.length
        return member.dofs, b
    return member.dofs[[0, 1, 0]], b


def _layout(n: int, groups: Sequence[FastenerGroup], planes: Sequence[str], tolerance: float,
            stiffness_scale: float) -> _Layout:
    """The augmented system's DOFs, maps, loads, springs and held DOFs (see _Layout)."""
    next_dof = 2 * n
    members, positions, held, springs = [], [], [], []
    maps: dict[str, list] = {k: [] for k in ("pin_cols", "pin_coef", "member_cols", "member_coef", "group_of",
                                             "portion", "across")}
    for g, group in enumerate(groups):
        member = _member(group, next_dof, planes, tolerance)
        members.append(member)
        next_dof += 4 if member.dofs.size == 3 else 2
        positions += [group.point] * ((next_dof - member.dofs[0]) // 2)
        held.append(member.held)
        for hole in group.holes:
            cols, b = _member_map(member, np.asarray(hole.center) - np.asarray(group.point))
            on = [p for p in member.own if abs(hole.center[0 if p == "x" else 1]) <= tolerance]
            part = 0.5 ** len(on)
            pin = next_dof + np.arange(2)
            rigid = group.fastener.rigid
            maps["pin_cols"].append(cols if rigid else pin[[0, 1, 0]])
            maps["pin_coef"].append(b if rigid else np.array([[1.0, 0.0, 0.0], [0.0, 1.0, 0.0]]))
            for key, value in (("member_cols", cols), ("member_coef", b), ("group_of", g), ("portion", part),
                               ("across", ["x" in on, "y" in on])):
                maps[key].append(value)
            if rigid:
                continue
            next_dof += 2
            positions.append(hole.center)
            held += [pin[[0 if p == "x" else 1]] for p in on]  # half a pin on the plane stays on it
            springs.append((np.concatenate([pin, cols]), part * group.fastener.stiffness * _spring_block(b)))
    load = np.zeros(next_dof - 2 * n)
    for member in members:
        load[member.dofs - 2 * n] = member.load
    held_all = np.unique(np.concatenate(held)).astype(np.int64)
    arrays = {k: np.array(v) for k, v in maps.items()}
    return _Layout(next_dof, tuple(m.dofs for m in members), tuple(m.length for m in members), arrays["pin_cols"],
                   arrays["pin_coef"], arrays["member_cols"], arrays["member_coef"], arrays["group_of"],
                   arrays["portion"], tuple(m.free for m in members), held_all, load,
                   np.array(positions, float).reshape(-1, 2),
                   _spring_matrix(springs, next_dof, held_all, stiffness_scale),
                   np.array([2 ** len(m.own) for m in members]), arrays["across"].astype(bool).reshape(-1, 2),
                   np.array([["x" in m.own, "y" in m.own] for m in members], dtype=bool).reshape(-1, 2))


def _spring_block(b: np.ndarray) -> np.ndarray:
    """(5, 5) stiffness per unit k of a spring between a pin body (2 DOFs) and its member's motion at the
    pin, B U with B (2, 3): the energy k |V - B U|^2 / 2 on the DOFs (Vx, Vy, member's three)."""
    a = np.hstack([np.eye(2), -b])
    return a.T @ a


def _spring_matrix(springs, size: int, held: np.ndarray, scale: float) -> sp.csr_matrix | None:
    """The flexible fasteners' springs, plus `scale` (N/mm) on the diagonal of every held extra DOF: the
    solvers decouple held DOFs, and the diagonal keeps positive where nothing else stiffens one (the unused
    slot of a turning member)."""
    rows, cols, vals = [], [], []
    for dofs, block in springs:
        rows.append(np.repeat(dofs, dofs.size))
        cols.append(np.tile(dofs, dofs.size))
        vals.append(block.ravel())
    rows.append(held)
    cols.append(held)
    vals.append(np.full(held.size, scale))
    matrix = sp.csr_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(size, size))
    matrix.eliminate_zeros()
    return matrix if matrix.nnz else None


# --- the contact nodes -------------------------------------------------------------------------------------


def contact_nodes(mesh: Mesh, groups: Sequence[FastenerGroup], seats: Sequence[np.ndarray], fixed: np.ndarray,
                  planes: Sequence[str] = (), tolerance: float = 0.0) -> ContactNodes:
    """Every fastener hole's nodes on `mesh`, their radials, angles from the seats (radians, (F,) in
    fastener order), initial gaps and slips held by a symmetry plane. A node on a plane has its radial
    snapped along the plane's normal so that the plane's roller holds exactly its slip."""
    held_dofs = np.zeros(2 * mesh.n_nodes, dtype=bool)
    held_dofs[np.asarray(fixed, dtype=np.int64)] = True
    parts = []
    j = 0
    for group in groups:
        for hole in group.holes:
            nodes = mesh.edge_nodes(hole.edge)
            rel = mesh.nodes[nodes] - np.asarray(hole.center)
            distance = np.linalg.norm(rel, axis=1)
            normal = rel / distance[:, None]
            on = [np.abs(mesh.nodes[nodes, axis]) <= tolerance if p in planes else np.zeros(len(nodes), dtype=bool)
                  for axis, p in ((0, "x"), (1, "y"))]  # on the plane x = 0, on the plane y = 0
            for axis in (0, 1):  # the radial along the plane's normal
                snapped = np.zeros((int(on[axis].sum()), 2))
                snapped[:, 1 - axis] = np.sign(normal[on[axis], 1 - axis])
                normal[on[axis]] = snapped
            hx, hy = held_dofs[2 * nodes], held_dofs[2 * nodes + 1]
            if np.any(hx & ~on[0]) or np.any(hy & ~on[1]):
                raise SolverError(f"{hole.edge} has nodes held in a direction across its edge; {group.name}'s "
                                  "fastener cannot bear there (is the hole on a support?)")
            angle = np.angle(np.exp(1j * (np.arctan2(normal[:, 1], normal[:, 0]) - seats[j])))
            gap = initial_gap(distance, 0.5 * hole.diameter, angle, group.fastener.clearance)
            parts.append((nodes, normal, angle, gap, (hx & on[0]) | (hy & on[1]), np.full(len(nodes), j)))
            j += 1
    return ContactNodes(*(np.concatenate(column) for column in zip(*parts)))


# --- the solve ----------------------------------------------------------------------------------------------


def solve_fastener_groups(K: sp.spmatrix, f: np.ndarray, fixed: np.ndarray, mesh: Mesh,
                          groups: Sequence[FastenerGroup], thickness: float, planes: Sequence[str] = (),
                          tolerance: float = 0.0, solver: str = "auto",
                          start: Sequence[Sequence[tuple[float, float]] | None] | None = None) -> GroupsSolve:
    """Displacements of the plate with its fastener groups in contact (module docstring).

    K: (2n, 2n) the plate's stiffness (N/mm); f: (2n,) its other applied forces (N); fixed: its held DOFs;
    thickness: the plate's (mm); planes: the symmetry planes of the model ("x", "y") and `tolerance` (mm)
    within which a point lies on one; start: per fastener, the contact arcs (degrees from its seat,
    FastenerResult.arcs) of a coarser mesh to take as the first active set, or None for the half facing
    its seat.
    Raises PartError for a group that cannot be modelled and SolverError for a mechanism or a contact that
    does not settle."""
    check_groups(groups, planes, tolerance)
    n = mesh.n_nodes
    layout = _layout(n, groups, planes, tolerance, float(np.mean(np.abs(K.diagonal()))))
    seats = fastener_seats(groups, layout, f, mesh)
    contact = contact_nodes(mesh, groups, seats, fixed, planes, tolerance)
    restraint = plate_restraint(mesh, fixed, contact, groups, layout)
    _check_not_mechanism(mesh, groups, layout, contact, restraint, np.ones(contact.nodes.size, bool), True)
    K_aug = sp.block_diag([sp.csr_matrix(K), sp.csr_matrix((layout.size - 2 * n,) * 2)], format="csr")
    if layout.springs is not None:
        K_aug = (K_aug + layout.springs).tocsr()
    f_aug = np.concatenate([f, layout.load])
    positions = np.vstack([mesh.nodes, layout.positions])
    fixed_aug = np.union1d(np.asarray(fixed, dtype=np.int64), layout.held)
    force_scale, clearance = _force_scale(groups, layout, f), max(g.fastener.clearance for g in groups)
    active = _first_set(contact, start)
    seen: set[bytes] = set()
    seconds = 0.0
    for passes in range(1, MAX_PASSES + 1):
        seen.add(active.tobytes())
        _check_not_mechanism(mesh, groups, layout, contact, restraint, active, False)
        u, report, lam, gap = _solve_active(K, K_aug, f_aug, fixed_aug, contact, active, layout, positions, solver)
        seconds += report.seconds
        scale = max(float(np.max(np.abs(gap - contact.gap))), 0.5 * clearance, 1e-300)
        pulling = active & (lam < -FORCE_TOLERANCE * force_scale)
        penetrating = ~active & (gap < -GAP_TOLERANCE * scale)
        if not pulling.any() and not penetrating.any():
            lam = np.where(active, lam, 0.0)
            return _results(u, lam, gap, contact, active, groups, layout, seats, mesh, thickness, passes,
                            replace(report, seconds=seconds))
        changing = np.unique(contact.fastener[pulling | penetrating])
        active = (active & ~pulling) | penetrating
        if active.tobytes() in seen:
            break
    where = ", ".join(str(_hole(groups, j).edge) for j in changing)
    raise SolverError(f"the fasteners' contact with {where} did not settle in {passes} active-set passes; a finer "
                      "mesh (mesh.tolerance) or a smaller clearance usually settles it")


def check_groups(groups: Sequence[FastenerGroup], planes: Sequence[str] = (), tolerance: float = 0.0) -> None:
    """Refuse, naming the group and what is allowed, a group the model cannot take (PartError)."""
    if not groups:
        raise PartError("fastener groups: at least one group is needed")
    edges = [h.edge for g in groups for h in g.holes]
    if len(set(edges)) != len(edges):
        raise PartError("fastener groups: a hole belongs to one group and holds one fastener")
    for group in groups:
        _check_fastener(group)
        _check_load(group)
        own = _self_planes(group, planes, tolerance)
        for plane in planes:
            axis = 0 if plane == "x" else 1
            if plane in own and group.load is not None and (
                    abs(group.load[axis]) > MOMENT_TOLERANCE * math.hypot(*group.load[:2])
                    or abs(group.load[2]) > MOMENT_TOLERANCE * _load_size(group)):
                raise PartError(f"{group.name}: a group centred on the symmetry plane {plane} = 0 must be symmetric "
                                f"about it: no force along {plane} and no moment")
            if plane not in own and any(abs(h.center[axis]) <= tolerance for h in group.holes):
                raise PartError(f"{group.name}: a hole on the symmetry plane {plane} = 0 needs its group centred "
                                "on the plane")


def _check_fastener(group: FastenerGroup) -> None:
    fastener = group.fastener
    if not group.holes:
        raise PartError(f"{group.name}: a group needs at least one hole")
    if not (fastener.diameter > 0.0 and math.isfinite(fastener.diameter)):
        raise PartError(f"{group.name}: the fastener's diameter must be a positive number of mm")
    if not 0.0 <= fastener.clearance < MAX_CLEARANCE * (fastener.diameter + fastener.clearance):
        raise PartError(f"{group.name}: the clearance must be zero or more and less than "
                        f"{MAX_CLEARANCE:.0%} of the hole's diameter")
    if not (isinstance(fastener.shear_planes, int) and fastener.shear_planes >= 1):
        raise PartError(f"{group.name}: the number of shear planes must be a whole number, 1 or more")
    if not fastener.stiffness > 0.0:
        raise PartError(f"{group.name}: the fastener's stiffness must be positive (N/mm), or rigid")
    for hole in group.holes:
        fit = fastener.diameter + fastener.clearance
        if abs(hole.diameter - fit) > FIT_TOLERANCE * fit:
            raise PartError(f"{group.name}: {hole.edge} is {hole.diameter:g} mm across; a {fastener.diameter:g} mm "
                            f"fastener with {fastener.clearance:g} mm clearance needs {fit:g} mm")
    centres = np.array([h.center for h in group.holes], float)
    apart = np.linalg.norm(centres[:, None] - centres[None], axis=2)
    if np.any(apart[~np.eye(len(centres), dtype=bool)] <= 0.0):
        raise PartError(f"{group.name}: two of its holes have the same centre")
    if group.seats is not None and len(group.seats) != len(group.holes):
        raise PartError(f"{group.name}: give one seat direction per hole ({len(group.holes)}), or none")


def _check_load(group: FastenerGroup) -> None:
    if group.load is None:
        return
    if len(group.load) != 3 or not all(math.isfinite(v) for v in group.load):
        raise PartError(f"{group.name}: the load is three finite numbers (Fx N, Fy N, Mz N mm)")
    if len(group.holes) == 1:
        arm = np.asarray(group.point) - np.asarray(group.holes[0].center)
        fx, fy, mz = group.load
        about_pin = mz + arm[0] * fy - arm[1] * fx
        if abs(about_pin) > MOMENT_TOLERANCE * _load_size(group):
            raise PartError(f"{group.name}: a single frictionless fastener carries no moment; its load has "
                            f"{about_pin:g} N mm about the fastener's centre (give a second fastener, or no moment)")


def _load_size(group: FastenerGroup) -> float:
    """A force-times-length size of the group's load (N mm), for relative tolerances."""
    span = max(max(h.diameter for h in group.holes),
               max(math.dist(h.center, group.point) for h in group.holes))
    fx, fy, mz = group.load
    return max(math.hypot(fx, fy) * span, abs(mz), 1e-300)


def _hole(groups: Sequence[FastenerGroup], j: int) -> GroupHole:
    return [h for g in groups for h in g.holes][int(j)]


def _force_scale(groups: Sequence[FastenerGroup], layout: _Layout, f: np.ndarray) -> float:
    """A force (N) the contact forces are measured against: the largest modelled group force (or moment
    over its L), or half the sum of the plate's other nodal forces."""
    scale = 0.5 * float(np.sum(np.abs(f)))
    for dofs, length, group in zip(layout.member, layout.length, groups):
        if group.holding:
            continue
        share = layout.load[dofs - f.size]
        scale = max(scale, float(np.linalg.norm(share[:2])), abs(float(share[2])) if length else 0.0)
    return max(scale, 1e-300)


def fastener_seats(groups: Sequence[FastenerGroup], layout: _Layout, f: np.ndarray, mesh: Mesh) -> list[float]:
    """Each fastener's seat direction (radians from +x): given, or the default (module docstring)."""
    seats = np.zeros(layout.group_of.size)
    guess = _member_motion(layout, groups, f, mesh)
    for j, g in enumerate(layout.group_of):
        given = groups[g].seats
        k = j - int(np.flatnonzero(layout.group_of == g)[0])
        seats[j] = math.radians(given[k]) if given is not None else math.atan2(guess[j, 1], guess[j, 0])
    return seats.tolist()


def _member_motion(layout: _Layout, groups: Sequence[FastenerGroup], f: np.ndarray, mesh: Mesh) -> np.ndarray:
    """(F, 2) each fastener's motion B_j U on a rigid plate with unit fastener springs: a loading group's
    member under its load; the holding fasteners, as one pattern, resisting the plate's other loads."""
    motion = np.zeros((layout.group_of.size, 2))
    for g, group in enumerate(groups):
        mine = np.flatnonzero(layout.group_of == g)
        if not group.holding:
            motion[mine] = _pattern_motion(layout.member_coef[mine], np.array(group.load, float),
                                           layout.length[g], len(group.holes) > 1)
    holding = np.flatnonzero([groups[g].holding for g in layout.group_of])
    if holding.size:
        centres = np.array([_hole(groups, j).center for j in holding], float)
        about = centres.mean(axis=0)
        fx, fy, mz = _applied_resultant(f, mesh, groups, about)
        arms = centres - about
        L = float(np.sqrt(np.mean(np.sum(arms ** 2, axis=1))))
        b = np.zeros((holding.size, 2, 3))
        b[:, 0, 0] = b[:, 1, 1] = 1.0
        if L > 0.0:
            b[:, 0, 2], b[:, 1, 2] = -arms[:, 1] / L, arms[:, 0] / L
        motion[holding] = _pattern_motion(b, -np.array([fx, fy, mz]), L, L > 0.0)
    return motion


def _pattern_motion(b: np.ndarray, load: np.ndarray, length: float, turns: bool) -> np.ndarray:
    """(m, 2) motions B_j U of a rigid member on unit springs at its fasteners under `load` (Fx, Fy, Mz)."""
    slots = 3 if turns else 2
    bb = b[:, :, :slots]
    stiffness = np.einsum("jci,jck->ik", bb, bb)
    rhs = np.array([load[0], load[1], load[2] / length])[:slots] if turns else load[:2]
    return np.einsum("jci,i->jc", bb, np.linalg.lstsq(stiffness, rhs, rcond=None)[0])


def _applied_resultant(f: np.ndarray, mesh: Mesh, groups: Sequence[FastenerGroup], about: np.ndarray) -> np.ndarray:
    """(Fx, Fy, Mz) of the plate's nodal forces and the loading groups' loads, about `about`."""
    p = f.reshape(-1, 2)
    arm = mesh.nodes - about
    total = np.array([p[:, 0].sum(), p[:, 1].sum(), np.sum(arm[:, 0] * p[:, 1] - arm[:, 1] * p[:, 0])])
    for group in groups:
        if not group.holding:
            fx, fy, mz = group.load
            a = np.asarray(group.point) - about
            total += [fx, fy, mz + a[0] * fy - a[1] * fx]
    return total


def _first_set(contact: ContactNodes, start: Sequence[Sequence[tuple[float, float]] | None] | None) -> np.ndarray:
    """The half of each hole facing its seat, or the nodes within a coarser mesh's arcs."""
    active = np.cos(contact.angle) > 1e-12
    if start is None:
        return active
    margin = math.radians(START_MARGIN)
    for j, arcs in enumerate(start):
        mine = contact.fastener == j
        within = np.zeros_like(mine)
        for arc in arcs or ():
            lo, hi = (math.radians(a) for a in arc)
            for turn in (0.0, 2.0 * math.pi):  # an arc across the back of the hole ends above pi
                a = contact.angle + turn
                within |= mine & (a >= lo - margin) & (a <= hi + margin)
        if within.any():
            active = np.where(mine, within, active)
    return active


def contact_arcs(angle: np.ndarray, active: np.ndarray) -> tuple[tuple[float, float], ...]:
    """Each contiguous stretch of active nodes around one hole, (first, last) in degrees from the seat,
    from the nodes' angles (radians within (-pi, pi]); a stretch across the back of the hole is one
    stretch ending above 180 degrees."""
    order = np.argsort(angle, kind="stable")
    on, deg = active[order], np.degrees(angle[order])
    if not on.any():
        return ()
    if on.all():
        return ((float(deg[0]), float(deg[-1])),)
    edges = np.diff(np.concatenate([[0], on.astype(np.int8), [0]]))
    starts, stops = np.flatnonzero(edges == 1), np.flatnonzero(edges == -1) - 1
    runs = [[float(deg[a]), float(deg[b])] for a, b in zip(starts, stops)]
    if on[0] and on[-1] and len(runs) > 1:  # the first and last stretches meet behind the hole
        first = runs.pop(0)
        runs[-1][1] = first[1] + 360.0
    return tuple((a, b) for a, b in runs)


# --- held, or a mechanism ------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Restraint:
    """What can hold the plate against its rigid-body motions (fem.solve.rigid_modes): the (3, 3) Gram
    matrix of the modes on its held DOFs, and (k, 3) the radial motion each mode gives every contact node
    (zero rows for the nodes of loading groups, which hold nothing)."""

    held: np.ndarray
    contact: np.ndarray


def plate_restraint(mesh: Mesh, fixed: np.ndarray, contact: ContactNodes, groups, layout: _Layout) -> _Restraint:
    modes = rigid_modes(mesh.n_nodes, mesh.nodes)
    rows = modes[np.asarray(fixed, dtype=np.int64)]
    holding = np.array([g.holding for g in groups])[layout.group_of[contact.fastener]]
    radial = np.einsum("kc,kcm->km", contact.normal, modes.reshape(mesh.n_nodes, 2, 3)[contact.nodes])
    return _Restraint(rows.T @ rows, radial * holding[:, None])


def _check_not_mechanism(mesh: Mesh, groups, layout: _Layout, contact: ContactNodes, restraint: _Restraint,
                         active: np.ndarray, whole: bool) -> None:
    """Raise SolverError, naming what is missing, when the plate or a loading group's member is free to
    move: the plate against its supports and the contact of its holding groups, a member against its
    fasteners' contact. With `whole` every hole node counts (a mechanism whatever the contact), else the
    active ones (the contact of this pass touches at too few nodes)."""
    normal, on = contact.normal, active
    rows = restraint.contact[on]
    free = _free_motion(restraint.held + rows.T @ rows)
    if free is not None:
        raise SolverError(_mechanism_message(mesh, groups, free, whole))
    for g, group in enumerate(groups):
        slots = layout.free_slots[g]
        if slots.size == 0:
            continue
        mine = on & (layout.group_of[contact.fastener] == g)
        rows = np.einsum("kc,kcm->km", normal[mine], layout.member_coef[contact.fastener[mine]])[:, slots]
        if not mine.any() or np.linalg.eigvalsh(rows.T @ rows)[0] <= HOLD_LIMIT * max(int(mine.sum()), 1):
            raise SolverError(f"{group.name}'s fasteners touch their holes at too few nodes to hold its member (the "
                              "clearance is large for this load and mesh); refine the mesh or reduce the clearance")


def _free_motion(gram: np.ndarray) -> np.ndarray | None:
    """A rigid-body motion (3,) of the plate (modes of fem.solve.rigid_modes) the restraint leaves free, or
    None; two or three free motions give the (3, m) basis."""
    values, vectors = np.linalg.eigh(gram)
    free = values <= MECHANISM_LIMIT * max(float(values[-1]), 1e-300)
    if not free.any():
        return None
    return vectors[:, free]


def _mechanism_message(mesh: Mesh, groups, free: np.ndarray, whole: bool) -> str:
    """What holds nothing, in words: the point the plate can turn about, or the direction it can slide."""
    if not whole:
        return ("the holding fasteners touch their holes at too few nodes to hold the part (the clearance is large "
                "for this load and mesh); refine the mesh or reduce the clearance")
    if free.shape[1] > 1:
        return ("the part is a mechanism: nothing holds it (give it a support, or a fastener group that holds it; "
                "a group that carries a load holds nothing)")
    a, b, w = free[:, 0]
    centre = mesh.nodes.mean(axis=0)
    size = max(float(np.abs(mesh.nodes - centre).max()), 1e-300)
    if abs(w) > 1e-3 * math.hypot(a, b):
        point = [centre[0] - b * size / w, centre[1] + a * size / w]
        x, y = (0.0 if abs(v) <= 1e-9 * size else v for v in point)
        pin = next((f"{g.name}'s fastener in {h.edge} at " for g in groups if g.holding for h in g.holes
                    if math.dist(h.center, point) <= 0.5 * h.diameter), "")
        return (f"the part is a mechanism: it can turn about {pin}({x:.6g}, {y:.6g}) mm, and nothing holds that "
                "rotation (a frictionless fastener holds no turning): hold it at a second fastener or along an edge")
    angle = math.degrees(math.atan2(b, a)) % 180.0
    return (f"the part is a mechanism: it can slide along the direction {angle:.1f} degrees from +x, and nothing "
            "holds it there: hold it along an edge or through a fastener group that holds it")


# --- one pass -------------------------------------------------------------------------------------------------


def constraint_transform(size: int, contact: ContactNodes, active: np.ndarray, layout: _Layout) -> sp.csr_matrix:
    """(N, N) matrix T with u = T q + shift: identity except at the active nodes, whose DOF pair holds
    (tau, w) in their own frame and whose displacement follows their pin body (module docstring)."""
    nodes, e = contact.nodes[active], contact.normal[active]
    pins = contact.fastener[active]
    t = np.column_stack([-e[:, 1], e[:, 0]])
    keep = np.ones(size, dtype=bool)
    keep[2 * nodes] = keep[2 * nodes + 1] = False
    identity = np.flatnonzero(keep)
    along = np.einsum("kc,kcm->km", e, layout.pin_coef[pins])  # e_i . (coefficient of each pin DOF)
    rows, cols, vals = [identity], [identity], [np.ones(identity.size)]
    for c in (0, 1):
        row = 2 * nodes + c
        rows += [row, row] + [row] * 3
        cols += [2 * nodes, 2 * nodes + 1] + [layout.pin_cols[pins, m] for m in range(3)]
        vals += [t[:, c], e[:, c]] + [e[:, c] * along[:, m] for m in range(3)]
    rows, cols, vals = np.concatenate(rows), np.concatenate(cols), np.concatenate(vals)
    nonzero = vals != 0.0
    return sp.csr_matrix((vals[nonzero], (rows[nonzero], cols[nonzero])), shape=(size, size))


def _solve_active(K, K_aug, f_aug, fixed_aug, contact: ContactNodes, active, layout: _Layout, positions, solver):
    """One pass: solve with the active constraints exact; return u (N,), the report, the contact forces
    lambda (k,) at every hole node (meaningful at active ones) and the gaps (k,). K is the plate's own
    stiffness: the plate's rows of K_aug, which give the residual."""
    size = K_aug.shape[0]
    T = constraint_transform(size, contact, active, layout)
    nodes, e, g0 = contact.nodes[active], contact.normal[active], contact.gap[active]
    shift = np.zeros(size)
    shift[2 * nodes], shift[2 * nodes + 1] = -e[:, 0] * g0, -e[:, 1] * g0
    K_t = (T.T @ K_aug @ T).tocsr()
    K_t.sum_duplicates()
    K_t.sort_indices()
    f_t = T.T @ (f_aug - K_aug @ shift)
    held = np.setdiff1d(fixed_aug, np.concatenate([2 * nodes, 2 * nodes + 1]))
    local = [2 * nodes + 1, 2 * contact.nodes[active & contact.held]]  # w = 0, and tau = 0 on a plane
    fixed_t = np.unique(np.concatenate([held, *local]).astype(np.int64))
    q, report = solve_system(K_t, f_t, fixed_t, solver, positions)
    u = T @ q + shift
    n2 = K.shape[0]
    residual = (K @ u[:n2] - f_aug[:n2]).reshape(-1, 2)
    lam = np.einsum("ij,ij->i", contact.normal, residual[contact.nodes])
    pins = pin_displacements(u, layout)
    gap = contact.gap + np.einsum("ij,ij->i", contact.normal, u[:n2].reshape(-1, 2)[contact.nodes]
                                  - pins[contact.fastener])
    return u, report, lam, gap


def pin_displacements(u: np.ndarray, layout: _Layout) -> np.ndarray:
    """(F, 2) each pin body's translation V_j (mm) from the augmented displacements."""
    return np.einsum("jcm,jm->jc", layout.pin_coef, u[layout.pin_cols])


# --- results ----------------------------------------------------------------------------------------------------


def _results(u, lam, gap, contact: ContactNodes, active, groups, layout: _Layout, seats, mesh: Mesh, thickness,
             passes, report) -> GroupsSolve:
    n = mesh.n_nodes
    forces = np.zeros(2 * n)
    forces[2 * contact.nodes] = lam * contact.normal[:, 0]
    forces[2 * contact.nodes + 1] = lam * contact.normal[:, 1]
    count = layout.group_of.size
    per_pin = np.column_stack([np.bincount(contact.fastener, weights=lam * contact.normal[:, c], minlength=count)
                               for c in (0, 1)])
    pressure = contact_pressure(mesh, contact, lam, groups, thickness)
    pins = pin_displacements(u, layout)
    holes = [h for g in groups for h in g.holes]
    whole = np.where(layout.across, 0.0, per_pin) / layout.portion[:, None]
    magnitude = np.linalg.norm(whole, axis=1)
    images = layout.mirrors[layout.group_of] * layout.portion  # the fastener and its images in the full part
    total = np.bincount(layout.group_of, weights=images * magnitude, minlength=len(groups))
    fasteners = []
    for j, hole in enumerate(holes):
        g = int(layout.group_of[j])
        fastener = groups[g].fastener
        mine = contact.fastener == j
        size = float(magnitude[j])
        fasteners.append(FastenerResult(
            g, hole, float(layout.portion[j]), whole[j], size / total[g] if total[g] > 0 else 0.0,
            bearing_stress(size, fastener.diameter, thickness),
            shear_stress(size, fastener.diameter, fastener.shear_planes), math.degrees(seats[j]),
            contact_arcs(contact.angle[mine], active[mine]), int(np.sum(mine & active)),
            float(pressure[contact.nodes[mine]].max()), pins[j], float(max(0.0, -gap[mine].min()))))
    return GroupsSolve(u[:2 * n], forces, contact, active, lam, gap, tuple(fasteners),
                       _group_results(u, per_pin, groups, layout), passes, report)


def _group_results(u, per_pin, groups, layout: _Layout) -> tuple[GroupResult, ...]:
    """Each group's resultant: the modelled fasteners' forces and moment, or for a self-mirrored group
    (images in the full part) the modelled force's components along its planes times its images, and no
    moment (the images' moments cancel about a reference point on the planes)."""
    out = []
    for g, group in enumerate(groups):
        mine = layout.group_of == g
        arms = np.array([h.center for h in group.holes], float) - np.asarray(group.point)
        force = np.where(layout.own[g], 0.0, per_pin[mine].sum(axis=0) * layout.mirrors[g])
        moment = 0.0 if layout.mirrors[g] > 1 else float(np.sum(arms[:, 0] * per_pin[mine, 1]
                                                                 - arms[:, 1] * per_pin[mine, 0]))
        dofs = layout.member[g]
        rotation = float(u[dofs[2]] / layout.length[g]) if dofs.size == 3 else 0.0
        out.append(GroupResult(group, force, moment, u[dofs[:2]].copy(), rotation))
    return tuple(out)


def tributary_lengths(mesh: Mesh, name: Hashable) -> np.ndarray:
    """(n,) length (mm) of the named edge each node stands for: half of each straight edge at the node,
    or for 6-node triangles the Simpson weights (1/6, 4/6, 1/6 of each 3-node edge's length) that the
    consistent forces of a uniform pressure carry."""
    out = np.zeros(mesh.n_nodes)
    if mesh.quadratic_edges is not None and name in mesh.quadratic_edges:
        e3 = mesh.quadratic_edges[name]
        p = mesh.nodes
        length = np.linalg.norm(p[e3[:, 2]] - p[e3[:, 0]], axis=1) + np.linalg.norm(p[e3[:, 1]] - p[e3[:, 2]], axis=1)
        for column, weight in ((0, 1 / 6), (1, 1 / 6), (2, 4 / 6)):
            out += np.bincount(e3[:, column], weights=weight * length, minlength=mesh.n_nodes)
        return out
    edges = mesh.edges[name]
    length = np.linalg.norm(mesh.nodes[edges[:, 1]] - mesh.nodes[edges[:, 0]], axis=1)
    return np.bincount(edges.ravel(), weights=np.repeat(0.5 * length, 2), minlength=mesh.n_nodes)


def contact_pressure(mesh: Mesh, contact: ContactNodes, lam: np.ndarray, groups: Sequence[FastenerGroup],
                     thickness: float) -> np.ndarray:
    """(n,) contact pressure (MPa, >= 0) at each node of the modelled mesh: node force / tributary length /
    thickness on the fasteners' holes, zero elsewhere (for the exact edge state, fem.recovery)."""
    pressure = np.zeros(mesh.n_nodes)
    tributary = np.zeros(contact.nodes.size)
    for j, hole in enumerate(h for g in groups for h in g.holes):
        mine = contact.fastener == j
        tributary[mine] = tributary_lengths(mesh, hole.edge)[contact.nodes[mine]]
    pressure[contact.nodes] = np.maximum(lam, 0.0) / (tributary * thickness)
    return pressure
