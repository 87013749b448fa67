"""Published stress-concentration factors and the rules that match a part to them.

Each case carries its formula, source, nominal-stress definition and validity range. A part matches a
case only when its geometry is that case: the family's recogniser decides, within stated tolerances.
Values recalled from the handbooks rather than read from a copy are marked "(from memory)".
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from ..geometry.spec import PartSpec
from .case_types import Case, Match, Recognised, Recogniser, recogniser  # the library's data (re-exported here)

CENTRED_TOLERANCE = 0.01  # hole centre within 1 % of the width from the centre line
END_CLEARANCE = 1.0  # hole centre at least one plate width from either end (Saint-Venant; common practice)


# --- central circular hole in a finite-width plate, axial tension ------------------------------------

def _peterson_central_hole(p: dict[str, float]) -> float:
    x = p["d/W"]
    return 2.0 + 0.284 * (1 - x) - 0.600 * (1 - x) ** 2 + 1.32 * (1 - x) ** 3


HOWLAND_TABLE = ((0.0, 0.1, 0.2, 0.3, 0.4, 0.5), (3.00, 3.03, 3.14, 3.36, 3.74, 4.32))


def quadratic_interpolation(table: tuple[tuple[float, ...], tuple[float, ...]], x: float) -> float:
    """Quadratic (Lagrange) interpolation through the three table points nearest x; exact at the points."""
    xs, ys = np.asarray(table[0]), np.asarray(table[1])
    i = int(np.clip(np.searchsorted(xs, x) - 1, 0, len(xs) - 3))
    if i + 2 < len(xs) - 1 and abs(x - xs[i]) > abs(xs[i + 3] - x):
        i += 1
    x0, x1, x2 = xs[i:i + 3]
    y0, y1, y2 = ys[i:i + 3]
    return float(y0 * (x - x1) * (x - x2) / ((x0 - x1) * (x0 - x2))
                 + y1 * (x - x0) * (x - x2) / ((x1 - x0) * (x1 - x2))
                 + y2 * (x - x0) * (x - x1) / ((x2 - x0) * (x2 - x1)))


def _howland_central_hole(p: dict[str, float]) -> float:
    return quadratic_interpolation(HOWLAND_TABLE, p["d/W"])


CASES: tuple[Case, ...] = (
    Case(
        key="central-hole-tension-peterson",
        family="central-hole-tension",
        title="Central circular hole in a finite-width plate, axial tension (curve fit)",
        source="W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), "
               "chart 4.1, curve fit (validity range from memory)",
        formula="Ktn = 2 + 0.284 (1 - d/W) - 0.600 (1 - d/W)^2 + 1.32 (1 - d/W)^3",
        nominal="net",
        nominal_text="P / ((W - d) t)",
        ranges={"d/W": (0.0, 1.0)},
        kt=_peterson_central_hole,
    ),
    Case(
        key="central-hole-tension-howland",
        family="central-hole-tension",
        title="Central circular hole in a finite-width plate, axial tension (Howland's table)",
        source="R. C. J. Howland, On the stresses in the neighbourhood of a circular hole in a strip under "
               "tension, Phil. Trans. R. Soc. A 229 (1930); tabulated d/W = 0 ... 0.5, quadratic "
               "interpolation between table points",
        formula="Ktg from Howland's table, quadratic interpolation between points",
        nominal="gross",
        nominal_text="P / (W t)",
        ranges={"d/W": (0.0, 0.5)},
        kt=_howland_central_hole,
    ),
)


@recogniser(hole=1)
def recognise_central_hole(spec: PartSpec) -> Recognised | None:
    """One circular hole on the centre line, far enough from both ends, axial load only."""
    if not axial(spec):
        return None
    hole = spec.holes[0]
    W, L = spec.plate.width, spec.plate.length
    if abs(hole.center[1]) > CENTRED_TOLERANCE * W:
        return None
    if min(hole.center[0] + L / 2, L / 2 - hole.center[0]) < END_CLEARANCE * W:
        return None
    x = hole.diameter / W
    return Recognised("central-hole-tension", "central circular hole in a finite-width plate, axial tension",
                      {"d/W": x}, 1.0 / (1.0 - x))


def build_central_hole(params: dict[str, float], width: float = 100.0) -> dict:
    """A part-file dictionary of the central-hole case at `params` (for sweeps and regression suites):
    a plate six widths long in axial tension, mm / N / MPa."""
    return {
        "title": f"central hole, d/W = {params['d/W']:g}",
        "plate": {"length": 6.0 * width, "width": width, "thickness": 10.0},
        "hole": [{"center": [0.0, 0.0], "diameter": params["d/W"] * width}],
        "material": {"E": 210000.0, "nu": 0.3},
        "load": {"axial": 100000.0},
    }


# the cases of the other raisers (ellipses, notches, steps, rows of holes) live in compare/raiser_cases.py
from .raiser_cases import RAISER_BUILDERS, RAISER_CASES, RAISER_RECOGNISERS, axial  # noqa: E402

CASES = CASES + RAISER_CASES

# in-plane bending cases (opposite notches, shoulder fillets) live in compare/bending_cases.py
from .bending_cases import BENDING_BUILDERS, BENDING_CASES, BENDING_RECOGNISERS  # noqa: E402

CASES = CASES + BENDING_CASES

# the pin-loaded lug (a closely fitting pin) lives in compare/pin_cases.py
from .pin_cases import PIN_CASES, PIN_RECOGNISERS  # noqa: E402

CASES = CASES + PIN_CASES

RECOGNISERS: tuple[Recogniser, ...] = (recognise_central_hole,) + RAISER_RECOGNISERS + BENDING_RECOGNISERS + PIN_RECOGNISERS

# family -> function building a part-file dictionary that the family's recogniser accepts
BUILDERS: dict[str, Callable[[dict[str, float]], dict]] = {"central-hole-tension": build_central_hole,
                                                           **RAISER_BUILDERS, **BENDING_BUILDERS}


def handbook_matches(spec: PartSpec) -> list[Match]:
    """Every published case that covers this part's geometry, preferred first; empty if none does."""
    matches = []
    for recognise in RECOGNISERS:
        found = recognise(spec)
        if found is None:
            continue
        for case in (c for c in CASES if c.family == found.family):
            kt = float(case.kt(found.params))
            kt_net = kt if case.nominal == "net" else kt / found.gross_over_net
            kt_gross = kt if case.nominal == "gross" else kt * found.gross_over_net
            matches.append(Match(case, found, kt_net, kt_gross, case.in_range(found.params)))
    return matches


def case_table() -> list[Case]:
    """All cases, for listing."""
    return list(CASES)


def evaluate(key: str, params: dict[str, float]) -> float:
    """Kt of the case `key` at `params`, on that case's own nominal definition."""
    for case in CASES:
        if case.key == key:
            return float(case.kt(params))
    raise KeyError(key)


__all__ = ["Case", "Match", "Recognised", "Recogniser", "CASES", "handbook_matches", "case_table", "evaluate"]
