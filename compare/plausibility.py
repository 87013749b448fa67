"""Warnings that the input was probably not what was meant, or that the part has left the model's scope:
a number in a wrong unit, an overload, a load far too small, a strap that buckles. Each is a Notice
(compare/notices.py) whose numbers keep their kind, so it prints in the part file's units.

- The modulus below the yield strength (or the ultimate, when no yield is given). No structural material
  is that soft for its strength (steel: E / fy of about 600), so E was almost surely typed in GPa (ksi or
  Msi in inch units) while the file's stresses are in MPa.
- A peak strain |peak| / E above STRAIN_LIMIT. Small-strain theory leaves out the quadratic part of the
  strain, about half the strain itself relative to it, which passes the 1 % default tolerance at 2 %
  strain; no structural metal stays elastic that far (steel yields near 0.2 %).
- A displacement above DISPLACEMENT_LIMIT of the part's size. The tip deflection of a cantilever under an
  end load, from the elastica (the large-deflection solution, docs/references.md [Elastica], solved in
  benchmarks/model_limits.py), stays within 1 % of the linear one up to 10 % of the length (and the root
  moment within 0.6 %).
- A rigid pin with clearance (or a fastener group's fastener) whose hole deforms more than
  CLEARANCE_MULTIPLE times the clearance. The
  result then no longer depends on the clearance (it is the neat fit's: the gate hinge strap of the
  examples gives Kt 2.661 with E in GPa and 2.657 with a 0.001 mm clearance, against 3.760 with its
  0.1 mm), while at working loads a steel hole deforms by some hundredths of a millimetre: a wrong E or
  load is the likely cause.
- The elastic peak above the ultimate strength: a stress the material cannot carry; the part relies on
  yielding there, which the static check of a ductile part may accept but no cyclic load does. When only the yield strength is given, above the largest ultimate-to-yield
  ratio of the built-in materials (annealed 304 stainless, about 2.5) times it: above any ultimate that
  yield strength allows. Not above the yield strength itself: a ductile part's elastic peak commonly
  passes it under static load, which the sign-off treats as local yielding (common practice).
- The peak below LIGHT_LOAD of the yield strength (the ultimate when no yield is given): a load in N
  meant as kN (`axial = 10`) looks like this.
- An end or pin load that compresses the strap by more than BUCKLING_SHARE of its Euler load as a
  pinned-pinned column about its weak axis (common practice, docs/references.md [Practice]):
  Pcr = pi^2 E I / L^2, I = A b^2 / 12 with b the smaller of the (narrowest) width and the thickness,
  L from the held end to where the load is applied. An initial bow or eccentricity is amplified by
  1 / (1 - P / Pcr), which doubles it at half the Euler load; this 2-D model sees none of it.
"""

from __future__ import annotations

import math

import numpy as np

from ..fem.analysis import Solution
from ..geometry.far_field import narrowest_width
from ..geometry.kinds import bar
from ..geometry.materials import MATERIALS
from ..geometry.registry import RaiserId, outline_size
from ..geometry.spec import PartSpec
from .notices import Amount, Notice, notice

STRAIN_LIMIT = 0.02  # peak stress / E above which the small-strain model is out of its range
DISPLACEMENT_LIMIT = 0.10  # largest displacement as a fraction of the part's larger dimension
CLEARANCE_MULTIPLE = 10.0  # hole deformation / diametral clearance above which the clearance stops counting
LIGHT_LOAD = 0.01  # peak / yield strength below which the load looks too small by an order of magnitude
BUCKLING_SHARE = 0.5  # compressive load / Euler load above which buckling is warned

MODULUS_SLIP = {  # the unit a modulus typed as a bare number was probably meant in, by unit system
    "mm-N-MPa": "GPa (210 GPa is 210000 MPa)",
    "in-kip-ksi": "Msi (29 Msi is 29000 ksi)",
    "in-lbf-psi": "ksi or Msi (29 Msi is 29000000 psi)",
}


def input_warnings(spec: PartSpec, solution: Solution, peak_stress: float) -> list[Notice]:
    """Every warning of the module docstring that applies; `peak_stress` is the governing peak (MPa). The
    likely unit slip of E is named once: in the first warning that points to it."""
    modulus = _modulus_below_strength(spec)
    check_e = "check material.E" + ("" if modulus else f" (given in {_slip(spec)}?)")
    found = (modulus, _large_strain(spec, peak_stress, check_e), _large_displacement(spec, solution, check_e),
             _pin_clearance(spec, solution, check_e), _group_clearance(spec, solution, check_e),
             _beyond_strength(spec, peak_stress),
             _light_load(spec, peak_stress), _buckling(spec))
    return [w for w in found if w is not None]


