"""Limits that keep a valid-looking part inside what the mesher and the elements can resolve.

Three checks, each raising PartError with one line naming the feature and the limit:

- `check_feature_count`, run before any geometric check: the geometric checks compare every feature
  with every other one and the size field evaluates one expression per raiser at every mesh point, so
  both grow with the square of the count. A few hundred features is far beyond a real strap or plate.
- `check_resolution`, run after the geometric checks: every raiser edge must have a radius of curvature
  of at least MIN_CURVATURE_ELEMENTS of the mesher's finest element (FINEST_ELEMENT_FRACTION of the plate
  width). A smaller raiser, say a 1e-6 mm hole in an 80 mm strap, cannot be meshed around at all. And the
  plate must be at least MIN_LENGTH_FRACTION of its width long: the far-field elements are 15 % of the
  width, and a shorter strip (1 mm long, 1000 mm wide) came out of gmsh with degenerate triangles.
  Also `check_locking`: linear triangles in plane strain lock as Poisson's ratio nears 1/2 (volumetric
  locking: a nearly incompressible material makes the constant-strain triangle far too stiff), so a part
  with nu above LOCKING_NU in plane strain with mesh.order = 1 is refused and pointed to quadratic
  triangles. Measured (benchmarks/model_limits.py: three bundled parts, a hole in tension, a hole in a
  clamped arm under end shear and tension, U and V notches in tension; converged at 1 %, against the same
  part in plane stress, whose Kt is the same exactly, docs/references.md [Michell]): with linear triangles
  the Kt error grows roughly like 1 / (1 - 2 nu): -0.24 to -0.45 % at nu = 0.45, which every band still
  covered; -0.45 to -0.63 % at 0.47, outside two of the three bands; -0.8 to -1.4 % at 0.49; at 0.499 the
  strap's Kt was 6.6 % low and "converged" with a band of 0.8 %. Quadratic triangles stayed within 0.22 %
  of the reference up to nu = 0.499.
"""

from __future__ import annotations

from .errors import PartError
from .registry import outline_size
from .spec import PartSpec
from .units import format_quantity
from .validate import FINEST_ELEMENT_FRACTION

MAX_FEATURES = 200  # features and sections in one part file, all kinds together
MIN_CURVATURE_ELEMENTS = 2.0  # smallest raiser radius, in finest elements
MIN_LENGTH_FRACTION = 0.01  # shortest plate, as a fraction of its width
LOCKING_NU = 0.45  # largest Poisson's ratio for linear triangles in plane strain (see the module docstring)


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
    """Refuse a raiser whose smallest radius of curvature is below `min_curvature(spec)`, a plate too
    short for its width, and a plane-strain part that would lock linear triangles (`check_locking`)."""
    check_locking(spec)
    from .raisers import part_raisers  # raisers imports validate; import here to keep the order one way

    def length_text(value: float, digits: int = 4) -> str:
        return format_quantity(value, "length", spec.units, digits)

    length, width = outline_size(spec)
    shortest = MIN_LENGTH_FRACTION * width
    if length < shortest:
        raise PartError(f"plate.length: {length_text(length)} is less than {MIN_LENGTH_FRACTION:.0%} of the width "
                        f"({length_text(shortest, 3)}); the mesh cannot grade a strip that short without degenerate "
                        "elements")
    limit = min_curvature(spec)
    for raiser in part_raisers(spec):
        if not raiser.curvature >= limit:
            raise PartError(
                f"{raiser.id}: radius {length_text(raiser.curvature, 3)} is below the smallest the mesh resolves, "
                f"{length_text(limit, 3)} ({MIN_CURVATURE_ELEMENTS * FINEST_ELEMENT_FRACTION:.1%} of the plate width "
                f"{length_text(width)}); enlarge it or model a narrower part")


def check_locking(spec: PartSpec) -> None:
    """Refuse plane strain with nu above LOCKING_NU on linear triangles (volumetric locking)."""
    nu = spec.material.nu
    if spec.plate.condition == "plane-strain" and spec.mesh.order == 1 and nu > LOCKING_NU:
        raise PartError(f"material.nu: {nu:g} in plane strain locks linear triangles (volumetric locking: Kt comes out "
                        f"several per cent low with a band that does not show it); linear triangles allow nu up to "
                        f"{LOCKING_NU:g} in plane strain: set mesh.order = 2 (quadratic triangles, measured right to "
                        "nu = 0.499) or use plane stress if the part is thin")
