"""The part file's fastener groups ([[fasteners]], geometry/fastenerfile.py) in the analysis.

Each group of the part file becomes a fem.fastener_groups.FastenerGroup for every load case: a group
that holds the part has its member fixed; any other carries the case's [[load.fasteners]] load (its force
and moment about `about`, the holes' centroid by default). fem.contact solves them together with a
loading rigid pin and the pin holds (one active-set iteration per case, on the one stiffness), and the
convergence study starts each level from the previous level's contact arcs, as for the pin.

`PartFasteners` is what a Solution keeps: the part file's groups and fasteners (whole fasteners, the
symmetry planes being refused with groups), the active-set passes of that solve, and the contact forces
of the loading groups on the part (for statics: they are applied loads whose distribution only the solve
knows; the holding groups' forces are support reactions).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from ..geometry.spec import FastenerSpec, PartSpec
from .fastener_groups import RIGID, Fastener, FastenerGroup, FastenerResult, GroupResult, GroupsSolve, group_holes
from .fastener_stiffness import huth_stiffness


def fastener_of(spec: PartSpec, group: FastenerSpec) -> Fastener:
    """The group's Fastener: its diameter, clearance, shear planes and stiffness (N/mm) with its source."""
    if group.stiffness == "given":
        stiffness, source = group.stiffness_value, "given in the part file"
    elif group.stiffness == "huth":
        h = group.huth
        stiffness, source = huth_stiffness(group.diameter, spec.plate.thickness, spec.material.E, h.other_thickness,
                                           h.other_modulus, h.fastener_modulus, group.shear_planes, h.joint)
    else:
        stiffness, source = RIGID, "rigid"
    return Fastener(group.diameter, group.clearance, group.shear_planes, stiffness, source)


def part_groups(spec: PartSpec) -> tuple[FastenerGroup, ...]:
    """The part file's groups under spec.load's case, in spec.fasteners order."""
    loads = {load.group: load for load in spec.load.fasteners}
    out = []
    for g in spec.fasteners:
        holes = group_holes(spec.holes, g.holes)
        if g.holds:
            out.append(FastenerGroup(g.name, holes, fastener_of(spec, g)))
            continue
        load = loads[g.name]  # geometry.fastenerfile.check_fasteners: every group that does not hold is loaded
        out.append(FastenerGroup(g.name, holes, fastener_of(spec, g), load.components, load.about))
    return tuple(out)


@dataclass(frozen=True)
class PartFasteners:
    """The part file's fastener groups after one solve (mm, N, MPa).

    groups: each group's result (GroupResult: its fasteners' resultant on the part and moment about its
      reference point, the member's motion), in spec.fasteners order.
    fasteners: every fastener (FastenerResult, its `group` an index into `groups`), group by group in the
      order of each group's holes.
    passes: the active-set passes of the case's contact solve.
    points, forces: (m, 2) the loading groups' contact nodes (mm) and their forces on the part (N).
    """

    groups: tuple[GroupResult, ...]
    fasteners: tuple[FastenerResult, ...]
    passes: int
    points: np.ndarray
    forces: np.ndarray

    def of_group(self, index: int) -> tuple[FastenerResult, ...]:
        """The fasteners of group `index`."""
        return tuple(f for f in self.fasteners if f.group == index)


def part_fasteners(solved: GroupsSolve, mesh, first: int, groups: tuple[FastenerGroup, ...]) -> PartFasteners | None:
    """The part file's groups out of a contact solve whose groups from index `first` on are theirs."""
    if len(solved.groups) <= first:
        return None
    mine = tuple(replace(f, group=f.group - first) for f in solved.fasteners if f.group >= first)
    loading = np.array([not groups[f.group].holding and f.group >= first for f in solved.fasteners], dtype=bool)
    on = solved.active & loading[solved.contact.fastener]
    points = mesh.nodes[solved.contact.nodes[on]]
    forces = solved.normal_force[on, None] * solved.contact.normal[on]
    return PartFasteners(solved.groups[first:], mine, solved.passes, points, forces)


def mean_bearing(spec: PartSpec, index: int, result: PartFasteners) -> float:
    """The group's mean bearing stress (MPa): the mean of F / (d t) over its fasteners (the bearing nominal
    of a hole in a group)."""
    values = [f.bearing for f in result.of_group(index)]
    return float(np.mean(values)) if values else math.nan