def _slip(spec: PartSpec) -> str:
    return MODULUS_SLIP.get(spec.units, MODULUS_SLIP["mm-N-MPa"])


def _strength(spec: PartSpec) -> tuple[float, str] | None:
    """The yield strength, else the ultimate, with its name; None when neither is given."""
    m = spec.material
    if m.yield_strength is not None:
        return m.yield_strength, "yield strength"
    if m.ultimate is not None:
        return m.ultimate, "ultimate strength"
    return None


def _modulus_below_strength(spec: PartSpec) -> Notice | None:
    strength = _strength(spec)
    E = spec.material.E
    if strength is None or E >= strength[0]:
        return None
    return notice("material.E = ", Amount(E, "stress"), f" is below the {strength[1]} ", Amount(strength[0], "stress"),
                  f", softer than any structural material for its strength: was it given in {_slip(spec)}? The "
                  "strains, the displacements and a pin's contact with clearance depend on it")


def _large_strain(spec: PartSpec, peak: float, check_e: str) -> Notice | None:
    E = spec.material.E
    strain = abs(peak) / E if E > 0 and math.isfinite(peak) else 0.0
    if strain <= STRAIN_LIMIT:
        return None
    return notice(f"the peak strain is about {strain:.0%} (peak ", Amount(peak, "stress"), " / E ", Amount(E, "stress"),
                  f"), beyond the small-strain model (up to {STRAIN_LIMIT:.0%}) and any metal's elastic range: "
                  f"{check_e} and the load's units")


def _large_displacement(spec: PartSpec, solution: Solution, check_e: str) -> Notice | None:
    u = np.asarray(solution.displacement).reshape(-1, 2)
    if u.size == 0:
        return None
    largest = float(np.max(np.hypot(u[:, 0], u[:, 1])))
    size = max(outline_size(spec))
    if not largest > DISPLACEMENT_LIMIT * size:
        return None
    return notice("the largest displacement, ", Amount(largest, "length"), f", is {largest / size:.0%} of the part's "
                  "size ", Amount(size, "length"), f"; the small-displacement model holds to about "
                  f"{DISPLACEMENT_LIMIT:.0%}: {check_e} and the load's units")


def hole_deformation(spec: PartSpec, solution: Solution, hole: int) -> float:
    """How much the edge of hole `hole` (1-based) changes shape (mm): the spread of its nodes' radial
    displacements relative to their mean displacement (about the change of its diameter)."""
    mesh = solution.mesh
    name = RaiserId("hole", hole)
    if name not in mesh.edges:
        return 0.0
    nodes = mesh.edge_nodes(name)
    u = np.asarray(solution.displacement).reshape(-1, 2)[nodes]
    radial = mesh.nodes[nodes] - np.asarray(spec.holes[hole - 1].center)
    radial /= np.linalg.norm(radial, axis=1)[:, None]
    moved = np.einsum("ij,ij->i", radial, u - u.mean(axis=0))
    return float(moved.max() - moved.min())


def _pin_clearance(spec: PartSpec, solution: Solution, check_e: str) -> Notice | None:
    pin = spec.load.pin
    if pin is None or pin.contact != "rigid" or pin.clearance <= 0.0:
        return None
    change = hole_deformation(spec, solution, pin.hole)
    if not change > CLEARANCE_MULTIPLE * pin.clearance:
        return None
    return notice(f"hole {pin.hole} deforms by ", Amount(change, "length"), f", {change / pin.clearance:.0f} times the "
                  "pin's clearance ", Amount(pin.clearance, "length"), "; the result no longer depends on the "
                  f"clearance (it is the neat fit's), and a metal hole at working load deforms far less: {check_e}, "
                  "load.pin.force and the clearance")


def _group_clearance(spec: PartSpec, solution: Solution, check_e: str) -> Notice | None:
    """The first fastener group's hole that deforms more than CLEARANCE_MULTIPLE times its clearance."""
    for g in spec.fasteners:
        if g.clearance <= 0.0:
            continue
        for hole in g.holes:
            change = hole_deformation(spec, solution, hole)
            if change > CLEARANCE_MULTIPLE * g.clearance:
                return notice(f"hole {hole} deforms by ", Amount(change, "length"), f", {change / g.clearance:.0f} "
                              f"times the clearance ", Amount(g.clearance, "length"), f" of {g.key} ({g.name!r}); the "
                              "sharing no longer depends on the clearance (it is the neat fit's), and a metal hole at "
                              f"working load deforms far less: {check_e}, the group's load and the clearance")
    return None


