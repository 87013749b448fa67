"""Limits that keep a valid-looking part inside what the mesher can resolve in bounded time.

Two checks, each raising PartError with one line naming the feature and the limit:

- `check_feature_count`, run before any geometric check: the geometric checks compare every feature
  with every other one and the size field evaluates one expression per raiser at every mesh point, so
  both grow with the square of the count. A few hundred features is far beyond a real strap or plate.
- `check_resolution`, run after the geometric checks: every raiser edge must have a radius of curvature
  of at least MIN_CURVATURE_ELEMENTS of the mesher's finest element (FINEST_ELEMENT_FRACTION of the plate
  width). A smaller raiser, say a 1e-6 mm hole in an 80 mm strap, cannot be meshed around at all. And the
  plate must be at least MIN_LENGTH_FRACTION of its width long: the far-field elements are 15 % of the
  width, and a shorter strip (1 mm long, 1000 mm wide) came out of gmsh with degenerate triangles.
"""

from __future__ import annotations

from .errors import PartError
from .registry import outline_size
from .spec import PartSpec
from .validate import FINEST_ELEMENT_FRACTION

MAX_FEATURES = 200  # features and sections in one part file, all kinds together
MIN_CURVATURE_ELEMENTS = 2.0  # smallest raiser radius, in finest elements
MIN_LENGTH_FRACTION = 0.01  # shortest plate, as a fraction of its width


def feature_count(spec: PartSpec) -> int:
    """How many listed items the part has: its raisers of every kind and its section cuts."""
    return len(spec.raisers) + len(spec.sections)


def check_feature_count(spec: PartSpec) -> None:
    """Refuse a part with more than MAX_FEATURES features."""
    count = feature_count(spec)
    if count > MAX_FEATURES:
        raise PartError(f"part file: {count} features and sections; at most {MAX_FEATURES} are allowed in one part")


def min_curvature(spec: PartSpec) -> float:
    """Smallest raiser radius of curvature (mm) the mesh resolves."""
    return MIN_CURVATURE_ELEMENTS * FINEST_ELEMENT_FRACTION * outline_size(spec)[1]


def check_resolution(spec: PartSpec) -> None:
    """Refuse a raiser whose smallest radius of curvature is below `min_curvature(spec)`."""
    from .raisers import part_raisers  # raisers imports validate; import here to keep the order one way

    length, width = outline_size(spec)
    shortest = MIN_LENGTH_FRACTION * width
    if length < shortest:
        raise PartError(f"plate.length: {length:g} mm is less than {MIN_LENGTH_FRACTION:.0%} of the width "
                        f"({shortest:.3g} mm); the mesh cannot grade a strip that short without degenerate elements")
    limit = min_curvature(spec)
    for raiser in part_raisers(spec):
        if not raiser.curvature >= limit:
            raise PartError(
                f"{raiser.id}: radius {raiser.curvature:.3g} mm is below the smallest the mesh resolves, "
                f"{limit:.3g} mm ({MIN_CURVATURE_ELEMENTS * FINEST_ELEMENT_FRACTION:.1%} of the plate width "
                f"{outline_size(spec)[1]:g} mm); enlarge it or model a narrower part")
