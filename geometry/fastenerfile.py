"""Part-file tables for fastener groups and the loads they carry (fem/fastener_groups.py is the model).

    [[fasteners]]                 a group of bolts or pins joined by a rigid connecting member (any number)
    name = "splice bolts"         its name (load cases name it; default "group N")
    holes = [1, 2, 3]             the [[hole]] numbers it fills, one fastener in each
    diameter = 16.0               the fastener's shank diameter d (default: the hole's less the clearance)
    clearance = 0.2               diametral clearance (default: the hole's diameter less d; 0 is a neat fit)
    shear_planes = 2              1 (single shear, default) or 2 (double shear), for F / (n pi d^2 / 4)
    stiffness = "rigid"           "rigid" (default), a stiffness such as "60 kN/mm", or "huth":
    holds = false                 true: the group holds the part (its other member is fixed)

    [fasteners.huth]              with stiffness = "huth" (docs/references.md [Huth], from memory)
    other_thickness = 10.0        the other member's thickness (length)
    other_modulus = "70 GPa"      the other member's modulus (stress)
    fastener_modulus = "210 GPa"  the fastener's modulus (stress)
    joint = "bolted metallic"     or "riveted metallic", "bolted graphite/epoxy"

    [[load.fasteners]]            a load through a group that does not hold (in [load] or any [[load]] case)
    group = "splice bolts"        the group's name
    force = "40 kN"               the force its member puts into the part (>= 0)
    direction = 0.0               degrees counter-clockwise from +x, or a direction vector [x, y]
    moment = "1.2 kN m"           counter-clockwise moment (default 0)
    about = [120.0, 0.0]          the point the force acts at and the moment is about (default: the holes'
                                  centroid)

Each reader names the key and what is allowed when something is wrong (PartError, one line);
`check_fasteners` checks the groups against the part (holes, fits, loads) once the part is known.
"""

from __future__ import annotations

import math
from typing import Any

from .errors import PartError
from .readers import array_of_tables, case_entries, integer, known, number, point, positive, shown
from .spec import FastenerSpec, GroupLoad, HuthInputs, PartSpec, hole_count_words

GROUP_KEYS = {"name", "holes", "diameter", "clearance", "shear_planes", "stiffness", "holds", "huth"}
HUTH_KEYS = {"other_thickness", "other_modulus", "fastener_modulus", "joint"}
LOAD_KEYS = {"group", "force", "direction", "moment", "about"}
HUTH_JOINT_KINDS = ("bolted metallic", "riveted metallic", "bolted graphite/epoxy")  # fem.fastener_stiffness
MAX_NAME = 60  # characters in a group's name
MAX_CLEARANCE = 0.1  # of the hole's diameter: the linearised contact gap's range (fem.fastener_groups)
FIT_TOLERANCE = 1e-6  # relative: a hole's diameter equals d + clearance within this


def read_fasteners(items: Any, units: str) -> tuple[FastenerSpec, ...]:
    """The [[fasteners]] entries, each a FastenerSpec (its fit is settled against the holes by `fitted`)."""
    out = []
    for n, item in array_of_tables({"fasteners": items}, "fasteners"):
        where = f"fasteners {n}"
        known(item, GROUP_KEYS, where)
        name = item.get("name", f"group {n}")
        if not isinstance(name, str) or not name.strip() or len(name) > MAX_NAME:
            raise PartError(f"{where}.name: must be a text of 1 to {MAX_NAME} characters; got {shown(name)}")
        name = name.strip()
        if any(g.name == name for g in out):
            raise PartError(f"{where}.name: {name!r} names another group too; each group needs its own name")
        holes = item.get("holes")
        if (not isinstance(holes, list) or not holes
                or not all(isinstance(h, int) and not isinstance(h, bool) and h >= 1 for h in holes)):
            raise PartError(f"{where}.holes: must be a list of [[hole]] numbers (1 for the first), e.g. [1, 2]; "
                            f"got {shown(holes)}")
        if len(set(holes)) != len(holes):
            raise PartError(f"{where}.holes: names a hole twice; a hole takes one fastener")
        diameter = positive(item, "diameter", where, "length", units, required=False)
        clearance = number(item, "clearance", where, "length", units, required=False)
        if clearance is not None and clearance < 0.0:
            raise PartError(f"{where}.clearance: must be zero or more (the diametral clearance); got "
                            f"{shown(item['clearance'])}")
        holds = item.get("holds", False)
        if not isinstance(holds, bool):
            raise PartError(f"{where}.holds: must be true (the group holds the part) or false; got {shown(holds)}")
        kind, value, huth = _stiffness(item, where, units)
        out.append(FastenerSpec(name, tuple(holes), -1.0 if diameter is None else diameter,
                                -1.0 if clearance is None else clearance,
                                integer(item, "shear_planes", where, 1, 1, 2), kind, value, huth, holds, where))
    return tuple(out)


