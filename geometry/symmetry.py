"""Mirror planes of a symmetric part: the region that is meshed, which raiser mirrors which, and the
names of the cut edges.

A plane "x" is the plane x = 0 and "y" the plane y = 0 (the part's centre lines). With planes declared,
only the part on their positive side is meshed; the cut edges are named "symmetry x" / "symmetry y"
and carry rollers (the displacement normal to the plane is zero, the shear traction is zero).
"""

from __future__ import annotations

import math

from .spec import PartSpec

TOLERANCE_FRACTION = 1e-6  # of the plate's larger dimension: how close counts as "on the plane"


def symmetry_tolerance(spec: PartSpec) -> float:
    """Distance (mm) within which a point counts as lying on a plane or two centres as coinciding."""
    return TOLERANCE_FRACTION * max(spec.plate.length, spec.plate.width)


def mirror_point(point: tuple[float, float], plane: str) -> tuple[float, float]:
    """The mirror image of a point (mm) in the plane "x" (x -> -x) or "y" (y -> -y)."""
    x, y = point
    return (-x, y) if plane == "x" else (x, -y)


def mirror_holes(spec: PartSpec, plane: str) -> dict[int, int] | None:
    """For each hole n (1-based) the hole that is its mirror image in `plane` (n itself when it is
    centred on the plane); None when some hole has no mirror image of the same diameter."""
    tol = symmetry_tolerance(spec)
    out: dict[int, int] = {}
    for n, hole in enumerate(spec.holes, start=1):
        image = mirror_point(hole.center, plane)
        for m, other in enumerate(spec.holes, start=1):
            if math.dist(image, other.center) <= tol and abs(other.diameter - hole.diameter) <= tol:
                out[n] = m
                break
        else:
            return None
    return out


def modelled_box(spec: PartSpec) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) in mm of the region that is meshed: the plate, cut at each plane."""
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    planes = spec.support.symmetry
    return (0.0 if "x" in planes else -half_l, 0.0 if "y" in planes else -half_w, half_l, half_w)


def on_plane(spec: PartSpec, x: float, y: float) -> str | None:
    """The edge name "symmetry x" / "symmetry y" when (x, y) lies on a declared plane, else None."""
    tol = symmetry_tolerance(spec)
    for plane, coordinate in (("x", x), ("y", y)):
        if plane in spec.support.symmetry and abs(coordinate) <= tol:
            return f"symmetry {plane}"
    return None


def kept_quarters(spec: PartSpec, center: tuple[float, float], radius: float) -> int:
    """How many of the four quarter-turns around `center` (split at 0, 90, 180, 270 degrees) lie in the
    meshed region, judged at their middle direction at distance `radius` (mm)."""
    x0, y0, x1, y1 = modelled_box(spec)
    tol = symmetry_tolerance(spec)
    kept = 0
    for k in range(4):
        a = 0.25 * math.pi * (2 * k + 1)
        x, y = center[0] + radius * math.cos(a), center[1] + radius * math.sin(a)
        kept += x0 - tol <= x <= x1 + tol and y0 - tol <= y <= y1 + tol
    return kept
