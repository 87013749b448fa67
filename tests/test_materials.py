"""Built-in material table: every row sourced, values in sane ranges, lookup errors helpful.

Range bounds are common practice for these families (steel E about 190-215 GPa, aluminium about
68-74 GPa, titanium alloys about 105-120 GPa; nu 0.25-0.35). Grade-name checks: the EN 10025-2 steel
name states the minimum yield strength in MPa for the thinnest range (EN 10025-2:2004, from memory).
"""

from __future__ import annotations

import pytest

from stressraiser.geometry.materials import FAMILIES, MATERIALS, lookup_material, material_keys
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.units import STATED_UNITS, Stated, format_stated

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
    # ASTM A36 (from memory): Fy 36 ksi, kept as stated; 1 ksi = 6.894757 MPa (NIST SP 811)
    row = lookup_material("a36")
    assert row.minimum_yield == Stated(36.0, "ksi")
    assert row.yield_mpa == pytest.approx(36 * 6.894757, rel=1e-7)


def test_stated_units_agree_with_pint() -> None:
    # the exact US customary definitions (NIST SP 811) against pint's own, an independent library
    import pint

    ureg = pint.UnitRegistry()
    for unit, mpa in STATED_UNITS.items():
        assert mpa == pytest.approx(ureg.Quantity(1.0, unit).to("MPa").magnitude, rel=1e-14), unit


@pytest.mark.parametrize("key, stated", [("7075-t6", "68 ksi"), ("6061-t6", "35 ksi"), ("2024-t3", "42 ksi"),
                                         ("ti-6al-4v", "120 ksi"), ("s275", "275 MPa"), ("6082-t6", "255 MPa")])
def test_minimum_yield_is_kept_as_its_standard_states_it(key: str, stated: str) -> None:
    # ASTM B209 / B265 minimums in ksi, EN 10025-2 / EN 485-2 minimums in MPa (from memory, as in each row's
    # source): the number and the unit of the standard, shown again exactly in that standard's unit system
    row = lookup_material(key)
    assert str(row.minimum_yield) == stated
    system = "in-kip-ksi" if stated.endswith("ksi") else "mm-N-MPa"
    assert format_stated(row.minimum_yield, system) == stated
    # in the other unit system of the same family, a power of ten: 68 ksi is 68000 psi exactly
    if system == "in-kip-ksi":
        assert format_stated(row.minimum_yield, "in-lbf-psi") == f"{int(row.minimum_yield.value) * 1000} psi"


def test_every_row_states_its_values_in_a_known_unit() -> None:
    for row in MATERIALS:
        for key, value in row.stated():
            assert value.unit in STATED_UNITS, (row.key, key)
            assert value.mpa == pytest.approx(value.value * STATED_UNITS[value.unit], rel=1e-15)


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
