"""Sanity guards on every check result: numbers that cannot be right earn a warning in the terminal
summary and in the JSON record's `warnings`, never silence. Each warning is a Notice (compare/notices.py):
its numbers keep their kind, so the summary and the report show them in the part file's units.

- A reported number that is not finite (NaN or infinity): peak, net-section average, Kt, equilibrium.
- A peak of the wrong sign or below the section average under a pure axial end load. Under axial
  tension alone the governing stress is tensile and, because the peak of the whole part is at least the
  largest normal stress on the net section, which is at least that section's average, Kt(net) >= 1 (to
  within the FE equilibrium error); the same holds with both signs reversed under compression.
- A peak away from every raiser: farther from each raiser's edge than the larger of its radius of
  curvature and REACH_ELEMENTS of its edge elements. With raisers present, a peak elsewhere (at a support,
  a loaded end, or inside the material) points to a load or support effect, or a fault of the model.
- A refinement that did not refine: two successive levels with (nearly) the same element count, or the
  same peak to the last digit. Richardson extrapolation then reads an unchanged value as converged. The
  far zones of a long plate (geometry/far_field.py) keep their elements from level to level, so they are
  left out of the count.
- Inputs that were probably not what was meant, or a part beyond the model's scope: compare/plausibility.py.
"""

from __future__ import annotations

import math

from ..fem.convergence import Study
from ..fem.analysis import Solution
from ..geometry.spec import PartSpec
from .notices import Amount, Notice, notice
from .plausibility import input_warnings

KT_SLACK = 0.02  # Kt(net) may fall this far below 1 (plus twice the equilibrium error) before a warning
REACH_ELEMENTS = 4.0  # a peak within this many edge elements of a raiser's edge belongs to it
MIN_GROWTH = 1.1  # each level must have at least this many times the elements of the one before


def result_warnings(spec: PartSpec, study: Study, solution: Solution, peak, section, kt) -> list[Notice]:
    """Warnings about results that cannot be right (see the module docstring), numbers with their units
    (compare/notices.py). `peak`, `section` and `kt` are the check's Peak, NetSection and KtResult."""
    out = _non_finite(peak, section, kt)
    out += _impossible_sign(spec, peak, section, kt)
    far = _away_from_raisers(spec, solution, peak.location)
    if far:
        out.append(far)
    out += _stalled(spec, study, solution)
    return out + input_warnings(spec, solution, peak.stress)


def _non_finite(peak, section, kt) -> list[Notice]:
    values = {
        "the peak stress": peak.stress,
        "the finest-mesh peak": peak.fe_stress,
        "the net-section average": section.average,
        "the equilibrium error": section.equilibrium_error,
        "Kt(net)": kt.net,
        "Kt(gross)": kt.gross,
    }
    bad = [name for name, value in values.items() if not math.isfinite(value)]
    if not bad:
        return []
    return [notice(f"{', '.join(bad)} {'is' if len(bad) == 1 else 'are'} not a finite number (NaN or infinity); "
                   "the result cannot be used: check the part's numbers, supports and loads")]


def _impossible_sign(spec: PartSpec, peak, section, kt) -> list[Notice]:
    load = spec.load
    if getattr(load, "kind", "axial") != "axial" or load.axial == 0.0 or not math.isfinite(peak.stress):
        return []
    sense = "tension" if load.axial > 0 else "compression"
    if peak.stress * load.axial <= 0.0:
        return [notice(f"under axial {sense} alone the governing peak is ", Amount(peak.stress, "stress"),
                       ", of the opposite sign or zero; that cannot be: check the supports, the loads and the mesh")]
    slack = KT_SLACK + 2.0 * abs(section.equilibrium_error) if math.isfinite(section.equilibrium_error) else KT_SLACK
    if math.isfinite(kt.net) and kt.net < 1.0 - slack:
        return [notice(f"Kt(net) = {kt.net:.3f} is below 1 under axial {sense} alone; the peak cannot be smaller "
                       "than the net-section average: check the net section, the supports and the mesh")]
    return []


def _away_from_raisers(spec: PartSpec, solution: Solution, location: tuple[float, float]) -> Notice | None:
    features = solution.mesh.features
    if not features or not all(math.isfinite(c) for c in location):
        return None
    from shapely.geometry import Point

    from ..geometry.outline import feature_edges

    edges = feature_edges(spec)
    point = Point(location)
    nearest, gap = "", math.inf
    for feature in features:
        edge = edges.get(feature.name)
        if edge is None or edge.is_empty:
            return None  # a raiser whose edge the outline cannot give: no basis for the guard
        distance = float(edge.distance(point))
        if distance <= max(feature.radius, REACH_ELEMENTS * feature.edge_size):
            return None
        if distance < gap:
            nearest, gap = feature.name, distance
    return notice("the peak at ", Amount(location, "point"), " is ", Amount(gap, "length", 3),
                  f" from the nearest raiser ({nearest}), away from every feature; check that a load, support or "
                  "end effect is expected to govern there")


def _stalled(spec: PartSpec, study: Study, solution: Solution) -> list[Notice]:
    levels = study.levels
    far = far_zone_elements(spec, solution) * levels[-1].elements / max(solution.mesh.n_elements, 1)  # modelled
    for a, b in zip(levels, levels[1:]):
        if b.elements - far < MIN_GROWTH * (a.elements - far):
            where = " away from the far zones of the long plate" if far else ""
            return [notice(f"mesh refinement stalled: a level has {b.elements - far:.0f} elements{where} after "
                           f"{a.elements - far:.0f}; the convergence estimate is not reliable")]
    if len(levels) >= 2 and levels[-1].peak == levels[-2].peak:
        return [notice("the last two mesh levels gave exactly the same peak; the refinement may not have changed "
                       "the mesh at the peak, and the convergence estimate is not reliable")]
    return []


def far_zone_elements(spec: PartSpec, solution: Solution) -> int:
    """Triangles of the solution's (full-part) mesh whose centroid lies in a far zone of the long plate
    or its mirror image in a symmetry plane x = 0: elements that no level refines."""
    from ..geometry.far_field import far_zones

    zones = far_zones(spec)
    if not zones:
        return 0
    mesh = solution.mesh
    x = mesh.nodes[mesh.triangles, 0].mean(axis=1)
    if "x" in spec.support.symmetry:
        x = abs(x)
    inside = sum(((x > a) & (x < b)).astype(int) for a, b in zones)
    return int(inside.sum())
