"""A rigid, frictionless pin in its hole: the contact found by an active-set iteration, constraints exact.

Model (small displacements; mm, N, MPa). The pin is a rigid body of diameter d - c (c the diametral
clearance, >= 0) whose centre starts c/2 from the hole's centre towards the pin's direction phi, so that
it touches the hole first at the point facing phi. It translates by U (two DOFs; one when the plane y = 0
of a half model fixes U_y) under the pin force P along phi, and it cannot turn anything: a frictionless
contact force is radial. Each node i of the hole's edge, at angle a_i from the hole centre and distance
r_i from it, with unit radial e_i = (cos a_i, sin a_i) pointing into the material, has the gap

    g_i = g0_i + e_i . (u_i - U),   g0_i = r_i - s cos(a_i - phi) - sqrt(r_p^2 - s^2 sin^2(a_i - phi))

(s = c/2, r_p = d/2 - s: g0 is the distance from the hole's edge to the pin's surface along the hole's
radius, zero at a = phi), which must stay >= 0 (no penetration), and takes a contact force lambda_i e_i
on the material with lambda_i >= 0 (the pin pushes, never pulls) and lambda_i g_i = 0.

Active set (a primal-dual iteration): for the set A of nodes in contact the constraints g_i = 0 are
imposed exactly by a change of variables, not by penalty springs, so the only constraint error left is
round-off. Each active node's displacement is written in its own frame,

    u_i = t_i tau_i + e_i (w_i - g0_i + e_i . U),   t_i = (-e_iy, e_ix),

with w_i = g_i held at zero and tau_i its free, frictionless slip along the edge; the pin's U joins the
unknowns as one more node, at the hole's centre, loaded by P. The transformed stiffness T^T K T stays
symmetric positive definite, so fem.solve.solve_system solves it unchanged. The contact forces follow
from the residual at the active nodes, lambda_i = e_i . (K u - f)_i, and the pin's own equation makes
their sum equal P to round-off. Nodes with lambda_i < 0 (pulling) leave the set, free nodes with
g_i < 0 (penetrating) join it, and the pass repeats until the set is unchanged. The first pass takes the
loaded half of the hole (its nodes facing phi), or the arc a coarser mesh's contact settled on.

A symmetric model holds the part of the pin on its side of the planes: P/2 with the plane y = 0 (the
pin's centre lies on it), the whole pin with the plane x = 0 (the pin's hole lies on the side x > 0 and
its mirror image carries the mirrored pin). `PinContact` describes the full part.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
import scipy.sparse as sp

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec
from ..geometry.symmetry import symmetry_tolerance
from .solve import SolveReport, SolverError, solve_system

MAX_PASSES = 40  # active-set passes before the contact is declared unsettled (seen: 1-3 a level from the
                 # coarser level's arc; up to 8 from the loaded half, with clearance)
FORCE_TOLERANCE = 1e-9  # of the pin force: a contact force more negative than this is pulling
GAP_TOLERANCE = 1e-9  # of the largest relative displacement at the hole: a gap more negative is penetrating
START_MARGIN = 1e-6  # degrees: a node on the edge of a coarser mesh's contact arc starts in contact


@dataclass(frozen=True)
class HoleNodes:
    """The pin's hole on one (modelled) mesh: node indices (k,), unit radials into the material (k, 2),
    angles from the pin's direction (k,) in radians within (-pi, pi], initial gaps (k,) in mm, and which
    nodes have a DOF held by a symmetry plane (k,) bool (always along the edge: the plane y = 0 through
    the hole's centre)."""

    nodes: np.ndarray
    normal: np.ndarray
    angle: np.ndarray
    gap: np.ndarray
    held: np.ndarray


@dataclass(frozen=True)
class ContactSolve:
    """One mesh's contact solve, on the modelled mesh: displacements (2n,) mm, the contact forces on the
    material (2n,) N, the pin's translation (2,) mm, the active mask over `hole.nodes`, the contact
    forces lambda (k,) N (zero off contact), the gaps (k,) mm, passes taken and the last solve's report
    (seconds summed over the passes)."""

    displacement: np.ndarray
    forces: np.ndarray
    pin_displacement: np.ndarray
    hole: HoleNodes
    active: np.ndarray
    normal_force: np.ndarray
    gap: np.ndarray
    passes: int
    report: SolveReport


@dataclass(frozen=True)
class PinContact:
    """A rigid pin's contact after the solve, for the full part (mm, N, MPa, degrees).

    clearance: the pin's diametral clearance (mm).
    points: (m, 2) hole-edge nodes the pin presses on, with every mirror image; forces: (m, 2) the pin's
      force on the part at each (N; radial, pushing the material away from the hole's centre).
    arc: (first, last) angle of the contact around the pin's hole, from the pin's direction,
      counter-clockwise (degrees).
    passes: active-set passes (solves) the last mesh took.
    pin_displacement: the modelled pin's translation (mm).
    penetration: the largest penetration of the pin into the hole's edge left at any node (mm; >= 0).
    peak_pressure: the largest contact pressure, node force / tributary length / thickness (MPa).
    """

    clearance: float
    points: np.ndarray
    forces: np.ndarray
    arc: tuple[float, float]
    passes: int
    pin_displacement: tuple[float, float]
    penetration: float
    peak_pressure: float


def rigid_pin(spec: PartSpec) -> bool:
    """True when the part is loaded through a rigid-contact pin."""
    return spec.load.pin is not None and spec.load.pin.contact == "rigid"


def modelled_pin_force(spec: PartSpec) -> np.ndarray:
    """(2,) the force (N) on the pin of the model: P along phi, halved by the plane y = 0."""
    pin = spec.load.pin
    share = 0.5 if "y" in spec.support.symmetry else 1.0
    return share * pin.force * np.array([math.cos(pin.angle), math.sin(pin.angle)])


def initial_gap(distance: np.ndarray, radius: float, angle: np.ndarray, clearance: float) -> np.ndarray:
    """(k,) gap (mm) along the hole's radius from hole-edge points at `distance` (mm) from the hole's
    centre and `angle` (radians from the pin's direction) to the surface of a pin of diameter
    2 radius - clearance touching the hole at angle 0 (see the module docstring)."""
    s = 0.5 * clearance
    pin_radius = radius - s
    across = s * np.sin(angle)
    return distance - s * np.cos(angle) - np.sqrt(pin_radius ** 2 - across ** 2)


def hole_nodes(spec: PartSpec, mesh: Mesh, fixed: np.ndarray) -> HoleNodes:
    """The nodes of the pin's hole on `mesh`, their radials, angles, initial gaps and held DOFs.

    A node on the plane y = 0 has its radial snapped to +-x, so that the plane's roller (holding y) is
    exactly along the edge."""
    pin = spec.load.pin
    hole = spec.holes[pin.hole - 1]
    nodes = mesh.edge_nodes(f"hole {pin.hole}")
    rel = mesh.nodes[nodes] - np.asarray(hole.center)
    distance = np.linalg.norm(rel, axis=1)
    normal = rel / distance[:, None]
    on_plane = np.abs(mesh.nodes[nodes, 1]) <= symmetry_tolerance(spec) if "y" in spec.support.symmetry else \
        np.zeros(len(nodes), dtype=bool)
    normal[on_plane] = np.column_stack([np.sign(normal[on_plane, 0]), np.zeros(int(on_plane.sum()))])
    held_dofs = np.zeros(2 * mesh.n_nodes, dtype=bool)
    held_dofs[fixed] = True
    held_x, held_y = held_dofs[2 * nodes], held_dofs[2 * nodes + 1]
    if np.any(held_x) or np.any(held_y & ~on_plane):
        raise SolverError(f"hole {pin.hole} has nodes held in a direction across its edge; a rigid pin "
                          "cannot bear there (is the pin's hole on a support?)")
    angle = np.angle(np.exp(1j * (np.arctan2(normal[:, 1], normal[:, 0]) - pin.angle)))
    return HoleNodes(nodes, normal, angle, initial_gap(distance, hole.radius, angle, pin.clearance), held_y)


def constraint_transform(n_dofs: int, hole: HoleNodes, active: np.ndarray, pin_dofs: tuple[int, int]) -> sp.csr_matrix:
    """(N, N) matrix T with u = T q + shift: identity except at the active nodes, whose DOF pair holds
    (tau, w) in their own frame and whose displacement follows the pin's DOFs (module docstring)."""
    nodes, e = hole.nodes[active], hole.normal[active]
    t = np.column_stack([-e[:, 1], e[:, 0]])
    keep = np.ones(n_dofs, dtype=bool)
    keep[2 * nodes] = keep[2 * nodes + 1] = False
    identity = np.flatnonzero(keep)
    rows, cols, vals = [identity], [identity], [np.ones(identity.size)]
    k = nodes.size
    for c in (0, 1):
        row = 2 * nodes + c
        rows += [row, row, row, row]
        cols += [2 * nodes, 2 * nodes + 1, np.full(k, pin_dofs[0]), np.full(k, pin_dofs[1])]
        vals += [t[:, c], e[:, c], e[:, c] * e[:, 0], e[:, c] * e[:, 1]]
    return sp.csr_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(n_dofs, n_dofs))


