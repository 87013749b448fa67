"""Part-file keys for loads, supports and sections: what they read to, and one clear error line for
each mistake."""

from __future__ import annotations

import math

import pytest

from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import part_from_dict

from conftest import strap

BASE = strap(load=None)


def _part(load, **extra):
    return part_from_dict({**BASE, "load": load, **extra})


def test_loads_read_with_units_and_kinds():
    spec = _part({"axial": "12 kN", "bending": "0.5 kN*m", "shear": -300.0})
    assert (spec.load.axial, spec.load.bending, spec.load.shear) == pytest.approx((12000.0, 5.0e5, -300.0))
    assert spec.load.kind == "combined"
    assert _part({"bending": 1.0}).load.kind == "bending"
    assert _part({"shear": 1.0}).load.kind == "bending"
    remote = _part({"remote": {"sx": "10 ksi", "txy": 5.0}}).load.remote
    assert remote.sx == pytest.approx(68.9475729, rel=1e-6)  # 1 ksi = 6.894757 MPa (NIST SP 811)
    assert remote.sy == 0.0 and remote.txy == 5.0
    pin = _part({"pin": {"hole": 1, "force": "20 kN", "direction": 90}}).load.pin
    assert (pin.hole, pin.force, pin.angle) == (1, 20000.0, pytest.approx(math.pi / 2))
    spec = _part({"axial": 1.0}, support={"held": "clamped", "symmetry": ["y"]},
                 section=[{"x": 10.0}, {"through": [[0, -40], [10, 40]], "name": "slant"}])
    assert spec.support.held == "clamped" and spec.support.symmetry == ("y",)
    assert spec.sections[0].label == "x = 10" and spec.sections[1].label == "slant"


@pytest.mark.parametrize("load, extra, words", [
    ({}, {}, ["load", "every load is zero"]),
    ({"bending": 0.0}, {}, ["load.bending", "zero"]),
    ({"bending": "3 kN"}, {}, ["load.bending", "moment"]),
    ({"axial": 1.0, "remote": {"sx": 1.0}}, {}, ["load.remote", "cannot be combined"]),
    ({"axial": 1.0, "pin": {"hole": 1, "force": 1.0}}, {}, ["load.pin", "cannot be combined"]),
    ({"remote": {}}, {}, ["load.remote", "all zero"]),
    ({"remote": 5.0}, {}, ["load.remote", "table"]),
    ({"remote": {"sz": 1.0}}, {}, ["load.remote.sz", "unknown key"]),
    ({"pin": {"hole": 2, "force": 1.0}}, {}, ["load.pin.hole", "names no hole"]),
    ({"pin": {"hole": 0, "force": 1.0}}, {}, ["load.pin.hole", "[[hole]]"]),
    ({"pin": {"hole": 1, "force": -1.0}}, {}, ["load.pin.force", "greater than zero"]),
    ({"pin": {"hole": 1, "force": 1.0, "direction": 400}}, {}, ["load.pin.direction", "-360 to 360"]),
    ({"axial": 1.0}, {"support": {"held": "welded"}}, ["support.held", "clamped"]),
    ({"axial": 1.0}, {"support": {"symmetry": ["z"]}}, ["support.symmetry", "planes"]),
    ({"axial": 1.0}, {"support": {"symmetry": ["y", "y"]}}, ["support.symmetry", "distinct"]),
    ({"bending": 1.0}, {"support": {"symmetry": ["y"]}}, ["support.symmetry", "load.bending"]),
    ({"shear": 1.0}, {"support": {"symmetry": ["x"]}}, ["support.symmetry", "load.shear"]),
    ({"axial": 1.0}, {"support": {"symmetry": ["x"], "held": "clamped"}}, ["support.held", "plane x = 0"]),
    ({"remote": {"sx": 1.0}}, {"support": {"held": "clamped"}}, ["support.held", "remote"]),
    ({"axial": 1.0}, {"section": [{"x": 1.0, "y": 2.0}]}, ["section 1", "exactly one"]),
    ({"axial": 1.0}, {"section": [{"x": 400.0}]}, ["section 1", "misses the part"]),
    ({"axial": 1.0}, {"section": [{"through": [[0, 0], [0, 0]]}]}, ["section 1", "same"]),
    ({"axial": 1.0}, {"section": {"x": 1.0}}, ["section", "[[section]]"]),
])
def test_mistakes_name_the_key(load, extra, words):
    with pytest.raises(PartError) as err:
        _part(load, **extra)
    message = str(err.value)
    assert "\n" not in message
    for word in words:
        assert word in message, message


def test_symmetry_needs_a_symmetric_part():
    with pytest.raises(PartError) as err:
        part_from_dict({**BASE, "hole": [{"center": [0.0, 10.0], "diameter": 22.0}], "load": {"axial": 1.0},
                        "support": {"symmetry": ["y"]}})
    assert "support.symmetry" in str(err.value) and "mirrored" in str(err.value)
    spec = part_from_dict({**BASE, "hole": [{"center": [0.0, 20.0], "diameter": 10.0},
                                            {"center": [0.0, -20.0], "diameter": 10.0}],
                           "load": {"axial": 1.0}, "support": {"symmetry": ["y"]}})
    assert spec.support.symmetry == ("y",)
