"""Shared helpers for the tests: the strap every input test starts from, part-file text from a dictionary,
and the example folder."""

from __future__ import annotations

import copy
import json
import random
from collections.abc import Iterator, Sequence
from pathlib import Path
from typing import Any

import pytest

from stressraiser.geometry.partfile import part_from_dict

REPO = Path(__file__).resolve().parents[1]
EXAMPLES = REPO / "examples"

# The strap of examples/winch_strap.toml: the part the input, failure and sign-off tests start from,
# changing one table or key at a time.
STRAP: dict[str, Any] = {
    "plate": {"length": 300.0, "width": 80.0, "thickness": 10.0},
    "hole": [{"center": [0.0, 0.0], "diameter": 22.0}],
    "material": {"E": 210000.0, "nu": 0.3},
    "load": {"axial": 120000.0},
}


def strap(**tables: Any) -> dict[str, Any]:
    """A copy of STRAP with top-level tables (or keys) replaced or added; a value of None removes one."""
    part = copy.deepcopy(STRAP)
    for key, value in tables.items():
        if value is None:
            part.pop(key, None)
        else:
            part[key] = copy.deepcopy(value)
    return part


def toml_text(part: dict[str, Any]) -> str:
    """TOML text of a part-file dictionary: top-level values first, then each table and array of tables
    in order (a table inside a table is written inline)."""
    def value(v: Any) -> str:
        if isinstance(v, dict):
            return "{ " + ", ".join(f"{k} = {value(x)}" for k, x in v.items()) + " }"
        return json.dumps(v)

    def is_array_of_tables(v: Any) -> bool:
        return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)

    lines = [f"{k} = {value(v)}" for k, v in part.items() if not isinstance(v, dict) and not is_array_of_tables(v)]
    for key, v in part.items():
        if isinstance(v, dict):
            lines += [f"[{key}]"] + [f"{k} = {value(x)}" for k, x in v.items()]
        elif is_array_of_tables(v):
            for item in v:
                lines += [f"[[{key}]]"] + [f"{k} = {value(x)}" for k, x in item.items()]
    return "\n".join(lines) + "\n"


STRAP_TEXT = toml_text(STRAP)  # the base that input tests corrupt one key at a time


def plate_with_hole(length=300.0, width=80.0, thickness=10.0, holes=((0.0, 0.0, 22.0),), E=210000.0, nu=0.3,
                    axial=120000.0, tolerance=0.01, condition="plane-stress"):
    """A PartSpec of a plate with circular holes given as (x, y, diameter)."""
    return part_from_dict({
        "title": "test plate",
        "plate": {"length": length, "width": width, "thickness": thickness, "condition": condition},
        "hole": [{"center": [x, y], "diameter": d} for x, y, d in holes],
        "material": {"E": E, "nu": nu},
        "load": {"axial": axial},
        "mesh": {"tolerance": tolerance},
    })


@pytest.fixture
def examples() -> Path:
    return EXAMPLES


def assert_refused(tmp_path, capsys, text: str, words, *options: str) -> None:
    """`stressraiser check` of the part-file `text` must refuse it: exit code 2, one error line naming every
    one of `words`, and no JSON record written (output files whole or not at all)."""
    from stressraiser.cli.main import main

    part = tmp_path / "part.toml"
    part.write_text(text, encoding="utf-8")
    out = tmp_path / "out.json"
    code = main(["check", str(part), "--json", str(out), *options])
    err = capsys.readouterr().err.strip()
    assert code == 2, err
    assert len(err.splitlines()) == 1, err
    for word in words:
        assert word in err, err
    assert not out.exists()


def damaged_copies(text: str, seed: int, count: int, junk: Sequence[str]) -> Iterator[str]:
    """`count` damaged copies of a file's text (seeded): every third cut short at a random line, the others
    with one random line replaced by one of the `junk` lines."""
    lines = text.splitlines(keepends=True)
    rng = random.Random(seed)
    for k in range(count):
        copy = list(lines)
        i = rng.randrange(len(copy))
        if k % 3 == 0:
            copy = copy[:i]
        else:
            copy[i] = rng.choice(junk)
        yield "".join(copy)


def pytest_terminal_summary(terminalreporter) -> None:
    """The whole-pipeline fuzz test's case counts (tests/test_fuzz_pipeline.py), so that CI shows them."""
    import sys

    module = sys.modules.get("pipelineparts")
    for name, counts in (getattr(module, "COUNTS", None) or {}).items():
        terminalreporter.write_line(f"fuzz {name}: " + ", ".join(f"{k} {v}" for k, v in counts.items()))