def _stiffness(item: dict[str, Any], where: str, units: str) -> tuple[str, float | None, HuthInputs | None]:
    value = item.get("stiffness", "rigid")
    if "huth" in item and value != "huth":
        raise PartError(f"{where}.huth: goes with {where}.stiffness = \"huth\"")
    if value == "rigid":
        return "rigid", None, None
    if value == "huth":
        t = item.get("huth")
        if not isinstance(t, dict):
            raise PartError(f"{where}.huth: missing; stiffness = \"huth\" needs a [fasteners.huth] table with "
                            "other_thickness, other_modulus, fastener_modulus (and joint)")
        key = f"{where}.huth"
        known(t, HUTH_KEYS, key)
        joint = t.get("joint", HuthInputs.joint)
        if joint not in HUTH_JOINT_KINDS:
            raise PartError(f"{key}.joint: {shown(joint)} is not allowed; use one of {', '.join(HUTH_JOINT_KINDS)}")
        return "huth", None, HuthInputs(positive(t, "other_thickness", key, "length", units),
                                        positive(t, "other_modulus", key, "stress", units),
                                        positive(t, "fastener_modulus", key, "stress", units), joint)
    if (isinstance(value, str) and value.strip()[:1].isdigit()) or (isinstance(value, (int, float))
                                                                     and not isinstance(value, bool)):
        return "given", positive({"stiffness": value}, "stiffness", where, "stiffness", units), None
    raise PartError(f"{where}.stiffness: {shown(value)} is not allowed; use \"rigid\", a stiffness such as "
                    "\"60 kN/mm\", or \"huth\" (with a [fasteners.huth] table)")


def read_group_loads(items: Any, where: str, units: str) -> tuple[GroupLoad, ...]:
    """The [[load.fasteners]] entries of one load case (`where` names the case's table, e.g. "load")."""
    out = []
    for key, item in case_entries(items, where, "fasteners"):
        known(item, LOAD_KEYS, key)
        group = item.get("group")
        if not isinstance(group, str) or not group.strip():
            raise PartError(f"{key}.group: must be the name of a [[fasteners]] group; got {shown(group)}")
        group = group.strip()
        if any(g.group == group for g in out):
            raise PartError(f"{key}.group: {group!r} is loaded twice in this case; give its force and moment once")
        force = number(item, "force", key, "force", units, required=False, default=0.0)
        if force < 0.0:
            raise PartError(f"{key}.force: must be zero or more (its sense is set by `direction`); got "
                            f"{shown(item['force'])}")
        moment = number(item, "moment", key, "moment", units, required=False, default=0.0)
        if force == 0.0 and moment == 0.0:
            raise PartError(f"{key}: force and moment are both zero; give the group a force (with direction) or a "
                            "moment")
        if force > 0.0 and "direction" not in item:
            raise PartError(f"{key}.direction: missing; the force's direction in degrees from +x, or a vector [x, y]")
        direction = _direction(item, key) if "direction" in item else 0.0
        about = point(item, "about", key, units) if "about" in item else None
        out.append(GroupLoad(group, force, direction, moment, about, key))
    return tuple(out)


def _direction(item: dict[str, Any], key: str) -> float:
    """`direction`: degrees from -360 to 360, or a direction vector [x, y] (not zero)."""
    value = item["direction"]
    if isinstance(value, list):
        if len(value) != 2 or not all(isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)
                                      for v in value) or math.hypot(*value) == 0.0:
            raise PartError(f"{key}.direction: a vector must be two finite numbers [x, y], not both zero; got "
                            f"{shown(value)}")
        return math.degrees(math.atan2(value[1], value[0]))
    angle = number(item, "direction", key)
    if not -360.0 <= angle <= 360.0:
        raise PartError(f"{key}.direction: {angle:g} is outside -360 to 360 degrees")
    return angle


