"""Checks that a part's loads, supports, symmetry planes and section cuts fit its geometry.

Every problem raises PartError with one line naming the key and what is allowed.
"""

from __future__ import annotations

import math

from shapely import affinity
from shapely.geometry import LineString

from .errors import PartError
from .kinds import bar
from .kinds.hole import named as named_hole
from .outline import part_polygon
from .registry import kind_of, named, outline_size
from .spec import PartSpec
from .symmetry import mirror_names, symmetry_tolerance

MAX_CLEARANCE = 0.1  # of the pin hole's diameter: the contact gap is measured along the hole's radii, which
                     # stay within asin(c / (d - c)), 6.4 degrees at this limit, of the true contact normal


def validate_loading(spec: PartSpec) -> None:
    """Raise PartError for the first load, support, symmetry plane or section that does not fit."""
    load, support = spec.load, spec.support
    if load.pin is not None and load.pin.hole > len(spec.holes):
        raise PartError(f"load.pin.hole: {load.pin.hole} names no hole; the part has {len(spec.holes)} "
                        "[[hole]] entries")
    if load.pin is not None and load.pin.clearance >= MAX_CLEARANCE * spec.holes[load.pin.hole - 1].diameter:
        from .units import format_quantity

        limit = MAX_CLEARANCE * spec.holes[load.pin.hole - 1].diameter
        raise PartError(f"load.pin.clearance: {format_quantity(load.pin.clearance, 'length', spec.units)} is not less "
                        f"than {MAX_CLEARANCE:.0%} of the hole's diameter ({format_quantity(limit, 'length', spec.units)}); "
                        "the rigid-pin contact model is for close fits")
    if load.remote is not None and support.held != "x":
        raise PartError(f"support.held: {support.held!r} does not apply with [load.remote]: a remote stress "
                        "state loads every edge and the part is only held against rigid-body motion")
    if load.remote is not None:
        _check_remote(spec)
    if not bar.straight_held_end(spec) and (load.bending != 0.0 or load.shear != 0.0):
        raise PartError("load.bending: a lug at the held end is held by its pin, which carries no moment; "
                        "put the lug at the loaded end and load it with [load.pin], or hold a straight end")
    outline = part_polygon(spec)
    for plane in support.symmetry:
        _check_plane(spec, plane)
        image = affinity.scale(outline, -1.0 if plane == "x" else 1.0, -1.0 if plane == "y" else 1.0, origin=(0, 0))
        if outline.symmetric_difference(image).area > 1e-5 * outline.area:
            raise PartError(f"support.symmetry: the part is not mirror-symmetric about the plane {plane} = 0 "
                            "(outline, notches, step, lug and every cut-out must be)")
    reach = 4.0 * sum(outline_size(spec))
    for n, section in enumerate(spec.sections, start=1):
        (px, py), (nx, ny) = section.point, section.normal
        line = LineString([(px + reach * ny, py - reach * nx), (px - reach * ny, py + reach * nx)])
        if outline.intersection(line).length <= 0.0:
            x0, y0, x1, y1 = outline.bounds
            raise PartError(f"section {n}: the cut {section.label} misses the part (it spans "
                            f"x = {x0:g} to {x1:g}, y = {y0:g} to {y1:g} mm)")


def _check_remote(spec: PartSpec) -> None:
    """A remote stress state loads every edge of a plain rectangle; a raiser that opens onto an edge (a notch)
    or a shaped outline would leave edges it cannot describe."""
    if not bar.rectangular(spec):
        raise PartError("load.remote: a remote stress state needs a plain rectangular outline; remove the [step] "
                        "or [lug] table or load the ends instead")
    edge = next((rid for rid, item in named(spec) if kind_of(item).mouths(spec, item)), None)
    if edge is not None:
        raise PartError(f"load.remote: a remote stress state needs a plain rectangular outline with every raiser "
                        f"inside it; {edge} opens onto an edge: remove it or load the ends instead")


def _check_plane(spec: PartSpec, plane: str) -> None:
    """The raisers and the loads must be mirror-symmetric about `plane`."""
    where = f"support.symmetry: the plane {plane} = 0"
    if mirror_names(spec, plane) is None:
        raise PartError(f"{where} needs every raiser mirrored across it (a raiser of the same kind and size) or "
                        "centred on it")
    load = spec.load
    tol = symmetry_tolerance(spec)
    if load.remote is not None and load.remote.txy != 0.0:
        raise PartError(f"{where} does not hold with load.remote.txy (a shear state is not mirror-symmetric)")
    if load.shear != 0.0:
        raise PartError(f"{where} does not hold with load.shear (a transverse end force is not mirror-symmetric)")
    if plane == "y" and load.bending != 0.0:
        raise PartError(f"{where} does not hold with load.bending (bending is antisymmetric about the centre line)")
    if plane == "x" and spec.support.held != "x":
        raise PartError(f"support.held: {spec.support.held!r} does not apply with the plane x = 0: the part is "
                        "modelled as loaded at both ends alike and the plane takes the place of the held end")
    if load.pin is not None:
        center = spec.holes[load.pin.hole - 1].center
        if abs(math.sin(load.pin.angle)) > 1e-9:
            raise PartError(f"{where} needs load.pin.direction along x (0 or 180 degrees)")
        if plane == "y" and abs(center[1]) > tol:
            raise PartError(f"{where} needs the pin hole ({named_hole(load.pin.hole)}) centred on it")
        if plane == "x" and center[0] <= tol:
            raise PartError(f"{where} needs the pin hole ({named_hole(load.pin.hole)}) on the side x > 0; its mirror "
                            "image carries the mirrored pin load")
