"""What every kind shares: the name of a raiser, its curved edges, its net-section cut, and what a raiser
kind module and an outline kind module provide.

A raiser kind is one module (geometry/kinds/hole.py, ...) with the members of `RaiserKind`; an outline
kind likewise with those of `OutlineKind`. geometry/registry.py lists them; everything else asks the
registry. Lengths in mm, angles of arcs in radians counter-clockwise from +x, angles in part files in
degrees.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any, Protocol, TypeVar

from ..readers import angle, known, point, positive
from ..shapes import Arc, EllipseShape, Line, Loop, Point
from ..units import format_point, format_quantity

if TYPE_CHECKING:
    from ..shapes import Edge
    from ..spec import PartSpec


@dataclass(frozen=True, order=True)
class RaiserId:
    """The name of one raiser: its kind ("hole", "fillet", ...) and its number within that kind (1-based,
    in part-file order; an outline numbers its own). Printed "hole 2". Ordered by kind, then number."""

    kind: str
    number: int

    def __str__(self) -> str:
        return f"{self.kind} {self.number}"


def mirror_point(point: Point, plane: str) -> Point:
    """The mirror image of a point (mm) in the plane "x" (x -> -x) or "y" (y -> -y)."""
    x, y = point
    return (-x, y) if plane == "x" else (x, -y)


def mirror_angle(angle: float, plane: str) -> float:
    """The mirror image of a direction (degrees from +x) in the plane "x" or "y"."""
    return 180.0 - angle if plane == "x" else -angle


@dataclass(frozen=True)
class Oriented:
    """A cut-out laid along its own axis: centre (x, y) in mm, its length along that axis and its width
    across it (mm), and the angle in degrees, counter-clockwise from +x to the length axis."""

    center: tuple[float, float]
    length: float
    width: float
    angle: float


OrientedT = TypeVar("OrientedT", bound=Oriented)


def read_oriented(t: dict[str, Any], where: str, units: str, more: tuple[str, ...] = ()) -> dict[str, Any]:
    """center, length, width and angle (default 0) of an oriented cut-out's table, which may also have the
    keys `more` (read by the kind itself)."""
    known(t, {"center", "length", "width", "angle", *more}, where)
    return {"center": point(t, "center", where, units), "length": positive(t, "length", where, "length", units),
            "width": positive(t, "width", where, "length", units), "angle": angle(t, "angle", where)}


def mirror_oriented(item: OrientedT, plane: str) -> OrientedT:
    """An oriented cut-out's mirror image: its centre mirrored, its axis turned to the mirrored direction."""
    return replace(item, center=mirror_point(item.center, plane), angle=mirror_angle(item.angle, plane))


def describe_oriented(item: Oriented, units: str) -> str:
    """"24 mm × 10 mm at 60°, centre (0, 0) mm"."""
    return (f"{format_quantity(item.length, 'length', units)} × {format_quantity(item.width, 'length', units)} "
            f"at {item.angle:g}°, centre {format_point(item.center, units)}")


def opens_onto_no_edge(spec: PartSpec, item: Any) -> tuple[Point, ...]:
    """`mouths` of a cut-out inside the outline: it opens onto no edge."""
    return ()


def raiser_label(raiser: RaiserId | None) -> str:
    """A raiser's name in words, or "plate" for a peak at no raiser."""
    return "plate" if raiser is None else str(raiser)


@dataclass(frozen=True)
class CurvedEdges:
    """The curved edges of one raiser, where the mesh is graded and banded.

    arcs: circular arcs with counter-clockwise angles (start < end); the material lies outside each circle.
    strips: straight edges bordered by structured layers, each with its unit normal into the material.
    ellipse: an elliptical edge, or None.
    curvature: the smallest radius of curvature along these edges (mm).
    lines: straight edges the mesh is graded at like the arcs, without layers (a drawn cut-out's sides,
        which may meet at sharp corners where layers would overlap).
    """

    arcs: tuple[Arc, ...] = ()
    strips: tuple[tuple[Line, Point], ...] = ()
    ellipse: EllipseShape | None = None
    curvature: float = 0.0
    lines: tuple[Line, ...] = ()


