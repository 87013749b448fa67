"""Part-file tables of the raisers other than circular holes: [[ellipse]], [[slot]], [[notch]], [step] and
[lug]. Each reader names the key and what is allowed when something is wrong (PartError, one line).

    [[ellipse]]                  [[slot]]                     [[notch]]
    center = [0.0, 0.0]          center = [40.0, 0.0]         x = 0.0
    length = 30.0  # mm          length = 40.0  # end to end  side = "both"   # "top", "bottom" or "both"
    width = 10.0   # mm          width = 12.0                 shape = "U"     # "U", "V" or "semicircle"
    angle = 90.0   # degrees     angle = 0.0                  depth = 8.0     # not for a semicircle
                                                              radius = 2.0    # root radius
                                                              angle = 60.0    # V only: opening angle
    [step]                       [lug]
    x = 40.0       # shoulder    hole = 1   # the [[hole]] that takes the pin
    width = 50.0   # narrow width
    radius = 5.0   # fillet
    narrow = "loaded"            # or "held"      (loaded end rounded about that hole;
                                              it is pulled through [load.pin])
"""

from __future__ import annotations

from typing import Any

from .errors import PartError
from .spec import NOTCH_SHAPES, NOTCH_SIDES, STEP_NARROW_ENDS, Ellipse, Lug, Notch, Slot, Step

RAISER_TABLES = ("ellipse", "slot", "notch", "step", "lug")


def raiser_tables(data: dict[str, Any], units: str, plate_width: float, holes: int) -> dict[str, Any]:
    """PartSpec fields (ellipses, slots, notches, step, lug) read from the part-file dictionary."""
    from .partfile import _table

    step = _table(data, "step", required=False)
    lug = _table(data, "lug", required=False)
    return {
        "ellipses": tuple(_ellipse(t, f"ellipse {n}", units) for n, t in _array(data, "ellipse")),
        "slots": tuple(_slot(t, f"slot {n}", units) for n, t in _array(data, "slot")),
        "notches": tuple(_notch(t, f"notch {n}", units) for n, t in _array(data, "notch")),
        "step": _step(step, units, plate_width) if "step" in data else None,
        "lug": _lug(lug, holes) if "lug" in data else None,
    }


def _array(data: dict[str, Any], key: str) -> list[tuple[int, dict[str, Any]]]:
    items = data.get(key, [])
    if not isinstance(items, list) or not all(isinstance(i, dict) for i in items):
        raise PartError(f"{key}: must be an array of tables, each written [[{key}]]")
    return list(enumerate(items, start=1))


def _angle(t: dict[str, Any], key: str, where: str, default: float = 0.0) -> float:
    from .partfile import _number

    value = _number(t, key, where, required=False, default=default)
    if not -360.0 <= value <= 360.0:
        raise PartError(f"{where}.{key}: {value:g} is outside -360 to 360 degrees")
    return value


def _ellipse(t: dict[str, Any], where: str, units: str) -> Ellipse:
    from .partfile import _known, _point, _positive

    _known(t, {"center", "length", "width", "angle"}, where)
    return Ellipse(center=_point(t, "center", where, units), length=_positive(t, "length", where, "length", units),
                   width=_positive(t, "width", where, "length", units), angle=_angle(t, "angle", where))


def _slot(t: dict[str, Any], where: str, units: str) -> Slot:
    from .partfile import _known, _point, _positive

    _known(t, {"center", "length", "width", "angle"}, where)
    slot = Slot(center=_point(t, "center", where, units), length=_positive(t, "length", where, "length", units),
                width=_positive(t, "width", where, "length", units), angle=_angle(t, "angle", where))
    if slot.length <= slot.width:
        raise PartError(f"{where}.length: {slot.length:g} mm must exceed the width {slot.width:g} mm (the length "
                        "runs end to end; a slot no longer than it is wide is a hole)")
    return slot


def _choice(t: dict[str, Any], key: str, where: str, allowed: tuple[str, ...], default: str | None = None) -> str:
    value = t.get(key, default)
    if value not in allowed:
        shown = "missing" if value is None else repr(value)
        raise PartError(f"{where}.{key}: {shown} is not allowed; use one of {', '.join(allowed)}")
    return value


def _notch(t: dict[str, Any], where: str, units: str) -> Notch:
    from .partfile import _known, _number, _positive

    shape = _choice(t, "shape", where, NOTCH_SHAPES)
    keys = {"x", "side", "shape", "radius"} | ({"depth"} if shape != "semicircle" else set()) | (
        {"angle"} if shape == "V" else set())
    if shape == "semicircle" and "depth" in t:
        raise PartError(f"{where}.depth: a semicircular notch is as deep as its radius; give the radius only")
    if shape != "V" and "angle" in t:
        raise PartError(f"{where}.angle: only a V notch has an opening angle")
    _known(t, keys, where)
    radius = _positive(t, "radius", where, "length", units)
    depth = radius if shape == "semicircle" else _positive(t, "depth", where, "length", units)
    angle = 0.0
    if shape == "V":
        angle = _number(t, "angle", where)
        if not 0.0 < angle < 180.0:
            raise PartError(f"{where}.angle: {angle:g} degrees is outside the allowed range 0 < angle < 180")
    return Notch(x=_number(t, "x", where, "length", units), side=_choice(t, "side", where, NOTCH_SIDES),
                 shape=shape, depth=depth, radius=radius, angle=angle)


def _step(t: dict[str, Any], units: str, plate_width: float) -> Step:
    from .partfile import _known, _number, _positive

    _known(t, {"x", "width", "radius", "narrow"}, "step")
    width = _positive(t, "width", "step", "length", units)
    if width >= plate_width:
        raise PartError(f"step.width: the narrow width {width:g} mm must be less than plate.width {plate_width:g} mm")
    return Step(x=_number(t, "x", "step", "length", units), width=width,
                radius=_positive(t, "radius", "step", "length", units),
                narrow=_choice(t, "narrow", "step", STEP_NARROW_ENDS, "loaded"))


def _lug(t: dict[str, Any], holes: int) -> Lug:
    from .partfile import _known

    _known(t, {"hole"}, "lug")
    n = t.get("hole")
    if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= max(holes, 1) or holes == 0:
        allowed = f"1 to {holes}" if holes else "a [[hole]] to take the pin, which this part file does not have"
        raise PartError(f"lug.hole: must be the number of the [[hole]] that takes the pin ({allowed}); got {n!r}")
    return Lug(hole=n)
