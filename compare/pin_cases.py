"""Published Kt of a pin-loaded lug: a square-ended plate pulled through a closely fitting pin.

The case is the curve fit that Peterson's handbook draws through the photoelastic data of Frocht and Hill,
recalled from memory (chart number not recalled):

    Ktn = 12.882 - 52.714 (d/H) + 89.762 (d/H)^2 - 51.667 (d/H)^3,   0.15 <= d/H <= 0.75,

on the net-section stress P / ((H - d) t), for a square-ended lug whose end distance c (hole centre to the
lug's end) is at least H; on the bearing stress P / (d t) the same peak gives Ktb = Ktn d / (H - d).
H is the lug's width, d the hole's diameter, t the thickness, P the pin force.

Which contact model the comparison assumes: the data are for a closely fitting pin bearing on the hole's
edge, so the FE counterpart is `load.pin.contact = "rigid"` with the fit's clearance (the tests use zero:
a neat fit). The handbook notes that clearance raises the peak strongly, and the photoelastic pins had
some; the cosine pressure of common practice is a further idealisation. This project measured the rigid,
neat-fit FE 7-11 % below the fit at d/H 0.27-0.45 and 20-22 % below it at d/H 0.6-0.75, and the cosine FE
6-13 % below it at d/H 0.3-0.6 (tests/test_pin_contact.py); a clearance of 0.1 mm on an 18 mm pin at
10 kN (d/H 0.45, 5 mm steel) brings the rigid FE to within 1 % of the fit (measured). The case is a
reference to read against, not a tight check.

The fit describes the tensile peak at the hole's sides, which is also what the check's Kt is: where a pin
bears, the compression under it is bearing, reported on its own row against P / (d t), and the governing
peak is the tensile one on the free edge (fem/raiser_peaks.py). The case names the pin's hole as its
raiser (compare/case_kt.py).

A part is recognised only when it IS the case: one circular hole on the centre line, no other raiser, a
straight (square) loaded end, a pin through that hole pushing along the part towards the free end
(direction 0 degrees: the loaded end x = +L/2 carries nothing else), end distance c/H >= 1, the held end
(or the plane x = 0 that takes its place) at least FAR_END widths from the hole, and d/H inside the fit's
range.
"""

from __future__ import annotations

import math

from ..geometry.spec import PartSpec
from ..geometry.kinds.hole import named as named_hole
from .case_types import Case, Recognised, Recogniser, recogniser

POSITION_TOLERANCE = 0.01  # hole centre within 1 % of the width of the centre line
FAR_END = 2.0  # held end at least this many widths from the hole (Saint-Venant; common practice)
MIN_END_DISTANCE = 1.0  # c/H: the fit is for end distances of at least one width (from memory)
D_OVER_H = (0.15, 0.75)  # the fit's range (from memory)

_SOURCE = ("W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chapter 5 "
           "(lug joints), pin joint with a closely fitting pin, square-ended lug, c/H >= 1, curve fit of the "
           "photoelastic data of M. M. Frocht and H. N. Hill, J. Appl. Mech. 7 (1940) (from memory; chart number "
           "not recalled)")


def square_lug_kt(p: dict[str, float]) -> float:
    """Ktn of the pin-loaded square-ended lug on P / ((H - d) t) (see the module docstring; from memory)."""
    x = p["d/H"]
    return 12.882 - 52.714 * x + 89.762 * x * x - 51.667 * x ** 3


def bearing_kt(p: dict[str, float]) -> float:
    """Ktb on the bearing stress P / (d t): Ktn d / (H - d) (the same peak over the other nominal)."""
    x = p["d/H"]
    return square_lug_kt(p) * x / (1.0 - x)