def solve_pin_contact(K: sp.spmatrix, f: np.ndarray, fixed: np.ndarray, spec: PartSpec, mesh: Mesh,
                      start: tuple[float, float] | None = None) -> ContactSolve:
    """Displacements of the part with a rigid pin in contact (module docstring).

    K: (2n, 2n) stiffness (N/mm); f: (2n,) the other applied forces (N); fixed: held DOFs; start: the
    contact arc (degrees from the pin's direction) to take as the first active set, or None for the
    loaded half. Raises SolverError when the contact does not settle or cannot hold the pin."""
    n = mesh.n_nodes
    hole = hole_nodes(spec, mesh, fixed)
    pin_dofs = (2 * n, 2 * n + 1)
    K_aug = sp.block_diag([sp.csr_matrix(K), sp.csr_matrix((2, 2))], format="csr")
    force = modelled_pin_force(spec)
    f_aug = np.concatenate([f, force])
    nodes_aug = np.vstack([mesh.nodes, spec.holes[spec.load.pin.hole - 1].center])
    pin_fixed = [pin_dofs[1]] if "y" in spec.support.symmetry else []
    active = _first_set(hole, start)
    seen: set[bytes] = set()
    seconds = 0.0
    for passes in range(1, MAX_PASSES + 1):
        seen.add(active.tobytes())
        _check_holds_pin(hole, active, spec)
        u, report, lam, gap = _solve_active(K_aug, f_aug, fixed, hole, active, pin_dofs, pin_fixed, nodes_aug,
                                            spec.mesh.solver)
        seconds += report.seconds
        scale = max(float(np.max(np.abs(gap - hole.gap))), 0.5 * spec.load.pin.clearance, 1e-300)
        pulling = active & (lam < -FORCE_TOLERANCE * float(np.linalg.norm(force)))
        penetrating = ~active & (gap < -GAP_TOLERANCE * scale)
        if not pulling.any() and not penetrating.any():
            lam = np.where(active, lam, 0.0)
            forces = np.zeros(2 * n)
            forces[2 * hole.nodes] = lam * hole.normal[:, 0]
            forces[2 * hole.nodes + 1] = lam * hole.normal[:, 1]
            return ContactSolve(u[:2 * n], forces, u[2 * n:], hole, active, lam, gap, passes,
                                replace(report, seconds=seconds))
        active = (active & ~pulling) | penetrating
        if active.tobytes() in seen:
            break
    raise SolverError(f"the rigid pin's contact with hole {spec.load.pin.hole} did not settle in {passes} "
                      "active-set passes; try contact = \"cosine\" or a finer mesh (mesh.tolerance)")


