"""Checks that a part's loads, supports, symmetry planes and section cuts fit its geometry.

Every problem raises PartError with one line naming the key and what is allowed.
"""

from __future__ import annotations

import math
from dataclasses import replace

from shapely.geometry import LineString

from .cut_labels import cut_label
from .errors import PartError
from .kinds import bar
from .kinds.hole import named as named_hole
from .outline import part_polygon
from .registry import kind_of, named, outline_size
from .spec import BoundaryPick, Load, LoadCase, PartSpec, hole_count_words
from .symmetry import mirror_names, mirror_symmetric, symmetry_tolerance

MAX_CLEARANCE = 0.1  # of the pin hole's diameter: the contact gap is measured along the hole's radii, which
                     # stay within asin(c / (d - c)), 6.4 degrees at this limit, of the true contact normal


def validate_loading(spec: PartSpec) -> None:
    """Raise PartError for the first load, support, symmetry plane or section that does not fit."""
    if spec.outline != bar.NAME:
        from .rigid_body import check_drawn

        check_drawn(spec, case_keys(spec))
    for where, case in case_keys(spec):
        _check_load(spec, case.load, where)
    _check_holds(spec)
    outline = part_polygon(spec)
    for plane in spec.support.symmetry:
        for where, case in case_keys(spec):
            _check_plane(replace(spec, load=case.load), plane, where)
        _check_boundary_mirrors(spec, plane)
        if not mirror_symmetric(spec, plane):
            raise PartError(f"support.symmetry: the part is not mirror-symmetric about the plane {plane} = 0 "
                            "(outline, notches, step, lug and every cut-out must be)")
    if spec.support.holds or any(g.holds for g in spec.fasteners):
        from .rigid_body import check_held

        check_held(spec)
    reach = 4.0 * sum(outline_size(spec))
    for n, section in enumerate(spec.sections, start=1):
        (px, py), (nx, ny) = section.point, section.normal
        line = LineString([(px + reach * ny, py - reach * nx), (px - reach * ny, py + reach * nx)])
        if outline.intersection(line).length <= 0.0:
            from .units import format_quantity

            x0, y0, x1, y1 = (format_quantity(v, "length", spec.units) for v in outline.bounds)
            raise PartError(f"section {n}: the cut {cut_label(section.label, section.point, spec.units)} misses the "
                            f"part (it spans x = {x0} to {x1}, y = {y0} to {y1})")


def case_keys(spec: PartSpec) -> list[tuple[str, LoadCase]]:
    """(part-file key, case) of every load case: "load" for a single [load] table, "load N" for the Nth
    [[load]] entry."""
    if not spec.cases:
        return [("load", spec.load_cases[0])]
    return [(f"load {n}", case) for n, case in enumerate(spec.cases, start=1)]


def _check_load(spec: PartSpec, load: Load, where: str) -> None:
    """One load case against the part: its pin, remote state and edge loads."""
    support = spec.support
    if load.pin is not None and load.pin.hole > len(spec.holes):
        raise PartError(f"{where}.pin.hole: {load.pin.hole} names no hole; " + hole_count_words(spec))
    if load.pin is not None and load.pin.clearance >= MAX_CLEARANCE * spec.holes[load.pin.hole - 1].diameter:
        from .units import format_quantity

        limit = MAX_CLEARANCE * spec.holes[load.pin.hole - 1].diameter
        raise PartError(f"{where}.pin.clearance: {format_quantity(load.pin.clearance, 'length', spec.units)} is not "
                        f"less than {MAX_CLEARANCE:.0%} of the hole's diameter "
                        f"({format_quantity(limit, 'length', spec.units)}); the rigid-pin contact model is for close fits")
    if load.pin is not None and any(h.pin == load.pin.hole for h in support.holds):
        raise PartError(f"{where}.pin.hole: {named_hole(load.pin.hole)} is held by a pin ([[hold]] pin = "
                        f"{load.pin.hole}); a hole takes one pin")
    if load.remote is not None and support.held != "x":
        if support.holds:
            raise PartError(f"{where}.remote: a remote stress state is held only against rigid-body motion; it "
                            "cannot be combined with [[hold]] supports")
        raise PartError(f"support.held: {support.held!r} does not apply with [load.remote]: a remote stress "
                        "state loads every edge and the part is only held against rigid-body motion")
    if load.remote is not None:
        _check_remote(spec, where)
    if not bar.straight_held_end(spec) and (load.bending != 0.0 or load.shear != 0.0) and not support.holds:
        raise PartError(f"{where}.bending: a lug at the held end is held by its pin, which carries no moment; "
                        "put the lug at the loaded end and load it with [load.pin], or hold a straight end")
    for edge in load.edges:
        _check_on_part(spec, edge.where, pinned=_pin_holes(spec, load))


def _pin_holes(spec: PartSpec, load: Load | None = None) -> set[int]:
    """Holes that take a pin: held by one, loaded through one in `load`, or filled by a group's fastener."""
    holes = {h.pin for h in spec.support.holds if h.pin is not None} | {h for g in spec.fasteners for h in g.holes}
    if load is not None and load.pin is not None:
        holes.add(load.pin.hole)
    return holes


