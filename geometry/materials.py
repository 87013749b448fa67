"""Built-in table of common plate and bar materials (MPa throughout).

Every value here was recalled from the named standard or handbook, not read from a copy, and each row's
source says so ("from memory"). Strengths are the specified minimums for the stated product and
thickness range where a standard gives one; published fatigue strengths are typical (mean) values from
rotating-beam tests on polished specimens, not design minimums. Check the values against the governing
specification and the mill certificate before signing off a part.
"""

from __future__ import annotations

from dataclasses import dataclass

from .errors import PartError

FAMILIES = ("steel", "stainless", "aluminium", "titanium")

# Wrought metals of these families yield locally before they fracture at room temperature, so a part
# made of one is taken as ductile unless the part file says otherwise (common practice).
DUCTILE_FAMILIES = FAMILIES

# Families the steel notch-sensitivity fits and the steel endurance-limit estimate apply to.
STEEL_FAMILIES = ("steel", "stainless")


@dataclass(frozen=True)
class MaterialRow:
    """One material of the built-in table.

    youngs_modulus_mpa:   E in MPa.
    poisson_ratio:        nu (dimensionless).
    yield_mpa:            minimum yield strength (or 0.2 % proof strength) in MPa.
    ultimate_mpa:         minimum tensile strength in MPa.
    family:               one of FAMILIES; decides how the fatigue screen estimates strength.
    fatigue_strength_mpa: published fully reversed fatigue strength in MPa, or None if none is listed.
    fatigue_life_cycles:  the life in cycles that fatigue strength applies to, or None.
    ductile:              True when local yielding can relieve a peak under static load.
    source:               standard or handbook (with edition) the values come from.
    cyclic_strength_mpa, cyclic_exponent: K' (MPa) and n' of the cyclic Ramberg-Osgood stress-strain curve
                          where published, else None; cyclic_source names where they come from.
    """

    key: str
    name: str
    youngs_modulus_mpa: float
    poisson_ratio: float
    yield_mpa: float
    ultimate_mpa: float
    family: str
    fatigue_strength_mpa: float | None
    fatigue_life_cycles: float | None
    ductile: bool
    source: str
    cyclic_strength_mpa: float | None = None
    cyclic_exponent: float | None = None
    cyclic_source: str = ""


_EN10025 = (
    "EN 10025-2:2004, minimum ReH and Rm for 3 mm < t <= 16 mm; E and nu from EN 1993-1-1:2005 "
    "clause 3.2.6 (from memory)"
)

MATERIALS: tuple[MaterialRow, ...] = (
    MaterialRow(
        "s235", "EN 10025-2 S235 structural steel, t <= 16 mm",
        210_000.0, 0.3, 235.0, 360.0, "steel", None, None, True, _EN10025,
    ),
    MaterialRow(
        "s275", "EN 10025-2 S275 structural steel, t <= 16 mm",
        210_000.0, 0.3, 275.0, 410.0, "steel", None, None, True, _EN10025,
    ),
    MaterialRow(
        "s355", "EN 10025-2 S355 structural steel, t <= 16 mm",
        210_000.0, 0.3, 355.0, 470.0, "steel", None, None, True, _EN10025,
    ),
    MaterialRow(
        "a36", "ASTM A36 structural steel plate and bar",
        200_000.0, 0.3, 248.2, 400.0, "steel", None, None, True,
        "ASTM A36/A36M-19, minimum Fy 36 ksi and Fu 58 ksi; E = 29 000 ksi and nu = 0.3 from "
        "AISC 360-16 (from memory)",
    ),
    MaterialRow(
        "304", "Stainless steel 304 / 1.4301, annealed plate",
        193_000.0, 0.29, 205.0, 515.0, "stainless", None, None, True,
        "ASTM A240/A240M-20, type 304 annealed, minimum 0.2 % proof 30 ksi and tensile 75 ksi; "
        "E and nu from ASM Handbook vol. 1, 10th ed. (1990) (from memory)",
    ),
    MaterialRow(
        "6061-t6", "Aluminium alloy 6061-T6 / T651 plate",
        68_900.0, 0.33, 240.0, 290.0, "aluminium", 96.5, 5e8, True,
        "ASTM B209-14, 6061-T651 plate, minimum yield 35 ksi and tensile 42 ksi; E, nu and typical "
        "rotating-beam fatigue strength (5e8 cycles) from ASM Handbook vol. 2, 10th ed. (1990) "
        "(from memory)",
    ),
    MaterialRow(
        "6082-t6", "Aluminium alloy 6082-T6 plate, 6 mm < t <= 12.5 mm",
        70_000.0, 0.3, 255.0, 300.0, "aluminium", None, None, True,
        "EN 485-2:2016 / EN 1999-1-1:2007 table 3.2a, 6082-T6, minimum Rp0.2 and Rm for "
        "6 mm < t <= 12.5 mm; E and nu from EN 1999-1-1 clause 3.2.5 (from memory)",
    ),
    MaterialRow(
        "2024-t3", "Aluminium alloy 2024-T3 sheet",
        73_100.0, 0.33, 290.0, 440.0, "aluminium", 138.0, 5e8, True,
        "ASTM B209-14, 2024-T3 sheet 0.010-0.062 in, minimum yield 42 ksi and tensile 64 ksi; E, nu "
        "and typical rotating-beam fatigue strength (5e8 cycles) from ASM Handbook vol. 2, 10th ed. "
        "(1990) (from memory)",
        655.0, 0.065,
        "cyclic K' = 95 ksi and n' = 0.065 measured on 2024-T351, SAE J1099 (1975) strain-life data as "
        "tabulated by Bannantine, Comer and Handrock, Fundamentals of Metal Fatigue Analysis (1990) (from "
        "memory); taken for the T3 temper alike",
    ),
    MaterialRow(
        "7075-t6", "Aluminium alloy 7075-T6 sheet",
        71_700.0, 0.33, 469.0, 538.0, "aluminium", 159.0, 5e8, True,
        "ASTM B209-14, 7075-T6 sheet, minimum yield 68 ksi and tensile 78 ksi; E, nu and typical "
        "rotating-beam fatigue strength (5e8 cycles) from ASM Handbook vol. 2, 10th ed. (1990) "
        "(from memory)",
    ),
    MaterialRow(
        "ti-6al-4v", "Titanium alloy Ti-6Al-4V (grade 5), annealed plate",
        113_800.0, 0.342, 828.0, 895.0, "titanium", 510.0, 1e7, True,
        "ASTM B265-15 grade 5, minimum yield 120 ksi and tensile 130 ksi; E, nu and typical "
        "unnotched fatigue strength (1e7 cycles) from ASM Materials Properties Handbook: Titanium "
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