@dataclass(frozen=True)
class NetCut:
    """A raiser's net-section cut: a straight line through `point` with unit `normal` (positions along the
    cut are measured from `point`), and `reach` (mm): a peak within that distance of the cut, along the
    normal, belongs to this raiser's section."""

    point: Point
    normal: Point
    reach: float


def across(x: float, reach: float) -> NetCut:
    """The cut across the load (normal +x) at x, measured from the centre line y = 0."""
    return NetCut((x, 0.0), (1.0, 0.0), reach)


@dataclass(frozen=True)
class OutlineRaiser:
    """A concave curved edge of the outline that concentrates stress (a shoulder fillet): its name, curved
    edge, net-section cut, and the outline edges (by name) it must keep a ligament to."""

    id: RaiserId
    curved: CurvedEdges
    cut: NetCut
    clear_of: tuple[str, ...]


class RaiserKind(Protocol):
    """The members of a raiser kind module.

    NAME:      the kind ("hole"): its part-file table [[NAME]] and the kind of its RaiserIds.
    read:      the part-file table of one entry -> its frozen spec dataclass (whose KIND is NAME).
    loops:     the cut-out's exact closed boundaries (one region each; an edge raiser's reach beyond the edge).
    mouths:    where it opens onto the outline's edges (a notch's mouth); () for a cut-out inside the outline.
    curved:    its curved edges with their smallest radius of curvature (grading, bands, distances).
    cut:       its net-section cut.
    mirrored:  its mirror image in the plane "x" (x = 0) or "y" (y = 0).
    check:     placement and shape checks of this kind (PartError naming `where`, e.g. "notch 1").
    record:    its fields as given (mm, degrees), for the JSON record.
    describe:  its dimensions in words in the unit system `units`, for drawings and reports.
    """

    NAME: str

    def read(self, t: dict[str, Any], where: str, units: str) -> Any: ...

    def loops(self, spec: PartSpec, item: Any) -> tuple[Loop, ...]: ...

    def mouths(self, spec: PartSpec, item: Any) -> tuple[Point, ...]: ...

    def curved(self, spec: PartSpec, item: Any) -> CurvedEdges: ...

    def cut(self, spec: PartSpec, item: Any) -> NetCut: ...

    def mirrored(self, item: Any, plane: str) -> Any: ...

    def check(self, spec: PartSpec, item: Any, where: str) -> None: ...

    def record(self, item: Any) -> dict[str, Any]: ...

    def describe(self, item: Any, units: str) -> str: ...


class OutlineKind(Protocol):
    """The members of an outline kind module.

    NAME:      the kind, as PartSpec.outline names it.
    TABLES:    the part-file tables it reads besides [plate].
    read:      those tables -> PartSpec fields (given the spec read so far: its raisers are known; `base`:
               the part file's folder, for a file the tables name).
    path:      the closed counter-clockwise chain of named edges (material on the left).
    raisers:   its concave curved edges that concentrate stress, each a raiser of its own.
    mirrored:  the mirror image of one of those raisers in a plane, or None.
    features:  its optional features the part has (a bar's "step", "lug"), for handbook matching.
    size:      (length, width): the outline's extents along x and y (mm), for every scale decision.
    bounds:    (xmin, ymin, xmax, ymax): where the outline lies (mm).
    check:     the outline's own checks, with `limit` the thinnest ligament allowed (mm).
    record:    its tables as given, for the JSON record.
    """

    NAME: str
    TABLES: tuple[str, ...]

    def read(self, data: dict[str, Any], spec: PartSpec, base: Any = None) -> dict[str, Any]: ...

    def path(self, spec: PartSpec) -> tuple[Edge, ...]: ...

    def raisers(self, spec: PartSpec) -> tuple[OutlineRaiser, ...]: ...

    def mirrored(self, spec: PartSpec, raiser: RaiserId, plane: str) -> RaiserId | None: ...

    def features(self, spec: PartSpec) -> tuple[str, ...]: ...

    def size(self, spec: PartSpec) -> tuple[float, float]: ...

    def bounds(self, spec: PartSpec) -> tuple[float, float, float, float]: ...

    def check(self, spec: PartSpec, limit: float) -> None: ...

    def record(self, spec: PartSpec) -> dict[str, Any]: ...
