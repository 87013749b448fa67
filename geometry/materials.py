"""Built-in table of common plate and bar materials, each value in its source's own unit.

Every value here was recalled from the named standard or handbook, not read from a copy, and each row's
source says so ("from memory"). Strengths are the specified minimums for the stated product and
thickness range where a standard gives one; published fatigue strengths are typical (mean) values from
rotating-beam tests on polished specimens, not design minimums. Check the values against the governing
specification and the mill certificate before signing off a part.

Each value keeps the number and the unit its source states (`geometry.units.Stated`: 68 ksi for an ASTM
minimum, 275 MPa for an EN one). It is converted to MPa once, exactly, for the computation; shown in the
source's own unit system it is the source's number again (never a round trip through a rounded MPa value).
"""

from __future__ import annotations

from dataclasses import dataclass

from .errors import PartError
from .units import Stated

FAMILIES = ("steel", "stainless", "aluminium", "titanium")

# Wrought metals of these families yield locally before they fracture at room temperature, so a part
# made of one is taken as ductile unless the part file says otherwise (common practice).
DUCTILE_FAMILIES = FAMILIES

# Families the steel notch-sensitivity fits and the steel endurance-limit estimate apply to.
STEEL_FAMILIES = ("steel", "stainless")


@dataclass(frozen=True)
class MaterialRow:
    """One material of the built-in table; every strength and modulus is kept as its source states it
    (`Stated`: the number and the source's unit, 68 ksi for an ASTM minimum, 275 MPa for an EN one) and
    converted to MPa once, by the `*_mpa` properties the computation uses.

    youngs_modulus:   E as stated.
    poisson_ratio:    nu (dimensionless).
    minimum_yield:    minimum yield strength (or 0.2 % proof strength) as stated.
    minimum_ultimate: minimum tensile strength as stated.
    family:           one of FAMILIES; decides how the fatigue screen estimates strength.
    fatigue_strength: published fully reversed fatigue strength as stated, or None if none is listed.
    fatigue_life_cycles: the life in cycles that fatigue strength applies to, or None.
    ductile:          True when local yielding can relieve a peak under static load.
    source:           standard or handbook (with edition) the values come from.
    cyclic_strength, cyclic_exponent: K' (as stated) and n' of the cyclic Ramberg-Osgood stress-strain
                      curve where published, else None; cyclic_source names where they come from.
    """

    key: str
    name: str
    youngs_modulus: Stated
    poisson_ratio: float
    minimum_yield: Stated
    minimum_ultimate: Stated
    family: str
    fatigue_strength: Stated | None
    fatigue_life_cycles: float | None
    ductile: bool
    source: str
    cyclic_strength: Stated | None = None
    cyclic_exponent: float | None = None
    cyclic_source: str = ""

    @property
    def youngs_modulus_mpa(self) -> float:
        return self.youngs_modulus.mpa

    @property
    def yield_mpa(self) -> float:
        return self.minimum_yield.mpa

    @property
    def ultimate_mpa(self) -> float:
        return self.minimum_ultimate.mpa

    @property
    def fatigue_strength_mpa(self) -> float | None:
        return None if self.fatigue_strength is None else self.fatigue_strength.mpa

    @property
    def cyclic_strength_mpa(self) -> float | None:
        return None if self.cyclic_strength is None else self.cyclic_strength.mpa

    def stated(self) -> tuple[tuple[str, Stated], ...]:
        """(part-file key of [material], value as stated) of every value of the row that has a unit."""
        values = (("E", self.youngs_modulus), ("yield", self.minimum_yield), ("ultimate", self.minimum_ultimate),
                  ("fatigue_strength", self.fatigue_strength))
        return tuple((key, value) for key, value in values if value is not None)


_EN10025 = (
    "EN 10025-2:2004, minimum ReH and Rm for 3 mm < t <= 16 mm; E and nu from EN 1993-1-1:2005 "
    "clause 3.2.6 (from memory)"
)


def _mpa(value: float) -> Stated:
    return Stated(value, "MPa")


def _gpa(value: float) -> Stated:
    return Stated(value, "GPa")


def _ksi(value: float) -> Stated:
    return Stated(value, "ksi")


