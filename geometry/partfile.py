"""Read a part file (TOML) into a validated PartSpec.

Every problem raises PartError with one line naming the key, the value and what is allowed.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path
from typing import Any

from .errors import PartError
from .spec import STRESS_STATES, Hole, Load, Material, MeshControls, PartSpec, Plate
from .validate import validate_geometry

TOP_KEYS = {"title", "units", "plate", "hole", "material", "load", "mesh"}
DEFAULT_UNITS = "mm-N-MPa"


def load_part(path: str | Path) -> PartSpec:
    """Read and validate the part file at `path`."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise PartError(f"{path}: no such part file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise PartError(f"{path}: cannot be read as UTF-8 text ({exc.__class__.__name__})") from None
    return parse_part(text)


def parse_part(text: str) -> PartSpec:
    """Parse TOML text and validate it into a PartSpec."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise PartError(f"part file is not valid TOML: {exc}") from None
    return part_from_dict(data)


def part_from_dict(data: dict[str, Any]) -> PartSpec:
    """Validate a part-file dictionary (as read from TOML) into a PartSpec."""
    _known(data, TOP_KEYS, "")
    title = data.get("title", "untitled part")
    if not isinstance(title, str):
        raise PartError(f"title: must be a text string; got {title!r}")
    units = _units(data.get("units", DEFAULT_UNITS))
    spec = PartSpec(
        title=title,
        plate=_plate(_table(data, "plate"), units),
        material=_material(_table(data, "material"), units),
        load=_load(_table(data, "load"), units),
        holes=_holes(data.get("hole", []), units),
        mesh=_mesh(_table(data, "mesh", required=False)),
        units=units,
    )
    validate_geometry(spec)
    return spec


def _units(value: Any) -> str:
    if value == DEFAULT_UNITS:
        return DEFAULT_UNITS
    from .units import UNIT_SYSTEMS

    if not isinstance(value, str) or value not in UNIT_SYSTEMS:
        raise PartError(f"units: {value!r} is not a unit system; use one of {', '.join(UNIT_SYSTEMS)}")
    return value


def _plate(t: dict[str, Any], units: str) -> Plate:
    _known(t, {"length", "width", "thickness", "condition"}, "plate")
    condition = t.get("condition", "plane-stress")
    if condition not in STRESS_STATES:
        raise PartError(f"plate.condition: {condition!r} is not allowed; use one of {', '.join(STRESS_STATES)}")
    return Plate(
        length=_positive(t, "length", "plate", "length", units),
        width=_positive(t, "width", "plate", "length", units),
        thickness=_positive(t, "thickness", "plate", "length", units),
        condition=condition,
    )


def _material(t: dict[str, Any], units: str) -> Material:
    _known(t, {"E", "nu", "yield", "ultimate"}, "material")
    nu = _number(t, "nu", "material")
    if not -1.0 < nu < 0.5:
        raise PartError(f"material.nu: {nu} is outside the allowed range -1 < nu < 0.5")
    return Material(
        E=_positive(t, "E", "material", "stress", units),
        nu=nu,
        yield_strength=_positive(t, "yield", "material", "stress", units, required=False),
        ultimate=_positive(t, "ultimate", "material", "stress", units, required=False),
    )


def _load(t: dict[str, Any], units: str) -> Load:
    _known(t, {"axial"}, "load")
    axial = _number(t, "axial", "load", "force", units)
    if axial == 0.0:
        raise PartError("load.axial: must be non-zero (positive in tension)")
    return Load(axial=axial)


def _mesh(t: dict[str, Any]) -> MeshControls:
    _known(t, {"tolerance", "max_levels", "max_elements"}, "mesh")
    default = MeshControls()
    tol = _number(t, "tolerance", "mesh", required=False, default=default.tolerance)
    if not 1e-4 <= tol <= 0.2:
        raise PartError(f"mesh.tolerance: {tol} is outside the allowed range 0.0001 to 0.2")
    levels = _integer(t, "max_levels", "mesh", default.max_levels, 3, 12)
    elements = _integer(t, "max_elements", "mesh", default.max_elements, 1_000, 20_000_000)
    return MeshControls(tolerance=tol, max_levels=levels, max_elements=elements)


def _holes(items: Any, units: str) -> tuple[Hole, ...]:
    if not isinstance(items, list) or not all(isinstance(i, dict) for i in items):
        raise PartError("hole: must be an array of tables, each written [[hole]]")
    holes = []
    for n, item in enumerate(items, start=1):
        where = f"hole {n}"
        _known(item, {"center", "diameter"}, where)
        holes.append(Hole(center=_point(item, "center", where, units),
                          diameter=_positive(item, "diameter", where, "length", units)))
    return tuple(holes)


# --- small readers: each names the key and what is allowed --------------------------------------


def _known(t: dict[str, Any], allowed: set[str], where: str) -> None:
    for key in t:
        if key not in allowed:
            name = f"{where}.{key}" if where else key
            raise PartError(f"{name}: unknown key; allowed here: {', '.join(sorted(allowed))}")


def _table(data: dict[str, Any], key: str, required: bool = True) -> dict[str, Any]:
    if key not in data:
        if required:
            raise PartError(f"[{key}]: missing table")
        return {}
    value = data[key]
    if not isinstance(value, dict):
        raise PartError(f"{key}: must be a table written [{key}]")
    return value


def _number(t: dict[str, Any], key: str, where: str, quantity: str | None = None, units: str = DEFAULT_UNITS,
            required: bool = True, default: float | None = None) -> float:
    """A finite number from t[key], converted to mm, N or MPa when `quantity` names one.

    A bare number is in the file's unit system; a string carries its own unit ("12 kN", "0.5 in").
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
        raise PartError(f"{name}: must be a number; got {value!r}")
    value = float(value)
    if not math.isfinite(value) or abs(value) > 1e12:
        raise PartError(f"{name}: must be a finite number of magnitude below 1e12; got {value!r}")
    return value


def _positive(t: dict[str, Any], key: str, where: str, quantity: str | None = None, units: str = DEFAULT_UNITS,
              required: bool = True) -> float:
    value = _number(t, key, where, quantity, units, required)
    if value is not None and value <= 0.0:
        raise PartError(f"{where}.{key}: must be greater than zero; got {t[key]!r}")
    return value


def _integer(t: dict[str, Any], key: str, where: str, default: int, low: int, high: int) -> int:
    value = t.get(key, default)
    if isinstance(value, bool) or not isinstance(value, int) or not low <= value <= high:
        raise PartError(f"{where}.{key}: must be a whole number from {low} to {high}; got {value!r}")
    return value


def _point(t: dict[str, Any], key: str, where: str, units: str = DEFAULT_UNITS) -> tuple[float, float]:
    value = t.get(key)
    if not isinstance(value, list) or len(value) != 2:
        raise PartError(f"{where}.{key}: must be a pair of lengths [x, y]; got {value!r}")
    pair = {"x": value[0], "y": value[1]}
    return (_number(pair, "x", f"{where}.{key}", "length", units), _number(pair, "y", f"{where}.{key}", "length", units))
