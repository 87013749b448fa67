"""Published Kt cases for the raisers other than a central hole, with the rules that recognise a part as
each case and part builders for sweeps and regression suites.

Every case states its formula, source, nominal stress and validity range. Where the formula or its range
was recalled rather than read from a copy it says "(from memory)". A part matches a case only when it IS
that case: the right raisers and nothing else (each recogniser declares the kinds it describes,
compare/case_types.py), centred and symmetric within POSITION_TOLERANCE of the width, at least
END_CLEARANCE widths from either end (Saint-Venant; common practice), under axial load.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from ..geometry.kinds import ellipse, hole, notch
from ..geometry.kinds.stepped import step_shape
from ..geometry.registry import of_kind
from ..geometry.spec import PartSpec
from .case_types import Case, Coefficients, Recognised, Recogniser, recogniser, two_range_cubic

POSITION_TOLERANCE = 0.01  # centres within 1 % of the width of where the case puts them
END_CLEARANCE = 1.0  # raiser at least one plate width from either end (common practice)
WIDE_PLATE = 0.1  # "wide plate": the hole spans at most this fraction of the width across the load (common practice)
SHALLOW_EDGE_NOTCH = 0.02  # "semi-infinite plate": notch depth at most this fraction of the width (see tests)
ROW_MIN_HOLES = 7  # a row of at least this many equal holes stands for an infinite row (measured: with 5 the
                   # middle hole sits 1-3 % above the infinite row, with 7 within 1 %)

def axial(spec: PartSpec) -> bool:
    """An axial end load only (the load of the tension cases)."""
    return spec.load.kind == "axial"


def _clear_of_ends(spec: PartSpec, x0: float, x1: float) -> bool:
    half_l, W = 0.5 * spec.plate.length, spec.plate.width
    return min(x0 + half_l, half_l - x1) >= END_CLEARANCE * W


def _close(a: float, b: float, scale: float) -> bool:
    return abs(a - b) <= POSITION_TOLERANCE * scale


# --- elliptical hole in a wide plate (Inglis) ------------------------------------------------------------

def inglis_kt(a_over_b: float, angle_deg: float) -> float:
    """Largest hoop stress on an elliptical hole in an infinite plate over the remote uniaxial stress S.

    a >= b: the semi-axes; the load is at angle beta = angle_deg to the a axis. With tanh(alpha0) = b / a, the boundary stress at eccentric angle eta is
        s = S [sinh 2 alpha0 + cos 2 beta - exp(2 alpha0) cos 2 (beta - eta)] / (cosh 2 alpha0 - cos 2 eta)
    (C. E. Inglis, Trans. Inst. Naval Architects 55, 1913; inclined-load form as given in Pilkey & Pilkey,
    Peterson's Stress Concentration Factors, 3rd ed., 2008, section 4 (from memory)). For a load across the
    a axis (beta = 90 degrees) its largest value is 1 + 2 a / b, at the ends of the a axis.
    """
    if a_over_b <= 1.0 + 1e-9:
        return 3.0  # a circle: Kirsch
    alpha = math.atanh(1.0 / a_over_b)
    beta = math.radians(angle_deg)
    n = 3600
    best = -math.inf
    for k in range(n):
        eta = math.pi * k / n
        s = ((math.sinh(2 * alpha) + math.cos(2 * beta) - math.exp(2 * alpha) * math.cos(2 * (beta - eta)))
             / (math.cosh(2 * alpha) - math.cos(2 * eta)))
        best = max(best, s)
    return best


@recogniser(ellipse=1)
def recognise_ellipse(spec: PartSpec) -> Recognised | None:
    """One elliptical hole on the centre line of a plate much wider than the hole, far from the ends."""
    if not axial(spec):
        return None
    e = of_kind(spec, ellipse.NAME)[0]
    W = spec.plate.width
    shape = ellipse.shape(e)
    c, s = math.cos(shape.angle), math.sin(shape.angle)
    span_y = 2.0 * math.hypot(shape.major * s, shape.minor * c)
    span_x = 2.0 * math.hypot(shape.major * c, shape.minor * s)
    if not _close(e.center[1], 0.0, W) or not _clear_of_ends(spec, e.center[0] - span_x / 2, e.center[0] + span_x / 2):
        return None
    load_to_major = math.degrees(shape.angle) % 180.0  # angle between the load (x) and the major axis
    beta = min(load_to_major, 180.0 - load_to_major)
    net = 1.0 - span_y / W
    return Recognised("elliptical-hole-wide-plate", "elliptical hole in a wide plate, uniaxial tension",
                      {"a/b": shape.major / shape.minor, "load angle": beta, "hole span/W": span_y / W}, 1.0 / net)


def build_ellipse(params: dict[str, float], width: float = 400.0) -> dict:
    """Part-file dictionary of an ellipse (major/minor = a/b, major axis at `load angle` to the load)
    spanning `hole span/W` of a plate three widths long."""
    a_b, beta, span = params["a/b"], params["load angle"], params["hole span/W"]
    t = math.radians(beta)
    # span across the load of an ellipse with semi-axes (a, a / a_b) whose major axis is at beta to x
    unit = 2.0 * math.hypot(math.sin(t), math.cos(t) / a_b)
    a = span * width / unit
    return _base(f"elliptical hole, a/b = {a_b:g}, load at {beta:g} deg", width, 3.0 * width,
                 ellipse=[{"center": [0.0, 0.0], "length": 2 * a, "width": 2 * a / a_b, "angle": beta}])


# --- edge notches --------------------------------------------------------------------------------------

_U_NOTCHES_LOW: Coefficients = ((0.85, 2.628, -0.413), (-1.119, -4.826, 2.575), (3.563, -0.514, -2.402), (-2.294, 2.713, 0.24))
_U_NOTCHES_HIGH: Coefficients = ((0.833, 2.069, -0.009), (2.732, -4.157, 0.176), (-8.859, 5.327, -0.32), (6.294, -3.239, 0.154))


def roark_opposite_u_notches(p: dict[str, float]) -> float:
    """Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory; shared
    docs/references.md [Roark]): Kt = C1 + C2 x + C3 x^2 + C4 x^3, x = 2h/D, on the net section."""
    return two_range_cubic(p, _U_NOTCHES_LOW, _U_NOTCHES_HIGH)


def peterson_semicircular_notches(p: dict[str, float]) -> float:
    """Two opposite semicircular notches, net section: Ktn = 3.065 - 3.472 x + 1.009 x^2 + 0.405 x^3,
    x = 2r/D (Pilkey & Pilkey, Peterson's Stress Concentration Factors, 3rd ed., 2008, chart 2.3 fit after
    Ling (from memory))."""
    x = p["2r/D"]
    return 3.065 - 3.472 * x + 1.009 * x * x + 0.405 * x ** 3


def edge_u_notch_semi_infinite(p: dict[str, float]) -> float:
    """One U-shaped (or semicircular, h/r = 1) edge notch in a semi-infinite plate, remote stress:
    Kt = 0.855 + 2.21 sqrt(h/r), 1 <= h/r <= 361 (Pilkey & Pilkey, Peterson's Stress Concentration
    Factors, 3rd ed., 2008, chart 2.2 fit (from memory)); h/r = 1 gives 3.065, the semicircular notch."""
    return 0.855 + 2.21 * math.sqrt(p["h/r"])


def _notch_pair(spec: PartSpec):
    """The one pair of equal opposite notches of a part whose raisers are one or two notches (one "both"
    notch or a top and a bottom notch at the same x) under axial load, else None."""
    if not axial(spec):
        return None
    W = spec.plate.width
    notches = of_kind(spec, notch.NAME)
    if len(notches) == 1 and notches[0].side == "both":
        return notches[0]
    if len(notches) == 2:
        a, b = notches
        if {a.side, b.side} == {"top", "bottom"} and a.shape == b.shape and _close(a.x, b.x, W) \
                and _close(a.depth, b.depth, W) and _close(a.radius, b.radius, W) and _close(a.angle, b.angle, 100.0):
            return a
    return None


@recogniser(notch=(1, 2))
def recognise_opposite_u_notches(spec: PartSpec) -> Recognised | None:
    """Two equal opposite U (or semicircular) notches at the same x, far from the ends."""
    pair = _notch_pair(spec)
    if pair is None or pair.shape == "V" or not _clear_of_ends(spec, pair.x - pair.radius, pair.x + pair.radius):
        return None
    D, h, r = spec.plate.width, pair.depth, pair.radius
    return Recognised("opposite-u-notches", "two opposite U-notches in a flat bar, axial tension",
                      {"h/r": h / r, "2h/D": 2 * h / D}, D / (D - 2 * h))


@recogniser(notch=(1, 2))
def recognise_opposite_semicircles(spec: PartSpec) -> Recognised | None:
    """Two equal opposite notches whose depth equals their radius."""
    pair = _notch_pair(spec)
    if pair is None or pair.shape == "V" or not _close(pair.depth, pair.radius, pair.radius):
        return None
    if not _clear_of_ends(spec, pair.x - pair.radius, pair.x + pair.radius):
        return None
    D = spec.plate.width
    return Recognised("opposite-semicircular-notches", "two opposite semicircular notches in a flat bar, axial tension",
                      {"2r/D": 2 * pair.radius / D}, D / (D - 2 * pair.radius))


@recogniser(notch=1)
def recognise_edge_notch(spec: PartSpec) -> Recognised | None:
    """One U (or semicircular) notch on one edge, shallow against the width, far from the ends."""
    if not axial(spec):
        return None
    one = of_kind(spec, notch.NAME)[0]
    W = spec.plate.width
    if one.side == "both" or one.shape == "V" or one.depth < one.radius:
        return None
    if one.depth > SHALLOW_EDGE_NOTCH * W or not _clear_of_ends(spec, one.x - one.radius, one.x + one.radius):
        return None
    return Recognised("edge-u-notch-semi-infinite", "single U-notch in the edge of a wide plate, axial tension",
                      {"h/r": one.depth / one.radius, "h/W": one.depth / W}, W / (W - one.depth))


def build_opposite_u_notches(params: dict[str, float], width: float = 100.0) -> dict:
    h = 0.5 * params["2h/D"] * width
    return _base(f"opposite U-notches, h/r = {params['h/r']:g}, 2h/D = {params['2h/D']:g}", width, 6.0 * width,
                 notch=[{"x": 0.0, "side": "both", "shape": "U", "depth": h, "radius": h / params["h/r"]}])


def build_opposite_semicircles(params: dict[str, float], width: float = 100.0) -> dict:
    r = 0.5 * params["2r/D"] * width
    return _base(f"opposite semicircular notches, 2r/D = {params['2r/D']:g}", width, 6.0 * width,
                 notch=[{"x": 0.0, "side": "both", "shape": "semicircle", "radius": r}])


def build_edge_notch(params: dict[str, float], width: float = 400.0) -> dict:
    h = params["h/W"] * width
    return _base(f"edge U-notch, h/r = {params['h/r']:g}", width, 3.0 * width,
                 notch=[{"x": 0.0, "side": "top", "shape": "U", "depth": h, "radius": h / params["h/r"]}])


# --- stepped flat bar with shoulder fillets ---------------------------------------------------------------

_STEP_LOW: Coefficients = ((1.007, 1.0, -0.031), (-0.114, -0.585, 0.314), (0.241, -0.992, -0.271), (-0.134, 0.577, -0.012))
_STEP_HIGH: Coefficients = ((1.042, 0.982, -0.036), (-0.074, -0.156, -0.01), (-3.418, 1.22, -0.005), (3.45, -2.046, 0.051))


def roark_stepped_bar(p: dict[str, float]) -> float:
    """Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory; shared
    docs/references.md [Roark]): Kt = C1 + C2 x + C3 x^2 + C4 x^3, x = 2h/D, on the narrow section."""
    return two_range_cubic(p, _STEP_LOW, _STEP_HIGH)


@recogniser(step=1, fillet=2)
def recognise_stepped_bar(spec: PartSpec) -> Recognised | None:
    """A symmetric shoulder step with fillets, nothing else, with the wide and narrow parts each at least
    one (own) width long (the chart assumes both are long; common practice)."""
    if not axial(spec):
        return None
    shape = step_shape(spec)
    D, d, r = spec.plate.width, spec.step.width, spec.step.radius
    half_l = 0.5 * spec.plate.length
    narrow_len = half_l - shape.x_narrow * shape.sense
    wide_len = half_l + spec.step.x * shape.sense
    if narrow_len < END_CLEARANCE * d or wide_len < END_CLEARANCE * D:
        return None
    h = 0.5 * (D - d)
    return Recognised("stepped-bar-fillets", "stepped flat bar with shoulder fillets, axial tension",
                      {"h/r": h / r, "2h/D": 2 * h / D}, D / d)


def build_stepped_bar(params: dict[str, float], narrow: float = 50.0) -> dict:
    x = params["2h/D"]
    D = narrow / (1.0 - x)
    h = 0.5 * (D - narrow)
    return _base(f"stepped bar, h/r = {params['h/r']:g}, 2h/D = {x:g}", D, 6.0 * D,
                 step={"x": 0.0, "width": narrow, "radius": h / params["h/r"]})


# --- infinite row of holes across the load --------------------------------------------------------------

def row_of_holes(p: dict[str, float]) -> float:
    """Infinite row of circular holes across a uniaxial tension (the row perpendicular to the load),
    pitch l, net section per pitch (l - d): Ktn = 3.000 - 3.095 (d/l) + 0.309 (d/l)^2 + 0.786 (d/l)^3
    (Pilkey & Pilkey, Peterson's Stress Concentration Factors, 3rd ed., 2008, chart 4.? fit after Schulz
    (from memory; chart number not recalled))."""
    x = p["d/l"]
    return 3.000 - 3.095 * x + 0.309 * x * x + 0.786 * x ** 3


@recogniser(hole=(ROW_MIN_HOLES, 10 ** 9))
def recognise_row(spec: PartSpec) -> Recognised | None:
    """At least ROW_MIN_HOLES equal holes at one x, at an equal pitch l, the outer ones l/2 from the sides
    (the plate is a whole number of pitches wide). The case describes the holes of the middle of the row;
    the outer holes see the free sides (`raiser` names the middle hole)."""
    n = len(spec.holes)
    if not axial(spec):
        return None
    W = spec.plate.width
    holes = sorted(spec.holes, key=lambda h: h.center[1])
    pitch = W / n
    for k, h in enumerate(holes):
        if not (_close(h.center[0], holes[0].center[0], W) and _close(h.diameter, holes[0].diameter, W)
                and _close(h.center[1], -0.5 * W + (k + 0.5) * pitch, W)):
            return None
    if not _clear_of_ends(spec, holes[0].center[0] - holes[0].radius, holes[0].center[0] + holes[0].radius):
        return None
    middle = spec.holes.index(holes[n // 2]) + 1
    d = holes[0].diameter
    return Recognised("row-of-holes", "row of equal holes across the load (as an infinite row)",
                      {"d/l": d / pitch, "holes": float(n)}, pitch / (pitch - d), raiser=hole.named(middle))


def build_row(params: dict[str, float], pitch: float = 20.0) -> dict:
    """Part-file dictionary of a row of `holes` (default ROW_MIN_HOLES) equal holes of diameter d/l x pitch
    across the load at x = 0, the plate a whole number of pitches wide and four widths long."""
    n = int(round(params.get("holes", ROW_MIN_HOLES)))
    W = n * pitch
    return _base(f"row of {n} holes, d/l = {params['d/l']:g}", W, 4.0 * W,
                 hole=[{"center": [0.0, -0.5 * W + (k + 0.5) * pitch], "diameter": params["d/l"] * pitch} for k in range(n)])


def _base(title: str, width: float, length: float, **raisers) -> dict:
    return {"title": title, "plate": {"length": length, "width": width, "thickness": 10.0},
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 100000.0}, **raisers}


RAISER_CASES: tuple[Case, ...] = (
    Case(key="elliptical-hole-inglis", family="elliptical-hole-wide-plate",
         title="Elliptical hole in a wide plate, uniaxial tension at any angle to its axes (Inglis)",
         source="C. E. Inglis, Stresses in a plate due to the presence of cracks and sharp corners, Trans. Inst. "
                "Naval Architects 55 (1913); inclined-load boundary stress as in W. D. Pilkey and D. F. Pilkey, "
                "Peterson's Stress Concentration Factors, 3rd ed. (2008), section 4 (from memory). Exact for an "
                "infinite plate; 'wide' (hole span/W <= 0.1) is common practice",
         formula="Ktg = 1 + 2a/b for a load across the a axis; any angle: the largest Inglis boundary stress",
         nominal="gross", nominal_text="P / (W t), the remote stress",
         ranges={"a/b": (1.0, 1e6), "load angle": (0.0, 90.0), "hole span/W": (0.0, WIDE_PLATE)}, kt=lambda p: inglis_kt(p["a/b"], p["load angle"]),
         checked={"a/b": (1.5, 3.0), "load angle": (0.0, 90.0), "hole span/W": (0.02, 0.05)}),
    Case(key="opposite-u-notches-roark", family="opposite-u-notches",
         title="Two opposite U-notches in a flat bar, axial tension",
         source="W. C. Young and R. G. Budynas, Roark's Formulas for Stress and Strain, 7th ed. (2002), table 17.1 "
                "(from memory; coefficients in docs/references.md [Roark])",
         formula="Ktn = C1 + C2 (2h/D) + C3 (2h/D)^2 + C4 (2h/D)^3, C from sqrt(h/r) and h/r",
         nominal="net", nominal_text="P / ((D - 2h) t)",
         ranges={"h/r": (0.1, 50.0), "2h/D": (0.0, 1.0)}, kt=roark_opposite_u_notches,
         checked={"h/r": (0.5, 2.0), "2h/D": (0.2, 0.5)}),
    Case(key="opposite-semicircular-notches-peterson", family="opposite-semicircular-notches",
         title="Two opposite semicircular notches in a flat bar, axial tension",
         source="W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chart 2.3 "
                "fit after Ling (from memory)",
         formula="Ktn = 3.065 - 3.472 (2r/D) + 1.009 (2r/D)^2 + 0.405 (2r/D)^3",
         nominal="net", nominal_text="P / ((D - 2r) t)",
         ranges={"2r/D": (0.0, 1.0)}, kt=peterson_semicircular_notches, checked={"2r/D": (0.1, 0.5)}),
    Case(key="edge-u-notch-semi-infinite", family="edge-u-notch-semi-infinite",
         title="Single U-shaped or semicircular edge notch in a semi-infinite plate, tension",
         source="W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chart 2.2 "
                "fit (from memory); 'semi-infinite' taken as h/W <= 0.02 (measured here: the eccentricity of a "
                "deeper notch bends the bar)",
         formula="Ktg = 0.855 + 2.21 sqrt(h/r) (3.065 for a semicircular notch)",
         nominal="gross", nominal_text="P / (W t), the remote stress",
         ranges={"h/r": (1.0, 361.0), "h/W": (0.0, SHALLOW_EDGE_NOTCH)}, kt=edge_u_notch_semi_infinite,
         checked={"h/r": (1.0, 4.0), "h/W": (0.005, SHALLOW_EDGE_NOTCH)}),
    Case(key="stepped-bar-fillets-roark", family="stepped-bar-fillets",
         title="Stepped flat bar with shoulder fillets, axial tension",
         source="W. C. Young and R. G. Budynas, Roark's Formulas for Stress and Strain, 7th ed. (2002), table 17.1 "
                "(from memory; coefficients in docs/references.md [Roark]); older photoelastic charts read "
                "7-10 % lower",
         formula="Ktn = C1 + C2 (2h/D) + C3 (2h/D)^2 + C4 (2h/D)^3, C from sqrt(h/r) and h/r, h = (D - d)/2",
         nominal="net", nominal_text="P / (d t), the narrow section",
         ranges={"h/r": (0.1, 20.0), "2h/D": (0.0, 1.0)}, kt=roark_stepped_bar,
         checked={"h/r": (0.5, 2.5), "2h/D": (1.0 / 3.0, 0.5)}),
    Case(key="row-of-holes-schulz", family="row-of-holes",
         title="Infinite row of circular holes across a uniaxial tension (middle holes of a row)",
         source="W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), fit "
                "after K. J. Schulz (1941-45) (from memory; chart number not recalled)",
         formula="Ktn = 3.000 - 3.095 (d/l) + 0.309 (d/l)^2 + 0.786 (d/l)^3, l the pitch",
         nominal="net", nominal_text="P / ((W - n d) t), i.e. per pitch (l - d)",
         ranges={"d/l": (0.0, 1.0), "holes": (ROW_MIN_HOLES, 1e6)}, kt=row_of_holes,
         checked={"d/l": (0.2, 0.6), "holes": (ROW_MIN_HOLES, ROW_MIN_HOLES)}),
)

RAISER_RECOGNISERS: tuple[Recogniser, ...] = (
    recognise_ellipse, recognise_opposite_u_notches, recognise_opposite_semicircles, recognise_edge_notch,
    recognise_stepped_bar, recognise_row,
)

RAISER_BUILDERS: dict[str, Callable[[dict[str, float]], dict]] = {
    "elliptical-hole-wide-plate": build_ellipse,
    "opposite-u-notches": build_opposite_u_notches,
    "opposite-semicircular-notches": build_opposite_semicircles,
    "edge-u-notch-semi-infinite": build_edge_notch,
    "stepped-bar-fillets": build_stepped_bar,
    # sweeps and suites compare this case with the middle hole's own Kt (Recognised.raiser,
    # compare/case_kt.py), not the part's governing Kt, which is an outer hole's beside a free side
    "row-of-holes": build_row,
}
