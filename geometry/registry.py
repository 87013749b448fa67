"""The kinds of raiser and of outline, and the name of a raiser.

A raiser kind is one module under geometry/kinds/ (what it provides: geometry/kinds/base.py `RaiserKind`);
RAISER_KINDS lists them in a fixed order, the order of PartSpec.raisers and of every listing. An outline
kind likewise (`OutlineKind`), listed in OUTLINE_KINDS. A raiser is named by a RaiserId (kind, number):
the nth [[hole]] of the part file is RaiserId("hole", n), printed "hole n"; an outline names its own
raisers (a stepped bar's fillets are "fillet 1" and "fillet 2"). Everything that deals with every kind
iterates these lists; adding a kind is its module plus one entry here.
"""

from __future__ import annotations

from typing import Any

from .kinds import bar, cutout, drawn, ellipse, hole, notch, slot, window
from .kinds.base import NetCut, OutlineKind, OutlineRaiser, RaiserId, RaiserKind, raiser_label
from .readers import array_of_tables
from .spec import PartSpec

RAISER_KINDS: tuple[RaiserKind, ...] = (hole, ellipse, slot, notch, window, cutout)
OUTLINE_KINDS: tuple[OutlineKind, ...] = (bar, drawn)

__all__ = ["RAISER_KINDS", "OUTLINE_KINDS", "RaiserId", "raiser_label", "raiser_kind", "kind_of", "outline_of",
           "outline_size", "outline_bounds", "outline_named", "read_raisers", "named", "outline_raisers", "raiser_ids", "kind_counts", "part_features",
           "of_kind", "cuts",
           "TABLES"]

TABLES = frozenset([k.NAME for k in RAISER_KINDS] + [t for o in OUTLINE_KINDS for t in o.TABLES])  # part-file tables


def raiser_kind(name: str) -> RaiserKind:
    """The raiser kind module called `name`."""
    return next(k for k in RAISER_KINDS if k.NAME == name)


def kind_of(item: Any) -> RaiserKind:
    """The kind module of a raiser's spec dataclass."""
    return raiser_kind(item.KIND)


def outline_of(spec: PartSpec) -> OutlineKind:
    """The outline kind module of a part."""
    return next(k for k in OUTLINE_KINDS if k.NAME == spec.outline)


def outline_size(spec: PartSpec) -> tuple[float, float]:
    """(length, width): the outline's extents along x and y (mm); every scale decision (mesh fractions,
    tolerances, element budget) takes its sizes from here."""
    return outline_of(spec).size(spec)


def outline_bounds(spec: PartSpec) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax): where the outline lies (mm)."""
    return outline_of(spec).bounds(spec)


def outline_named(data: dict[str, Any]) -> str:
    """The outline kind a part-file dictionary asks for: "drawn" with an [outline] table, else the bar."""
    return drawn.NAME if drawn.TABLE in data else bar.NAME


def read_raisers(data: dict[str, Any], units: str) -> tuple[Any, ...]:
    """Every raiser table of a part-file dictionary, read by its kind: kinds in RAISER_KINDS order, entries
    in file order. Each is named in messages as it will be in the results ("hole 2")."""
    return tuple(kind.read(t, str(RaiserId(kind.NAME, n)), units)
                 for kind in RAISER_KINDS for n, t in array_of_tables(data, kind.NAME))


def named(spec: PartSpec) -> tuple[tuple[RaiserId, Any], ...]:
    """Every raiser of spec.raisers with its name, in the same order."""
    counts: dict[str, int] = {}
    out = []
    for item in spec.raisers:
        counts[item.KIND] = counts.get(item.KIND, 0) + 1
        out.append((RaiserId(item.KIND, counts[item.KIND]), item))
    return tuple(out)


def outline_raisers(spec: PartSpec) -> tuple[OutlineRaiser, ...]:
    """The raisers of the outline itself (a stepped bar's fillets)."""
    return outline_of(spec).raisers(spec)


def raiser_ids(spec: PartSpec) -> tuple[RaiserId, ...]:
    """The names of every raiser: spec.raisers in order, then the outline's."""
    return tuple(rid for rid, _ in named(spec)) + tuple(r.id for r in outline_raisers(spec))


def kind_counts(spec: PartSpec) -> dict[str, int]:
    """How many raisers of each kind the part has (outline raisers included), only kinds it has."""
    counts: dict[str, int] = {}
    for rid in raiser_ids(spec):
        counts[rid.kind] = counts.get(rid.kind, 0) + 1
    return counts


def part_features(spec: PartSpec) -> dict[str, int]:
    """How many of each kind of raiser the part has, and its outline's optional features (a bar's "step",
    "lug": 1 each): what a handbook case must describe whole before it may match the part."""
    return {**kind_counts(spec), **{name: 1 for name in outline_of(spec).features(spec)}}


def of_kind(spec: PartSpec, name: str) -> tuple[Any, ...]:
    """The part's raisers of the kind `name`, in part-file order."""
    return tuple(item for item in spec.raisers if item.KIND == name)


def cuts(spec: PartSpec) -> dict[RaiserId, NetCut]:
    """Every raiser's net-section cut."""
    out = {rid: kind_of(item).cut(spec, item) for rid, item in named(spec)}
    out.update({r.id: r.cut for r in outline_raisers(spec)})
    return out
