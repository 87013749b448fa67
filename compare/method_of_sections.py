"""The method of sections on any straight cut: FE resultants against statics, averages and the peak.

For a cut (point, unit normal n; positions along d = (-n_y, n_x)) through the whole part:
- the ligaments (material intervals) come from the exact outline, the area is their length x thickness;
- the FE tractions are integrated across the cut (compare.sections.cut_resultants): normal force N,
  shear force V along d and bending moment M about the centroid of the cut's material (positive when it
  stretches the +d side);
- statics gives the N, V, M the applied loads require (compare.statics);
- the average normal and shear stresses are N / A and V / A; the peak is the largest normal traction
  in magnitude along the cut (signed), with where it is;
- the errors are (FE - statics) / S for N and V and (FE - statics) / (S h / 6) for M, with
  S = max(|N|, |V|, 6 |M| / h, s_ref A) from statics, h the extent of the cut's material and s_ref A
  the force the cut's area A carries at the part's reference stress (compare.statics.reference_stress):
  the largest of the section's force scales (a pure moment is measured against the edge-stress force
  6 M / h), and a cut that carries little is measured against the load level of the part.
Forces in N, moments in N mm, stresses in MPa, positions in mm.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..fem.analysis import Solution
from ..geometry.outline import part_polygon
from ..geometry.spec import PartSpec, SectionSpec
from .sections import Cut, cut_resultants, ligaments
from .statics import HALF_PLANE, FreeBody, Statics, cut_statics, reference_stress


@dataclass(frozen=True)
class SectionResult:
    """One cut: where it is, its material, the FE resultants, statics and the errors between them.

    centroid: position along the cut (mm) of the material's centroid, and centroid_point the same as (x, y).
    fe_*: FE resultants; statics: what the applied loads require; *_error: see the module docstring
    (None when the cut carries no load at all). peak_normal: largest |normal traction| on the cut, signed
    (MPa), at peak_position (mm along the cut) = peak_point (x, y). peak_shear likewise for the shear traction.
    """

    label: str
    point: tuple[float, float]
    normal: tuple[float, float]
    ligaments: tuple[tuple[float, float], ...]
    area: float
    centroid: float
    centroid_point: tuple[float, float]
    fe_normal_force: float
    fe_shear_force: float
    fe_moment: float
    statics: Statics
    normal_error: float | None
    shear_error: float | None
    moment_error: float | None
    average_normal: float
    average_shear: float
    peak_normal: float
    peak_position: float
    peak_point: tuple[float, float]
    peak_shear: float
    cut: Cut

    @property
    def worst_error(self) -> float | None:
        errors = [abs(e) for e in (self.normal_error, self.shear_error, self.moment_error) if e is not None]
        return max(errors) if errors else None


def section_result(spec: PartSpec, solution: Solution, section: SectionSpec,
                   window: tuple[float, float] | None = None, side: FreeBody = HALF_PLANE) -> SectionResult:
    """Resultants, averages, peak and statics check of one cut through the solved part: through the whole
    part along its line, or only across `window` (lo, hi: positions along the cut, mm) with `side` the free
    body on its +normal side (compare/edge_cut.py)."""
    t = spec.plate.thickness
    mesh = solution.mesh
    cut = cut_resultants(mesh.nodes, mesh.triangles, solution.nodal_stress, t, section.point, section.normal, window)
    spans = tuple(ligaments(part_polygon(spec), section.point, section.normal))
    if window is not None:
        spans = tuple((max(a, window[0]), min(b, window[1])) for a, b in spans if min(b, window[1]) > max(a, window[0]))
    length = sum(b - a for a, b in spans)
    p0 = np.asarray(section.point, float)
    n = np.asarray(section.normal, float) / np.hypot(*section.normal)
    d = np.array([-n[1], n[0]])
    centre = p0 + cut.centroid * d
    statics = cut_statics(spec, solution, section.point, section.normal, (float(centre[0]), float(centre[1])), side)
    extent = (spans[-1][1] - spans[0][0]) if spans else 0.0
    errors = _errors(cut, statics, extent, reference_stress(spec) * length * t)
    k = int(np.argmax(np.abs(cut.normal_stress))) if cut.normal_stress.size else 0
    peak_pos = float(cut.positions[k]) if cut.positions.size else 0.0
    peak_pt = p0 + peak_pos * d
    area = length * t
    return SectionResult(
        label=section.label, point=tuple(section.point), normal=(float(n[0]), float(n[1])), ligaments=spans,
        area=area, centroid=cut.centroid, centroid_point=(float(centre[0]), float(centre[1])),
        fe_normal_force=cut.normal_force, fe_shear_force=cut.shear_force, fe_moment=cut.moment, statics=statics,
        normal_error=errors[0], shear_error=errors[1], moment_error=errors[2],
        average_normal=cut.normal_force / area if area else 0.0,
        average_shear=cut.shear_force / area if area else 0.0,
        peak_normal=float(cut.normal_stress[k]) if cut.normal_stress.size else 0.0,
        peak_position=peak_pos, peak_point=(float(peak_pt[0]), float(peak_pt[1])),
        peak_shear=float(cut.shear_stress[np.argmax(np.abs(cut.shear_stress))]) if cut.shear_stress.size else 0.0,
        cut=cut,
    )


def _errors(cut: Cut, statics: Statics, extent: float, floor: float) -> tuple[float | None, float | None, float | None]:
    scale = max(abs(statics.normal_force), abs(statics.shear_force),
                6.0 * abs(statics.moment) / extent if extent > 0 else 0.0, floor)
    if scale <= 0.0:
        return None, None, None
    return ((cut.normal_force - statics.normal_force) / scale,
            (cut.shear_force - statics.shear_force) / scale,
            (cut.moment - statics.moment) / (scale * extent / 6.0) if extent > 0 else None)


def section_results(spec: PartSpec, solution: Solution) -> tuple[SectionResult, ...]:
    """The result of every cut the part file (or the command line) asks for."""
    return tuple(section_result(spec, solution, s) for s in spec.sections)
