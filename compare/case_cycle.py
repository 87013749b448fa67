"""A fatigue cycle between two load cases: each case's notch state at the same point.

A part with several load cases may give its fatigue cycle as two of them ([fatigue] min_case, max_case):
the load runs between the min case's and the max case's. Every case is solved on the same meshes at every
level (fem.convergence), so the finest level's nodal fields of the two cases can be read at the same node.
Units: mm, N, MPa; stresses signed, tension positive.

Where the notch is. Each case's converged peak is a candidate: the max case's, and the min case's when it
is at another node (a min case that compresses another raiser harder than the max case stretches the first
one). The cycle is screened at each candidate and the one with the smaller modified Goodman factor governs
(the max case's on a tie); the other is reported beside it with its factor. A point where neither case
peaks may still see a wider range (a raiser one case stretches and the other compresses, each less than
its own peak): the finest mesh's boundary nodes the peak search covers are searched for the widest
elastic range of the edge stress (each node's principal stress of larger magnitude, signed), and a point
more than NEAR of the width from every screened notch whose range passes theirs by more than WIDER is
named as not screened.

The two states at a notch where load case R (the notch case) has its converged peak P_R, O being the other:
- n is R's governing principal direction at the notch's node on the finest mesh (on a free edge, the
  edge's tangent). O's elastic notch stress is rho P_R, with rho = (n . s_O n) / (n . s_R n) the ratio of
  the two cases' nodal stresses along n at that node on the finest mesh: O's stress at the same point,
  extrapolated consistently with R's converged peak (both are the same multiple of their finest values).
- Each state's nominal is its own load's nominal on the same cut, R's critical section (the net section
  through the raiser, or the cut normal to the edge at the peak): the handbook formula of that load
  (compare.nominal) from the statics of that case on that cut, with the sign of its elastic notch stress,
  as a scaled cycle takes R's (compare.signoff.notch_at_load). Each state thus has its own Kt when the
  two loads are of different kinds (an axial minimum under a bending maximum).
For a case O that is R's load times f, rho is f and O's nominal f S_R (every formula is homogeneous in the
load): the cycle is exactly the scaled cycle between f and 1 x R's load (tests/test_case_cycle.py). The
two states then go through the same screen as any cycle (compare.signoff.notch_screen): Kf, modified
Goodman, first-cycle yield and Neuber's rule.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import TYPE_CHECKING

import numpy as np

from ..geometry.outline import nearest_raiser
from ..geometry.registry import outline_size
from ..geometry.spec import SectionSpec
from .edge_cut import EDGE_NORMAL, edge_cut
from .fatigue import NotchCycle, NotchState
from .method_of_sections import section_result
from .nominal import edge_nominals, gross_section, nominal_stresses
from .signoff import (NOT_SCREENED, FatigueSignOff, OtherNotch, WiderRange, case_words, notch_at_load, notch_screen,
                      screen_basis)

if TYPE_CHECKING:
    from .check import CheckResult

CUT_LABEL = "critical net section"
NEAR = 0.1  # of the part's width: boundary points this close to a screened notch belong to it
WIDER = 0.02  # a range this much wider than every screened notch's, elsewhere, is named as not screened


def part_fatigue(results: tuple[CheckResult, ...]) -> FatigueSignOff | None:
    """The part's fatigue screen from its load cases' results: the cycle between [fatigue] min_case and
    max_case, or the screen of the one case a cycle in fractions or forces scales; None without [fatigue]."""
    fatigue = results[0].spec.fatigue
    if fatigue is None:
        return None
    named = {r.case: r for r in results}
    if fatigue.cycle_form == "cases":
        return case_cycle_signoff(named[fatigue.min_case], named[fatigue.max_case])
    return named[fatigue.case].fatigue


def case_cycle_signoff(low: CheckResult, high: CheckResult) -> FatigueSignOff:
    """The fatigue screen of the cycle between load case `low` (its minimum) and `high` (its maximum), at
    the worse of the two cases' peaks (module docstring)."""
    _same_meshes(low, high)
    notches = [high] + ([low] if _node(low) != _node(high) else [])
    screened = [_at_notch(ref, low if ref is high else high, low, high) for ref in notches]
    governing = min(screened, key=lambda s: s.screen.n_f)  # the first (the max case's) on a tie
    others = tuple(OtherNotch(s.feature, s.location, s.notch_case, s.screen.n_f, s.screen.passes,
                              s.screen.first_cycle_yield) for s in screened if s is not governing)
    notes = tuple(_other_words(o) for o in others)
    return replace(governing, others=others, basis=governing.basis[:1] + notes + governing.basis[1:],
                   wider=wider_range(low, high, [_node(r) for r in notches]))


