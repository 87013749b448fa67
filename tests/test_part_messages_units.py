"""Every message about a part file speaks the part file's units: the errors raised while reading and checking
a part in inches name inches (and pounds-force, psi or ksi), never the millimetres the tool computes in.

The part is a 10 x 2 x 0.25 in strap with a 0.5 in hole (an invented scenario); each case breaks one thing.
Expected numbers are worked by hand beside each case from the part's own inches and the exact factors of
NIST SP 811 (2008), appendix B (1 in = 25.4 mm, 1 lbf = 4.4482216152605 N): the tool's limits are stated in
mm inside (geometry/validate.py: a ligament of 4 finest elements, each 0.1 % of the width; geometry/readers.py:
lengths up to 1e6 mm; compare/fatigue.py: Neuber's steel fit for Su 340-1700 MPa).
"""

from __future__ import annotations

import copy
import re

import pytest

from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import part_from_dict

from conftest import assert_refused, toml_text

STRAP_IN = {"units": "in-lbf-psi", "plate": {"length": 10.0, "width": 2.0, "thickness": 0.25},
            "hole": [{"center": [0.0, 0.0], "diameter": 0.5}],
            "material": {"E": 10.0e6, "nu": 0.33}, "load": {"axial": 4000.0}}
METRIC = re.compile(r"\bmm\b|mm²|MPa|\bN\b|N·mm|\bkN\b")


def inch_part(**tables):
    part = copy.deepcopy(STRAP_IN)
    for key, value in tables.items():
        if value is None:
            part.pop(key)
        else:
            part[key] = value
    return part


def _notch(**keys):
    return [{"side": "top", "shape": "U", **keys}]


