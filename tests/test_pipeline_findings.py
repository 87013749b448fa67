"""What the whole-pipeline fuzz test (tests/test_fuzz_pipeline.py) found, each held here by a test of its
own: parts a user could write that failed past the reader."""

from __future__ import annotations

import pytest

from stressraiser.compare.check import check_part
from stressraiser.geometry.partfile import part_from_dict

NOTCH_STRAP = {"plate": {"length": 300.0, "width": 50.0, "thickness": 6.0},
               "material": {"E": 200000.0, "nu": 0.3}, "load": {"axial": 30000.0}}


def notched(notch: dict, tolerance: float = 0.02, order: int = 1, **tables):
    part = {**NOTCH_STRAP, "notch": [{"x": 0.0, "side": "top", **notch}],
            "mesh": {"tolerance": tolerance, "max_levels": 6, "order": order}, **tables}
    return check_part(part_from_dict(part))


def within_band(result, value: float) -> bool:
    return abs(result.kt.net - value) <= result.kt.error * result.kt.net + 1e-12


# --- a root arc of a quarter turn or less: one band piece across the axis, where the wire is split ------

@pytest.mark.parametrize("angle", [90.0, 120.0, 150.0])
def test_a_wide_v_notch_meshes_and_is_milder_than_the_u_notch(angle):
    """A V opening 90 degrees or more has a root arc of at most a quarter turn; gmsh refused its band patch
    ("transfinite but has 5 corners", exit 3). It meshes and converges now, and its Kt lies below the U
    notch's of the same depth and root radius: the wider the flanks open, the less load flows round the root
    (Peterson (Pilkey), Peterson's Stress Concentration Factors, 3rd ed., the V-notch chart of section 2:
    the V's Kt equals the U's up to about 90 degrees and falls below it for wider openings; from memory)."""
    v = notched({"shape": "V", "depth": 6.0, "radius": 1.0, "angle": angle})
    u = notched({"shape": "U", "depth": 6.0, "radius": 1.0})
    assert v.kt.converged and u.kt.converged
    assert 1.0 < v.kt.net <= u.kt.net * (1 + u.kt.error + v.kt.error)


def test_a_wide_v_notch_agrees_with_quadratic_triangles():
    """The same V notch with 6-node triangles (an independent element, converging on its own sequence):
    the two Kt agree within their bands."""
    linear = notched({"shape": "V", "depth": 6.0, "radius": 1.0, "angle": 120.0})
    quadratic = notched({"shape": "V", "depth": 6.0, "radius": 1.0, "angle": 120.0}, order=2)
    assert linear.kt.converged and quadratic.kt.converged
    gap = abs(linear.kt.net - quadratic.kt.net)
    assert gap <= linear.kt.error * linear.kt.net + quadratic.kt.error * quadratic.kt.net, (linear.kt, quadratic.kt)


def test_a_shallow_u_notch_meshes_and_is_milder_than_a_semicircle_of_its_depth():
    """A U notch much shallower than its radius (a circular arc of 74 degrees) failed like the wide V. Its
    Kt lies between 1 and that of a semicircular notch of radius equal to its depth, 3.065 for h/r = 1
    (Peterson, 3rd ed., chart 2.2 fit Kt = 0.855 + 2.21 sqrt(h/r), from memory; docs/references.md
    [Peterson]): the same depth with a blunter root."""
    result = notched({"shape": "U", "depth": 1.0, "radius": 5.0})
    assert result.kt.converged
    assert 1.0 < result.kt.net < 3.065


# --- shoulder fillets whose bands closed across the narrow part ----------------------------------------

def stepped(radius: float, narrow: float, order: int = 1):
    return check_part(part_from_dict({
        "plate": {"length": 200.0, "width": 50.0, "thickness": 5.0},
        "step": {"x": 0.0, "width": narrow, "radius": radius},
        "material": {"E": 200000.0, "nu": 0.3}, "load": {"axial": 5000.0},
        "mesh": {"tolerance": 0.02, "max_levels": 6, "order": order}}))


def test_fillets_larger_than_a_narrow_part_keep_their_bands_apart():
    """Fillets of radius 50 mm into a 10 mm narrow part: each fillet's band was sized from its distance to
    the ends alone, the two bands crossed the narrow part and the mesh fell apart ("the part split into 2
    pieces", exit 3). The opposite fillet now bounds each band. Against the same part in 6-node triangles
    (an independent element): the Kt agree within their bands, and a gentle taper stays above 1."""
    linear, quadratic = stepped(50.0, 10.0), stepped(50.0, 10.0, order=2)
    assert linear.kt.converged and quadratic.kt.converged
    assert linear.kt.net > 1.0
    gap = abs(linear.kt.net - quadratic.kt.net)
    assert gap <= linear.kt.error * linear.kt.net + quadratic.kt.error * quadratic.kt.net, (linear.kt, quadratic.kt)


# --- an infinite Kt in the JSON record ---------------------------------------------------------------------