PIN_CASES: tuple[Case, ...] = (
    Case(key="pin-loaded-square-lug", family="pin-loaded-square-lug",
         title="Pin-loaded square-ended lug, closely fitting pin, c/H >= 1 (curve fit)", source=_SOURCE,
         formula="Ktn = 12.882 - 52.714 (d/H) + 89.762 (d/H)^2 - 51.667 (d/H)^3; on the bearing stress "
                 "Ktb = Ktn d / (H - d); data for a closely fitting pin (FE: load.pin.contact = \"rigid\")",
         nominal="net", nominal_text="P / ((H - d) t)", ranges={"d/H": D_OVER_H}, kt=square_lug_kt),
)


@recogniser(hole=1)
def recognise_square_lug(spec: PartSpec) -> Recognised | None:
    """One hole on the centre line of a square-ended plate (nothing else), pulled towards the free end by a
    pin through it, the end distance at least one width and the held end at least FAR_END widths away."""
    load = spec.load
    if load.kind == "fasteners":  # the pin as a one-fastener group of the part file
        pin = _group_pin(spec)
        if pin is None:
            return None
        angle, model = pin
    elif load.kind != "pin" or load.pin.hole != 1:
        return None
    else:
        angle = load.pin.angle
        model = (f"rigid pin, clearance {load.pin.clearance:g} mm" if load.pin.contact == "rigid"
                 else "cosine pressure (the data are for a closely fitting pin: contact = \"rigid\" models it)")
    hole = spec.holes[0]
    H, half_l = spec.plate.width, 0.5 * spec.plate.length
    if abs(math.sin(angle)) > 1e-9 or math.cos(angle) < 0.0:  # along +x, towards the free end
        return None
    if abs(hole.center[1]) > POSITION_TOLERANCE * H:
        return None
    end_distance = half_l - hole.center[0]
    far = hole.center[0] if "x" in spec.support.symmetry else hole.center[0] + half_l
    x = hole.diameter / H
    if end_distance < MIN_END_DISTANCE * H or far < FAR_END * H or not D_OVER_H[0] <= x <= D_OVER_H[1]:
        return None
    # the case describes the tensile peak at the hole's sides, on the free edge of the pin's hole
    return Recognised("pin-loaded-square-lug", f"pin-loaded square-ended lug, c/H = {end_distance / H:.3g}; FE pin "
                      f"model: {model}", {"d/H": x}, 1.0 / (1.0 - x), raiser=named_hole(1))


def _group_pin(spec: PartSpec) -> tuple[float, str] | None:
    """(direction in radians, the FE model in words) of a part loaded only by one rigid one-fastener group in
    hole 1, with no moment about it, and held at its end: the lug's pin given as a [[fasteners]] group."""
    load = spec.load
    if (len(spec.fasteners) != 1 or spec.fasteners[0].holds or spec.fasteners[0].holes != (1,)
            or spec.fasteners[0].stiffness != "rigid" or load.has_end_loads or load.edges or spec.support.holds):
        return None
    (group_load,) = load.fasteners
    if group_load.moment != 0.0 or group_load.about is not None:
        return None
    return math.radians(group_load.direction), f"one-fastener group, clearance {spec.fasteners[0].clearance:g} mm"


def build_square_lug(params: dict[str, float], width: float = 40.0) -> dict:
    """Part-file dictionary: a square-ended lug of width 40 mm, 5 mm thick, the hole one width from the
    free end and five widths from the held end, pulled by a 10 kN rigid, neat-fit pin (mm, N, MPa)."""
    c = width
    length = c + 5.0 * width
    return {"title": f"pin-loaded square lug, d/H = {params['d/H']:g}",
            "plate": {"length": length, "width": width, "thickness": 5.0},
            "hole": [{"center": [0.5 * length - c, 0.0], "diameter": params["d/H"] * width}],
            "material": {"E": 200000.0, "nu": 0.3},
            "load": {"pin": {"hole": 1, "force": 10000.0, "direction": 0.0, "contact": "rigid"}}}


PIN_RECOGNISERS: tuple[Recogniser, ...] = (recognise_square_lug,)
# build_square_lug is deliberately NOT a registered builder (compare.handbook.BUILDERS): the built-in suite
# would judge the FE against a recalled fit it misses by 7-22 %, which is no check. The tests use it.
