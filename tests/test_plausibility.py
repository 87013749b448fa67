"""Inputs that were probably not what was meant get a plain warning naming the likely slip: E in GPa, a
load far too small, a compressed slender strap, a peak the material cannot carry. Each warning keeps its
numbers' kinds, so it prints in the part file's units."""

from __future__ import annotations

import json
import math
import re
from dataclasses import replace

import pytest

from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.compare.plausibility import euler_load, input_warnings
from stressraiser.geometry.partfile import load_part, part_from_dict

from conftest import EXAMPLES, plate_with_hole


def words(result) -> str:
    return " | ".join(str(w) for w in result.warnings)


@pytest.fixture(scope="module")
def hinge_in_gpa():
    # The bundled gate hinge strap (rigid pin, 0.1 mm clearance, S275-like yield 275 MPa) with E typed as 205
    # (GPa) in a file whose stresses are MPa: its Kt moved 29 % with no warning before.
    spec = load_part(EXAMPLES / "gate_hinge_strap.toml")
    return check_part(replace(spec, material=replace(spec.material, E=205.0)))


def test_modulus_below_yield_names_the_unit_slip(hinge_in_gpa):
    text = words(hinge_in_gpa)
    assert "material.E = 205 MPa is below the yield strength 275 MPa" in text
    assert "GPa" in text


def test_large_strain_large_displacement_and_clearance_are_warned(hinge_in_gpa):
    text = words(hinge_in_gpa)
    # peak / E: about 200 MPa / 205 MPa; the small-strain model holds to 2 % (compare/plausibility.py)
    assert 95 <= int(re.search(r"the peak strain is about (\d+)%", text).group(1)) <= 99
    # the pin travels about 50 mm on a 220 mm strap: beyond 10 % of the size (elastica, model_limits.py)
    assert "the largest displacement" in text and "of the part's size 220 mm" in text
    # the hole deforms by centimetres against a 0.1 mm clearance: the clearance no longer counts
    assert "times the pin's clearance 0.1 mm" in text


def test_the_bundled_hinge_with_its_real_modulus_gets_none_of_them():
    result = check_part(load_part(EXAMPLES / "gate_hinge_strap.toml"))
    text = words(result)
    for phrase in ("material.E", "peak strain", "largest displacement", "clearance", "Euler", "exceeds"):
        assert phrase not in text


def test_inch_parts_name_the_inch_unit_slip():
    # E = 29 meant as 29 Msi (29,000 ksi) in an in-kip-ksi part; the warning prints in ksi.
    spec = part_from_dict({
        "units": "in-kip-ksi",
        "plate": {"length": 12.0, "width": 3.0, "thickness": 0.25},
        "hole": [{"center": [0.0, 0.0], "diameter": 0.75}],
        "material": {"E": 29.0, "nu": 0.3, "yield": 36.0},
        "load": {"axial": 10.0},
        "mesh": {"tolerance": 0.05},
    })
    warnings = input_warnings(spec, check_part(spec).solution, 1.0)
    shown = " | ".join(w.text(spec.units) for w in warnings)
    assert "material.E = 29 ksi is below the yield strength 36 ksi" in shown and "Msi" in shown


def strut(**load) -> dict:
    # A 3 m x 80 x 2 mm strap (steel, yield 355, ultimate 510 MPa), held at one end, pushed at the other.
    return {
        "title": "slender strap",
        "plate": {"length": 3000.0, "width": 80.0, "thickness": 2.0},
        "material": {"E": 210000.0, "nu": 0.3, "yield": 355.0, "ultimate": 510.0},
        "load": load,
        "mesh": {"tolerance": 0.05},
    }


def test_euler_load_of_the_strap():
    # Euler (common practice): pinned-pinned column, Pcr = pi^2 E I / L^2, weak axis I = W t^3 / 12.
    spec = part_from_dict(strut(axial=-120000.0))
    expected = math.pi ** 2 * 210000.0 * (80.0 * 2.0 ** 3 / 12.0) / 3000.0 ** 2  # 12.28 N
    assert euler_load(spec, 3000.0) == pytest.approx(expected, rel=1e-12)
    assert expected == pytest.approx(12.28, abs=0.01)


def test_compressed_slender_strap_warns_buckling_and_the_overload(tmp_path, capsys):
    part = tmp_path / "strut.toml"
    part.write_text('title = "slender strap"\n[plate]\nlength = 3000.0\nwidth = 80.0\nthickness = 2.0\n'
                    "[material]\nE = 210000.0\nnu = 0.3\nyield = 355.0\nultimate = 510.0\n"
                    "[load]\naxial = -120000.0\n[mesh]\ntolerance = 0.05\n", encoding="utf-8")
    out = tmp_path / "strut.json"
    main(["check", str(part), "--json", str(out), "--quiet"])
    record = " | ".join(json.loads(out.read_text())["warnings"])
    # -120 kN on 160 mm^2: -750 MPa, above the 510 MPa ultimate
    assert "the elastic peak -750 MPa exceeds the ultimate strength 510 MPa" in record
    # 120 kN is 9,770 times the Euler load 12.28 N (the assertion above): it buckles
    assert "its Euler load 12.28 N" in record and "pinned-pinned" in record and "buckles" in record


def test_a_compression_far_below_the_euler_load_is_not_warned():
    # 1 kN on a 300 x 80 x 10 mm strap: Pcr = pi^2 E (80 x 10^3 / 12) / 300^2 = 153.5 kN, 0.65 % of it.
    spec = plate_with_hole(axial=-1000.0, tolerance=0.05)
    assert "Euler" not in words(check_part(spec))


def test_buckling_threshold_is_half_the_euler_load():
    # Just above and just below 0.5 Pcr of a plain 1000 x 40 x 4 mm strap (common practice: an initial bow
    # is amplified 1 / (1 - P / Pcr), doubled at half the Euler load).
    base = part_from_dict({**strut(axial=-1.0), "plate": {"length": 1000.0, "width": 40.0, "thickness": 4.0}})
    critical = euler_load(base, 1000.0)
    solution = check_part(base).solution
    for share, warned in ((0.51, True), (0.49, False)):
        spec = replace(base, load=replace(base.load, axial=-share * critical))
        found = " | ".join(str(w) for w in input_warnings(spec, solution, -1.0))
        assert ("Euler" in found) is warned, share


def test_a_load_given_in_n_but_meant_in_kn_is_warned():
    # axial = 10 meant as 10 kN: 10 N on the 80 x 10 mm strap with a 22 mm hole, a peak near 0.04 MPa,
    # far below 1 % of the 355 MPa yield (issue's rule).
    spec = plate_with_hole(axial=10.0, tolerance=0.05)
    spec = replace(spec, material=replace(spec.material, yield_strength=355.0))
    text = words(check_part(spec))
    assert "below 1% of the yield strength 355 MPa" in text and "load.axial" in text


def test_a_sound_loaded_strap_has_no_plausibility_warning():
    spec = load_part(EXAMPLES / "winch_strap.toml")  # 120 kN, peak about 496 MPa, ultimate 510 MPa
    assert words(check_part(spec)) == ""