def ultimate_to_yield() -> float:
    """The largest ratio of ultimate to yield strength among the built-in materials."""
    return max(row.ultimate_mpa / row.yield_mpa for row in MATERIALS)


def _beyond_strength(spec: PartSpec, peak: float) -> Notice | None:
    m = spec.material
    if m.ultimate is not None:
        limit, words = m.ultimate, ("the ultimate strength ", Amount(m.ultimate, "stress"))
    elif m.yield_strength is not None:
        ratio = ultimate_to_yield()
        limit = ratio * m.yield_strength
        words = (f"{ratio:.2f} times the yield strength ", Amount(m.yield_strength, "stress"),
                 " (no ultimate strength is given; none of the built-in materials has one that far above its yield)")
    else:
        return None
    if not abs(peak) > limit:
        return None
    return notice("the elastic peak ", Amount(peak, "stress"), " exceeds ", *words, ": no real stress reaches it, "
                  "the part relies on yielding there (a static check of a ductile part may accept it on the net "
                  "section; a cyclic load will not); check the load and its units, and the part's size")


LOAD_KEYS = {"axial": "load.axial", "combined": "load.axial", "bending": "load.bending and load.shear",
             "pin": "load.pin.force", "remote": "load.remote"}  # the part-file keys of each load kind


def _light_load(spec: PartSpec, peak: float) -> Notice | None:
    strength = _strength(spec)
    if strength is None or not math.isfinite(peak) or abs(peak) >= LIGHT_LOAD * strength[0]:
        return None
    key = LOAD_KEYS.get(spec.load.kind, "the load")
    return notice("the peak ", Amount(peak, "stress"), f" is below {LIGHT_LOAD:.0%} of the {strength[1]} ",
                  Amount(strength[0], "stress"), f": the load may be too small by an order of magnitude or more "
                  f"(a force meant in kN but written as a bare number is read in N); check {key} and its units")


def euler_load(spec: PartSpec, length: float) -> float:
    """Euler load (N) of the strap as a pinned-pinned column of `length` (mm) about its weak axis:
    pi^2 E I / L^2 with I = A b^2 / 12, A = w t, b = min(w, t), w the narrowest width (common practice)."""
    w = narrowest_width(spec)
    t = spec.plate.thickness
    inertia = w * t * min(w, t) ** 2 / 12.0
    return math.pi ** 2 * spec.material.E * inertia / length ** 2


def compression(spec: PartSpec) -> tuple[float, float, str] | None:
    """(compressive force in N, column length in mm, where it acts) of an end or pin load that pushes
    the bar towards its held end; None when the strap is not compressed that way or is no bar."""
    if spec.outline != bar.NAME:
        return None
    load, half = spec.load, 0.5 * spec.plate.length
    if load.kind in ("axial", "combined") and load.axial < 0.0:
        return -load.axial, spec.plate.length, "the held end to the loaded end"
    pin = load.pin
    if pin is not None and math.cos(pin.angle) < -1e-12:
        x = spec.holes[pin.hole - 1].center[0]
        return -pin.force * math.cos(pin.angle), x + half, f"the held end to hole {pin.hole}"
    return None


def _buckling(spec: PartSpec) -> Notice | None:
    pushed = compression(spec)
    if pushed is None:
        return None
    force, length, span = pushed
    if length <= 0.0:
        return None
    critical = euler_load(spec, length)
    share = force / critical
    if not share > BUCKLING_SHARE:
        return None
    inertia = "w t^3 / 12" if spec.plate.thickness <= narrowest_width(spec) else "t w^3 / 12"
    verdict = "it buckles before this load is reached" if share >= 1.0 else "it may buckle"
    return notice("the strap is compressed by ", Amount(force, "force"), f", {_times(share)} its Euler load ",
                  Amount(critical, "force"), " (a pinned-pinned column ", Amount(length, "length"), f" long, from "
                  f"{span}, bending about its weak axis: pi^2 E I / L^2, I = {inertia}; warned above "
                  f"{BUCKLING_SHARE:g} of it): {verdict}, which this 2-D model does not check, and an end free to "
                  "sway buckles at a quarter of that load; check it as a column under the governing design code")


def _times(share: float) -> str:
    return f"{share:.2f} times" if share < 10.0 else f"{share:,.0f} times"