def _first_set(hole: HoleNodes, start: tuple[float, float] | None) -> np.ndarray:
    """The loaded half (nodes facing the pin's direction), or the nodes within a coarser mesh's arc."""
    if start is not None:
        lo, hi = (math.radians(a) for a in start)
        margin = math.radians(START_MARGIN)
        within = (hole.angle >= lo - margin) & (hole.angle <= hi + margin)
        if within.any():
            return within
    return np.cos(hole.angle) > 1e-12


def _check_holds_pin(hole: HoleNodes, active: np.ndarray, spec: PartSpec) -> None:
    """The active normals must hold the pin in each of its free directions."""
    e = hole.normal[active]
    if "y" in spec.support.symmetry:  # the plane holds the pin across its line
        held = float(np.sum(e[:, 0] ** 2)) > 1e-12
    else:
        held = len(e) > 0 and float(np.linalg.eigvalsh(e.T @ e)[0]) > 1e-12 * len(e)
    if not held:
        raise SolverError(f"the rigid pin touches hole {spec.load.pin.hole} at too few nodes to be held (the "
                          "clearance is large for this load and mesh); refine the mesh or reduce the clearance")


def _solve_active(K_aug, f_aug, fixed, hole: HoleNodes, active, pin_dofs, pin_fixed, nodes_aug, solver):
    """One pass: solve with the active constraints exact; return u (2n + 2,), the report, the contact
    forces lambda (k,) at every hole node (meaningful at active ones) and the gaps (k,)."""
    size = K_aug.shape[0]
    T = constraint_transform(size, hole, active, pin_dofs)
    nodes, e, g0 = hole.nodes[active], hole.normal[active], hole.gap[active]
    shift = np.zeros(size)
    shift[2 * nodes], shift[2 * nodes + 1] = -e[:, 0] * g0, -e[:, 1] * g0
    K_t = (T.T @ K_aug @ T).tocsr()
    K_t.sum_duplicates()
    K_t.sort_indices()
    f_t = T.T @ (f_aug - K_aug @ shift)
    held = set(np.asarray(fixed, dtype=np.int64).tolist())
    held -= set((2 * nodes).tolist()) | set((2 * nodes + 1).tolist())
    local = list(2 * nodes + 1)  # w = 0: the constraints
    local += list(2 * hole.nodes[active & hole.held])  # tau = 0 where a symmetry plane holds the slip
    fixed_t = np.unique(np.array(sorted(held) + local + list(pin_fixed), dtype=np.int64))
    q, report = solve_system(K_t, f_t, fixed_t, solver, nodes_aug)
    u = T @ q + shift
    n2 = size - 2
    residual = (K_aug[:n2] @ u - f_aug[:n2]).reshape(-1, 2)
    lam = np.einsum("ij,ij->i", hole.normal, residual[hole.nodes])
    uu = u[:n2].reshape(-1, 2)
    gap = hole.gap + np.einsum("ij,ij->i", hole.normal, uu[hole.nodes] - u[n2:])
    return u, report, lam, gap


