"""One linear-elastic solve of a part on one mesh: displacements, element and nodal stresses."""

from __future__ import annotations

import time
from dataclasses import dataclass, field

import numpy as np

from ..geometry.boundary import stretch
from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec
from .assembly import element_stresses, stiffness_matrix
from .contact import (HeldPin, PinContact, contact_pressure, full_part_contact, group_forces, has_contact, held_pins,
                      part_fastener_results, rigid_pin, solve_contact)
from .elasticity import constitutive_matrix
from .loads import edge_loads, loaded_edge_names, part_loads, pin_pressure_at_nodes
from .recovery import free_edge_stress, patch_recovery, principal_stresses, tresca, von_mises
from .quadratic import quadratic_stiffness, sub_triangle_stresses
from .solve import SolveReport, solve_system
from .stretches import on_point, segment_edges
from .supports import Supports, singular_zone, skew_transform, support_set
from .symmetry import Fields, unfold

LOADED_EDGES = ("held", "loaded", "symmetry x", "symmetry y")  # not traction-free unless told otherwise
SYMMETRY_EDGES = ("symmetry x", "symmetry y")  # rollers: their corners with free edges keep the edge state
COMPRESSION_MARGIN = 0.02  # the compressive peak governs when its magnitude is this much larger


@dataclass(frozen=True)
class Solution:
    """Fields of one solve. Stresses in MPa ordered (sxx, syy, txy); displacements in mm.

    element_stress: (m, 3) constant stress of each triangle.
    nodal_stress: (n, 3) recovered nodal stress.
    principal: (n, 2) nodal principal stresses s1 >= s2.
    von_mises: (n,) nodal von Mises stress.
    seconds: wall time of each stage ("assemble", "solve", "recover").
    tresca: (n,) nodal Tresca stress.
    reactions: (2n,) support reactions in N (zero at DOFs that are not held).
    With symmetry planes every field is of the full part (the model is unfolded after the solve).
    """

    mesh: Mesh
    displacement: np.ndarray
    element_stress: np.ndarray
    nodal_stress: np.ndarray
    principal: np.ndarray
    von_mises: np.ndarray
    seconds: dict[str, float] = field(default_factory=dict)
    tresca: np.ndarray | None = None
    reactions: np.ndarray | None = None
    excluded: np.ndarray | None = None  # (n,) bool: nodes left out of the peak search (support singularities)
    solver: SolveReport | None = None  # how the system was solved (fem/solve.py)
    contact: PinContact | None = None  # a rigid loading pin's contact, for the full part (fem/contact.py)
    held_pins: tuple[HeldPin, ...] = ()  # the contact of every pin hold (their forces are reactions)
    contact_arcs: tuple | None = None  # per fastener of the contact solve, its arcs (the next level's start)
    pressure: np.ndarray | None = None  # (n,) a pin's or fastener's contact pressure on its hole (MPa, >= 0; else zero)
    fasteners: object | None = None  # the part file's fastener groups (fem.fastener_part.PartFasteners), or None

    @property
    def bearing(self) -> np.ndarray:
        """(n,) bool: nodes where a pin or fastener presses on the part (its contact pressure is positive)."""
        return self.pressure > 0.0 if self.pressure is not None else np.zeros(self.mesh.n_nodes, dtype=bool)

    def compressive_governs(self) -> bool:
        """True when the compressive peak governs: nothing bears on the part and the most negative minimum
        principal stress is larger in magnitude than the largest maximum principal stress by
        COMPRESSION_MARGIN. Where a pin bears, the compression under it is bearing, reported on its own:
        the tensile peak on the free edges governs."""
        return self._governing()[1] < 0.0

    def peak_node(self) -> int:
        """Index of the node with the governing principal stress: the largest maximum principal stress,
        unless nothing bears on the part and the most negative minimum principal stress is larger in
        magnitude by COMPRESSION_MARGIN."""
        return self._governing()[0]

    def peak_stress(self) -> float:
        """The governing principal stress (MPa, signed: negative when the compressive peak governs)."""
        return self._governing()[1]

    def searched(self, values: np.ndarray, largest: bool = True) -> int:
        """Index of the largest (or smallest) of nodal `values` among the nodes the peak search covers."""
        if self.excluded is None or self.excluded.all():
            return int(np.argmax(values) if largest else np.argmin(values))
        masked = np.where(self.excluded, -np.inf if largest else np.inf, values)
        return int(np.argmax(masked) if largest else np.argmin(masked))

    def _governing(self) -> tuple[int, float]:
        tension, compression = self.searched(self.principal[:, 0]), self.searched(self.principal[:, 1], largest=False)
        s1, s2 = float(self.principal[tension, 0]), float(self.principal[compression, 1])
        if not self.bearing.any() and -s2 > (1.0 + COMPRESSION_MARGIN) * max(s1, 0.0):
            return compression, s2
        return tension, s1


