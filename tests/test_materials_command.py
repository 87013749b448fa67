"""`stressraiser materials` lists every row of the built-in table with its source, in any unit system.

Expected values: the table rows themselves (tests/test_materials.py checks them against their named
standards) and NIST SP 811 (2008) appendix B for ksi (1 ksi = 6.894757 MPa).
"""

from __future__ import annotations

import pytest

from stressraiser.cli.main import main
from stressraiser.geometry.materials import MATERIALS


def test_lists_every_row_with_its_source(capsys) -> None:
    assert main(["materials"]) == 0
    printed = capsys.readouterr().out
    for row in MATERIALS:
        assert f" {row.key}: {row.name}. {row.source}." in printed
    assert "from memory" in printed and "mill certificate" in printed


def test_in_ksi(capsys) -> None:
    assert main(["materials", "--units", "in-kip-ksi"]) == 0
    line = next(ln for ln in capsys.readouterr().out.splitlines() if ln.strip().startswith("a36 "))
    # ASTM A36 Fy 36 ksi (from memory, as in the table: 248.2 MPa / 6.894757 = 36.00 ksi, NIST SP 811)
    assert line.split()[4] == "36"


@pytest.mark.parametrize("units, yield_, ultimate, fatigue", [("in-kip-ksi", "68", "78", "23"),
                                                              ("in-lbf-psi", "68000", "78000", "23000")])
def test_inch_rows_print_the_standards_own_numbers(capsys, monkeypatch, units, yield_, ultimate, fatigue) -> None:
    # ASTM B209 7075-T6 sheet, minimum yield 68 ksi and tensile 78 ksi; ASM Handbook vol. 2 fatigue strength
    # 23 ksi (from memory, the row's source): printed as the source states them, not a round trip through
    # a rounded MPa value ("68023 psi")
    monkeypatch.setenv("COLUMNS", "200")
    assert main(["materials", "--units", units]) == 0
    line = next(ln for ln in capsys.readouterr().out.splitlines() if ln.strip().startswith("7075-t6 "))
    assert line.split()[4:7] == [yield_, ultimate, fatigue]


def test_bad_unit_system_is_exit_2(capsys) -> None:
    assert main(["materials", "--units", "cgs"]) == 2
    assert capsys.readouterr().err.startswith("stressraiser: command line:")