def tributary_lengths(mesh: Mesh, name: str) -> np.ndarray:
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


def contact_pressure(mesh: Mesh, solved: ContactSolve, spec: PartSpec) -> np.ndarray:
    """(n,) contact pressure (MPa, >= 0) at each node of the modelled mesh: node force / tributary length
    / thickness on the pin's hole, zero elsewhere (for the exact edge state, fem.recovery)."""
    pressure = np.zeros(mesh.n_nodes)
    tributary = tributary_lengths(mesh, f"hole {spec.load.pin.hole}")[solved.hole.nodes]
    pressure[solved.hole.nodes] = np.maximum(solved.normal_force, 0.0) / (tributary * spec.plate.thickness)
    return pressure


def full_part_contact(spec: PartSpec, mesh: Mesh, solved: ContactSolve, pressure: np.ndarray) -> PinContact:
    """The contact of the full part: the modelled contact forces with their mirror images (a node on a
    plane gathers both halves, as the plane's reactions do: fem.symmetry), and its arc."""
    on = solved.active
    points = mesh.nodes[solved.hole.nodes[on]]
    forces = solved.normal_force[on, None] * solved.hole.normal[on]
    tol = symmetry_tolerance(spec)
    for plane in spec.support.symmetry:
        axis = 0 if plane == "x" else 1
        flip = np.array([-1.0, 1.0]) if axis == 0 else np.array([1.0, -1.0])
        at_plane = np.abs(points[:, axis]) <= tol
        forces = forces.copy()
        forces[at_plane, axis] = 0.0
        forces[at_plane] *= 2.0
        points = np.vstack([points, points[~at_plane] * flip])
        forces = np.vstack([forces, forces[~at_plane] * flip])
    pin = spec.load.pin
    hole = spec.holes[pin.hole - 1]
    rel = points - np.asarray(hole.center)
    own = np.linalg.norm(rel, axis=1) <= 1.5 * hole.radius  # the pin's own hole, not a mirror image's
    angles = np.degrees(np.angle(np.exp(1j * (np.arctan2(rel[own, 1], rel[own, 0]) - pin.angle))))
    arc = (float(angles.min()), float(angles.max())) if angles.size else (0.0, 0.0)
    return PinContact(pin.clearance, points, forces, arc, solved.passes,
                      (float(solved.pin_displacement[0]), float(solved.pin_displacement[1])),
                      float(max(0.0, -solved.gap.min())), float(pressure.max()))

