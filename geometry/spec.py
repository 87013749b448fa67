"""The validated description of one part: plain frozen dataclasses in mm, N, MPa.

Coordinates: origin at the plate centre, x along the length (the load direction), y across the
width. The held end is x = -length/2, the loaded end is x = +length/2.
"""

from __future__ import annotations

from dataclasses import dataclass, field

STRESS_STATES = ("plane-stress", "plane-strain")


@dataclass(frozen=True)
class Plate:
    """Rectangular plate outline: length along x, width along y, thickness (all mm)."""

    length: float
    width: float
    thickness: float
    condition: str = "plane-stress"


@dataclass(frozen=True)
class Hole:
    """Circular through-hole: centre (x, y) in mm and diameter in mm."""

    center: tuple[float, float]
    diameter: float

    @property
    def radius(self) -> float:
        return 0.5 * self.diameter


@dataclass(frozen=True)
class Material:
    """Linear-elastic isotropic material: E in MPa, Poisson's ratio nu, strengths in MPa."""

    E: float
    nu: float
    yield_strength: float | None = None
    ultimate: float | None = None


@dataclass(frozen=True)
class Load:
    """Axial force in N on the loaded end (x = +length/2); positive is tension."""

    axial: float


@dataclass(frozen=True)
class MeshControls:
    """Convergence controls.

    tolerance: target relative error of the peak stress.
    max_levels: most mesh levels solved before giving up on convergence.
    max_elements: most triangles any level may have; refinement stops before exceeding it.
    """

    tolerance: float = 0.01
    max_levels: int = 6
    max_elements: int = 2_000_000


@dataclass(frozen=True)
class PartSpec:
    """One plate, its raisers, material, load and mesh controls, validated, in mm, N, MPa."""

    title: str
    plate: Plate
    material: Material
    load: Load
    holes: tuple[Hole, ...] = ()
    mesh: MeshControls = field(default_factory=MeshControls)
    units: str = "mm-N-MPa"  # the unit system the part file was written in (for reporting only)