def _check_on_part(spec: PartSpec, pick: BoundaryPick, pinned: set[int]) -> None:
    """The pick names a stretch of this part's boundary, not on a hole that takes a pin."""
    from .boundary import stretch

    picked = stretch(spec, pick)
    for name in picked.names:
        if name in {named_hole(n) for n in pinned}:
            raise PartError(f"{pick.key}: picks {name}'s edge, which takes a pin; a pinned hole's edge carries the "
                            "pin's contact only")


def _check_holds(spec: PartSpec) -> None:
    """Every [[hold]]: its stretch on the part, or its pin hole a hole of the part (once)."""
    seen: set[int] = set()
    for hold in spec.support.holds:
        if hold.pin is None:
            _check_on_part(spec, hold.where, _pin_holes(spec))
            continue
        if hold.pin > len(spec.holes):
            raise PartError(f"{hold.key}.pin: {hold.pin} names no hole; " + hole_count_words(spec))
        if hold.pin in seen:
            raise PartError(f"{hold.key}.pin: {named_hole(hold.pin)} is held by a pin already")
        seen.add(hold.pin)
        if spec.support.symmetry:
            raise PartError(f"{hold.key}.pin: a pin hold needs the whole part modelled; remove support.symmetry")


def _check_boundary_mirrors(spec: PartSpec, plane: str) -> None:
    """With a symmetry plane, every hold and edge load must be its own mirror image: its stretch maps
    onto itself and an edge force's direction onto itself."""
    from .boundary import boundary_picks, project, stretch

    tol = 1e-6 * max(outline_size(spec))
    for pick in boundary_picks(spec):
        picked = stretch(spec, pick)
        image = picked.samples() * ((-1.0, 1.0) if plane == "x" else (1.0, -1.0))
        if any(min(project(seg, tuple(p))[0] for seg in picked.pieces) > tol for p in image):
            raise PartError(f"{pick.key}: with the symmetry plane {plane} = 0 every hold and edge load must be its "
                            "own mirror image; this stretch is not (model the whole part instead)")
    for where, case in case_keys(spec):
        for edge in case.load.edges:
            angle = math.radians(edge.direction)
            across = math.cos(angle) if plane == "x" else math.sin(angle)
            if edge.force != 0.0 and abs(across) > 1e-9:
                raise PartError(f"{edge.where.key}.direction: with the symmetry plane {plane} = 0 an edge force must "
                                f"act along the plane ({'90 or 270' if plane == 'x' else '0 or 180'} degrees)")


def _check_remote(spec: PartSpec, where: str = "load") -> None:
    """A remote stress state loads every edge of a plain rectangle; a raiser that opens onto an edge (a notch)
    or a shaped outline would leave edges it cannot describe."""
    if not bar.rectangular(spec):
        raise PartError(f"{where}.remote: a remote stress state needs a plain rectangular outline; remove the [step] "
                        "or [lug] table or load the ends instead")
    edge = next((rid for rid, item in named(spec) if kind_of(item).mouths(spec, item)), None)
    if edge is not None:
        raise PartError(f"{where}.remote: a remote stress state needs a plain rectangular outline with every raiser "
                        f"inside it; {edge} opens onto an edge: remove it or load the ends instead")


def _check_plane(spec: PartSpec, plane: str, key: str = "load") -> None:
    """The raisers and the loads (of spec.load, the case `key` names) must be mirror-symmetric about `plane`."""
    where = f"support.symmetry: the plane {plane} = 0"
    if mirror_names(spec, plane) is None:
        raise PartError(f"{where} needs every raiser mirrored across it (a raiser of the same kind and size) or "
                        "centred on it")
    load = spec.load
    tol = symmetry_tolerance(spec)
    if load.remote is not None and load.remote.txy != 0.0:
        raise PartError(f"{where} does not hold with {key}.remote.txy (a shear state is not mirror-symmetric)")
    if load.shear != 0.0:
        raise PartError(f"{where} does not hold with {key}.shear (a transverse end force is not mirror-symmetric)")
    if plane == "y" and load.bending != 0.0:
        raise PartError(f"{where} does not hold with {key}.bending (bending is antisymmetric about the centre line)")
    if plane == "x" and spec.support.held == "clamped":
        raise PartError(f"support.held: {spec.support.held!r} does not apply with the plane x = 0: the part is "
                        "modelled as loaded at both ends alike and the plane takes the place of the held end")
    if load.pin is not None:
        center = spec.holes[load.pin.hole - 1].center
        if abs(math.sin(load.pin.angle)) > 1e-9:
            raise PartError(f"{where} needs {key}.pin.direction along x (0 or 180 degrees)")
        if plane == "y" and abs(center[1]) > tol:
            raise PartError(f"{where} needs the pin hole ({named_hole(load.pin.hole)}) centred on it")
        if plane == "x" and center[0] <= tol:
            raise PartError(f"{where} needs the pin hole ({named_hole(load.pin.hole)}) on the side x > 0; its mirror "
                            "image carries the mirrored pin load")
