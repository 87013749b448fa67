"""Published Kt for in-plane bending: opposite U-notches and shoulder fillets in a flat bar.

Both are curve fits of the form Kt = C1 + C2 x + C3 x^2 + C4 x^3 with x = 2h/D, referred to the net
bending stress 6 M / (t d^2) on the narrowest width d (between the notch roots, or the narrow part of a
stepped bar); D is the full width, h the notch depth or step height, r the root or fillet radius, M the
in-plane moment (pure bending: no axial or shear force). The coefficients were recalled from the
handbooks (marked "from memory"); the two ranges of each fit were checked to meet at h/r = 2 and each fit
to tend to 1 as x -> 1 (notches meeting; a vanishing shoulder), which a mis-recalled coefficient breaks.

A part is recognised by the same geometric rules as the tension case of the same raiser
(compare.raiser_cases), then by its load: a pure moment on the loaded end.

No central-hole case for in-plane bending is given: a published curve for it could not be recalled
reliably enough to cite.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace

from ..geometry.spec import Load, PartSpec
from .case_types import Case, Coefficients, Recognised, Recogniser, recogniser, two_range_cubic


_U_NOTCHES_BENDING_LOW: Coefficients = ((1.024, 2.092, -0.051), (-0.63, -7.194, 1.288), (2.117, 8.574, -2.16), (-1.42, -3.494, 0.932))
_U_NOTCHES_BENDING_HIGH: Coefficients = ((1.113, 1.957, 0.0), (-2.579, -4.017, -0.013), (4.1, 3.922, 0.083), (-1.528, -1.893, -0.066))


def opposite_u_notches_bending(p: dict[str, float]) -> float:
    """Two opposite U-notches, in-plane bending, Kt on 6 M / (t d^2), d = D - 2h (Pilkey & Pilkey,
    Peterson's Stress Concentration Factors, 3rd ed., 2008, chart 2.25 fit; the same fit in Young & Budynas,
    Roark's Formulas for Stress and Strain, 7th ed., table 17.1 (from memory))."""
    return two_range_cubic(p, _U_NOTCHES_BENDING_LOW, _U_NOTCHES_BENDING_HIGH)


_STEP_BENDING_LOW: Coefficients = ((1.006, 0.967, 0.013), (-0.27, -2.372, 0.708), (0.662, 1.157, -0.908), (-0.405, 0.249, 0.2))
_STEP_BENDING_HIGH: Coefficients = ((1.058, 1.002, -0.038), (-3.652, 1.639, -0.436), (6.17, -5.687, 1.175), (-2.558, 3.046, -0.701))


def stepped_bar_bending(p: dict[str, float]) -> float:
    """Stepped flat bar with shoulder fillets, in-plane bending, Kt on 6 M / (t d^2), d the narrow width
    (Pilkey & Pilkey, Peterson's Stress Concentration Factors, 3rd ed., 2008, chapter 3 fit for a stepped
    flat bar in bending; the same fit in Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed.,
    table 17.1 (from memory))."""
    return two_range_cubic(p, _STEP_BENDING_LOW, _STEP_BENDING_HIGH)


_SOURCE_NOTCHES = ("W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chart "
                   "2.25 (opposite U-notches, in-plane bending) curve fit; also W. C. Young and R. G. Budynas, "
                   "Roark's Formulas for Stress and Strain, 7th ed. (2002), table 17.1 (from memory)")
_SOURCE_STEP = ("W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), chapter 3 "
                "(stepped flat bar with shoulder fillets, in-plane bending) curve fit; also W. C. Young and R. G. "
                "Budynas, Roark's Formulas for Stress and Strain, 7th ed. (2002), table 17.1 (from memory)")

BENDING_CASES: tuple[Case, ...] = (
    Case(key="opposite-u-notches-bending", family="opposite-u-notches-bending",
         title="Two opposite U-notches in a flat bar, in-plane bending (curve fit)", source=_SOURCE_NOTCHES,
         formula="Ktn = C1 + C2 (2h/D) + C3 (2h/D)^2 + C4 (2h/D)^3, C from sqrt(h/r) and h/r in two ranges",
         nominal="net", nominal_text="6 M / (t (D - 2h)^2)",
         ranges={"h/r": (0.1, 50.0), "2h/D": (0.0, 1.0)}, kt=opposite_u_notches_bending,
         checked={"h/r": (1.0, 4.0), "2h/D": (0.2, 0.5)}),
    Case(key="stepped-bar-fillets-bending", family="stepped-bar-fillets-bending",
         title="Stepped flat bar with shoulder fillets, in-plane bending (curve fit)", source=_SOURCE_STEP,
         formula="Ktn = C1 + C2 (2h/D) + C3 (2h/D)^2 + C4 (2h/D)^3, C from sqrt(h/r) and h/r in two ranges",
         nominal="net", nominal_text="6 M / (t d^2), d the narrow width",
         ranges={"h/r": (0.1, 20.0), "2h/D": (0.0, 1.0)}, kt=stepped_bar_bending,
         checked={"h/r": (1.0, 4.0), "2h/D": (0.2, 0.5)}),
)


def pure_bending(spec: PartSpec) -> bool:
    """A moment on the loaded end and nothing else (the handbooks' pure bending)."""
    load = spec.load
    return load.kind == "bending" and load.bending != 0.0 and load.shear == 0.0


def _as_tension(spec: PartSpec) -> PartSpec:
    """The same part under an axial load, for the tension recognisers' geometric rules."""
    return replace(spec, load=Load(axial=1.0))


@recogniser(notch=(1, 2))
def recognise_notches_bending(spec: PartSpec) -> Recognised | None:
    """Two equal opposite U (or semicircular) notches, as in tension, under pure bending."""
    from .raiser_cases import recognise_opposite_u_notches

    found = recognise_opposite_u_notches(_as_tension(spec)) if pure_bending(spec) else None
    if found is None:
        return None
    x = found.params["2h/D"]
    return Recognised("opposite-u-notches-bending", "two opposite U-notches in a flat bar, in-plane bending",
                      dict(found.params), 1.0 / (1.0 - x) ** 2)


@recogniser(step=1, fillet=2)
def recognise_step_bending(spec: PartSpec) -> Recognised | None:
    """A symmetric shoulder step with fillets, as in tension, under pure bending."""
    from .raiser_cases import recognise_stepped_bar

    found = recognise_stepped_bar(_as_tension(spec)) if pure_bending(spec) else None
    if found is None:
        return None
    x = found.params["2h/D"]
    return Recognised("stepped-bar-fillets-bending", "stepped flat bar with shoulder fillets, in-plane bending",
                      dict(found.params), 1.0 / (1.0 - x) ** 2)


def build_notches_bending(params: dict[str, float], width: float = 100.0) -> dict:
    """Part-file dictionary: opposite U-notches mid-length in a bar six widths long under a pure moment
    giving 100 MPa on the net section (mm, N, MPa)."""
    h = 0.5 * params["2h/D"] * width
    d = width - 2.0 * h
    return {"title": f"opposite U-notches in bending, h/r = {params['h/r']:g}, 2h/D = {params['2h/D']:g}",
            "plate": {"length": 6.0 * width, "width": width, "thickness": 10.0},
            "notch": [{"x": 0.0, "side": "both", "shape": "U", "depth": h, "radius": h / params["h/r"]}],
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"bending": 100.0 * 10.0 * d * d / 6.0}}


def build_step_bending(params: dict[str, float], narrow: float = 50.0) -> dict:
    """Part-file dictionary: a stepped bar (narrow part at the loaded end) under a pure moment giving
    100 MPa on the narrow section (mm, N, MPa)."""
    x = params["2h/D"]
    D = narrow / (1.0 - x)
    h = 0.5 * (D - narrow)
    return {"title": f"stepped bar in bending, h/r = {params['h/r']:g}, 2h/D = {x:g}",
            "plate": {"length": 6.0 * D, "width": D, "thickness": 10.0},
            "step": {"x": 0.0, "width": narrow, "radius": h / params["h/r"]},
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"bending": 100.0 * 10.0 * narrow * narrow / 6.0}}


BENDING_RECOGNISERS: tuple[Recogniser, ...] = (recognise_notches_bending, recognise_step_bending)
BENDING_BUILDERS: dict[str, Callable[[dict[str, float]], dict]] = {
    "opposite-u-notches-bending": build_notches_bending,
    "stepped-bar-fillets-bending": build_step_bending,
}
