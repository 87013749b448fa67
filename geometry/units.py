"""Unit systems and parsing of part-file quantities into the internal units mm, N, MPa, N·mm.

A part file names one unit system (default "mm-N-MPa"). A bare number in the file is taken in that
system; a string carries its own unit ("12 kN", "0.375 in", "50 ksi", "3 kip*in"). Either way the value
is converted once, here, into the internal units:

    length mm, force N, stress MPa (N/mm²), area mm², moment N·mm.

Reporting converts back with `from_internal` and labels with `unit_label`.

Strings must be one number followed by a unit expression (pint syntax: `*`, `/`, `^` or `**`, `·`,
`²`/`³`; a hyphen between two unit names means multiplication, so "lbf-in" reads as lbf·in). Arithmetic,
commas, bare unit names without a number, NaN and infinity are refused. Every refusal raises
`PartError` with the key path (e.g. "load.axial"), the value, and what is allowed.

The conversion factors come from pint's definitions, which follow the exact SI definitions
(1 in = 25.4 mm, 1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N; NIST SP 811).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache
from typing import TYPE_CHECKING, TypeVar

import numpy as np

from .errors import PartError

if TYPE_CHECKING:  # pint is imported on first use: it costs about a second at start-up
    import pint

QUANTITIES = ("length", "force", "stress", "area", "moment", "stiffness")

INTERNAL_UNITS: dict[str, str] = {
    "length": "mm",
    "force": "N",
    "stress": "MPa",
    "area": "mm**2",
    "moment": "N*mm",
    "stiffness": "N/mm",
}

_EXAMPLES: dict[str, str] = {
    "length": '"12 mm" or "0.5 in"',
    "force": '"12 kN" or "2.5 kip"',
    "stress": '"250 MPa" or "36 ksi"',
    "area": '"120 mm^2" or "0.2 in^2"',
    "moment": '"40 N*m" or "350 lbf*in"',
    "stiffness": '"60 kN/mm" or "300 kip/in"',
}

_ARTICLE_NAMES: dict[str, str] = {
    "length": "a length",
    "force": "a force",
    "stress": "a stress",
    "area": "an area",
    "moment": "a moment",
    "stiffness": "a stiffness (force per length)",
}


@dataclass(frozen=True)
class UnitSystem:
    """A consistent set of input/report units (pint unit strings and display labels)."""

    name: str
    length: str
    force: str
    stress: str
    labels: tuple[tuple[str, str], ...]

    def unit(self, quantity: str) -> str:
        """pint unit string for `quantity` (one of QUANTITIES) in this system."""
        _check_quantity(quantity)
        if quantity == "area":
            return f"({self.length})**2"
        if quantity == "moment":
            return f"({self.force})*({self.length})"
        if quantity == "stiffness":
            return f"({self.force})/({self.length})"
        return getattr(self, quantity)

    def label(self, quantity: str) -> str:
        """Display label for `quantity` in this system, e.g. "mm²" or "kip·in"."""
        _check_quantity(quantity)
        return dict(self.labels)[quantity]


UNIT_SYSTEMS: dict[str, UnitSystem] = {
    "mm-N-MPa": UnitSystem(
        "mm-N-MPa", "mm", "N", "MPa",
        (("length", "mm"), ("force", "N"), ("stress", "MPa"), ("area", "mm²"), ("moment", "N·mm"), ("stiffness", "N/mm")),
    ),
    "in-lbf-psi": UnitSystem(
        "in-lbf-psi", "inch", "lbf", "psi",
        (("length", "in"), ("force", "lbf"), ("stress", "psi"), ("area", "in²"), ("moment", "lbf·in"), ("stiffness", "lbf/in")),
    ),
    "in-kip-ksi": UnitSystem(
        "in-kip-ksi", "inch", "kip", "ksi",
        (("length", "in"), ("force", "kip"), ("stress", "ksi"), ("area", "in²"), ("moment", "kip·in"), ("stiffness", "kip/in")),
    ),
}

DEFAULT_SYSTEM = "mm-N-MPa"

_NUMBER_THEN_UNIT = re.compile(
    r"^\s*(?P<number>[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(?P<unit>.*?)\s*$"
)
_UNIT_CHARS = re.compile(r"^[A-Za-z_µμΩ°%·²³*/^()\s\d.]*$")
_HYPHEN_PRODUCT = re.compile(r"(?<=[A-Za-z])\s*-\s*(?=[A-Za-z])")

Number = TypeVar("Number", float, np.ndarray)


@cache
def _registry() -> pint.UnitRegistry:
    """The one pint registry, built on first use and only read afterwards."""
    import pint

    return pint.UnitRegistry()


def _check_quantity(quantity: str) -> None:
    if quantity not in QUANTITIES:
        raise ValueError(f"quantity {quantity!r} is not one of {', '.join(QUANTITIES)}")


def unit_system(name: str, key: str = "units") -> UnitSystem:
    """Look up a unit system by name; PartError naming `key` and the allowed names if unknown."""
    if isinstance(name, str) and name in UNIT_SYSTEMS:
        return UNIT_SYSTEMS[name]
    allowed = ", ".join(f'"{n}"' for n in UNIT_SYSTEMS)
    raise PartError(f"{key}: {name!r} is not a known unit system; use one of {allowed}")


@cache
def _factor(quantity: str, system: str) -> float:
    """Internal units per one unit of `quantity` in `system` (e.g. 25.4 for length in inches)."""
    unit_system(system)
    if system == DEFAULT_SYSTEM:  # the default system is the internal one: no pint needed
        return 1.0
    ureg = _registry()
    source = unit_system(system).unit(quantity)
    return float(ureg.Quantity(1.0, source).to(INTERNAL_UNITS[quantity]).magnitude)


def to_internal(value: Number, quantity: str, system: str = DEFAULT_SYSTEM) -> Number:
    """Convert a number (or array) in `system` units of `quantity` to mm, N, MPa, mm² or N·mm."""
    _check_quantity(quantity)
    return value * _factor(quantity, system)


def from_internal(value: Number, quantity: str, system: str = DEFAULT_SYSTEM) -> Number:
    """Convert a number (or array) in internal units (mm, N, MPa, mm², N·mm) to `system` units."""
    _check_quantity(quantity)
    return value / _factor(quantity, system)


def unit_label(quantity: str, system: str = DEFAULT_SYSTEM) -> str:
    """Display label of `quantity` in `system`, e.g. unit_label("stress", "in-kip-ksi") == "ksi"."""
    return unit_system(system).label(quantity)


def format_number(value: float, digits: int = 4) -> str:
    """`value` to `digits` significant figures, trailing zeros dropped; plain decimals from 1e-3 to 1e7
    (so "30012", not "3.001e+04"), exponent notation outside that range; a zero (-0.0 too) is "0"."""
    if not math.isfinite(value):
        return str(value)
    if value == 0.0:
        return "0"
    exponent = math.floor(math.log10(abs(value)))
    if not -3 <= exponent < 7:
        mantissa, power = f"{value:.{digits - 1}e}".split("e")
        return (mantissa.rstrip("0").rstrip(".") if "." in mantissa else mantissa) + "e" + power
    text = f"{value:.{max(0, digits - 1 - exponent)}f}"
    return text.rstrip("0").rstrip(".") if "." in text else text


def format_quantity(value: float, quantity: str, system: str = DEFAULT_SYSTEM, digits: int = 4) -> str:
    """An internal value (mm, N, MPa, mm², N·mm) shown in `system` with its label, e.g. "30012 psi"."""
    return f"{format_number(float(from_internal(value, quantity, system)), digits)} {unit_label(quantity, system)}"


def format_point(point: tuple[float, float], system: str = DEFAULT_SYSTEM, digits: int = 4) -> str:
    """A point (x, y) in mm shown in `system` with the length label, e.g. "(0, 0.25) in". Both coordinates
    are rounded at the same place, `digits` significant figures of the larger one, so the round-off of a
    coordinate that is zero (a mesh node on an axis, -1e-15) shows as 0, never as -0 or 1e-15."""
    x, y = (float(from_internal(c, "length", system)) for c in point[:2])
    size = max(abs(x), abs(y))
    if math.isfinite(size) and size > 0.0:
        place = 10.0 ** (math.floor(math.log10(size)) - digits + 1)
        x, y = (round(c / place) * place for c in (x, y))
    return f"({format_number(x, digits)}, {format_number(y, digits)}) {unit_label('length', system)}"


# Stress units a source may state a material value in, in MPa per unit. The US customary factors are the
# exact definitions (1 lbf = 4.4482216152605 N, 1 in = 25.4 mm; NIST SP 811), so no pint is needed to read
# the material table; tests/test_materials.py checks them against pint.
LBF_N = 0.45359237 * 9.80665
PSI_MPA = LBF_N / 25.4**2
STATED_UNITS: dict[str, float] = {"MPa": 1.0, "GPa": 1e3, "psi": PSI_MPA, "ksi": 1e3 * PSI_MPA}
_FAMILY = {"MPa": "SI", "GPa": "SI", "psi": "US", "ksi": "US"}


@dataclass(frozen=True)
class Stated:
    """A stress or modulus as its source states it: the number and the source's unit (one of STATED_UNITS).

    `mpa` is the value converted once for the computation; `in_system(system)` is the number in a unit
    system's stress unit: the stated number itself in the source's unit, an exact power-of-ten scaling
    between units of one family (68 ksi is 68000 psi, 68.9 GPa is 68900 MPa), a conversion otherwise."""

    value: float
    unit: str

    def __post_init__(self) -> None:
        if self.unit not in STATED_UNITS:
            raise ValueError(f"stated unit {self.unit!r} is not one of {', '.join(STATED_UNITS)}")

    @property
    def mpa(self) -> float:
        """The value in MPa."""
        return self.value * STATED_UNITS[self.unit]

    def native_to(self, system: str) -> bool:
        """True when `system`'s stress unit is of the source's family (SI or US customary): there the value
        is shown as the source's number (scaled by a power of ten at most)."""
        return _FAMILY[unit_label("stress", system)] == _FAMILY[self.unit]

    def in_system(self, system: str = DEFAULT_SYSTEM) -> float:
        """The number in the stress unit of `system` (its label: MPa, psi or ksi)."""
        target = unit_label("stress", system)
        if self.native_to(system):
            return float(f"{self.value * STATED_UNITS[self.unit] / STATED_UNITS[target]:.12g}")
        return float(from_internal(self.mpa, "stress", system))

    def __str__(self) -> str:
        return f"{format_number(self.value, 6)} {self.unit}"