def wider_range(low: CheckResult, high: CheckResult, notches: list[int]) -> WiderRange | None:
    """The boundary point of the finest mesh, away from the screened `notches` (node indices), whose elastic
    stress range between the two cases is the widest, when it passes theirs by more than WIDER; else None.
    The nodes the peak search leaves out are left out here too: support singularities, and where a pin or
    fastener bears (its compression is bearing, checked on its own)."""
    mesh, spec = high.solution.mesh, high.spec
    nodes = mesh.boundary_nodes()
    for solution in (low.solution, high.solution):
        if solution.excluded is not None:
            nodes = nodes[~solution.excluded[nodes]]
        nodes = nodes[~solution.bearing[nodes]]
    ranges = np.abs(_edge_stress(high.solution.principal[nodes]) - _edge_stress(low.solution.principal[nodes]))
    screened = float(np.max(np.abs(_edge_stress(high.solution.principal[notches])
                                   - _edge_stress(low.solution.principal[notches]))))
    width = outline_size(spec)[1]
    gaps = np.min(np.linalg.norm(mesh.nodes[nodes][:, None, :] - mesh.nodes[notches][None, :, :], axis=2), axis=1)
    ranges = np.where(gaps > NEAR * width, ranges, -np.inf)
    k = int(np.argmax(ranges)) if ranges.size else 0
    if not ranges.size or not ranges[k] > (1.0 + WIDER) * screened:
        return None
    location = (float(mesh.nodes[nodes[k], 0]), float(mesh.nodes[nodes[k], 1]))
    from .check import ON_RAISER  # the check's own rule for the raiser a point belongs to

    ratio = float(ranges[k]) / screened if screened > 0.0 else math.inf  # inf: the notches see no range at all
    return WiderRange(nearest_raiser(spec, location, ON_RAISER * width), location, ratio)


def _edge_stress(principal: np.ndarray) -> np.ndarray:
    """The signed principal stress of larger magnitude of (k, 2) principal stresses: on a free edge, the
    edge's own (tangential) stress (MPa)."""
    return np.where(np.abs(principal[:, 0]) >= np.abs(principal[:, 1]), principal[:, 0], principal[:, 1])


def _at_notch(ref: CheckResult, other: CheckResult, low: CheckResult, high: CheckResult) -> FatigueSignOff:
    """The screen of the cycle between `low` and `high` at the peak of `ref` (one of them; `other` the other)."""
    node = _node(ref)
    direction = _principal_direction(ref.solution.nodal_stress[node], ref.peak.stress < 0.0)
    at_ref, at_other = (_along(case.solution.nodal_stress[node], direction) for case in (ref, other))
    ratio = at_other / at_ref + 0.0  # + 0.0 turns a negative zero into zero
    nominal, peak = notch_at_load(ref)
    other_peak = ratio * peak
    other_nominal = math.copysign(abs(_nominal_on_cut(other, ref, other_peak)), other_peak)
    states = {ref.case: NotchState(nominal, peak, case_words(ref)),
              other.case: NotchState(other_nominal, other_peak, case_words(other))}
    screen = notch_screen(ref, NotchCycle(states[low.case], states[high.case]))
    basis = screen_basis(ref, screen, _cycle_basis(ref, other, low, high, ratio))
    return FatigueSignOff(screen, None, None, None, ref.peak.feature, basis, min_case=low.case, max_case=high.case,
                          notch_case=ref.case, location=ref.peak.location, ratio=ratio)