# the limit of every ligament: 4 elements of 0.1 % of the 2 in width = 0.008 in
CASES = [
    # outline edges are named in inches: the long side at y = +1 in, the loaded end at x = +5 in
    ("an ellipse across the side", inch_part(ellipse=[{"center": [2.0, 0.9], "length": 0.6, "width": 0.3}]),
     "ellipse 1: crosses or touches the side y = 1 in"),
    ("a thin ligament", inch_part(slot=[{"center": [2.0, 0.7], "length": 1.0, "width": 0.599}]),
     "ligament to the side y = 1 in is 5e-04 in; at least 0.008 in is needed"),  # 1 - 0.7 - 0.2995 in
    ("a notch across the loaded end", inch_part(notch=_notch(x=4.95, depth=0.2, radius=0.1)),
     "notch 1: crosses or touches the loaded end x = 5 in"),
    # the shoulder step
    ("a step wider than the plate", inch_part(step={"x": 2.0, "width": 2.5, "radius": 0.2}),
     "step.width: the narrow width 2.5 in must be less than plate.width 2 in"),
    ("a fillet beyond the end", inch_part(step={"x": 4.0, "width": 1.0, "radius": 1.5}),
     "step.radius: a 1.5 in fillet from x = 4 in reaches x = 5.118 in"),  # 4 + sqrt(2 x 1.5 x 0.5 - 0.5²)
    ("no wide part left", inch_part(step={"x": -4.999, "width": 1.0, "radius": 0.0005}),
     "step.x: -4.999 in leaves 0.001 in of wide part; at least 0.008 in is needed"),
    ("a hole across the shoulder", inch_part(step={"x": 2.0, "width": 1.0, "radius": 0.1},
                                              hole=[STRAP_IN["hole"][0], {"center": [1.95, 0.8], "diameter": 0.2}]),
     "hole 2: crosses or touches the shoulder at x = 2 in"),
    # notches, a lug, slots and windows
    ("a notch on the fillet", inch_part(step={"x": 2.0, "width": 1.0, "radius": 0.25},
                                        notch=_notch(x=2.1, depth=0.1, radius=0.05)),
     "notch 1.x: x = 2.1 in lies on the step's shoulder fillet (x = 2 in to 2.25 in)"),
    ("a notch deeper than half the width", inch_part(notch=_notch(x=-2.0, depth=1.1, radius=0.1)),
     "notch 1.depth: 1.1 in is not less than half the width at x = -2 in (1 in)"),
    ("a V notch shallower than its radius",
     inch_part(notch=[{"x": -2.0, "side": "top", "shape": "V", "depth": 0.1, "radius": 0.2, "angle": 60.0}]),
     "a V notch must be at least as deep as its root radius (0.2 in); got 0.1 in"),
    ("a lug's pin hole off its centre", inch_part(hole=[{"center": [3.9, 0.0], "diameter": 0.5}], lug={"hole": 1},
                                                  load={"pin": {"hole": 1, "force": 4000.0}}),
     "its centre must be at (4, 0) in, half the width (1 in) from the loaded end; got (3.9, 0) in"),
    ("a slot shorter than wide", inch_part(slot=[{"center": [2.0, 0.0], "length": 0.4, "width": 0.5}]),
     "slot 1.length: 0.4 in must exceed the width 0.5 in"),
    ("a window rounded too far",
     inch_part(window=[{"center": [2.0, 0.0], "length": 1.0, "width": 0.5, "radius": 0.3}]),
     "window 1.radius: 0.3 in must be less than half the width and half the length (0.25 in)"),
    # what the mesh resolves: 1 % of the width long, a radius of 2 finest elements (0.004 in)
    ("a plate too short", inch_part(plate={"length": 0.01, "width": 2.0, "thickness": 0.25}, hole=None),
     "plate.length: 0.01 in is less than 1% of the width (0.02 in)"),
    ("a hole too small to mesh", inch_part(hole=[{"center": [0.0, 0.0], "diameter": 0.0001}]),
     "hole 1: radius 5e-05 in is below the smallest the mesh resolves, 0.004 in (0.2% of the plate width 2 in)"),
    # cuts, magnitudes and loads
    ("a cut beside the part", inch_part(section=[{"x": 6.0}]),
     "section 1: the cut x = 6 in misses the part (it spans x = -5 in to 5 in, y = -1 in to 1 in)"),
    ("a kilometre-long plate", inch_part(plate={"length": 1e9, "width": 2.0, "thickness": 0.25}),
     "plate.length: 1e+09 in is beyond the largest magnitude allowed, 3.94e+04 in"),  # 1e6 mm / 25.4
    ("no load", inch_part(load={"axial": 0.0}),
     "load.axial (lbf, positive in tension), load.bending (lbf·in) or load.shear (lbf)"),
    ("a pin's clearance too large", inch_part(load={"pin": {"hole": 1, "force": 4000.0, "contact": "rigid",
                                                            "clearance": 0.06}}),
     "load.pin.clearance: 0.06 in is not less than 10% of the hole's diameter (0.05 in)"),
]


@pytest.mark.parametrize("part, expected", [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_placement_and_shape_messages_are_in_inches(part, expected) -> None:
    with pytest.raises(PartError) as caught:
        part_from_dict(part)
    message = str(caught.value)
    assert expected in message, message
    assert METRIC.search(message) is None, message


def test_a_stress_limit_is_in_ksi() -> None:
    # Neuber's steel fit: Su 340-1700 MPa = 49.3-247 ksi (NIST SP 811: 1 ksi = 6.894757 MPa)
    part = inch_part(units="in-kip-ksi", material={"E": 29000.0, "nu": 0.3, "yield": 250.0, "ultimate": 300.0,
                                                   "family": "steel"},
                     load={"axial": 4.0}, fatigue={"min_fraction": 0.0, "max_fraction": 1.0,
                                                   "notch_sensitivity": "neuber"})
    with pytest.raises(PartError) as caught:
        part_from_dict(part)
    message = str(caught.value)
    assert "ultimate strength of 49.3-247 ksi; material.ultimate is 300 ksi" in message, message
    assert METRIC.search(message) is None, message


def test_the_command_line_prints_the_message_in_inches(tmp_path, capsys) -> None:
    # the same one line on stderr, exit 2, as every refused part file (a hole's ligament to the side y = +1 in)
    part = inch_part(hole=[{"center": [0.0, 0.7], "diameter": 0.599}])  # ligament 1 - 0.7 - 0.2995 in
    assert_refused(tmp_path, capsys, toml_text(part), ["hole 1: ligament to the side y = 1 in is 5e-04 in",
                                                       "at least 0.008 in is needed"])
