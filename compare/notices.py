"""Warnings of a check that carry their numbers with the kind of each, so the words can be shown in any
unit system.

A warning is a `Notice`: a sequence of plain text and `Amount`s. An amount holds a number in the internal
units (mm, N, MPa, mm², N·mm) and says what it is: a quantity of geometry.units.QUANTITIES, a point (x, y)
in mm, or a section cut (its label, made in mm by the part reader, and its first point). `text(units)`
writes the words in a unit system with geometry.units' formatters (significant figures, labels after the
numbers); `str(notice)` is the text in mm-N-MPa, which is what the JSON record keeps. The terminal summary
and the report show `text(spec.units)` (cli/display_units.warning_text), restating unnamed cuts there.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from ..geometry.units import DEFAULT_SYSTEM, QUANTITIES, format_point, format_quantity

CutLabel = Callable[[str, tuple[float, float], str], str]  # (label, point in mm, units) -> label in units


@dataclass(frozen=True)
class Amount:
    """A number in a warning, in internal units.

    quantity: one of geometry.units.QUANTITIES (value a float), "point" (value (x, y) in mm) or "cut"
              (value the cut's first point in mm, `label` its label).
    digits:   significant figures shown.
    """

    value: float | tuple[float, float]
    quantity: str
    digits: int = 4
    label: str = ""

    def text(self, units: str = DEFAULT_SYSTEM, cut_label: CutLabel | None = None) -> str:
        """The amount in `units` with its unit label; a cut's label, restated by `cut_label` when given."""
        if self.quantity == "point":
            return format_point(self.value, units, self.digits)  # type: ignore[arg-type]
        if self.quantity == "cut":
            point: tuple[float, float] = self.value  # type: ignore[assignment]
            return self.label if cut_label is None else cut_label(self.label, point, units)
        if self.quantity not in QUANTITIES:
            raise ValueError(f"amount of unknown kind {self.quantity!r}")
        return format_quantity(float(self.value), self.quantity, units, self.digits)  # type: ignore[arg-type]


@dataclass(frozen=True)
class Notice:
    """A warning in words: plain text and amounts, in reading order."""

    parts: tuple[str | Amount, ...]

    def text(self, units: str = DEFAULT_SYSTEM, cut_label: CutLabel | None = None) -> str:
        """The words with every amount written in the unit system `units`."""
        return "".join(p if isinstance(p, str) else p.text(units, cut_label) for p in self.parts)

    def __str__(self) -> str:
        return self.text()


def notice(*parts: str | Amount) -> Notice:
    """A Notice of the given text and amounts, e.g. notice("the peak is ", Amount(-12.5, "stress"), ".")."""
    return Notice(tuple(parts))