def test_an_infinite_kt_is_written_as_null_and_the_record_validates(tmp_path):
    """Where the nominal stress vanishes on the section, Kt is infinite (compare/check.py `_kt`) and the
    record writes it as null (JSON has no infinity: cli/files.py `finite_or_null`); the schema required a
    number there, so such a record failed its own schema. The check's result with its Kt made infinite, as a
    vanishing nominal makes it, gives a record that validates, with null Kt and band."""
    import dataclasses
    import json

    import jsonschema

    from conftest import STRAP
    from stressraiser.cli.files import write_json
    from stressraiser.cli.record import check_record
    from stressraiser.cli.schema import check_schema

    result = check_part(part_from_dict({**STRAP, "mesh": {"tolerance": 0.05}}))
    infinite = dataclasses.replace(result, kt=dataclasses.replace(result.kt, net=float("inf"), gross=float("inf")),
                                   peaks=tuple(dataclasses.replace(p, kt_net=float("inf"), kt_gross=float("inf"))
                                                      for p in result.peaks))
    path = tmp_path / "out.json"
    write_json(path, check_record(infinite))
    record = json.loads(path.read_text(encoding="utf-8"))
    assert record["kt"]["net"] is None and record["kt"]["net_band"] == [None, None]
    jsonschema.Draft202012Validator(check_schema()).validate(record)


# --- a plate with no raiser: nothing refined, yet "converged ± 0.00 %" ---------------------------------

def test_a_plain_clamped_plate_is_refined_and_never_converged_on_repeated_meshes(capsys):
    """A clamped plate with no raiser under an axial pull: the far-field size did not follow the level, so
    every level was the same mesh with the same peak, and the study said "converged ± 0.00 %". Now each
    level is finer than the one before, the peak's band is not zero, and away from the clamp the stress is
    the statics value N / (W t) = 150 MPa (a uniform bar: exact for constant-strain triangles)."""
    from stressraiser.cli.summary import print_levels
    from stressraiser.cli.terminal import out_console

    result = check_part(part_from_dict({"plate": {"length": 300.0, "width": 80.0, "thickness": 10.0},
                                        "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 120000.0},
                                        "support": {"held": "clamped"},
                                        "mesh": {"tolerance": 0.01, "max_levels": 4}}))
    elements = [lv.elements for lv in result.study.levels]
    assert all(b > a for a, b in zip(elements, elements[1:])), elements
    assert result.kt.error > 0.0
    assert result.net_section.average == pytest.approx(150.0, rel=1e-9)
    print_levels(result, out_console())
    assert "None" not in capsys.readouterr().out  # the table named the peak's raiser "None"


def test_repeated_meshes_are_never_called_converged():
    """fem.convergence.refined: three levels with the same element count say nothing about the error."""
    from stressraiser.fem.convergence import Level, refined

    def level(elements: int) -> Level:
        return Level(scale=1.0, nodes=elements, elements=elements, peak=1.0, location=(0.0, 0.0), seconds={})

    assert not refined([level(416), level(416), level(416)])
    assert not refined([level(100), level(400), level(400)])
    assert refined([level(100), level(400), level(1600)])


# --- a pin pulling across a long strap --------------------------------------------------------------------

def test_a_pin_across_a_long_strap_takes_the_nominal_at_the_pin():
    """A pin pulling a 2 m strap sideways: its Kt was once referred to a nominal away from the pin (Kt in the
    thousands of a meaningless section). The nominal is P / A_net on the cut through the pin hole across the
    pin's line (README, Loads: the pin's net section), here along the whole strap: 20 kN / ((2000 - 22) mm x
    10 mm); the peak is the strap's bending at its held end, far from the pin, and is warned as such."""
    spec = part_from_dict({"plate": {"length": 2000.0, "width": 80.0, "thickness": 10.0},
                           "hole": [{"center": [0.0, 0.0], "diameter": 22.0}],
                           "material": {"E": 210000.0, "nu": 0.3},
                           "load": {"pin": {"hole": 1, "force": 20000.0, "direction": 90.0}},
                           "mesh": {"tolerance": 0.05, "max_levels": 3}})
    result = check_part(spec)
    nominal = 20000.0 / ((2000.0 - 22.0) * 10.0)
    assert result.nominal.net.stress == pytest.approx(nominal, rel=1e-6)
    assert result.kt.net == pytest.approx(abs(result.peak.stress) / nominal, rel=1e-9)
    assert any("away from every feature" in str(w) for w in result.warnings)


# --- a round ellipse turned a little: a half model that sliced its band ---------------------------------

