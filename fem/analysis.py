"""One linear-elastic solve of a part on one mesh: displacements, element and nodal stresses."""

from __future__ import annotations

import time
from dataclasses import dataclass, field

import numpy as np

from ..geometry.mesh import Mesh
from ..geometry.spec import PartSpec
from .assembly import element_stresses, stiffness_matrix
from .elasticity import constitutive_matrix
from .loads import part_loads
from .recovery import free_edge_stress, patch_recovery, principal_stresses, von_mises
from .solve import solve_constrained
from .supports import part_supports

LOADED_EDGES = ("held", "loaded")


@dataclass(frozen=True)
class Solution:
    """Fields of one solve. Stresses in MPa ordered (sxx, syy, txy); displacements in mm.

    element_stress: (m, 3) constant stress of each triangle.
    nodal_stress: (n, 3) recovered nodal stress.
    principal: (n, 2) nodal principal stresses s1 >= s2.
    von_mises: (n,) nodal von Mises stress.
    seconds: wall time of each stage ("assemble", "solve", "recover").
    """

    mesh: Mesh
    displacement: np.ndarray
    element_stress: np.ndarray
    nodal_stress: np.ndarray
    principal: np.ndarray
    von_mises: np.ndarray
    seconds: dict[str, float] = field(default_factory=dict)

    def peak_node(self) -> int:
        """Index of the node with the largest maximum principal stress."""
        return int(np.argmax(self.principal[:, 0]))


def solve_part(spec: PartSpec, mesh: Mesh) -> Solution:
    """Assemble, load, support and solve the part on `mesh`; recover nodal stresses."""
    clock = time.perf_counter()
    seconds = {}
    D = constitutive_matrix(spec.material.E, spec.material.nu, spec.plate.condition)
    t = spec.plate.thickness
    K = stiffness_matrix(mesh.nodes, mesh.triangles, D, t)
    f = part_loads(spec, mesh)
    seconds["assemble"], clock = time.perf_counter() - clock, time.perf_counter()
    u = solve_constrained(K, f, part_supports(spec, mesh))
    seconds["solve"], clock = time.perf_counter() - clock, time.perf_counter()
    sigma_e = element_stresses(mesh.nodes, mesh.triangles, D, u)
    nodal = recover_nodal(mesh, sigma_e, u, edge_modulus(spec))
    szz = spec.material.nu * (nodal[:, 0] + nodal[:, 1]) if spec.plate.condition == "plane-strain" else 0.0
    vm = von_mises(nodal, szz)
    seconds["recover"] = time.perf_counter() - clock
    return Solution(mesh, u, sigma_e, nodal, principal_stresses(nodal), vm, seconds)


def edge_modulus(spec: PartSpec) -> float:
    """E' relating tangential stress and strain on a traction-free edge (MPa)."""
    E, nu = spec.material.E, spec.material.nu
    return E if spec.plate.condition == "plane-stress" else E / (1.0 - nu * nu)


def recover_nodal(mesh: Mesh, element_stress: np.ndarray, displacement: np.ndarray, modulus: float) -> np.ndarray:
    """Patch-recovered nodal stresses, with the exact edge state on the traction-free edges."""
    nodal = patch_recovery(mesh.nodes, mesh.triangles, element_stress, mesh.boundary_nodes())
    free = [e for name, e in mesh.edges.items() if name not in LOADED_EDGES]
    other = [mesh.edges[name].ravel() for name in LOADED_EDGES if name in mesh.edges]
    free_edges = np.concatenate(free) if free else np.zeros((0, 2), dtype=np.int32)
    return free_edge_stress(mesh.nodes, nodal, displacement, free_edges,
                            np.concatenate(other) if other else np.zeros(0, int), modulus)