def fitted(spec: PartSpec) -> tuple[FastenerSpec, ...]:
    """Each group with its diameter and clearance settled against its holes: every hole of a group has one
    diameter D, and d + clearance = D (either given, the other follows; neither: a neat fit)."""
    from dataclasses import replace

    from .units import format_quantity

    out = []
    claimed: dict[int, str] = {}
    for g in spec.fasteners:
        for h in g.holes:
            if h > len(spec.holes):
                raise PartError(f"{g.key}.holes: {h} names no hole; " + hole_count_words(spec))
            if h in claimed:
                raise PartError(f"{g.key}.holes: hole {h} is in {claimed[h]} too; a hole takes one fastener")
            claimed[h] = g.key
        sizes = {spec.holes[h - 1].diameter for h in g.holes}
        if max(sizes) - min(sizes) > FIT_TOLERANCE * max(sizes):
            raise PartError(f"{g.key}.holes: the holes of a group must have one diameter (its fasteners are alike); "
                            "put holes of another size in a group of their own")
        hole = max(sizes)
        d, c = g.diameter, g.clearance
        if d > 0.0 and c >= 0.0 and abs(d + c - hole) > FIT_TOLERANCE * hole:
            raise PartError(f"{g.key}.clearance: diameter + clearance must equal the holes' diameter "
                            f"{format_quantity(hole, 'length', spec.units)}; give one of them and the other follows")
        if d > 0.0 and d > hole * (1.0 + FIT_TOLERANCE):
            raise PartError(f"{g.key}.diameter: {format_quantity(d, 'length', spec.units)} is larger than its holes "
                            f"({format_quantity(hole, 'length', spec.units)}); the fastener must fit the hole")
        if d <= 0.0:
            d = hole - max(c, 0.0)
            if d <= 0.0:
                raise PartError(f"{g.key}.clearance: is not less than the holes' diameter")
        c = max(hole - d, 0.0)
        if c >= MAX_CLEARANCE * hole:
            raise PartError(f"{g.key}.clearance: {format_quantity(c, 'length', spec.units)} is not less than "
                            f"{MAX_CLEARANCE:.0%} of the holes' diameter; the contact model is for close fits")
        out.append(replace(g, diameter=d, clearance=c))
    return tuple(out)


def check_fasteners(spec: PartSpec) -> None:
    """The groups and their loads against the part: every load names a group that does not hold, every
    group that does not hold is loaded in every case, a one-fastener group carries no moment about its pin,
    no hole takes both a group's fastener and a pin, and no symmetry plane."""
    from .loading import case_keys

    groups = {g.name: g for g in spec.fasteners}
    if spec.fasteners and spec.support.symmetry:
        raise PartError(f"{spec.fasteners[0].key}: fastener groups need the whole part modelled; remove "
                        "support.symmetry")
    pinned = {h.pin for h in spec.support.holds if h.pin is not None}
    for where, case in case_keys(spec):
        if case.load.pin is not None:
            pinned.add(case.load.pin.hole)
    for g in spec.fasteners:
        both = sorted(set(g.holes) & pinned)
        if both:
            raise PartError(f"{g.key}.holes: hole {both[0]} takes a pin ([load.pin] or a [[hold]] pin) too; a hole "
                            "takes one fastener")
    for where, case in case_keys(spec):
        for load in case.load.fasteners:
            group = groups.get(load.group)
            if group is None:
                names = ", ".join(repr(n) for n in groups) or "none"
                raise PartError(f"{load.key}.group: {load.group!r} names no [[fasteners]] group; the groups are {names}")
            if group.holds:
                raise PartError(f"{load.key}.group: {load.group!r} holds the part (holds = true); a holding group "
                                "takes the reaction, not a load")
            if len(group.holes) == 1 and _moment_about_pin(spec, group, load) != 0.0:
                raise PartError(f"{load.key}.moment: a one-fastener group carries no moment about its pin (a "
                                "frictionless pin does not turn its hole); load it through its centre with no moment")
        loaded = {load.group for load in case.load.fasteners}
        for g in spec.fasteners:
            if not g.holds and g.name not in loaded:
                raise PartError(f"{g.key}: {g.name!r} neither holds the part nor is loaded in {where}; give it a "
                                f"[[{where.split()[0]}.fasteners]] load there or holds = true")


def _moment_about_pin(spec: PartSpec, group: FastenerSpec, load: GroupLoad) -> float:
    """The load's moment about the one fastener's centre (N mm), zero to round-off."""
    fx, fy, mz = load.components
    centre = spec.holes[group.holes[0] - 1].center
    if load.about is None:
        return mz
    ax, ay = load.about[0] - centre[0], load.about[1] - centre[1]
    total = mz + ax * fy - ay * fx
    scale = math.hypot(fx, fy) * spec.holes[group.holes[0] - 1].diameter + abs(mz)
    return 0.0 if abs(total) <= 1e-9 * scale else total
