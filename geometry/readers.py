"""Small typed readers of a part-file dictionary (as read from TOML), shared by the part-file reader and
every kind's table reader.

Each takes the table `t`, the key and `where` (the table's name in messages, e.g. "hole 2" or "plate") and
returns the value in mm, N or MPa, or raises PartError with one line naming `where.key`, the value and
what is allowed. A bare number is in the part file's unit system (`units`); a string carries its own unit
("12 kN", "0.5 in").
"""

from __future__ import annotations

import math
from typing import Any

from .errors import PartError, clipped

DEFAULT_UNITS = "mm-N-MPa"

# Magnitudes the solver handles without overflow, underflow or lost precision, in mm, N, MPa. A zero
# (where a key allows it) is exact; any other value must lie in this range. Positive dimensions and
# moduli must reach the low end too (see `positive`). Wide enough for any real plate.
MAGNITUDES = {
    "length": (1e-3, 1e6),     # 1 µm to 1 km
    "force": (1e-6, 1e12),
    "stress": (1e-6, 1e7),     # 1 Pa to 10 TPa
    "moment": (1e-6, 1e15),
    "area": (1e-6, 1e12),
    "stiffness": (1e-3, 1e12),
}
ANGLE_LIMIT = 360.0  # degrees either way


def shown(value: Any, limit: int = 60) -> str:
    """repr of a value cut to one short line for an error message."""
    text = repr(value)
    return text if len(text) <= limit else text[:limit] + "..."


def known(t: dict[str, Any], allowed: set[str], where: str) -> None:
    """Refuse the first key of `t` not in `allowed`."""
    for key in t:
        if key not in allowed:
            name = clipped(key, 60) if key.replace("_", "").replace("-", "").isalnum() and key.isascii() else shown(key)
            name = f"{where}.{name}" if where else name
            raise PartError(f"{name}: unknown key; allowed here: {', '.join(sorted(allowed))}")


def table(data: dict[str, Any], key: str, required: bool = True) -> dict[str, Any]:
    """The table data[key] (written [key]); {} when absent and not required."""
    if key not in data:
        if required:
            raise PartError(f"[{key}]: missing table")
        return {}
    value = data[key]
    if not isinstance(value, dict):
        raise PartError(f"{key}: must be a table written [{key}]")
    return value


def array_of_tables(data: dict[str, Any], key: str) -> list[tuple[int, dict[str, Any]]]:
    """The entries of data[key] (written [[key]]) numbered from 1; [] when absent."""
    items = data.get(key, [])
    if not isinstance(items, list) or not all(isinstance(i, dict) for i in items):
        raise PartError(f"{key}: must be an array of tables, each written [[{key}]]")
    return list(enumerate(items, start=1))


def case_entries(items: Any, where: str, name: str) -> list[tuple[str, dict[str, Any]]]:
    """The [[load.NAME]] entries of one load case (`where` names the case's table, e.g. "load"), each with
    the key messages name it by ("load.edge 2")."""
    if not isinstance(items, list) or not all(isinstance(i, dict) for i in items):
        raise PartError(f"{where}.{name}: must be an array of tables, each written [[{where.split()[0]}.{name}]]")
    return [(f"{where}.{name} {n}", item) for n, item in enumerate(items, start=1)]


def number(t: dict[str, Any], key: str, where: str, quantity: str | None = None, units: str = DEFAULT_UNITS,
           required: bool = True, default: float | None = None) -> float:
    """A finite number from t[key], converted to mm, N or MPa when `quantity` names one.

    Dimensionless values (quantity None) must be bare numbers.
    """
    name = f"{where}.{key}"
    if key not in t:
        if required:
            raise PartError(f"{name}: missing; a number is required")
        return default  # type: ignore[return-value]
    value = t[key]
    if quantity is not None and (isinstance(value, str) or units != DEFAULT_UNITS):
        from .units import parse_quantity  # pint loads only when a file needs it

        value = parse_quantity(value, quantity, name, units)
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise PartError(f"{name}: must be a number; got {shown(value)}")
    try:
        value = float(value)
    except OverflowError:  # an integer beyond the float range
        value = math.inf
    if not math.isfinite(value):
        raise PartError(f"{name}: must be a finite number; got {shown(t[key])}")
    in_range(value, name, quantity, units=units)
    if abs(value) > 1e12:
        raise PartError(f"{name}: must be a finite number of magnitude below 1e12; got {shown(value)}")
    return value


def in_range(value: float, name: str, quantity: str | None, positive: bool = False, units: str = DEFAULT_UNITS) -> None:
    """Refuse magnitudes outside MAGNITUDES[quantity] (`value` in mm, N, MPa; the message in `units`);
    signed lengths (coordinates) may be small."""
    if quantity not in MAGNITUDES or value == 0.0:
        return
    low, high = MAGNITUDES[quantity]
    if abs(value) > high or (abs(value) < low and (positive or quantity != "length")):
        from .units import format_quantity, from_internal, unit_label

        limit = "beyond the largest" if abs(value) > high else "below the smallest"
        bound = float(from_internal(high if abs(value) > high else low, quantity, units))
        raise PartError(f"{name}: {format_quantity(value, quantity, units, 6)} is {limit} magnitude allowed, "
                        f"{bound:.3g} {unit_label(quantity, units)}")


def positive(t: dict[str, Any], key: str, where: str, quantity: str | None = None, units: str = DEFAULT_UNITS,
             required: bool = True) -> float:
    """A number above zero (see `number`); None when absent and not required."""
    value = number(t, key, where, quantity, units, required)
    if value is not None and value <= 0.0:
        raise PartError(f"{where}.{key}: must be greater than zero; got {shown(t[key])}")
    if value is not None:
        in_range(value, f"{where}.{key}", quantity, positive=True, units=units)
    return value


def integer(t: dict[str, Any], key: str, where: str, default: int, low: int, high: int) -> int:
    """A whole number from low to high (inclusive), `default` when absent."""
    value = t.get(key, default)
    if isinstance(value, bool) or not isinstance(value, int) or not low <= value <= high:
        raise PartError(f"{where}.{key}: must be a whole number from {low} to {high}; got {value!r}")
    return value


def point(t: dict[str, Any], key: str, where: str, units: str = DEFAULT_UNITS) -> tuple[float, float]:
    """A pair of lengths [x, y] (mm)."""
    value = t.get(key)
    if not isinstance(value, list) or len(value) != 2:
        raise PartError(f"{where}.{key}: must be a pair of lengths [x, y]; got {value!r}")
    pair = {"x": value[0], "y": value[1]}
    return (number(pair, "x", f"{where}.{key}", "length", units), number(pair, "y", f"{where}.{key}", "length", units))


def choice(t: dict[str, Any], key: str, where: str, allowed: tuple[str, ...], default: str | None = None) -> str:
    """One of the words `allowed` (`default` when absent, if given)."""
    value = t.get(key, default)
    if value not in allowed:
        name = "missing" if value is None else shown(value)
        raise PartError(f"{where}.{key}: {name} is not allowed; use one of {', '.join(allowed)}")
    return value


def angle(t: dict[str, Any], key: str, where: str, default: float = 0.0) -> float:
    """An angle in degrees from -360 to 360, counter-clockwise from +x."""
    value = number(t, key, where, required=False, default=default)
    if not -ANGLE_LIMIT <= value <= ANGLE_LIMIT:
        raise PartError(f"{where}.{key}: {value:g} is outside -360 to 360 degrees")
    return value