MATERIALS: tuple[MaterialRow, ...] = (
    MaterialRow(
        "s235", "EN 10025-2 S235 structural steel, t <= 16 mm",
        _mpa(210_000.0), 0.3, _mpa(235.0), _mpa(360.0), "steel", None, None, True, _EN10025,
    ),
    MaterialRow(
        "s275", "EN 10025-2 S275 structural steel, t <= 16 mm",
        _mpa(210_000.0), 0.3, _mpa(275.0), _mpa(410.0), "steel", None, None, True, _EN10025,
    ),
    MaterialRow(
        "s355", "EN 10025-2 S355 structural steel, t <= 16 mm",
        _mpa(210_000.0), 0.3, _mpa(355.0), _mpa(470.0), "steel", None, None, True, _EN10025,
    ),
    MaterialRow(
        "a36", "ASTM A36 structural steel plate and bar",
        _ksi(29_000.0), 0.3, _ksi(36.0), _ksi(58.0), "steel", None, None, True,
        "ASTM A36/A36M-19, minimum Fy 36 ksi and Fu 58 ksi; E = 29 000 ksi and nu = 0.3 from "
        "AISC 360-16 (from memory)",
    ),
    MaterialRow(
        "304", "Stainless steel 304 / 1.4301, annealed plate",
        _gpa(193.0), 0.29, _ksi(30.0), _ksi(75.0), "stainless", None, None, True,
        "ASTM A240/A240M-20, type 304 annealed, minimum 0.2 % proof 30 ksi and tensile 75 ksi; "
        "E = 193 GPa and nu from ASM Handbook vol. 1, 10th ed. (1990) (from memory)",
    ),
    MaterialRow(
        "6061-t6", "Aluminium alloy 6061-T6 / T651 plate",
        _gpa(68.9), 0.33, _ksi(35.0), _ksi(42.0), "aluminium", _ksi(14.0), 5e8, True,
        "ASTM B209-14, 6061-T651 plate, minimum yield 35 ksi and tensile 42 ksi; E = 68.9 GPa, nu and "
        "typical rotating-beam fatigue strength 14 ksi (5e8 cycles) from ASM Handbook vol. 2, 10th ed. (1990) "
        "(from memory)",
    ),
    MaterialRow(
        "6082-t6", "Aluminium alloy 6082-T6 plate, 6 mm < t <= 12.5 mm",
        _mpa(70_000.0), 0.3, _mpa(255.0), _mpa(300.0), "aluminium", None, None, True,
        "EN 485-2:2016 / EN 1999-1-1:2007 table 3.2a, 6082-T6, minimum Rp0.2 and Rm for "
        "6 mm < t <= 12.5 mm; E and nu from EN 1999-1-1 clause 3.2.5 (from memory)",
    ),
    MaterialRow(
        "2024-t3", "Aluminium alloy 2024-T3 sheet",
        _gpa(73.1), 0.33, _ksi(42.0), _ksi(64.0), "aluminium", _ksi(20.0), 5e8, True,
        "ASTM B209-14, 2024-T3 sheet 0.010-0.062 in, minimum yield 42 ksi and tensile 64 ksi; E = 73.1 GPa, "
        "nu and typical rotating-beam fatigue strength 20 ksi (5e8 cycles) from ASM Handbook vol. 2, 10th ed. "
        "(1990) (from memory)",
        _ksi(95.0), 0.065,
        "cyclic K' = 95 ksi and n' = 0.065 measured on 2024-T351, SAE J1099 (1975) strain-life data as "
        "tabulated by Bannantine, Comer and Handrock, Fundamentals of Metal Fatigue Analysis (1990) (from "
        "memory); taken for the T3 temper alike",
    ),
    MaterialRow(
        "7075-t6", "Aluminium alloy 7075-T6 sheet",
        _gpa(71.7), 0.33, _ksi(68.0), _ksi(78.0), "aluminium", _ksi(23.0), 5e8, True,
        "ASTM B209-14, 7075-T6 sheet, minimum yield 68 ksi and tensile 78 ksi; E = 71.7 GPa, nu and typical "
        "rotating-beam fatigue strength 23 ksi (5e8 cycles) from ASM Handbook vol. 2, 10th ed. (1990) "
        "(from memory)",
    ),
    MaterialRow(
        "ti-6al-4v", "Titanium alloy Ti-6Al-4V (grade 5), annealed plate",
        _gpa(113.8), 0.342, _ksi(120.0), _ksi(130.0), "titanium", _mpa(510.0), 1e7, True,
        "ASTM B265-15 grade 5, minimum yield 120 ksi and tensile 130 ksi; E = 113.8 GPa, nu and typical "
        "unnotched fatigue strength 510 MPa (1e7 cycles) from ASM Materials Properties Handbook: Titanium "
        "Alloys (1994) (from memory)",
    ),
)

_BY_KEY: dict[str, MaterialRow] = {row.key: row for row in MATERIALS}


def material_keys() -> tuple[str, ...]:
    """The keys of the built-in table, in table order."""
    return tuple(row.key for row in MATERIALS)


def lookup_material(name: str, key: str = "material.grade") -> MaterialRow:
    """Return the built-in row for `name` (case and surrounding spaces ignored).

    key: the part-file key path that held `name`, used in the error message.
    Raises PartError listing the allowed keys when `name` is not in the table.
    """
    if isinstance(name, str):
        row = _BY_KEY.get(name.strip().lower())
        if row is not None:
            return row
    allowed = ", ".join(material_keys())
    raise PartError(f"{key}: {name!r} is not in the built-in material table; use one of {allowed}")
