"""Dotted keys that address one value of a part-file dictionary (as read from TOML), for sweeps and suites.

Syntax: the names of the tables and keys joined by dots, with a 1-based index for an entry of an array of
tables and `x` or `y` for a component of a point:

    plate.width            the [plate] table's width
    hole.2.diameter        the diameter of the second [[hole]] entry
    hole.1.center.y        the y coordinate of the first hole's centre
    mesh.tolerance         created when the part file has no [mesh] table or no tolerance in it
    hole.*.diameter        every [[hole]] entry's diameter, set together (`expand_key`)

A key must end at a single number (or a quantity string such as "22 mm"). A key that names a value the part
file does not have is accepted only where a table can hold it (the table is created if missing); whether the
part-file reader knows that key is decided by the reader itself (see `check_key_known`). Every mistake
raises PartError with one line that names the key and what is there instead.
"""

from __future__ import annotations

import copy
import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any

from .errors import PartError

POINT_AXES = ("x", "y")
EVERY_ENTRY = "*"  # in place of an entry number: every entry of an array of tables, set together
_QUANTITY = re.compile(r"^\s*[-+]?(\d|\.\d)")


@dataclass(frozen=True)
class KeyPath:
    """A validated key: its text and the concrete steps (table keys and 0-based list positions)."""

    text: str
    steps: tuple[str | int, ...]
    present: bool  # whether the part file already holds this value


def resolve_key(part: Mapping[str, Any], text: str) -> KeyPath:
    """Check `text` against the part-file dictionary `part` and return its steps; raise PartError if the
    key does not address a single number that the part file has or that a table of it could hold."""
    if not isinstance(text, str) or not text or any(not s for s in text.split(".")):
        raise PartError(f"{text}: a key is table and key names joined by dots, e.g. plate.width or hole.1.diameter")
    segments = text.split(".")
    node: Any = part
    steps: list[str | int] = []
    where = ""
    for i, seg in enumerate(segments):
        last = i == len(segments) - 1
        if isinstance(node, dict):
            if seg not in node:
                return _absent(text, segments, i, steps, where, node)
            steps.append(seg)
            node = node[seg]
        elif isinstance(node, list) and node and all(isinstance(v, dict) for v in node):
            steps.append(_position(text, where, seg, len(node), "tables"))
            node = node[steps[-1]]
        elif isinstance(node, list):
            steps.append(_component(text, where, seg, node))
            node = node[steps[-1]]
        else:
            raise PartError(f"{text}: {where} is a single value; nothing is inside it to address with {seg!r}")
        where = f"{where}.{seg}" if where else seg
        if last:
            _check_leaf(text, node)
    return KeyPath(text, tuple(steps), True)


def expand_key(base: Mapping[str, Any], text: str) -> list[str]:
    """The dotted keys that `text` stands for (a sweep's --vary key, a suite's `set` key): itself, or, with
    its one `*`, every entry number (1-based) of the array of tables it stands in, e.g. hole.*.diameter ->
    hole.1.diameter, hole.2.diameter."""
    segments = text.split(".")
    stars = [i for i, seg in enumerate(segments) if seg == EVERY_ENTRY]
    if not stars:
        return [text]
    if len(stars) > 1:
        raise PartError(f"{text}: a key may hold one {EVERY_ENTRY} (every entry of one array of tables)")
    prefix = segments[:stars[0]]
    node: Any = base
    for seg in prefix:
        if isinstance(node, dict) and seg in node:
            node = node[seg]
        elif isinstance(node, list) and seg.isdigit() and 1 <= int(seg) <= len(node):
            node = node[int(seg) - 1]
        else:
            node = None
            break
    if not prefix or not isinstance(node, list) or not node or not all(isinstance(v, dict) for v in node):
        raise PartError(f"{text}: {EVERY_ENTRY} stands for every entry of an array of tables (e.g. hole.*.diameter "
                        f"for every [[hole]]); {'.'.join(prefix) or 'the start of the key'} is not one in this part file")
    return [".".join([*prefix, str(n), *segments[stars[0] + 1:]]) for n in range(1, len(node) + 1)]


def set_value(part: Mapping[str, Any], key: KeyPath, value: Any) -> dict[str, Any]:
    """A deep copy of `part` with the value at `key` replaced (tables on the way created when missing)."""
    out = copy.deepcopy(dict(part))
    node: Any = out
    for step in key.steps[:-1]:
        if isinstance(node, dict) and step not in node:
            node[step] = {}
        node = node[step]
    node[key.steps[-1]] = value
    return out


def check_key_known(part: Mapping[str, Any], key: KeyPath, value: Any, read: Callable[[dict], object]) -> None:
    """For a key the part file does not hold yet, ask the part-file reader `read` whether it knows the key:
    `read` is applied to the part with the value set, and an "unknown key" refusal becomes this key's error.
    Other refusals (a value out of range, say) are left for the run of that value to report."""
    if key.present:
        return
    try:
        read(set_value(part, key, value))
    except PartError as exc:
        if "unknown key" in str(exc):
            raise PartError(f"{key.text}: the part-file reader does not know this key ({exc})") from None


def flatten_keys(table: Mapping[str, Any], prefix: str = "") -> dict[str, Any]:
    """Dotted keys of a (possibly nested) table: {"hole": {"1": {"diameter": 5}}} -> {"hole.1.diameter": 5}.
    TOML reads an unquoted dotted key as nested tables; this gives back the dotted text."""
    out: dict[str, Any] = {}
    for name, value in table.items():
        text = f"{prefix}.{name}" if prefix else str(name)
        if isinstance(value, Mapping):
            out.update(flatten_keys(value, text))
        else:
            out[text] = value
    return out


def _absent(text: str, segments: list[str], i: int, steps: list[str | int], where: str,
            node: dict[str, Any]) -> KeyPath:
    """A key whose segment i is missing from the table `node`: allowed only when every missing segment is a
    table or key name (tables are created), never a list position."""
    missing = segments[i:]
    have = ", ".join(sorted(str(k) for k in node)) or "nothing"
    place = where or "the part file"
    if any(s.isdigit() for s in missing):  # a list entry cannot be made up
        raise PartError(f"{text}: {place} has no {missing[0]!r} (it has: {have})")
    return KeyPath(text, tuple(steps) + tuple(missing), False)


def _position(text: str, where: str, seg: str, count: int, kind: str) -> int:
    if not seg.isdigit() or not 1 <= int(seg) <= count:
        entries = "entry" if count == 1 else "entries"
        choices = f"{where}.1" + (f" ... {where}.{count}" if count > 1 else "")
        raise PartError(f"{text}: {where} is an array of {kind} with {count} {entries}; address one as {choices}")
    return int(seg) - 1


def _component(text: str, where: str, seg: str, values: list[Any]) -> int:
    if len(values) == 2 and seg in POINT_AXES:
        return POINT_AXES.index(seg)
    return _position(text, where, seg, len(values), "values" if len(values) != 2 else "values (x, y)")


def _check_leaf(text: str, value: Any) -> None:
    if isinstance(value, dict):
        names = ", ".join(f"{text}.{k}" for k in value)
        raise PartError(f"{text}: is a table; address one of its values ({names})")
    if isinstance(value, list):
        hint = f"{text}.x or {text}.y" if len(value) == 2 and not any(isinstance(v, dict) for v in value) else f"{text}.1"
        raise PartError(f"{text}: is an array; address one entry, e.g. {hint}")
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise PartError(f"{text}: holds {value!r}, not a number")
    if isinstance(value, str) and not _QUANTITY.match(value):
        raise PartError(f"{text}: holds the text {value!r}, not a number or a quantity")