def test_a_round_ellipse_turned_a_little_is_meshed_whole_and_matches_the_hole():
    """An ellipse as long as it is wide, turned a third of a degree: as a region it is its own mirror image,
    so the part was meshed as its half, and the cut along y = 0 sliced the band quarters (which start on the
    ellipse's axis, a third of a degree off the cut) into slivers: "364 degenerate triangles", exit 3. A
    raiser whose axis does not mirror onto itself now makes the part whole; its Kt is the round hole's:
    Peterson (Pilkey), 3rd ed., chart 4.1 fit, Ktn = 2 + 0.284 (1 - x) - 0.600 (1 - x)^2 + 1.32 (1 - x)^3
    at x = d/W = 0.32 (docs/references.md [Peterson]; a curve fit, 3 %)."""
    from stressraiser.geometry.symmetry import mirror_symmetric

    part = {"plate": {"length": 300.0, "width": 50.0, "thickness": 5.0},
            "ellipse": [{"center": [0.0, 0.0], "length": 16.0, "width": 16.0, "angle": -1.0 / 3.0}],
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 10000.0},
            "mesh": {"tolerance": 0.02, "max_levels": 5}}
    spec = part_from_dict(part)
    assert not mirror_symmetric(spec, "y")
    result = check_part(spec)
    x = 0.32
    peterson = 2 + 0.284 * (1 - x) - 0.600 * (1 - x) ** 2 + 1.32 * (1 - x) ** 3
    assert result.kt.converged
    assert result.kt.net == pytest.approx(peterson, rel=0.03)


# --- a fillet a hair below the step: a sliver of a shoulder face ---------------------------------------

def shouldered(radius: float) -> dict:
    return {"plate": {"length": 400.0, "width": 60.0, "thickness": 8.0},
            "step": {"x": 0.0, "width": 40.0, "radius": radius},
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 40000.0},
            "mesh": {"tolerance": 0.02}}


def test_a_fillet_a_hair_below_the_step_is_refused_naming_the_face(tmp_path, capsys):
    """A fillet 0.1 mm smaller than its 10 mm step leaves a shoulder face 0.1 mm long, below the 0.24 mm
    the mesh can resolve on a 60 mm part (four of its finest elements, as for a ligament): the mesher made
    degenerate triangles there (exit 3). Refused now, naming step.radius and the face."""
    from conftest import assert_refused, toml_text

    assert_refused(tmp_path, capsys, toml_text(shouldered(9.9)), ["step.radius", "shoulder face of 0.1 mm"])


def test_a_fillet_equal_to_the_step_meets_the_handbook():
    """The fillet equal to the step (no face) is accepted; its Kt against Young and Budynas, Roark's
    Formulas for Stress and Strain, 7th ed., table 17.1, stepped flat bar in tension (docs/references.md
    [Roark]): h/r = 1, s = 1, x = 2h/D = 1/3: C1 = 1.976, C2 = -0.385, C3 = -1.022, C4 = 0.431,
    Kt = C1 + C2 x + C3 x^2 + C4 x^3 = 1.750; a curve fit, 3 %."""
    result = check_part(part_from_dict(shouldered(10.0)))
    x = 1.0 / 3.0
    roark = 1.976 - 0.385 * x - 1.022 * x**2 + 0.431 * x**3
    assert result.kt.converged
    assert result.kt.net == pytest.approx(roark, rel=0.03)


# --- a U notch a hair off a semicircle ----------------------------------------------------------------

@pytest.mark.parametrize("depth", [9.9, 10.02])
def test_a_u_notch_a_hair_off_its_radius_is_refused(tmp_path, capsys, depth):
    """A U notch 1 % shallower or 0.2 % deeper than its 10 mm radius: its band's end line ran a sliver away
    from the plate's edge and the mesher made degenerate triangles (or lost the part: "split into 0
    pieces"), exit 3. Refused now, naming notch 1.depth and the radius."""
    from conftest import assert_refused, toml_text

    part = {**NOTCH_STRAP, "notch": [{"x": 0.0, "side": "top", "shape": "U", "depth": depth, "radius": 10.0}]}
    assert_refused(tmp_path, capsys, toml_text(part), ["notch 1.depth", "of the radius 10 mm"])


def test_a_u_notch_as_deep_as_its_radius_is_the_semicircle():
    """depth = radius is accepted, and is the semicircular notch: the same Kt as `shape = "semicircle"`
    within the bands (the same cut-out, meshed alike)."""
    u = notched({"shape": "U", "depth": 10.0, "radius": 10.0})
    semicircle = notched({"shape": "semicircle", "radius": 10.0})
    assert u.kt.converged and semicircle.kt.converged
    assert abs(u.kt.net - semicircle.kt.net) <= (u.kt.error + semicircle.kt.error) * u.kt.net


def test_a_fillet_a_hair_larger_than_the_step_is_refused(tmp_path, capsys):
    """A fillet 1.3 % larger than its 10 mm step meets the wide edge at under a degree: its band's end line
    ran a sliver from the edge and the mesher made degenerate triangles (exit 3). Refused now, naming
    step.radius and the step; a radius 5 % larger meshes and converges."""
    from conftest import assert_refused, toml_text

    assert_refused(tmp_path, capsys, toml_text(shouldered(10.13)), ["step.radius", "of the 10 mm step"])
    assert check_part(part_from_dict(shouldered(10.5))).kt.converged
