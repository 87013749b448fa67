"""The validated description of one part: plain frozen dataclasses in mm, N, MPa.

Coordinates: origin at the plate centre, x along the length (the load direction), y across the
width. The held end is x = -length/2, the loaded end is x = +length/2.

What each kind of raiser and outline is (its spec dataclass among them) lives in its own module under
geometry/kinds/, listed by geometry/registry.py.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from .kinds.hole import NAME as HOLE

if TYPE_CHECKING:
    from .units import Stated
    from .kinds.drawn import Drawing
    from .kinds.hole import Hole
    from .kinds.lug_end import Lug
    from .kinds.stepped import Step

STRESS_STATES = ("plane-stress", "plane-strain")


@dataclass(frozen=True)
class Plate:
    """The plate: thickness (mm) and stress state; for the bar outline (geometry/kinds/bar.py) its length
    along x and width along y (mm)."""

    length: float
    width: float
    thickness: float
    condition: str = "plane-stress"


@dataclass(frozen=True)
class Material:
    """Linear-elastic isotropic material: E in MPa, Poisson's ratio nu, strengths in MPa.

    grade:            key of the built-in table row the values start from, or None.
    family:           "steel", "stainless", "aluminium" or "titanium" (geometry.materials.FAMILIES), or None.
    ductile:          True if local yielding can relieve a peak under static load; None if not known.
    fatigue_strength: fully reversed fatigue strength in MPa, or None.
    fatigue_life:     the life in cycles that fatigue strength applies to; None for an endurance limit.
    source:           where the values come from (the table row's source, and which keys the file set).
    stated:           the values taken from the table row as its source states them ([material] key, Stated:
                      number and unit, e.g. ("yield", 35 ksi)); the floats above are their conversions to MPa.
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
    stated: tuple[tuple[str, Stated], ...] = ()


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


LOAD_KINDS = ("axial", "bending", "combined", "remote", "pin", "boundary", "fasteners")
STIFFNESS_KINDS = ("rigid", "given", "huth")  # how a fastener group's stiffness is given (FastenerSpec)


@dataclass(frozen=True)
class HuthInputs:
    """What Huth's fastener flexibility needs beyond the plate and the fastener ([fasteners.huth]): the other
    member's thickness (mm) and modulus (MPa), the fastener's modulus (MPa) and the joint kind
    (fem.fastener_stiffness.HUTH_JOINTS)."""

    other_thickness: float
    other_modulus: float
    fastener_modulus: float
    joint: str = "bolted metallic"


@dataclass(frozen=True)
class FastenerSpec:
    """A fastener group of the part file ([[fasteners]]): bolts or pins in the holes `holes` (numbers,
    1-based), joined by a rigid connecting member (fem/fastener_groups.py).

    name: its name (load cases name it); diameter: the fastener's shank diameter d (mm); clearance: the
    diametral clearance (mm, >= 0): each hole's diameter is d + clearance; shear_planes: 1 or 2;
    stiffness: "rigid", "given" (`stiffness_value` N/mm) or "huth" (from `huth` and the plate);
    holds: True when the group holds the part (its member fixed), else the load cases load it."""

    name: str
    holes: tuple[int, ...]
    diameter: float
    clearance: float = 0.0
    shear_planes: int = 1
    stiffness: str = "rigid"
    stiffness_value: float | None = None
    huth: HuthInputs | None = None
    holds: bool = False
    key: str = "fasteners 1"  # the part-file key, for messages


@dataclass(frozen=True)
class GroupLoad:
    """A load carried into the plate through a fastener group's member ([[load.fasteners]]): a force (N,
    >= 0) in the direction `direction` (degrees from +x) and a moment (N mm, counter-clockwise), about the
    point `about` (mm; None for the centroid of the group's hole centres)."""

    group: str
    force: float = 0.0
    direction: float = 0.0
    moment: float = 0.0
    about: tuple[float, float] | None = None
    key: str = "load.fasteners 1"

    @property
    def components(self) -> tuple[float, float, float]:
        """(Fx N, Fy N, Mz N mm)."""
        a = math.radians(self.direction)
        return self.force * math.cos(a), self.force * math.sin(a), self.moment


@dataclass(frozen=True)
class BoundaryPick:
    """A stretch of the part's own boundary as the part file picks it (mm): `at`, a point on one piece
    (the whole line or arc of the outline or of a cut-out nearest it), or `start` and `end`, the boundary
    from the one to the other walking with the material on the left (counter-clockwise round the outline,
    clockwise round a hole). `key` is the part-file key that gave it ("hold 2", "load.edge 1"), for
    messages; geometry.boundary.stretch turns a pick into exact lines and arcs."""

    key: str
    at: tuple[float, float] | None = None
    start: tuple[float, float] | None = None
    end: tuple[float, float] | None = None


@dataclass(frozen=True)
class EdgeLoad:
    """A load on a stretch of the boundary: a total force (N) in the direction `direction` (degrees,
    counter-clockwise from +x) spread uniformly over the stretch's length, or a normal pressure (MPa,
    positive pressing into the material). Exactly one of force and pressure is non-zero."""

    where: BoundaryPick
    force: float = 0.0
    direction: float = 0.0
    pressure: float = 0.0


@dataclass(frozen=True)
class Load:
    """What loads the part (mm, N, MPa).

    End loads act on the loaded end (x = +length/2) and are reacted at the held end:
      axial: force in N along x, positive in tension (uniform traction).
      bending: in-plane moment in N mm, positive when it stretches the +y edge (traction M y / I).
      shear: transverse force in N along +y (parabolic traction, 3 V / (2 W t) (1 - 4 y^2 / W^2)); it also
             bends the part by V times the lever arm to the loaded end.
    remote: a uniform stress state on every outer edge instead (self-equilibrated: no held end).
    pin: a pin load through a hole instead, reacted at the held end (or the part's [[hold]] supports).
    edges: loads on stretches of the part's own boundary ([[load.edge]]), alone or with a pin.
    fasteners: loads through the part's fastener groups ([[load.fasteners]]).
    """

    axial: float = 0.0
    bending: float = 0.0
    shear: float = 0.0
    remote: Remote | None = None
    pin: Pin | None = None
    edges: tuple[EdgeLoad, ...] = ()
    fasteners: tuple[GroupLoad, ...] = ()  # loads through fastener groups ([[load.fasteners]])

    @property
    def has_end_loads(self) -> bool:
        return any(v != 0.0 for v in (self.axial, self.bending, self.shear))

    @property
    def kind(self) -> str:
        """"axial" (axial force only), "bending" (moment and/or shear, no axial force), "combined" (axial with
        moment or shear), "remote", "pin", "boundary" (loads on stretches of the boundary, with or
        without a pin), or "fasteners" (loads through fastener groups, with or without others)."""
        if self.fasteners:
            return "fasteners"
        if self.edges:
            return "boundary"
        if self.remote is not None:
            return "remote"
        if self.pin is not None:
            return "pin"
        if self.bending == 0.0 and self.shear == 0.0:
            return "axial"
        return "bending" if self.axial == 0.0 else "combined"


SINGLE_CASE = "load"  # the name of the one case of a part file with a single [load] table


@dataclass(frozen=True)
class LoadCase:
    """One named load case: a Load on the part's one stiffness (the supports are shared by every case)."""

    name: str
    load: Load


HELD_MODES = ("x", "clamped")  # the default held end, as a part file gives it
NO_HELD_END = "none"  # Support.held when the part is held by [[hold]] supports instead
HOLD_MODES = ("fixed", "roller")
SYMMETRY_PLANES = ("x", "y")


@dataclass(frozen=True)
class Hold:
    """A support on the part's own boundary ([[hold]]): the stretch `where` held "fixed" (both
    displacements zero) or "roller" (the displacement normal to the edge zero, free along it); or, with
    `pin`, the hole of that number (1-based) held by a rigid, frictionless, neat-fit pin fixed in space
    (fem/contact.py: the contact arc comes out of the solve). `key` names it in messages ("hold 2")."""

    key: str
    where: BoundaryPick | None = None
    mode: str = "fixed"
    pin: int | None = None


@dataclass(frozen=True)
class Support:
    """How the part is held.

    held: "x" (default: every node of the held end x = -length/2 held in x, free to contract; any
          transverse load is reacted there by the parabolic shear traction statics requires, and one
          node is held in y against rigid-body motion) or "clamped" (held end fixed in x and y); "none"
          (NO_HELD_END) when the part file gives [[hold]] supports instead.
    symmetry: mirror planes the model uses, "x" (the plane x = 0) and/or "y" (the plane y = 0): only the
          part on the positive side is meshed, with rollers on the plane, and every result is reported
          for the full part. Part, holes and loads must be symmetric about each plane.
    """

    held: str = "x"
    symmetry: tuple[str, ...] = ()
    holds: tuple[Hold, ...] = ()


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
    settled: raisers the study no longer refines, each with the scale its grading keeps (set by
        fem.convergence for the next level's mesh, never by the part file).
    """

    tolerance: float = 0.01
    max_levels: int = 6
    max_elements: int = 2_000_000
    order: int = 1
    solver: str = "auto"
    settled: tuple[tuple[Any, float], ...] = ()


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
    bearing_strength: a pin hole's (or a fastener hole's) bearing strength in MPa (the allowable bearing
                      stress is it over yield_factor), or None for the default, BEARING_FACTOR x yield (common
                      practice).
    fastener_shear_strength: the fasteners' shear strength in MPa (their average shear F / (n pi d^2/4) is
                      checked against it over yield_factor), or None: fastener shear is not checked.
    defaults:         the keys left at their defaults, for the report's statement of assumptions.
    """

    yield_factor: float = 1.5
    ultimate_factor: float | None = None
    behaviour: str = "ductile"
    behaviour_basis: str = "default"
    bearing_strength: float | None = None
    defaults: tuple[str, ...] = ()
    fastener_shear_strength: float | None = None  # MPa: the fasteners' shear strength, for their average shear


# A pin's bearing strength on its projected area d t, as a multiple of the plate's yield strength, when the
# part file gives none (common practice; docs/references.md [Pin-bearing]).
BEARING_FACTOR = 1.5


@dataclass(frozen=True)
class FatigueSpec:
    """The constant-amplitude load cycle and screen settings (the part file's [fatigue] table).

    min_fraction, max_fraction: the cycle's extremes as multiples of the load case `case` (linear elasticity
                       scales every stress with the load); min < max. None for a cycle between two cases.
    cycle_form:        how the file gave them: "fractions" of the load, "forces" (min_force/max_force) or
                       "amplitude" (alternating_force/mean_force), the last two divided by the load's force;
                       or "cases": the cycle runs between two of the part's load cases (min_case, max_case).
    case:              the load case the fractions scale (its name; "load" for a single [load] table).
    min_case, max_case: the two load cases of a "cases" cycle (names), else None.
    notch_sensitivity: "peterson" or "neuber" (the fits for steels); q: a given notch sensitivity
                       (0..1) used instead, or None.
    required_factor:   the modified Goodman factor of safety the screen must reach (>= 1).
    cyclic_strength, cyclic_exponent: K' (MPa) and n' of the cyclic Ramberg-Osgood curve for the local
                       strain at a yielding notch, or None; cyclic_source says where they came from.
    defaults:          the keys left at their defaults, for the report's statement of assumptions.
    """

    min_fraction: float | None
    max_fraction: float | None
    cycle_form: str = "fractions"
    case: str = SINGLE_CASE
    min_case: str | None = None
    max_case: str | None = None
    notch_sensitivity: str = "peterson"
    q: float | None = None
    required_factor: float = 1.5
    cyclic_strength: float | None = None
    cyclic_exponent: float | None = None
    cyclic_source: str = ""
    defaults: tuple[str, ...] = ()


@dataclass(frozen=True)
class PartSpec:
    """One plate, its raisers, material, load and mesh controls, validated, in mm, N, MPa.

    raisers: every raiser of the part file, each the spec dataclass of its kind (its KIND names it); kinds
        in the order of geometry.registry.RAISER_KINDS, entries of one kind in part-file order (the nth
        entry of a kind is that kind's raiser n; geometry.registry.named pairs them with their names).
    outline: the outline kind (geometry.registry.OUTLINE_KINDS); "bar": plate.length x plate.width with an
        optional shoulder `step` and `lug` end; "drawn": `drawing`, by points or from a cut file (plate.length
        and plate.width are then its extents along x and y).
    """

    title: str
    plate: Plate
    material: Material
    load: Load
    raisers: tuple[Any, ...] = ()
    mesh: MeshControls = field(default_factory=MeshControls)
    units: str = "mm-N-MPa"  # the unit system the part file was written in (for reporting only)
    design: DesignSpec | None = None  # the static sign-off, when the part file has a [design] table
    fatigue: FatigueSpec | None = None  # the fatigue screen, when the part file has a [fatigue] table
    support: Support = field(default_factory=Support)  # held end and symmetry planes
    sections: tuple[SectionSpec, ...] = ()  # cuts whose resultants the check reports (method of sections)
    outline: str = "bar"
    step: Step | None = None
    lug: Lug | None = None
    cases: tuple[LoadCase, ...] = ()  # every load case when the part file gives [[load]] entries; `load` is the first
    fasteners: tuple[FastenerSpec, ...] = ()  # fastener groups ([[fasteners]])
    drawing: Drawing | None = None  # the drawn outline ("drawn": geometry/kinds/drawn.py)

    @property
    def holes(self) -> tuple[Hole, ...]:
        """The circular holes in part-file order (pins and lugs refer to them by number)."""
        return tuple(r for r in self.raisers if r.KIND == HOLE)

    @property
    def load_cases(self) -> tuple[LoadCase, ...]:
        """Every load case of the part: `cases`, or the one `load` (named "load")."""
        return self.cases or (LoadCase(SINGLE_CASE, self.load),)

    def for_case(self, case: LoadCase) -> PartSpec:
        """The part under one load case alone (its `load`; `cases` the one case when the part has several)."""
        from dataclasses import replace

        return replace(self, load=case.load, cases=(case,) if self.cases else ())



def hole_count_words(spec: PartSpec) -> str:
    """How many holes `spec` has and where they come from, for a message that names a hole it lacks: a
    cut file's circles are holes too (numbered first), so "[[hole]] entries" alone would miscount them."""
    total = len(spec.holes)
    drawn = spec.drawing.holes if spec.drawing is not None else 0
    if drawn == 0:
        return f"the part has {total} [[hole]] entries"
    return (f"the part has {total} holes: {drawn} from the cut file's circles (numbered left to right, then "
            f"bottom to top) and {total - drawn} [[hole]] {'entry' if total - drawn == 1 else 'entries'}")
