"""The data of the handbook library: a published case, the rule that recognises a part as a case's
family, a part so recognised, and a case applied to a part. Kept apart from compare/handbook.py so that
the modules holding the cases of each family (raiser_cases.py, bending_cases.py) can import them in any
order."""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from ..geometry.kinds.base import RaiserId
from ..geometry.registry import part_features
from ..geometry.spec import PartSpec


@dataclass(frozen=True)
class Case:
    """One published Kt formula or table.

    nominal: "net" or "gross", the nominal stress the formula's Kt is referred to, described by
    nominal_text. ranges: validity interval of each parameter.
    """

    key: str
    family: str
    title: str
    source: str
    formula: str
    nominal: str
    nominal_text: str
    ranges: dict[str, tuple[float, float]]
    kt: Callable[[dict[str, float]], float]
    # where this project's FE was measured to agree with the formula (tests name the figures); the built-in
    # regression suite samples this sub-range when it is given, the full range otherwise
    checked: dict[str, tuple[float, float]] | None = None

    def in_range(self, params: dict[str, float]) -> bool:
        return _inside(self.ranges, params)

    def in_checked(self, params: dict[str, float]) -> bool | None:
        """Whether `params` lie in the FE-checked sub-range; None when the case gives none."""
        return None if self.checked is None else _inside(self.checked, params)


def _inside(ranges: dict[str, tuple[float, float]], params: dict[str, float]) -> bool:
    return all(lo - 1e-12 <= params[k] <= hi + 1e-12 for k, (lo, hi) in ranges.items())


@dataclass(frozen=True)
class Recognised:
    """A part recognised as a handbook family: its parameters and gross/net area ratio (>= 1)."""

    family: str
    description: str
    params: dict[str, float]
    gross_over_net: float
    raiser: RaiserId | None = None  # the raiser whose own peak the case describes (None: the part's peak)


@dataclass(frozen=True)
class Recogniser:
    """The rule that recognises a part as one handbook family.

    describes: every kind of raiser and outline feature the family's parts have (geometry.registry
        part_features: "hole", "notch", "fillet", "step", "lug", ...) with the count allowed, (low, high).
    rule: decides the rest (positions, proportions, the load) for a part that has exactly those kinds.
    A part with any raiser or outline feature the family does not describe, or another count, is never
    that family: the rule is not asked.
    """

    describes: dict[str, tuple[int, int]]
    rule: Callable[[PartSpec], Recognised | None]

    def __call__(self, spec: PartSpec) -> Recognised | None:
        counts = part_features(spec)
        if set(counts) != set(self.describes):
            return None
        if any(not low <= counts[kind] <= high for kind, (low, high) in self.describes.items()):
            return None
        return self.rule(spec)


def recogniser(**describes: int | tuple[int, int]) -> Callable[[Callable[[PartSpec], Recognised | None]], Recogniser]:
    """Make a rule a Recogniser of parts with exactly these kinds: `hole=1` (one hole), `notch=(1, 2)` (one
    or two notches), nothing else."""
    ranges = {kind: count if isinstance(count, tuple) else (count, count) for kind, count in describes.items()}
    return lambda rule: Recogniser(ranges, rule)


@dataclass(frozen=True)
class Match:
    """A case applied to a recognised part: Kt on both nominal definitions."""

    case: Case
    recognised: Recognised
    kt_net: float
    kt_gross: float
    in_range: bool

    @property
    def in_checked(self) -> bool | None:
        """Whether the part lies in the sub-range where this project measured the FE against the case
        (`Case.checked`); None when the case gives no such sub-range."""
        return self.case.in_checked(self.recognised.params)


Coefficients = tuple[tuple[float, float, float], ...]  # four rows (a, b, c): C_i = a + b sqrt(h/r) + c h/r


def two_range_cubic(p: dict[str, float], low: Coefficients, high: Coefficients) -> float:
    """The handbook curve-fit form Kt = C1 + C2 x + C3 x^2 + C4 x^3 with x = p["2h/D"], whose coefficients
    C_i = a + b sqrt(h/r) + c h/r come from `low` for h/r <= 2 and from `high` above (Young & Budynas,
    Roark's Formulas for Stress and Strain, 7th ed., table 17.1 form)."""
    hr, x = p["h/r"], p["2h/D"]
    s = math.sqrt(hr)
    c = [a + b * s + k * hr for a, b, k in (low if hr <= 2.0 else high)]
    return c[0] + c[1] * x + c[2] * x * x + c[3] * x ** 3
