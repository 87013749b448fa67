"""Nominal stresses the handbooks use for each kind of load, and the Kt each one gives.

On the critical section (a straight cut through the raiser; see compare.check) with statics resultants
N (normal force), M (moment about the centroid of the section's material), net area A = t sum(l_i),
second moment I about that centroid and extreme-fibre distance c (largest distance from the centroid
to the end of a ligament):

    axial     net  N / A                         gross  N / (W t)
    bending   net  |M| c / I  (= 6 M / (t h^2)   gross  6 |M| / (t W^2)
                   for one ligament of width h)
    combined  net  largest |N / A + M s / I| at the two extreme fibres (s from the centroid); gross alike
    pin       net  P / A (cut through the pin hole across the pin's line), gross P / (W t), and the
              bearing stress P / (d t)
    remote    the largest principal stress of the remote state in magnitude (Kirsch's nominal)

The gross section is the one the cited handbook uses for the raiser's kind (`gross_section`): the plate's
width W along the cut, or for a shoulder fillet the wide width D (the narrow width is the net section);
the gross moment is taken about the gross section's centroid, as a hand calculation does. Kt =
|peak| / |nominal| (MPa / MPa).

On the cut normal to the edge at the peak (parts held or loaded on their own boundary, compare/edge_cut.py)
the hand calculation is the stress in the peak's own fibre, N / A + M s / I, s the distance from the
cut's centroid to the peak along the cut; net on the cut's ligaments, gross on the same stretch of the
outline without its cut-outs (`edge_nominals`).
The headline Kt(net) and Kt(gross) use the first two rows of the load's kind; every nominal that
applies is listed with its own Kt, so the report states which nominal each Kt uses.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..fem.fastener_groups import bearing_stress
from ..geometry.kinds.base import NetCut, RaiserId
from ..geometry.kinds.stepped import FILLET, step_shape
from ..geometry.outline import plate_polygon
from ..geometry.registry import outline_size
from ..geometry.spec import PartSpec
from .method_of_sections import SectionResult
from .sections import ligaments


@dataclass(frozen=True)
class Nominal:
    """One nominal stress: key, what it is in words, its formula, value (MPa, signed) and Kt."""

    key: str
    label: str
    formula: str
    stress: float
    kt: float | None


@dataclass(frozen=True)
class NominalSet:
    """The nominals of a check: `net` and `gross` give the headline Kt; `all` lists every one."""

    net: Nominal
    gross: Nominal
    all: tuple[Nominal, ...]


@dataclass(frozen=True)
class SectionProperties:
    """Net area (mm^2), second moment about the centroid (mm^4) and the two extreme-fibre positions
    measured from the centroid along the cut (mm, bottom <= 0 <= top)."""

    area: float
    inertia: float
    bottom: float
    top: float

    @property
    def extreme(self) -> float:
        return max(-self.bottom, self.top)


def section_properties(ligaments: tuple[tuple[float, float], ...], thickness: float) -> SectionProperties:
    """Properties of the material intervals `ligaments` (mm along the cut) of a plate of `thickness`."""
    lig = np.asarray(ligaments, dtype=float).reshape(-1, 2)
    length = lig[:, 1] - lig[:, 0]
    area = thickness * float(length.sum())
    if area <= 0.0:
        return SectionProperties(0.0, 0.0, 0.0, 0.0)
    middle = 0.5 * (lig[:, 0] + lig[:, 1])
    centroid = float(np.sum(length * middle) / length.sum())
    inertia = thickness * float(np.sum(length ** 3 / 12.0 + length * (middle - centroid) ** 2))
    return SectionProperties(area, inertia, float(lig[0, 0] - centroid), float(lig[-1, 1] - centroid))


@dataclass(frozen=True)
class GrossSection:
    """The gross section a raiser's handbook uses: its material intervals along the critical cut's
    coordinate (mm), the symbol of its width in formulas, and what it is in words."""

    spans: tuple[tuple[float, float], ...]
    symbol: str
    definition: str

    @property
    def width(self) -> float:
        return float(sum(b - a for a, b in self.spans))

    @property
    def centroid(self) -> float:
        """Position of the gross section's centroid along the cut (mm)."""
        lig = np.asarray(self.spans, dtype=float).reshape(-1, 2)
        length = lig[:, 1] - lig[:, 0]
        return float(np.sum(length * lig.mean(axis=1)) / length.sum()) if length.sum() > 0 else 0.0