def format_stated(stated: Stated, system: str = DEFAULT_SYSTEM, digits: int = 4) -> str:
    """A stated value in `system`'s stress unit with its label: "68 ksi" in in-kip-ksi, "68000 psi" in
    in-lbf-psi, "468.8 MPa" in mm-N-MPa; the source's number wherever `system` is its source's."""
    return f"{format_number(stated.in_system(system), max(digits, _digits(stated.value)))} {unit_label('stress', system)}"


def _digits(value: float) -> int:
    """Significant figures of a stated number as written (29000 -> 2, 113.8 -> 4)."""
    text = f"{abs(value):.12g}".replace(".", "").lstrip("0").rstrip("0")
    return max(len(text), 1)


def _dimension_name(dimensionality: pint.util.UnitsContainer) -> str:
    """Plain name of a dimensionality ("a length", "a force", ...) or the raw pint form."""
    ureg = _registry()
    for quantity in QUANTITIES:
        if ureg.Quantity(1.0, INTERNAL_UNITS[quantity]).dimensionality == dimensionality:
            return _ARTICLE_NAMES[quantity]
    if not dimensionality:
        return "dimensionless"
    return f"of dimension {dimensionality}"


def _refuse(key: str, value: object, quantity: str, why: str) -> PartError:
    shown = f'"{value}"' if isinstance(value, str) else repr(value)
    return PartError(
        f"{key}: {shown} {why}; {_ARTICLE_NAMES[quantity]} is needed "
        f"(a number in the file's units, or e.g. {_EXAMPLES[quantity]})"
    )