def solve_part(spec: PartSpec, mesh: Mesh, contact_start: tuple[float, float] | None = None) -> Solution:
    """Assemble, load, support and solve the part (its first load case) on `mesh`; recover nodal stresses.
    A rigid pin's contact is found by fem.contact, starting from `contact_start` (a coarser mesh's contact
    arc, degrees from the pin's direction) when given, else from the loaded half of the hole."""
    case = spec.load_cases[0]
    return solve_cases(spec.for_case(case), mesh, None if contact_start is None else [((contact_start,),)])[0]


def solve_cases(spec: PartSpec, mesh: Mesh, contact_starts: list | None = None) -> tuple[Solution, ...]:
    """Solve every load case of the part on `mesh`, in the order of spec.load_cases.

    One stiffness is assembled and one set of supports built for all cases. The cases without rigid pins
    are the columns of one solve (fem.solve: one factorisation, or one multigrid hierarchy); a case with a
    rigid pin (a loading pin with contact "rigid", or any pin hold) is nonlinear and runs its own
    active-set iteration (fem.contact) on the same assembled stiffness, each pass a solve of its own.
    contact_starts: per case, a coarser mesh's contact arcs (per fastener, fem.contact.solve_contact) or None."""
    clock = time.perf_counter()
    seconds: dict[str, float] = {}
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    t = spec.plate.thickness
    quadratic = mesh.quadratic is not None  # 6-node triangles; mesh.triangles are then their sub-triangles
    K = quadratic_stiffness(mesh.nodes, mesh.quadratic, D, t) if quadratic else stiffness_matrix(mesh.nodes, mesh.triangles, D, t)
    cases = [spec.for_case(c) for c in spec.load_cases]
    forces = [part_loads(case, mesh) for case in cases]
    seconds["assemble"], clock = time.perf_counter() - clock, time.perf_counter()
    supports = support_set(spec, mesh)
    turn = skew_transform(K.shape[0], supports.skew_nodes, supports.skew_normals) if supports.skew_nodes.size else None
    K_s = (turn.T @ K @ turn).tocsr() if turn is not None else K
    fixed = np.union1d(supports.fixed, 2 * supports.skew_nodes + 1).astype(np.int64)
    solved: list = [None] * len(cases)
    linear = [k for k, case in enumerate(cases) if not has_contact(case)]
    if linear:
        F = forces[linear[0]] if len(linear) == 1 else np.column_stack([forces[k] for k in linear])
        U, report = solve_system(K_s, F if turn is None else turn.T @ F, fixed, spec.mesh.solver, mesh.nodes)
        U = U if turn is None else turn @ U
        for j, k in enumerate(linear):
            solved[k] = (U if U.ndim == 1 else U[:, j], report, None)
    for k, case in enumerate(cases):
        if solved[k] is None:
            start = contact_starts[k] if contact_starts is not None else None
            f_s = forces[k] if turn is None else turn.T @ forces[k]
            contact = solve_contact(K_s, f_s, fixed, case, mesh, start)
            u = contact.displacement if turn is None else turn @ contact.displacement
            solved[k] = (u, contact.report, contact)
    seconds["solve"], clock = time.perf_counter() - clock, time.perf_counter()
    quadratic = mesh.quadratic is not None
    sigma = [sub_triangle_stresses(mesh.nodes, mesh.quadratic, D, s[0]) if quadratic
             else element_stresses(mesh.nodes, mesh.triangles, D, s[0]) for s in solved]
    patched = patch_recovery(mesh.nodes, mesh.triangles, np.hstack(sigma), mesh.boundary_nodes())  # all cases at once
    seconds["recover"] = (time.perf_counter() - clock) / len(cases)
    return tuple(_case_solution(case, mesh, K, forces[k], supports, solved[k], sigma[k], patched[:, 3 * k:3 * k + 3],
                                dict(seconds)) for k, case in enumerate(cases))


