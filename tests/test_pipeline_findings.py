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
