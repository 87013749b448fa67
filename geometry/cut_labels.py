"""The label of an unnamed section cut in any unit system.

The part reader labels a cut the part file does not name by how it was given, in mm (geometry/partfile.py:
"x = 38.1", "y = -5", "through (0, -5) and (0, 5)"); the JSON record keeps that label. Wherever a cut is
named to a reader (an error message, a warning, the summary, the report, a figure), `cut_label` restates it
in the part file's unit system with the length label ("x = 1.5 in"). A name the user gave is never changed.
"""

from __future__ import annotations

import re

from .units import DEFAULT_SYSTEM, from_internal, unit_label

_THROUGH = re.compile(r"^through \((?P<x1>[^,()]+), (?P<y1>[^,()]+)\) and \((?P<x2>[^,()]+), (?P<y2>[^,()]+)\)$")


def _length(value: float, units: str) -> str:
    """A length in mm as a number of `units`' length unit, "g" format, a zero without its sign."""
    text = format(float(from_internal(value, "length", units)), "g")
    return text[1:] if text.startswith("-") and float(text) == 0.0 else text


def cut_label(text: str, point: tuple[float, float], units: str) -> str:
    """The label of a section cut in `units`. Unnamed cuts are labelled in mm by the part reader ("x = 38.1",
    "through (0, -5) and (0, 5)", from `point`, the cut's first point in mm); those are re-stated in `units`
    with the length label. Names the user gave, and every label in mm-N-MPa, are returned as they are."""
    if units == DEFAULT_SYSTEM:
        return text
    length = unit_label("length", units)
    for axis, coordinate in (("x", point[0]), ("y", point[1])):
        if text == f"{axis} = {coordinate:g}":
            return f"{axis} = {_length(coordinate, units)} {length}"
    through = _THROUGH.match(text)
    if through is not None and (through["x1"], through["y1"]) == (f"{point[0]:g}", f"{point[1]:g}"):
        try:
            x1, y1, x2, y2 = (float(through[k]) for k in ("x1", "y1", "x2", "y2"))
        except ValueError:
            return text
        a = f"({_length(x1, units)}, {_length(y1, units)})"
        b = f"({_length(x2, units)}, {_length(y2, units)})"
        return f"through {a} and {b} {length}"
    return text
