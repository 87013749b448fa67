"""Geometric checks on a PartSpec: every feature inside the plate with a real ligament around it."""

from __future__ import annotations

import math

from .errors import PartError
from .spec import PartSpec

# Smallest element the mesher may use, as a fraction of the plate width, and how many such elements a
# ligament must hold. Together they set the thinnest ligament the tool accepts.
FINEST_ELEMENT_FRACTION = 1e-3
ELEMENTS_PER_LIGAMENT = 4


def min_ligament(spec: PartSpec) -> float:
    """Thinnest ligament (mm) the mesh can resolve with a few elements across it."""
    return ELEMENTS_PER_LIGAMENT * FINEST_ELEMENT_FRACTION * spec.plate.width


def validate_geometry(spec: PartSpec) -> None:
    """Raise PartError naming the first feature that crosses the outline, another feature, or leaves
    too thin a ligament."""
    limit = min_ligament(spec)
    for n in range(1, len(spec.holes) + 1):
        for other, gap in hole_gaps(spec, n).items():
            _check_gap(f"hole {n}", other, gap, limit)


def hole_gaps(spec: PartSpec, n: int) -> dict[str, float]:
    """Clear distance (mm) from hole n (1-based) to each plate edge and to every other hole."""
    half_l, half_w = 0.5 * spec.plate.length, 0.5 * spec.plate.width
    hole = spec.holes[n - 1]
    x, y = hole.center
    r = hole.radius
    gaps = {
        f"the side y = {half_w:g}": half_w - (y + r),
        f"the side y = {-half_w:g}": (y - r) + half_w,
        f"the loaded end x = {half_l:g}": half_l - (x + r),
        f"the held end x = {-half_l:g}": (x - r) + half_l,
    }
    for m, other in enumerate(spec.holes, start=1):
        if m != n:
            gaps[f"hole {m}"] = math.dist(hole.center, other.center) - r - other.radius
    return gaps


def _check_gap(feature: str, other: str, gap: float, limit: float) -> None:
    if gap <= 0.0:
        raise PartError(f"{feature}: crosses or touches {other}; move it or make it smaller")
    if gap < limit:
        raise PartError(
            f"{feature}: ligament to {other} is {gap:.3g} mm; at least {limit:.3g} mm is needed "
            f"({ELEMENTS_PER_LIGAMENT} elements of the finest allowed size)"
        )
