"""Numbers of the terminal summary in the part file's unit system.

Every result is held in mm, N, MPa, mm², N·mm (geometry/units.py); the terminal summary shows it in the
part file's system (`spec.units`). The row functions say how a value is shown in mm-N-MPa with a format
spec (".1f", ".2f", "g", ...); `shown` converts the value and keeps the same resolution in the other system
by shifting the decimals of a fixed-point spec by the order of magnitude of the unit factor (a stress in
MPa with 1 decimal is shown in psi with none and in ksi with 2; a length in mm with 2 decimals is shown in
inches with 3). In mm-N-MPa the factor is 1 and the text is exactly `format(value, spec)`.

A number that rounds to zero is shown without a sign ("0.00", never "-0.00"): a coordinate on an axis is
often -1e-15 after meshing.

Section resultants are shown in larger units: kN and kN·m in mm-N-MPa (as the sections table always
has); the US systems use their own force and moment units. JSON records are not touched: they stay in
mm-N-MPa and declare `display_units`. The same holds for the warnings of a check (compare/notices.py):
`warning_text` writes them in the part file's system, the record keeps their mm-N-MPa text; an unnamed
section cut is restated by geometry.cut_labels.cut_label.
"""

from __future__ import annotations

import math
import re

from ..compare.notices import Notice
from ..geometry.cut_labels import cut_label
from ..geometry.units import DEFAULT_SYSTEM, format_number, to_internal, unit_label

_FIXED = re.compile(r"^(?P<head>[^.]*)\.(?P<decimals>\d+)f$")

# (label, internal units per display unit) of section resultants, where they differ from the system's own
_RESULTANT_UNITS: dict[str, dict[str, tuple[str, float]]] = {
    DEFAULT_SYSTEM: {"force": ("kN", 1e3), "moment": ("kN·m", 1e6)},
}


def display_unit(quantity: str, units: str, resultant: bool = False) -> tuple[str, float]:
    """(label, internal units per display unit) of `quantity` ("length", "force", "stress", "area",
    "moment") in the system `units`; `resultant` picks the section-resultant units (kN, kN·m in mm-N-MPa)."""
    if resultant and quantity in _RESULTANT_UNITS.get(units, {}):
        return _RESULTANT_UNITS[units][quantity]
    return unit_label(quantity, units), float(to_internal(1.0, quantity, units))


def label(quantity: str, units: str, resultant: bool = False) -> str:
    """Display label of `quantity` in `units`, e.g. "psi", "in²", "kN" (resultant forces in mm-N-MPa)."""
    return display_unit(quantity, units, resultant)[0]


def shown(value: float, quantity: str, units: str, spec: str = ".1f", resultant: bool = False) -> str:
    """The number alone: `value` (internal mm, N, MPa, mm², N·mm) in `units`, formatted by `spec` as
    written for mm-N-MPa (fixed-point decimals shifted by the unit factor's order of magnitude)."""
    factor = display_unit(quantity, units, resultant)[1]
    reference = display_unit(quantity, DEFAULT_SYSTEM, resultant)[1]
    fixed = _FIXED.match(spec)
    if fixed is not None and factor != reference:
        shift = round(math.log10(factor / reference))
        spec = f"{fixed['head']}.{max(0, int(fixed['decimals']) + shift)}f"
    return unsigned_zero(format(value / factor, spec))


def unsigned_zero(text: str) -> str:
    """`text` without its minus sign when the number it shows is zero ("-0.00" -> "0.00", "-0" -> "0")."""
    if text.startswith("-"):
        try:
            if float(text.rstrip("%")) == 0.0:
                return text[1:]
        except ValueError:
            pass
    return text


def significant(value: float, quantity: str, units: str, digits: int = 4, resultant: bool = False) -> str:
    """`value` (internal units) in `units` to `digits` significant figures with the unit label, e.g. "0.375 in²"
    (geometry.units.format_number: trailing zeros dropped, plain decimals from 1e-3 to 1e7)."""
    name, factor = display_unit(quantity, units, resultant)
    return f"{format_number(value / factor, digits)} {name}"


def quantity_text(value: float, quantity: str, units: str, spec: str = ".1f", resultant: bool = False) -> str:
    """`shown` followed by the unit label, e.g. "25993 psi" or "179.2 MPa"."""
    return f"{shown(value, quantity, units, spec, resultant)} {label(quantity, units, resultant)}"


def shown_point(location: tuple[float, float], units: str, spec: str = ".2f") -> str:
    """A point (x, y) in mm shown in `units` without its label, e.g. "(0.000, 0.250)"."""
    x, y = (shown(c, "length", units, spec) for c in location[:2])
    return f"({x}, {y})"


def point_text(location: tuple[float, float], units: str, spec: str = ".2f") -> str:
    """`shown_point` followed by the length label, e.g. "(0.000, 0.250) in"."""
    return f"{shown_point(location, units, spec)} {label('length', units)}"


def warning_text(warning: Notice | str, units: str) -> str:
    """A warning of a check in `units`: its numbers converted and labelled, unnamed cut labels restated."""
    return warning.text(units, cut_label) if isinstance(warning, Notice) else str(warning)
