"""The validated description of one part: plain frozen dataclasses in mm, N, MPa.

Coordinates: origin at the plate centre, x along the length (the load direction), y across the
width. The held end is x = -length/2, the loaded end is x = +length/2.
"""

from __future__ import annotations

import math
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
class Ellipse:
    """Elliptical through-hole: centre (x, y) in mm, full length along its own axis and full width across
    it (mm), and angle in degrees, counter-clockwise from +x to the length axis."""

    center: tuple[float, float]
    length: float
    width: float
    angle: float = 0.0


@dataclass(frozen=True)
class Slot:
    """Obround slot (two semicircular ends joined by straight sides): centre (x, y) in mm, overall length
    end to end and width (= twice the end radius) in mm, angle in degrees from +x to the length axis."""

    center: tuple[float, float]
    length: float
    width: float
    angle: float = 0.0


NOTCH_SHAPES = ("U", "V", "semicircle")
NOTCH_SIDES = ("top", "bottom", "both")  # top is the long edge at +y


@dataclass(frozen=True)
class Notch:
    """Edge notch on a long edge (or a pair, one on each edge): axis at x (mm), depth from the edge to the
    bottom of the root (mm), root radius (mm) and, for a V, the opening angle between its flanks (degrees).
    A semicircular notch has depth = radius. A U notch shallower than its radius is a circular arc of that
    radius cut to that depth."""

    x: float
    side: str
    shape: str
    depth: float
    radius: float
    angle: float = 0.0


STEP_NARROW_ENDS = ("loaded", "held")


@dataclass(frozen=True)
class Step:
    """A shoulder step in width, symmetric about the centre line: the width changes from plate.width to the
    narrow `width` (mm) through shoulder fillets of `radius` (mm) that start at x (mm); `narrow` says which
    end is narrow. A fillet no larger than the step height h = (plate.width - width)/2 meets a square shoulder
    face; a larger one is tangent to the narrow edge and meets the wide edge at an angle."""

    x: float
    width: float
    radius: float
    narrow: str = "loaded"


@dataclass(frozen=True)
class Lug:
    """A lug: the loaded end is a semicircle of half the end's width centred on hole `hole` (1-based), which
    takes the pin; the part is loaded through the pin ([load.pin]) and held at the far end."""

    hole: int


@dataclass(frozen=True)
class Material:
    """Linear-elastic isotropic material: E in MPa, Poisson's ratio nu, strengths in MPa.

    grade:            key of the built-in table row the values start from, or None.
    family:           "steel", "stainless", "aluminium" or "titanium" (geometry.materials.FAMILIES), or None.
    ductile:          True if local yielding can relieve a peak under static load; None if not known.
    fatigue_strength: fully reversed fatigue strength in MPa, or None.
    fatigue_life:     the life in cycles that fatigue strength applies to; None for an endurance limit.
    source:           where the values come from (the table row's source, and which keys the file set).
    """

    E: float
    nu: float
    yield_strength: float | None = None
    ultimate: float | None = None
    grade: str | None = None
    family: str | None = None
    ductile: bool | None = None
    fatigue_strength: float | None = None
    fatigue_life: float | None = None
    source: str | None = None


PIN_CONTACTS = ("cosine", "rigid")  # how a pin presses on its hole (see Pin)


@dataclass(frozen=True)
class Pin:
    """A rigid pin through hole `hole` (1-based) pressing on the half of the hole that faces `direction`.

    force: the pin's force on the part in N (> 0); direction: its direction in degrees, counter-clockwise
    from +x. contact "cosine" (default): the contact pressure is p(a) = p0 cos(a - direction) on that half
    (a = angle of the hole-edge point from the hole centre), p0 = 4 force / (pi d t), zero on the other
    half (common practice). contact "rigid": a rigid, frictionless pin of diameter d - clearance (mm,
    diametral, >= 0) that translates under the force, touching the hole first at the point facing
    `direction`; the contact arc and pressure come out of the solve (fem/contact.py).
    """

    hole: int
    force: float
    direction: float = 0.0
    contact: str = "cosine"
    clearance: float = 0.0

    @property
    def angle(self) -> float:
        """The direction in radians."""
        return math.radians(self.direction)


@dataclass(frozen=True)
class Remote:
    """A uniform stress state (MPa) applied as tractions on every outer edge: sx, sy normal, txy shear."""

    sx: float = 0.0
    sy: float = 0.0
    txy: float = 0.0

    @property
    def principal(self) -> tuple[float, float]:
        """(s1, s2) of the remote state, s1 >= s2 (MPa)."""
        centre, radius = 0.5 * (self.sx + self.sy), math.hypot(0.5 * (self.sx - self.sy), self.txy)
        return centre + radius, centre - radius


LOAD_KINDS = ("axial", "bending", "combined", "remote", "pin")


@dataclass(frozen=True)
class Load:
    """What loads the part (mm, N, MPa).

    End loads act on the loaded end (x = +length/2) and are reacted at the held end:
      axial: force in N along x, positive in tension (uniform traction).
      bending: in-plane moment in N mm, positive when it stretches the +y edge (traction M y / I).
      shear: transverse force in N along +y (parabolic traction, 3 V / (2 W t) (1 - 4 y^2 / W^2)); it also
             bends the part by V times the lever arm to the loaded end.
    remote: a uniform stress state on every outer edge instead (self-equilibrated: no held end).
    pin: a pin load through a hole instead, reacted at the held end.
    """

    axial: float = 0.0
    bending: float = 0.0
    shear: float = 0.0
    remote: Remote | None = None
    pin: Pin | None = None

    @property
    def has_end_loads(self) -> bool:
        return any(v != 0.0 for v in (self.axial, self.bending, self.shear))

    @property
    def kind(self) -> str:
        """"axial" (axial force only), "bending" (moment and/or shear, no axial force), "combined" (axial with
        moment or shear), "remote" or "pin"."""
        if self.remote is not None:
            return "remote"
        if self.pin is not None:
            return "pin"
        if self.bending == 0.0 and self.shear == 0.0:
            return "axial"
        return "bending" if self.axial == 0.0 else "combined"