def _case_solution(spec: PartSpec, mesh: Mesh, K, f: np.ndarray, supports: Supports, solved, sigma_e: np.ndarray,
                   patched: np.ndarray, seconds: dict[str, float]) -> Solution:
    """One case's Solution from its displacements, element stresses and patch-recovered nodal stresses:
    reactions, the exact edge states, the full part's fields of a symmetric model, and the nodes the peak
    search skips."""
    clock = time.perf_counter()
    u, report, contact_solve = solved
    applied, pressure, loading, holding, arcs = f, pin_pressure_at_nodes(spec, mesh), None, (), None
    groups = None
    if contact_solve is not None:
        groups = part_fastener_results(contact_solve, spec, mesh)
        applied = f + group_forces(contact_solve, spec, holding=False)
        pressure = contact_pressure(mesh, contact_solve, spec)
        loading = full_part_contact(spec, mesh, contact_solve, pressure) if rigid_pin(spec) else None
        holding = held_pins(contact_solve, spec)
        arcs = tuple(f.arcs for f in contact_solve.fasteners)
    residual = K @ u - applied
    reactions = np.zeros_like(f)
    reactions[supports.fixed] = residual[supports.fixed]
    for c in (0, 1):
        reactions[2 * supports.skew_nodes + c] = residual[2 * supports.skew_nodes + c]
    if contact_solve is not None:
        reactions += group_forces(contact_solve, spec, holding=True)
    skip, keep, edge_pressure = _edge_states(spec, mesh, supports)
    bearing = pressure  # where a pin or fastener presses: a loading pin's, and a pin hold's
    nodal = recover_nodal(mesh, sigma_e, u, edge_modulus(spec), tuple(loaded_edge_names(spec)),
                          np.maximum(pressure, edge_pressure), poisson_coupling(spec), held_corners(spec), skip,
                          keep, patched)
    if spec.support.symmetry:
        full = unfold(spec, Fields(mesh, u, sigma_e, nodal, reactions, bearing))
        mesh, u, sigma_e, nodal, reactions = full.mesh, full.displacement, full.element_stress, full.nodal_stress, full.reactions
        bearing = full.pressure
    szz = spec.material.nu * (nodal[:, 0] + nodal[:, 1]) if spec.plate.condition == "plane-strain" else 0.0
    vm = von_mises(nodal, szz)
    seconds["recover"] += time.perf_counter() - clock
    return Solution(mesh, u, sigma_e, nodal, principal_stresses(nodal), vm, seconds, tresca(nodal, szz), reactions,
                    singular_zone(spec, mesh), report, loading, holding, arcs, bearing, groups)


