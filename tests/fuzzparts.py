"""Hypothesis strategies for sloppy and hostile part files, and a small TOML writer for them.

Three sources of part files:

- `raw_texts`: arbitrary text, and the bundled examples' text with lines deleted, repeated or garbled
  (syntax errors, duplicate keys and tables).
- `core_parts`: part dictionaries built from scratch around the core keys (plate, hole, material, load,
  mesh), mostly plausible so that many are valid, with hostile values mixed in: NaN, infinities, huge and
  tiny numbers, integers beyond the float range, wrong types, strings with bad units, empty tables,
  unknown keys, duplicate holes, holes outside the plate, zero thickness.
- `mutated_examples`: every bundled example (examples/*.toml) with one to three random mutations (a value
  replaced by a hostile one, scaled far up or down, negated or zeroed, a key deleted, an unknown key
  added, a table emptied, an array entry repeated). Features, loads and keys added to the examples later
  are fuzzed without changing this file.
"""

from __future__ import annotations

import copy
import datetime as dt
import json
import math
import re
import tomllib
from pathlib import Path
from typing import Any

from hypothesis import strategies as st

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
EXAMPLE_FILES = sorted(EXAMPLES.glob("*.toml"))
EXAMPLE_TEXTS = [p.read_text(encoding="utf-8") for p in EXAMPLE_FILES]
EXAMPLE_DICTS = [tomllib.loads(t) for t in EXAMPLE_TEXTS]

# --- a TOML writer for any dictionary tomllib could have produced -------------------------------------

_BARE_KEY = re.compile(r"^[A-Za-z0-9_-]+$")


def toml_text(data: dict[str, Any]) -> str:
    """TOML text that tomllib reads back as `data` (top-level keys, inline tables and arrays)."""
    return "".join(f"{_key(k)} = {_value(v)}\n" for k, v in data.items())


def _key(key: str) -> str:
    return key if _BARE_KEY.match(key) else _string(key)


