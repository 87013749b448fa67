"""The peak of each nodal stress measure on the finest mesh: principal stresses, von Mises and Tresca.

Values in MPa at mesh nodes (recovered nodal stresses), locations in mm. The minimum principal stress
is the compressive peak (the most negative value); it is reported as governing when its magnitude
exceeds the largest maximum principal stress. Nodes the peak search skips (a clamped end's singular
corners, fem.supports.singular_zone) are skipped here too.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..fem.analysis import Solution


@dataclass(frozen=True)
class StressAt:
    """A stress value (MPa) at a node and where it is (mm)."""

    value: float
    location: tuple[float, float]
    node: int


@dataclass(frozen=True)
class StressPeaks:
    """max_principal: largest s1; min_principal: most negative s2 (the compressive peak); von_mises and
    tresca: largest equivalent stresses."""

    max_principal: StressAt
    min_principal: StressAt
    von_mises: StressAt
    tresca: StressAt

    @property
    def compressive_governs(self) -> bool:
        """True when the compressive peak is larger in magnitude than the tensile one."""
        return -self.min_principal.value > self.max_principal.value


def stress_peaks(solution: Solution) -> StressPeaks:
    """Peaks of the finest-mesh nodal fields."""
    nodes = solution.mesh.nodes
    tresca = solution.tresca if solution.tresca is not None else solution.principal[:, 0] - solution.principal[:, 1]

    def at(values: np.ndarray, node: int) -> StressAt:
        return StressAt(float(values[node]), (float(nodes[node, 0]), float(nodes[node, 1])), int(node))

    return StressPeaks(
        max_principal=at(solution.principal[:, 0], solution.searched(solution.principal[:, 0])),
        min_principal=at(solution.principal[:, 1], solution.searched(solution.principal[:, 1], largest=False)),
        von_mises=at(solution.von_mises, solution.searched(solution.von_mises)),
        tresca=at(tresca, solution.searched(tresca)),
    )
