"""One linear-elastic solve of a part on one mesh: displacements, element and nodal stresses."""

from __future__ import annotations

import time
from dataclasses import dataclass, field

import numpy as np

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec
from .assembly import element_stresses, stiffness_matrix
from .contact import PinContact, contact_pressure, full_part_contact, rigid_pin, solve_pin_contact
from .elasticity import constitutive_matrix
from .loads import loaded_edge_names, part_loads, pin_pressure_at_nodes
from .recovery import free_edge_stress, patch_recovery, principal_stresses, tresca, von_mises
from .quadratic import quadratic_stiffness, sub_triangle_stresses
from .solve import SolveReport, solve_system
from .supports import part_supports, singular_zone
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
    contact: PinContact | None = None  # a rigid pin's contact, for the full part (fem/contact.py)

    def peak_node(self) -> int:
        """Index of the node with the governing principal stress: the largest maximum principal stress,
        unless the most negative minimum principal stress is larger in magnitude by COMPRESSION_MARGIN."""
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
        if -s2 > (1.0 + COMPRESSION_MARGIN) * max(s1, 0.0):
            return compression, s2
        return tension, s1


def solve_part(spec: PartSpec, mesh: Mesh, contact_start: tuple[float, float] | None = None) -> Solution:
    """Assemble, load, support and solve the part on `mesh`; recover nodal stresses. A rigid pin's contact
    is found by fem.contact, starting from `contact_start` (a coarser mesh's contact arc, degrees from the
    pin's direction) when given, else from the loaded half of the hole."""
    clock = time.perf_counter()
    seconds = {}
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    t = spec.plate.thickness
    quadratic = mesh.quadratic is not None  # 6-node triangles; mesh.triangles are then their sub-triangles
    K = quadratic_stiffness(mesh.nodes, mesh.quadratic, D, t) if quadratic else stiffness_matrix(mesh.nodes, mesh.triangles, D, t)
    f = part_loads(spec, mesh)
    seconds["assemble"], clock = time.perf_counter() - clock, time.perf_counter()
    fixed = part_supports(spec, mesh)
    contact = None
    if rigid_pin(spec):
        solved = solve_pin_contact(K, f, fixed, spec, mesh, contact_start)
        u, solver, applied = solved.displacement, solved.report, f + solved.forces
        pressure = contact_pressure(mesh, solved, spec)
        contact = full_part_contact(spec, mesh, solved, pressure)
    else:
        u, solver = solve_system(K, f, fixed, spec.mesh.solver, mesh.nodes)
        applied, pressure = f, pin_pressure_at_nodes(spec, mesh)
    reactions = np.zeros_like(f)
    reactions[fixed] = (K @ u - applied)[fixed]
    seconds["solve"], clock = time.perf_counter() - clock, time.perf_counter()
    sigma_e = sub_triangle_stresses(mesh.nodes, mesh.quadratic, D, u) if quadratic else element_stresses(mesh.nodes, mesh.triangles, D, u)
    nodal = recover_nodal(mesh, sigma_e, u, edge_modulus(spec), tuple(loaded_edge_names(spec)),
                          pressure, poisson_coupling(spec), held_corners(spec))
    if spec.support.symmetry:
        full = unfold(spec, Fields(mesh, u, sigma_e, nodal, reactions))
        mesh, u, sigma_e, nodal, reactions = full.mesh, full.displacement, full.element_stress, full.nodal_stress, full.reactions
    szz = spec.material.nu * (nodal[:, 0] + nodal[:, 1]) if spec.plate.condition == "plane-strain" else 0.0
    vm = von_mises(nodal, szz)
    seconds["recover"] = time.perf_counter() - clock
    return Solution(mesh, u, sigma_e, nodal, principal_stresses(nodal), vm, seconds, tresca(nodal, szz), reactions,
                    singular_zone(spec, mesh), solver, contact)


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
                  coupling: float = 0.0, corners: tuple[str, ...] | None = None) -> np.ndarray:
    """Patch-recovered nodal stresses, with the exact edge state on the traction-free edges (every named
    edge not in `loaded`; where `pressure` (n,) MPa is non-zero, the edge state under that contact
    pressure). Corners of free edges with the edges named in `corners` keep the patch-recovered stress
    (default: every edge in `loaded` except the symmetry planes, which are mirrors)."""
    nodal = patch_recovery(mesh.nodes, mesh.triangles, element_stress, mesh.boundary_nodes())
    free = [e for name, e in mesh.edges.items() if name not in loaded]
    if corners is None:
        corners = tuple(name for name in loaded if name not in SYMMETRY_EDGES)
    other = [mesh.edges[name].ravel() for name in corners if name in mesh.edges]
    free_edges = np.concatenate(free) if free else np.zeros((0, 2), dtype=np.int32)
    return free_edge_stress(mesh.nodes, nodal, displacement, free_edges,
                            np.concatenate(other) if other else np.zeros(0, int), modulus, pressure, coupling)
