"""Unit systems and parsing into mm, N, MPa.

Exact definitions (NIST SP 811, 2008 ed., appendix B): 1 in = 25.4 mm; 1 lbf = 4.4482216152605 N
(0.45359237 kg x 9.80665 m/s²); 1 psi = 1 lbf/in² = 6.894757 kPa (NIST's printed 7 digits; the exact
ratio is 4.4482216152605 / 645.16 MPa); 1 kip = 1000 lbf; 1 ksi = 1000 psi.
Tolerances: rel 1e-12 against the exact definitions, rel 1e-7 against NIST's rounded psi.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stressraiser.geometry.errors import PartError
from stressraiser.geometry.units import (
    QUANTITIES,
    UNIT_SYSTEMS,
    from_internal,
    parse_force,
    parse_length,
    parse_moment,
    parse_quantity,
    parse_stress,
    to_internal,
    unit_label,
    unit_system,
)

REL = 1e-12
INCH_MM = 25.4  # NIST SP 811, exact
LBF_N = 4.4482216152605  # NIST SP 811, exact
PSI_MPA = LBF_N / INCH_MM**2  # definition psi = lbf / in²


def test_exact_definitions() -> None:
    assert to_internal(1.0, "length", "in-lbf-psi") == pytest.approx(INCH_MM, rel=REL)  # NIST SP 811
    assert to_internal(1.0, "force", "in-lbf-psi") == pytest.approx(LBF_N, rel=REL)  # NIST SP 811
    assert to_internal(1.0, "stress", "in-lbf-psi") == pytest.approx(PSI_MPA, rel=REL)  # lbf/in²
    assert to_internal(1.0, "stress", "in-lbf-psi") == pytest.approx(0.006894757, rel=1e-7)  # NIST SP 811
    assert to_internal(1.0, "force", "in-kip-ksi") == pytest.approx(1000 * LBF_N, rel=REL)  # kip = 1000 lbf
    assert to_internal(1.0, "stress", "in-kip-ksi") == pytest.approx(1000 * PSI_MPA, rel=REL)
    assert to_internal(1.0, "area", "in-lbf-psi") == pytest.approx(INCH_MM**2, rel=REL)
    assert to_internal(1.0, "moment", "in-kip-ksi") == pytest.approx(1000 * LBF_N * INCH_MM, rel=REL)


def test_internal_system_is_identity() -> None:
    for quantity in QUANTITIES:
        assert to_internal(7.25, quantity) == 7.25


@pytest.mark.parametrize(
    "text, quantity, expected",
    [
        ("12 kN", "force", 12_000.0),  # SI prefix
        ("0.375 in", "length", 0.375 * INCH_MM),  # NIST SP 811
        ("50 ksi", "stress", 50_000 * PSI_MPA),  # NIST SP 811
        ("250 MPa", "stress", 250.0),
        ("250 N/mm^2", "stress", 250.0),  # 1 MPa = 1 N/mm²
        ("2.5 kip", "force", 2_500 * LBF_N),
        ("40 N*m", "moment", 40_000.0),  # 1 m = 1000 mm
        ("40 N·m", "moment", 40_000.0),
        ("350 lbf-in", "moment", 350 * LBF_N * INCH_MM),  # hyphen read as a product
        ("120 mm²", "area", 120.0),
        ("1e3 psi", "stress", 1000 * PSI_MPA),
        ("-8 kN", "force", -8_000.0),  # sign kept: compression
        ("12kN", "force", 12_000.0),
        ("6", "length", 6.0),  # a number alone in a string: the file's units
    ],
)
def test_parse_strings(text: str, quantity: str, expected: float) -> None:
    assert parse_quantity(text, quantity, "k") == pytest.approx(expected, rel=REL)


def test_bare_numbers_use_the_file_system() -> None:
    assert parse_length(2, "plate.width", "in-lbf-psi") == pytest.approx(2 * INCH_MM, rel=REL)
    assert parse_force(3.0, "load.axial", "in-kip-ksi") == pytest.approx(3000 * LBF_N, rel=REL)
    assert parse_stress(36, "material.yield", "in-kip-ksi") == pytest.approx(36_000 * PSI_MPA, rel=REL)
    assert parse_moment(10, "load.moment") == 10.0
    # a string with its own unit ignores the file's system
    assert parse_force("12 kN", "load.axial", "in-lbf-psi") == pytest.approx(12_000.0, rel=REL)


def test_wrong_dimension_names_the_key_and_what_is_needed() -> None:
    with pytest.raises(PartError) as err:
        parse_force("12 mm", "load.axial")
    assert str(err.value).startswith('load.axial: "12 mm" is a length; a force is needed')
    assert '"12 kN"' in str(err.value)
    with pytest.raises(PartError, match=r"plate\.width: \"50 ksi\" is a stress; a length is needed"):
        parse_length("50 ksi", "plate.width")
    with pytest.raises(PartError, match="is a force; a moment is needed"):
        parse_moment("5 kN", "load.moment")
    with pytest.raises(PartError, match="is dimensionless; a stress is needed"):
        parse_stress("12 %", "material.yield")


@pytest.mark.parametrize(
    "value",
    [True, False, None, [1], {"v": 1}, math.nan, math.inf, -math.inf, 10**400,
     "", "   ", "mm", "twelve kN", "nan mm", "inf N", "1e999 mm", "1,5 mm", "1 in - 2 mm",
     "12 kN)", "(12 kN", "12 blorps", "3 mm 2"],
)
def test_rejects_non_numbers_and_junk(value: object) -> None:
    with pytest.raises(PartError) as err:
        parse_length(value, "plate.length")
    assert str(err.value).startswith("plate.length:")
    assert "a length is needed" in str(err.value)


def test_unknown_unit_system_lists_allowed() -> None:
    with pytest.raises(PartError) as err:
        unit_system("furlong-stone-fortnight", key="units")
    for name in UNIT_SYSTEMS:
        assert name in str(err.value)
    with pytest.raises(PartError):
        parse_length(1.0, "plate.length", "cgs")


def test_labels() -> None:
    assert unit_label("area") == "mm²" and unit_label("moment") == "N·mm"
    assert unit_label("stress", "in-kip-ksi") == "ksi" and unit_label("moment", "in-lbf-psi") == "lbf·in"


@given(
    value=st.floats(-1e9, 1e9, allow_nan=False),
    quantity=st.sampled_from(QUANTITIES),
    system=st.sampled_from(sorted(UNIT_SYSTEMS)),
)
def test_round_trip(value: float, quantity: str, system: str) -> None:
    # to_internal then from_internal returns the value (rel 1e-12, floating point)
    back = from_internal(to_internal(value, quantity, system), quantity, system)
    assert back == pytest.approx(value, rel=REL, abs=1e-300)
    # and a bare number parsed in the system then reported in it returns the value
    parsed = parse_quantity(value, quantity, "k", system)
    assert from_internal(parsed, quantity, system) == pytest.approx(value, rel=REL, abs=1e-300)


@given(value=st.floats(1e-6, 1e6))
def test_string_in_other_units_round_trip(value: float) -> None:
    # "<v> in" parsed then reported in inches returns v (1 in = 25.4 mm exactly, NIST SP 811)
    mm = parse_length(f"{value!r} in", "k")
    assert from_internal(mm, "length", "in-lbf-psi") == pytest.approx(value, rel=REL)


def test_arrays_convert() -> None:
    import numpy as np

    out = from_internal(np.array([25.4, 50.8]), "length", "in-kip-ksi")
    assert np.allclose(out, [1.0, 2.0], rtol=REL, atol=0)