def _parse_string(text: str, quantity: str, key: str, system: str) -> float:
    """Parse "number unit" (or a number alone, taken in `system`) to internal units."""
    import pint

    match = _NUMBER_THEN_UNIT.match(text)
    if match is None:
        raise _refuse(key, text, quantity, "does not start with a number")
    number = float(match["number"])
    unit_text = _HYPHEN_PRODUCT.sub("*", match["unit"])
    if not math.isfinite(number):
        raise _refuse(key, text, quantity, "is not a finite number")
    if not unit_text:
        return to_internal(number, quantity, system)
    if not _UNIT_CHARS.match(unit_text):
        raise _refuse(key, text, quantity, "is not one number followed by a unit")
    try:
        unit = _registry().parse_units(unit_text)
    except pint.UndefinedUnitError as exc:
        raise _refuse(key, text, quantity, f"has an unknown unit ({exc})") from None
    except Exception:  # pint raises assorted parser errors (TokenError, TypeError, ValueError)
        raise _refuse(key, text, quantity, "is not one number followed by a unit") from None
    wanted = _registry().Quantity(1.0, INTERNAL_UNITS[quantity]).dimensionality
    if unit.dimensionality != wanted:
        raise _refuse(key, text, quantity, f"is {_dimension_name(unit.dimensionality)}")
    converted = _registry().Quantity(number, unit).to(INTERNAL_UNITS[quantity]).magnitude
    return float(converted)


