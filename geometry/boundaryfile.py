"""Part-file tables for loads and supports on the part's own boundary, and for several load cases.

    [[hold]]                     a support on the boundary (any number):
    at = [-150.0, 0.0]           the line or arc of the boundary nearest this point (mm), or
    # from = [x1, y1]            the stretch from one point to the other, walking with the material on the
    # to = [x2, y2]              left (counter-clockwise round the outline, clockwise round a hole)
    mode = "fixed"               or "roller": held normal to the edge, free along it
    # pin = 2                    instead of at / from-to: hole 2 held by a rigid, neat-fit pin fixed in space

    [[load.edge]]                a load on the boundary (any number, in [load] or in any [[load]] case):
    at = [150.0, 0.0]            picked like a [[hold]]
    force = "12 kN"              a total force spread uniformly over the stretch's length,
    direction = 90.0             in this direction (degrees, counter-clockwise from +x); or
    # pressure = "4 MPa"         a normal pressure, positive pressing into the material

    [[load]]                     several load cases on one stiffness: each entry is a [load] table
    name = "working"             with a name of its own (default "load N")

Each reader names the key and what is allowed when something is wrong (PartError, one line). Whether a
picked point lies on the boundary is decided by geometry.boundary when the whole part is known.
"""

from __future__ import annotations

from typing import Any

from .errors import PartError
from .readers import array_of_tables, case_entries, known, number, point
from .spec import HOLD_MODES, BoundaryPick, EdgeLoad, Hold

HOLD_KEYS = {"at", "from", "to", "mode", "pin"}
EDGE_KEYS = {"at", "from", "to", "force", "direction", "pressure"}
MAX_NAME = 60  # characters in a load case's name


def read_holds(items: Any, units: str) -> tuple[Hold, ...]:
    """The [[hold]] entries: each picks a stretch (at, or from and to) and a mode, or names a pin hole."""
    out = []
    for n, item in array_of_tables({"hold": items}, "hold"):
        where = f"hold {n}"
        known(item, HOLD_KEYS, where)
        if "pin" in item:
            out.append(_pin_hold(item, where))
            continue
        mode = item.get("mode", Hold.mode)
        if mode not in HOLD_MODES:
            raise PartError(f"{where}.mode: {mode!r} is not allowed; use one of {', '.join(HOLD_MODES)} "
                            "(roller: held normal to the edge, free along it)")
        out.append(Hold(where, read_pick(item, where, units), mode))
    return tuple(out)


def _pin_hold(item: dict[str, Any], where: str) -> Hold:
    other = sorted(set(item) & {"at", "from", "to", "mode"})
    if other:
        raise PartError(f"{where}.{other[0]}: a pin hold names only its hole (pin = N); the pin holds the hole's "
                        "edge wherever the part presses on it")
    hole = item["pin"]
    if isinstance(hole, bool) or not isinstance(hole, int) or hole < 1:
        raise PartError(f"{where}.pin: must be the number of a [[hole]] entry (1 for the first); got {hole!r}")
    return Hold(where, None, "fixed", hole)


def read_pick(t: dict[str, Any], where: str, units: str) -> BoundaryPick:
    """`at = [x, y]`, or `from = [x, y]` with `to = [x, y]` (lengths in the file's units)."""
    given = [k for k in ("at", "from", "to") if k in t]
    if given == ["at"]:
        return BoundaryPick(where, at=point(t, "at", where, units))
    if given == ["from", "to"]:
        return BoundaryPick(where, start=point(t, "from", where, units), end=point(t, "to", where, units))
    if not given:
        raise PartError(f"{where}: give `at = [x, y]` (a point on the piece of the boundary to use) or `from` and "
                        "`to` (the stretch between two points)")
    if "at" in given:
        raise PartError(f"{where}.at: give either `at` or `from` and `to`, not both")
    missing = "to" if "from" in given else "from"
    raise PartError(f"{where}.{missing}: missing; a stretch of the boundary needs both `from` and `to`")


def read_edge_loads(items: Any, where: str, units: str) -> tuple[EdgeLoad, ...]:
    """The [[load.edge]] entries of one load case (`where` names the case's table, e.g. "load")."""
    out = []
    for key, item in case_entries(items, where, "edge"):
        known(item, EDGE_KEYS, key)
        kinds = [k for k in ("force", "pressure") if k in item]
        if len(kinds) != 1:
            raise PartError(f"{key}: give exactly one of force (with direction) or pressure; got "
                            f"{', '.join(kinds) or 'neither'}")
        pick = read_pick(item, key, units)
        if kinds == ["pressure"]:
            if "direction" in item:
                raise PartError(f"{key}.direction: a pressure acts normal to the edge; direction goes with force")
            pressure = number(item, "pressure", key, "stress", units)
            if pressure == 0.0:
                raise PartError(f"{key}.pressure: is zero; give a pressure that is not zero (positive presses into "
                                "the material)")
            out.append(EdgeLoad(pick, pressure=pressure))
            continue
        force = number(item, "force", key, "force", units)
        if force <= 0.0:
            raise PartError(f"{key}.force: must be greater than zero (its sense is set by `direction`); got "
                            f"{item['force']!r}")
        if "direction" not in item:
            raise PartError(f"{key}.direction: missing; the force's direction in degrees, counter-clockwise from +x")
        direction = number(item, "direction", key)
        if not -360.0 <= direction <= 360.0:
            raise PartError(f"{key}.direction: {direction:g} is outside -360 to 360 degrees")
        out.append(EdgeLoad(pick, force=force, direction=direction))
    return tuple(out)


def case_name(t: dict[str, Any], where: str, default: str) -> str:
    """A load case's `name`: a short text, `default` when not given."""
    name = t.get("name", default)
    if not isinstance(name, str) or not name.strip() or len(name) > MAX_NAME:
        raise PartError(f"{where}.name: must be a text of 1 to {MAX_NAME} characters; got {name!r}")
    return name.strip()