HELD_MODES = ("x", "clamped")
SYMMETRY_PLANES = ("x", "y")


@dataclass(frozen=True)
class Support:
    """How the part is held.

    held: "x" (default: every node of the held end x = -length/2 held in x, free to contract; any
          transverse load is reacted there by the parabolic shear traction statics requires, and one
          node is held in y against rigid-body motion) or "clamped" (held end fixed in x and y).
    symmetry: mirror planes the model uses, "x" (the plane x = 0) and/or "y" (the plane y = 0): only the
          part on the positive side is meshed, with rollers on the plane, and every result is reported
          for the full part. Part, holes and loads must be symmetric about each plane.
    """

    held: str = "x"
    symmetry: tuple[str, ...] = ()


@dataclass(frozen=True)
class SectionSpec:
    """A straight cut through the whole part: a point on it and its unit normal (the positive side is
    the side the normal points to); label says how it was given (e.g. "x = 40")."""

    point: tuple[float, float]
    normal: tuple[float, float]
    label: str


@dataclass(frozen=True)
class MeshControls:
    """Convergence controls.

    tolerance: target relative error of the peak stress.
    max_levels: most mesh levels solved before giving up on convergence.
    max_elements: most triangles any level may have; refinement stops before exceeding it.
    order: 1 for linear (3-node) triangles, 2 for quadratic (6-node) triangles with curved edges.
    solver: "auto" (chosen by size), "direct" (sparse Cholesky or LU) or "iterative" (multigrid CG);
        see fem/solve.py.
    """

    tolerance: float = 0.01
    max_levels: int = 6
    max_elements: int = 2_000_000
    order: int = 1
    solver: str = "auto"


MESH_ORDERS = (1, 2)
MESH_SOLVERS = ("auto", "direct", "iterative")  # fem.solve.SOLVERS

DESIGN_BEHAVIOURS = ("ductile", "brittle")
Q_METHODS = ("peterson", "neuber")  # notch-sensitivity fits for steels (compare.fatigue)
NEUBER_STEEL_RANGE_MPA = (340.0, 1700.0)  # Su range of Neuber's steel fit (Shigley 9th ed. eq. 6-35, from memory)


@dataclass(frozen=True)
class DesignSpec:
    """What the static sign-off asks for (the part file's [design] table).

    yield_factor:     factor of safety on the yield strength (>= 1).
    ultimate_factor:  factor of safety on the ultimate strength (>= 1), or None to check yield only.
    behaviour:        "ductile" (the hand check governs, the peak by von Mises) or "brittle" (the peak
                      governs, by the maximum principal stress).
    behaviour_basis:  where the behaviour came from, in words (the material, or the part file).
    bearing_strength: a pin hole's bearing strength in MPa (the allowable bearing stress is it over
                      yield_factor), or None for the default, BEARING_FACTOR x yield (common practice).
    defaults:         the keys left at their defaults, for the report's statement of assumptions.
    """

    yield_factor: float = 1.5
    ultimate_factor: float | None = None
    behaviour: str = "ductile"
    behaviour_basis: str = "default"
    bearing_strength: float | None = None
    defaults: tuple[str, ...] = ()


# A pin's bearing strength on its projected area d t, as a multiple of the plate's yield strength, when the
# part file gives none (common practice; docs/references.md [Pin-bearing]).
BEARING_FACTOR = 1.5


@dataclass(frozen=True)
class FatigueSpec:
    """The constant-amplitude load cycle and screen settings (the part file's [fatigue] table).

    min_fraction, max_fraction: the cycle's extremes as multiples of the part's [load] (linear elasticity
                       scales every stress with the load); min < max.
    cycle_form:        how the file gave them: "fractions" of the [load], "forces"
                       (min_force/max_force) or "amplitude" (alternating_force/mean_force), the last two
                       divided by the [load]'s force.
    notch_sensitivity: "peterson" or "neuber" (the fits for steels); q: a given notch sensitivity
                       (0..1) used instead, or None.
    required_factor:   the modified Goodman factor of safety the screen must reach (>= 1).
    cyclic_strength, cyclic_exponent: K' (MPa) and n' of the cyclic Ramberg-Osgood curve for the local
                       strain at a yielding notch, or None; cyclic_source says where they came from.
    defaults:          the keys left at their defaults, for the report's statement of assumptions.
    """

    min_fraction: float
    max_fraction: float
    cycle_form: str = "fractions"
    notch_sensitivity: str = "peterson"
    q: float | None = None
    required_factor: float = 1.5
    cyclic_strength: float | None = None
    cyclic_exponent: float | None = None
    cyclic_source: str = ""
    defaults: tuple[str, ...] = ()


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
    design: DesignSpec | None = None  # the static sign-off, when the part file has a [design] table
    fatigue: FatigueSpec | None = None  # the fatigue screen, when the part file has a [fatigue] table
    support: Support = field(default_factory=Support)  # held end and symmetry planes
    sections: tuple[SectionSpec, ...] = ()  # cuts whose resultants the check reports (method of sections)
    ellipses: tuple[Ellipse, ...] = ()
    slots: tuple[Slot, ...] = ()
    notches: tuple[Notch, ...] = ()
    step: Step | None = None
    lug: Lug | None = None