def _string(text: str) -> str:
    # JSON's escapes are a subset of TOML's basic-string escapes; TOML also forbids a raw DEL
    return json.dumps(text, ensure_ascii=False).replace("\x7f", "\\u007f")


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        return repr(v)  # "inf", "-inf", "1e+300", "0.5"
    if isinstance(v, str):
        return _string(v)
    if isinstance(v, (dt.datetime, dt.date, dt.time)):
        return v.isoformat()
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{_key(k)} = {_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(f"no TOML form for {type(v).__name__}")


# --- hostile values ---------------------------------------------------------------------------------

SPECIAL_NUMBERS = [0, 0.0, -0.0, -1, 1, 1e-300, -1e-300, 5e-324, 1e-9, 1e9, 1e300, -1e300, 2**63 - 1,
                   10**400, -(10**400), math.nan, math.inf, -math.inf, 0.5, 1e-4, 1e12, 1e13]
QUANTITY_TEXTS = ["12 mm", "0.5 in", "12 kN", "2.5 kip", "250 MPa", "36 ksi", "40 N*m", "1e400 mm", "nan mm",
                  "inf N", "12 parsec", "12 degC", "mm", "", "   ", "12", "-3 mm", "1e-9 mm", "3 mm mm",
                  "1/0 mm", "0x10 mm", "1_000 mm", "12 mm^2", "(12) mm", "12 %", "12 kg", "1 km^9999999",
                  "12 mm**0.5", "1e-300 N", "1e300 MPa", "12 m", "3 ft", "12 lbf-in", "12 μm", "12\nmm",
                  "[bold]12[/bold] mm", "12 mm # comment", "١٢ mm"]
UNIT_WORDS = ["mm", "in", "m", "um", "kN", "N", "MPa", "GPa", "ksi", "psi", "lbf", "kip", "N*m", "lbf*in", "s", "kg"]

finite_floats = st.floats(allow_nan=False, allow_infinity=False)
numbers = st.one_of(st.sampled_from(SPECIAL_NUMBERS), st.floats(), st.integers(), st.integers(-(10**30), 10**30))
quantity_texts = st.one_of(
    st.sampled_from(QUANTITY_TEXTS),
    st.text(max_size=16),
    st.builds(lambda n, u: f"{n!r} {u}", finite_floats, st.sampled_from(UNIT_WORDS)),
)
odd_values = st.one_of(
    st.booleans(),
    st.lists(st.one_of(st.integers(), st.floats(), st.text(max_size=4)), max_size=4),
    st.dictionaries(st.text(max_size=6), st.integers(), max_size=2),
    st.datetimes(dt.datetime(1900, 1, 1), dt.datetime(2100, 1, 1)),
    st.dates(),
    st.times(),
    st.text(max_size=30),
)
hostile = st.one_of(numbers, quantity_texts, odd_values)


@st.composite
def core_parts(draw) -> dict[str, Any]:
    """A part dictionary around the core keys: a plausible part (often valid) with zero to three
    corruptions: hostile values, missing or unknown keys, empty tables, a duplicate hole, a hole outside
    the plate, zero thickness."""
    length, width = draw(st.floats(20.0, 2000.0)), draw(st.floats(5.0, 500.0))
    part: dict[str, Any] = {"title": draw(st.text(max_size=40))}
    if draw(st.booleans()):
        part["units"] = draw(st.sampled_from(["mm-N-MPa", "in-lbf-psi", "in-kip-ksi"]))
    part["plate"] = {"length": length, "width": width, "thickness": draw(st.floats(0.5, 50.0))}
    if draw(st.booleans()):
        part["plate"]["condition"] = draw(st.sampled_from(["plane-stress", "plane-strain"]))
    holes = [{"center": [draw(st.floats(-0.4 * length, 0.4 * length)), draw(st.floats(-0.3 * width, 0.3 * width))],
              "diameter": draw(st.floats(0.01 * width, 0.35 * width))} for _ in range(draw(st.integers(0, 3)))]
    if holes:
        part["hole"] = holes
    part["material"] = {"E": draw(st.floats(1e3, 4e5)), "nu": draw(st.floats(-0.99, 0.49))}
    if draw(st.booleans()):
        part["material"]["yield"] = draw(st.floats(100.0, 900.0))
    part["load"] = {"axial": draw(st.one_of(st.floats(-1e6, 1e6).filter(lambda f: abs(f) > 1.0),
                                            st.sampled_from(["12 kN", "-3 kip", "900 lbf"])))}
    if draw(st.booleans()):
        part["mesh"] = {"tolerance": draw(st.floats(1e-4, 0.2)), "max_levels": draw(st.integers(3, 12)),
                        "max_elements": draw(st.integers(1000, 20_000_000))}
    for _ in range(draw(st.integers(0, 3))):
        kind = draw(st.sampled_from(CORRUPTIONS))
        holes = part.get("hole") if isinstance(part.get("hole"), list) else []  # as the mutations left it
        last = holes[-1] if holes and isinstance(holes[-1], dict) else None
        if kind == "zero thickness" and isinstance(part.get("plate"), dict):
            part["plate"]["thickness"] = draw(st.sampled_from([0, 0.0, -0.0]))
        elif kind == "hole outside" and last is not None:
            last["center"] = [draw(st.floats(-2 * length, 2 * length)), draw(st.floats(-2 * width, 2 * width))]
        elif kind == "duplicate hole" and holes:
            holes.append(copy.deepcopy(holes[draw(st.integers(0, len(holes) - 1))]))
        elif kind == "huge hole" and last is not None:
            last["diameter"] = draw(st.floats(0.9 * width, 3 * width))
        elif kind in ("zero thickness", "hole outside", "duplicate hole", "huge hole"):
            continue
        else:
            part = mutate(part, kind, draw(st.integers(0, 10_000)), draw(hostile), draw(st.text(min_size=1, max_size=10)))
    return part


CORRUPTIONS = ["zero thickness", "hole outside", "duplicate hole", "huge hole", "replace", "replace", "replace",
               "scale", "negate", "zero", "delete", "unknown", "empty", "repeat"]


# --- mutated examples ----------------------------------------------------------------------------


def leaf_paths(node: Any, prefix: tuple = ()) -> list[tuple]:
    """Paths (tuples of keys and list positions) to every value in a nested dict/list, leaves and
    containers alike, excluding the root."""
    out = []
    items = node.items() if isinstance(node, dict) else enumerate(node) if isinstance(node, list) else ()
    for key, value in items:
        out.append(prefix + (key,))
        out.extend(leaf_paths(value, prefix + (key,)))
    return out


def _parent(root: Any, path: tuple) -> Any:
    node = root
    for step in path[:-1]:
        node = node[step]
    return node


def mutate(data: dict[str, Any], kind: str, pick: int, value: Any, word: str) -> dict[str, Any]:
    """One mutation of a copy of `data`, at the `pick`-th path (modulo the number of paths)."""
    out = copy.deepcopy(data)
    paths = leaf_paths(out)
    if not paths:
        return out
    path = paths[pick % len(paths)]
    parent, last = _parent(out, path), path[-1]
    current = parent[last]
    if kind == "replace":
        parent[last] = value
    elif kind == "scale" and isinstance(current, (int, float)) and not isinstance(current, bool):
        parent[last] = current * (1e9 if pick % 2 else 1e-9)
    elif kind == "negate" and isinstance(current, (int, float)) and not isinstance(current, bool):
        parent[last] = -current
    elif kind == "zero":
        parent[last] = 0
    elif kind == "delete":
        del parent[last]
    elif kind == "unknown" and isinstance(current, dict):
        current[word] = value
    elif kind == "empty" and isinstance(current, (dict, list)):
        current.clear()
    elif kind == "repeat" and isinstance(current, list) and current:
        current.append(copy.deepcopy(current[pick % len(current)]))
    else:
        parent[last] = value
    return out


MUTATIONS = ["replace", "scale", "negate", "zero", "delete", "unknown", "empty", "repeat"]


@st.composite
def mutated_examples(draw) -> dict[str, Any]:
    """A bundled example's dictionary with none to three random mutations (none: the example as bundled,
    so that accepted parts stay a steady share of the draws whatever mix of examples is bundled)."""
    data = draw(st.sampled_from(EXAMPLE_DICTS))
    for _ in range(draw(st.integers(0, 3))):
        data = mutate(data, draw(st.sampled_from(MUTATIONS)), draw(st.integers(0, 10_000)), draw(hostile),
                      draw(st.text(min_size=1, max_size=10)))
    return data


# --- raw text ---------------------------------------------------------------------------------------


@st.composite
def garbled_examples(draw) -> str:
    """A bundled example's text with lines deleted, repeated or garbled."""
    lines = draw(st.sampled_from(EXAMPLE_TEXTS)).splitlines()
    for _ in range(draw(st.integers(1, 4))):
        if not lines:
            break
        n = draw(st.integers(0, len(lines) - 1))
        kind = draw(st.sampled_from(["delete", "repeat", "garble", "insert"]))
        if kind == "delete":
            del lines[n]
        elif kind == "repeat":
            lines.insert(n, lines[n])  # duplicate keys and duplicate tables are TOML errors
        elif kind == "garble":
            at = draw(st.integers(0, len(lines[n])))
            lines[n] = lines[n][:at] + draw(st.text(min_size=1, max_size=5)) + lines[n][at:]
        else:
            lines.insert(n, draw(st.text(max_size=30)))
    return "\n".join(lines) + "\n"


raw_texts = st.one_of(st.text(max_size=200), garbled_examples())