def _same_meshes(low: CheckResult, high: CheckResult) -> None:
    """The two cases' finest fields are on one mesh (fem.convergence solves every case on each level)."""
    a, b = low.solution.mesh.nodes, high.solution.mesh.nodes
    if a.shape != b.shape or not np.array_equal(a, b):
        raise RuntimeError(f"load cases {low.case!r} and {high.case!r} were not solved on the same mesh")


def _node(result: CheckResult) -> int:
    """The finest mesh's node at the result's peak (its location is a node's)."""
    nodes = result.solution.mesh.nodes
    x, y = result.peak.location
    return int(np.argmin((nodes[:, 0] - x) ** 2 + (nodes[:, 1] - y) ** 2))


def _principal_direction(stress: np.ndarray, compressive: bool) -> tuple[float, float]:
    """Unit direction of the largest principal stress of (sxx, syy, txy), or of the smallest when
    `compressive` (the peak is the minimum principal stress)."""
    sxx, syy, txy = (float(v) for v in stress)
    angle = 0.5 * math.atan2(2.0 * txy, sxx - syy) + (0.5 * math.pi if compressive else 0.0)
    return math.cos(angle), math.sin(angle)


def _along(stress: np.ndarray, n: tuple[float, float]) -> float:
    """The normal stress n . s n of (sxx, syy, txy) along the unit direction n (MPa)."""
    sxx, syy, txy = (float(v) for v in stress)
    return sxx * n[0] ** 2 + syy * n[1] ** 2 + 2.0 * txy * n[0] * n[1]


def _nominal_on_cut(case: CheckResult, ref: CheckResult, peak: float) -> float:
    """The net nominal stress of `case`'s load on `ref`'s critical section (MPa): the statics of `case` on
    the same cut, its load's formula (compare.nominal), against its elastic notch stress `peak`."""
    section = ref.net_section
    if section.kind == EDGE_NORMAL:  # the cut starts at the peak: its window and free body again
        cut = edge_cut(ref.spec, ref.peak.location)
        result = section_result(case.spec, case.solution, SectionSpec(cut.point, cut.normal, CUT_LABEL),
                                cut.window, cut.side)
        return edge_nominals(case.spec, peak, result, section.gross).net.stress
    result = section_result(case.spec, case.solution, SectionSpec(section.point, section.normal, CUT_LABEL))
    gross = ref.gross or gross_section(case.spec, ref.peak.feature, section.point, section.normal)
    return nominal_stresses(case.spec, peak, result, gross).net.stress


def _cycle_basis(ref: CheckResult, other: CheckResult, low: CheckResult, high: CheckResult, ratio: float) -> str:
    """How the two states of a cycle between load cases are built at `ref`'s peak, and what that assumes."""
    feature = "at no raiser" if ref.peak.feature is None else f"on {ref.peak.feature}"
    text = (f"Constant-amplitude cycle between {case_words(low)} (its minimum) and {case_words(high)} (its "
            f"maximum), both solved on the same meshes. The notch is the converged peak of {case_words(ref)}, "
            f"{feature}; there the elastic notch stress of {case_words(other)} is {ratio:.4g} x that peak: the "
            "ratio of the two cases' stresses along the peak's principal direction at the same node of the finest "
            "mesh, so both extremes are extrapolated alike. Each extreme's nominal stress is its own load's nominal "
            "on the same cut (the critical section through the notch), with the sign of its notch stress. "
            f"{NOT_SCREENED}")
    pushed = [c for c in (low, high) if c.spec.load.kind in ("axial", "combined") and c.spec.load.axial < 0.0]
    if pushed:
        text += f" Load case {pushed[0].case!r} compresses the part along its axis: buckling is not checked."
    return text


def _other_words(other: OtherNotch) -> str:
    """A sentence on the other point the cycle was screened at."""
    where = "at no raiser" if other.feature is None else f"on {other.feature}"
    factor = f"n_f {other.n_f:.3g}" if math.isfinite(other.n_f) else "no alternating or tensile mean stress"
    verdict = "passes" if other.passes else "FAILS"
    flag = ", with first-cycle yield" if other.first_cycle_yield else ""
    return (f"The cycle was screened as well at the converged peak of load case {other.case!r} ({where}): "
            f"{factor}, {verdict}{flag}; the point with the smaller factor governs.")