def gross_section(spec: PartSpec, feature: RaiserId | None, point: tuple[float, float],
                  normal: tuple[float, float]) -> GrossSection:
    """The gross section of the raiser `feature` on the cut through `point` with unit `normal`, as its
    family's handbook defines it: for a shoulder fillet the wide width D across the part (Roark table 17.1
    and Peterson's charts refer Kt gross to it; docs/references.md [Roark]), for every other raiser (and a
    peak at no raiser) the plate's width W along the cut. One rule per kind, keyed on the raiser's kind."""
    if feature is not None and feature.kind == FILLET:
        offset = point[1] * normal[0] - point[0] * normal[1]  # the cut coordinate of y = 0
        half = step_shape(spec).wide
        return GrossSection(((-half - offset, half - offset),), "D", "the wide width D of the shoulder")
    return GrossSection(tuple(ligaments(plate_polygon(spec), point, normal)), "W", "the plate's width W along the cut")


def nominal_stresses(spec: PartSpec, peak: float, section: SectionResult, gross_section: GrossSection) -> NominalSet:
    """The nominals of `spec`'s load on the critical `section` (statics N, M about the net section's
    centroid), with Kt against `peak` (MPa); the gross nominals on `gross_section`, with the moment taken
    about its own centroid."""
    t = spec.plate.thickness
    kind = spec.load.kind
    N, M = section.statics.normal_force, section.statics.moment
    net = section_properties(section.ligaments, t)
    gross = section_properties(gross_section.spans, t)
    M_gross = M + N * (section.centroid - gross_section.centroid)  # M positive stretching the +d side
    W = gross_section.symbol

    def make(key, label, formula, stress):
        return Nominal(key, label, formula, stress, abs(peak / stress) if stress != 0.0 else None)

    axial_net = make("axial-net", "axial, net section", "N / A_net", _ratio(N, net.area))
    axial_gross = make("axial-gross", "axial, gross section", f"N / ({W} t)", _ratio(N, gross.area))
    bending_net = make("bending-net", "bending, net section", "|M| c / I_net (= 6 M / (t h^2) for one ligament)",
                       _ratio(abs(M) * net.extreme, net.inertia))
    bending_gross = make("bending-gross", "bending, gross section", f"6 |M| / (t {W}^2), M about its centroid",
                         _ratio(abs(M_gross) * gross.extreme, gross.inertia))
    if kind == "remote":
        s1, s2 = spec.load.remote.principal
        remote = make("remote", "remote stress", "largest remote principal stress in magnitude",
                      s1 if abs(s1) >= abs(s2) else s2)
        return NominalSet(remote, remote, (remote, axial_net))
    if kind == "pin":
        pin = spec.load.pin
        d = spec.holes[pin.hole - 1].diameter
        pin_net = make("pin-net", "pin load, net section", "P / A_net", _ratio(pin.force, net.area))
        pin_gross = make("pin-gross", "pin load, gross section", f"P / ({W} t)", _ratio(pin.force, gross.area))
        bearing = make("bearing", "pin bearing", "P / (d t)", bearing_stress(pin.force, d, t))
        return NominalSet(pin_net, pin_gross, (pin_net, pin_gross, bearing))
    if kind == "axial":
        return NominalSet(axial_net, axial_gross, (axial_net, axial_gross))
    if kind == "bending":
        return NominalSet(bending_net, bending_gross, (bending_net, bending_gross))
    combined_net = make("combined-net", "axial + bending, net section", "largest |N / A_net + M s / I_net| at the "
                        "extreme fibres", _extreme_fibre(N, M, net))
    combined_gross = make("combined-gross", "axial + bending, gross section",
                          f"largest |N / ({W} t) +/- 6 M / (t {W}^2)|, M about its centroid",
                          _extreme_fibre(N, M_gross, gross))
    return NominalSet(combined_net, combined_gross,
                      (combined_net, combined_gross, axial_net, bending_net, axial_gross, bending_gross))


