"""Shared helpers for the tests: building parts from dictionaries and the example folder."""

from __future__ import annotations

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
