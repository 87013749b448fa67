"""Shared helpers for the tests: building parts from dictionaries and the example folder."""

from __future__ import annotations

import random
from collections.abc import Iterator, Sequence
from pathlib import Path

import pytest

from stressraiser.geometry.partfile import part_from_dict

REPO = Path(__file__).resolve().parents[1]

# The strap of examples/winch_strap.toml as part-file text: the base that input tests corrupt one key at a time.
STRAP_TEXT = """[plate]
length = 300.0
width = 80.0
thickness = 10.0
[[hole]]
center = [0.0, 0.0]
diameter = 22.0
[material]
E = 210000.0
nu = 0.3
[load]
axial = 120000.0
"""
EXAMPLES = REPO / "examples"


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