def edge_nominals(spec: PartSpec, peak: float, section: SectionResult, gross: tuple[tuple[float, float], ...],
                  at: float = 0.0) -> NominalSet:
    """The nominals on the cut normal to the edge at the peak: N / A + M s / I at the peak's position `at`
    (mm along the cut) on the net ligaments and on the `gross` stretches, and its two terms (net)."""
    t = spec.plate.thickness
    N, M = section.statics.normal_force, section.statics.moment

    def make(key, label, formula, stress):
        return Nominal(key, label, formula, stress, abs(peak / stress) if stress != 0.0 else None)

    def fibre(spans) -> tuple[float, float]:
        props = section_properties(spans, t)
        if props.area <= 0.0 or props.inertia <= 0.0:
            return 0.0, 0.0
        return N / props.area, M * (at - _centroid(spans)) / props.inertia

    axial, bending = fibre(section.ligaments)
    gross_axial, gross_bending = fibre(gross)
    if abs(bending) <= ROUND_OFF * abs(peak):  # a moment of round-off: no bending term
        bending = gross_bending = 0.0
    if abs(axial) <= ROUND_OFF * abs(peak):  # a force of round-off (no load crosses the cut): no axial term
        axial = gross_axial = 0.0
    net = make("edge-net", "cut normal to the edge, net", "N / A + M s / I at the peak (s from the cut's centroid)",
               axial + bending)
    gross_nominal = make("edge-gross", "cut normal to the edge, gross", "N / A_g + M s / I_g at the peak, the outline "
                         "without cut-outs", gross_axial + gross_bending)
    return NominalSet(net, gross_nominal, (net, gross_nominal,
                                           make("edge-axial", "normal force on that cut", "N / A", axial),
                                           make("edge-bending", "bending on that cut", "M s / I", bending)))


ROUND_OFF = 1e-9  # a nominal term below this fraction of the peak is round-off of a zero
FASTENER_BEARING = "fastener-bearing"  # the key of a fastener's own bearing nominal (compare.check.bearing_led)


def _centroid(spans: tuple[tuple[float, float], ...]) -> float:
    """Position (mm along the cut) of the centroid of the material intervals."""
    lig = np.asarray(spans, dtype=float).reshape(-1, 2)
    length = lig[:, 1] - lig[:, 0]
    return float(np.sum(length * 0.5 * (lig[:, 0] + lig[:, 1])) / length.sum()) if length.sum() > 0 else 0.0


def _ratio(a: float, b: float) -> float:
    return a / b if b > 0.0 else 0.0


def _extreme_fibre(N: float, M: float, p: SectionProperties) -> float:
    """The larger in magnitude of N / A + M s / I at s = bottom and s = top (signed, MPa)."""
    if p.area <= 0.0 or p.inertia <= 0.0:
        return 0.0
    values = [N / p.area + M * s / p.inertia for s in (p.bottom, p.top)]
    return max(values, key=abs)


def critical_cut(spec: PartSpec, cut: NetCut) -> tuple[tuple[float, float], tuple[float, float]]:
    """(point, unit normal) of the critical section: through a pin's hole centre across the pin's line,
    otherwise the raiser's `cut` (a cut across the load kept just inside the ends)."""
    if spec.load.pin is not None:
        pin = spec.load.pin
        return spec.holes[pin.hole - 1].center, (math.cos(pin.angle), math.sin(pin.angle))
    if cut.normal != (1.0, 0.0):
        return cut.point, cut.normal
    half = 0.5 * outline_size(spec)[0] * (1.0 - 1e-3)
    return (min(max(cut.point[0], -half), half), cut.point[1]), cut.normal