def _edge_states(spec: PartSpec, mesh: Mesh, supports: Supports) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(edges that are not traction-free beyond the named ones: the holds' and the edge forces'; nodes that
    keep the patch-recovered stress: a fixed hold's and a pressure's ends; (n,) edge pressure in MPa)."""
    skip = [supports.edges]
    keep = [supports.fixed_nodes]
    pressure = np.zeros(mesh.n_nodes)
    for bl in edge_loads(spec):
        on = segment_edges(mesh, bl.piece)
        if bl.pressure == 0.0:
            skip.append(on)
            continue
        nodes = np.unique(on)
        pressure[nodes] = np.maximum(pressure[nodes], bl.pressure)
    for edge in spec.load.edges:
        if edge.pressure != 0.0:
            ends = stretch(spec, edge.where).ends
            keep += [np.flatnonzero(on_point(mesh, e)) for e in ends]
    return np.vstack(skip), np.concatenate(keep).astype(np.int64), pressure


def edge_modulus(spec: PartSpec) -> float:
    """E' relating tangential stress and strain on a traction-free edge (MPa)."""
    E, nu = spec.material.E, spec.material.nu
    return E if spec.plate.condition == "plane-stress" else E / (1.0 - nu * nu)


def poisson_coupling(spec: PartSpec) -> float:
    """How a normal edge stress enters the tangential edge stress at fixed tangential strain: nu in plane
    stress, nu / (1 - nu) in plane strain."""
    nu = spec.material.nu
    return nu if spec.plate.condition == "plane-stress" else nu / (1.0 - nu)


def held_corners(spec: PartSpec) -> tuple[str, ...]:
    """Edges whose corners with free edges keep the patch-recovered stress: a clamped end (fixed in x and y,
    where the free edge's stretch says little about the corner). Corners with a roller end, a loaded end
    or a symmetry plane take the free edge's exact state: there the end's shear traction vanishes at the
    corner, as the free edge requires."""
    if spec.load.remote is not None:
        return tuple(n for n in LOADED_EDGES if n not in SYMMETRY_EDGES)
    return ("held",) if spec.support.held == "clamped" else ()


def recover_nodal(mesh: Mesh, element_stress: np.ndarray, displacement: np.ndarray, modulus: float,
                  loaded: tuple[str, ...] = LOADED_EDGES, pressure: np.ndarray | None = None,
                  coupling: float = 0.0, corners: tuple[str, ...] | None = None,
                  skip: np.ndarray | None = None, keep: np.ndarray | None = None,
                  patched: np.ndarray | None = None) -> np.ndarray:
    """Patch-recovered nodal stresses, with the exact edge state on the traction-free edges (every named
    edge not in `loaded`, less the edges in `skip` (k, 2); where `pressure` (n,) MPa is non-zero, the edge
    state under that contact pressure). Corners of free edges with the edges named in `corners` (default:
    every edge in `loaded` except the symmetry planes, which are mirrors), and the nodes in `keep`, keep
    the patch-recovered stress. `patched`: the patch-recovered stress when already computed (several load
    cases recover together: fem.recovery.patch_recovery takes their stresses side by side)."""
    nodal = patch_recovery(mesh.nodes, mesh.triangles, element_stress, mesh.boundary_nodes()) if patched is None \
        else patched.copy()
    free = [e for name, e in mesh.edges.items() if name not in loaded]
    if corners is None:
        corners = tuple(name for name in loaded if name not in SYMMETRY_EDGES)
    other = [mesh.edges[name].ravel() for name in corners if name in mesh.edges]
    if keep is not None and keep.size:
        other.append(keep)
    free_edges = np.concatenate(free) if free else np.zeros((0, 2), dtype=np.int32)
    if skip is not None and skip.size and free_edges.size:
        free_edges = free_edges[~np.isin(_edge_keys(free_edges, mesh.n_nodes), _edge_keys(skip, mesh.n_nodes))]
    return free_edge_stress(mesh.nodes, nodal, displacement, free_edges,
                            np.concatenate(other) if other else np.zeros(0, int), modulus, pressure, coupling)


def _edge_keys(edges: np.ndarray, n: int) -> np.ndarray:
    """One integer per edge, whatever the order of its two nodes."""
    lo, hi = np.minimum(edges[:, 0], edges[:, 1]).astype(np.int64), np.maximum(edges[:, 0], edges[:, 1]).astype(np.int64)
    return lo * n + hi
