"""Built-in material table: every row sourced, values in sane ranges, lookup errors helpful.

Range bounds are common practice for these families (steel E about 190-215 GPa, aluminium about
68-74 GPa, titanium alloys about 105-120 GPa; nu 0.25-0.35). Grade-name checks: the EN 10025-2 steel
name states the minimum yield strength in MPa for the thinnest range (EN 10025-2:2004, from memory).
"""

from __future__ import annotations

import pytest

from stressraiser.geometry.materials import FAMILIES, MATERIALS, lookup_material, material_keys
from stressraiser.geometry.errors import PartError

E_RANGE_MPA = {
    "steel": (190_000.0, 215_000.0),
    "stainless": (190_000.0, 205_000.0),
    "aluminium": (68_000.0, 74_000.0),
    "titanium": (105_000.0, 120_000.0),
}


def test_table_covers_the_families_and_keys_are_unique() -> None:
    keys = material_keys()
    assert len(keys) == len(set(keys)) == len(MATERIALS)
    assert {row.family for row in MATERIALS} == set(FAMILIES)


@pytest.mark.parametrize("row", MATERIALS, ids=lambda r: r.key)
def test_every_row_is_sourced_and_sane(row) -> None:
    assert row.source.strip() and "(from memory)" in row.source
    assert row.name.strip() and row.key == row.key.lower()
    low, high = E_RANGE_MPA[row.family]
    assert low <= row.youngs_modulus_mpa <= high
    assert 0.25 <= row.poisson_ratio <= 0.35
    assert 100.0 <= row.yield_mpa < row.ultimate_mpa <= 1200.0
    # fatigue strength and its life come together, and lie below the ultimate strength
    assert (row.fatigue_strength_mpa is None) == (row.fatigue_life_cycles is None)
    if row.fatigue_strength_mpa is not None:
        assert 0.0 < row.fatigue_strength_mpa < row.ultimate_mpa
        assert 1e5 <= row.fatigue_life_cycles <= 1e10


@pytest.mark.parametrize("key, yield_mpa", [("s235", 235.0), ("s275", 275.0), ("s355", 355.0)])
def test_en_grade_names_state_minimum_yield(key: str, yield_mpa: float) -> None:
    # EN 10025-2:2004 (from memory): S235/S275/S355 minimum ReH 235/275/355 MPa for t <= 16 mm
    assert lookup_material(key).yield_mpa == yield_mpa


def test_a36_yield_is_36_ksi() -> None:
    # ASTM A36 (from memory): Fy 36 ksi; 1 ksi = 6.894757 MPa (NIST SP 811), rel 0.1 %
    assert lookup_material("a36").yield_mpa == pytest.approx(36 * 6.894757, rel=1e-3)


def test_lookup_ignores_case_and_spaces() -> None:
    assert lookup_material("  S355 ") is lookup_material("s355")
    assert lookup_material("6061-T6").family == "aluminium"


def test_unknown_material_lists_allowed_keys() -> None:
    with pytest.raises(PartError) as err:
        lookup_material("unobtainium", key="material.grade")
    message = str(err.value)
    assert message.startswith("material.grade:") and "'unobtainium'" in message
    for key in material_keys():
        assert key in message


def test_non_string_is_refused() -> None:
    with pytest.raises(PartError):
        lookup_material(355)  # type: ignore[arg-type]