def parse_quantity(value: object, quantity: str, key: str, system: str = DEFAULT_SYSTEM) -> float:
    """Read one part-file value as `quantity` and return it in internal units.

    value:    an int/float (taken in `system` units) or a string "number unit" such as "12 kN".
    quantity: "length" (-> mm), "force" (-> N), "stress" (-> MPa), "area" (-> mm²), "moment" (-> N·mm).
    key:      the key path in the part file, e.g. "load.axial", used in error messages.
    system:   the part file's unit system, one of UNIT_SYSTEMS.

    The sign is kept (a negative force is compression); range checks belong to the caller.
    Raises PartError for booleans, other types, unparseable strings, NaN/inf and wrong dimensions.
    """
    _check_quantity(quantity)
    unit_system(system)
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise _refuse(key, value, quantity, f"is a {type(value).__name__}, not a number or a quantity")
    if isinstance(value, str):
        result = _parse_string(value, quantity, key, system)
    else:
        try:
            number = float(value)
        except OverflowError:
            raise _refuse(key, value, quantity, "is not a finite number") from None
        result = to_internal(number, quantity, system)
    if not math.isfinite(result):
        raise _refuse(key, value, quantity, "is not a finite number")
    return result


def parse_length(value: object, key: str, system: str = DEFAULT_SYSTEM) -> float:
    """parse_quantity for a length; returns mm."""
    return parse_quantity(value, "length", key, system)


def parse_force(value: object, key: str, system: str = DEFAULT_SYSTEM) -> float:
    """parse_quantity for a force; returns N."""
    return parse_quantity(value, "force", key, system)


def parse_stress(value: object, key: str, system: str = DEFAULT_SYSTEM) -> float:
    """parse_quantity for a stress or pressure; returns MPa."""
    return parse_quantity(value, "stress", key, system)


def parse_moment(value: object, key: str, system: str = DEFAULT_SYSTEM) -> float:
    """parse_quantity for a moment; returns N·mm."""
    return parse_quantity(value, "moment", key, system)
