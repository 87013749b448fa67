"""Hypothesis strategies for VALID-LOOKING parts, for fuzzing the whole pipeline (tests/test_fuzz_pipeline.py).

Where tests/fuzzparts.py feeds the reader hostile text, these strategies build parts a careful user could
have written: every raiser kind (hole, ellipse, slot, notch, window, shoulder step, lug end) and every load
(axial, bending, shear, their combinations, a pin with the cosine pressure or a rigid pin with clearance,
a remote stress state, holds and edge loads, several load cases, fastener groups that hold and pull),
an outline drawn by points with a concave recess, pushed to the corners of what the reader
accepts: extreme aspect ratios (a plate 200 widths long, an ellipse 50 times longer than wide), raisers
close to an edge or to each other, parts from a twentieth of a millimetre to tens of metres wide,
near-incompressible materials in plane strain, and every unit system. Many are still refused by the
geometry checks; the rest go on to the mesher and the solver.

A part is generated as a dictionary of PHYSICAL values in mm, N and MPa (`Part.data`) and written in its
unit system only when it becomes text (`Part.text`), so that the same part can be transformed exactly
(`scaled`, `stiffer`, `mirrored`, `in_units`) for the invariance properties.
"""

from __future__ import annotations

import copy
import math
from dataclasses import dataclass, replace
from typing import Any

from hypothesis import strategies as st

from fuzzparts import toml_text

# --- quantities of the part-file keys, and the unit systems -------------------------------------------

LENGTH_KEYS = {"length", "width", "thickness", "diameter", "depth", "radius", "x", "y", "center", "at", "from",
               "to", "clearance", "through", "points", "about"}
FORCE_KEYS = {"axial", "shear", "force"}
MOMENT_KEYS = {"bending", "moment"}
STRESS_KEYS = {"E", "yield", "ultimate", "sx", "sy", "txy", "pressure"}
NOT_QUANTITIES = {"mesh"}  # tables whose numbers are counts and fractions

# one unit of each system in mm, N and MPa: lbf and psi exact by their definitions (NIST SP 811, appendix B)
INCH = 25.4
LBF = 4.4482216152605
PSI = LBF / INCH**2
UNITS = {
    "mm-N-MPa": {"length": 1.0, "force": 1.0, "stress": 1.0},
    "in-lbf-psi": {"length": INCH, "force": LBF, "stress": PSI},
    "in-kip-ksi": {"length": INCH, "force": 1000 * LBF, "stress": 1000 * PSI},
}


def _scaled_values(node: Any, factor: dict[str, float], key: str = "") -> Any:
    """A copy of a part dictionary with every number multiplied by the factor of its key's quantity
    ("length", "force", "moment", "stress"); other numbers unchanged."""
    if isinstance(node, dict):
        return {k: (v if k in NOT_QUANTITIES else _scaled_values(v, factor, k)) for k, v in node.items()}
    if isinstance(node, list):
        return [_scaled_values(v, factor, key) for v in node]
    if isinstance(node, bool) or not isinstance(node, (int, float)):
        return node
    quantity = ("length" if key in LENGTH_KEYS else "force" if key in FORCE_KEYS else "moment"
                if key in MOMENT_KEYS else "stress" if key in STRESS_KEYS else None)
    return node * factor[quantity] if quantity else node


@dataclass(frozen=True)
class Part:
    """A generated part: its physical data (mm, N, MPa), the unit system it is written in, and what it is
    (the raiser kinds and loads, for the case counts)."""

    data: dict[str, Any]
    units: str = "mm-N-MPa"
    kinds: tuple[str, ...] = ()

    def written(self) -> dict[str, Any]:
        """The part-file dictionary in its own unit system."""
        unit = UNITS[self.units]
        factor = {"length": 1 / unit["length"], "force": 1 / unit["force"], "stress": 1 / unit["stress"],
                  "moment": 1 / (unit["force"] * unit["length"])}
        data = _scaled_values(self.data, factor)
        return {"units": self.units, **data} if self.units != "mm-N-MPa" else data

    def text(self) -> str:
        return toml_text(self.written())

    # --- exact transformations, for the invariance properties ---

    def scaled(self, k: float) -> Part:
        """Every length times k, forces times k², moments times k³: every stress, so every Kt, unchanged."""
        return replace(self, data=_scaled_values(self.data, {"length": k, "force": k * k, "moment": k**3,
                                                             "stress": 1.0}))

    def stiffer(self, factor: float) -> Part:
        """The modulus times `factor`: the stresses of a linear part (a pin without clearance) unchanged."""
        data = copy.deepcopy(self.data)
        data["material"]["E"] *= factor
        return replace(self, data=data)

    def in_units(self, units: str) -> Part:
        return replace(self, units=units)

    def mirrored(self) -> Part:
        """The mirror image in the centre line y = 0: every y negated, every angle and direction negated,
        top and bottom notches swapped, moments and transverse forces negated."""
        return replace(self, data=_mirror(self.data))


def _mirror(node: Any, key: str = "") -> Any:
    if isinstance(node, dict):
        out = {k: _mirror(v, k) for k, v in node.items()}
        if "side" in node and "angle" in node:  # a notch's angle is its opening, not a direction
            out["angle"] = node["angle"]
        if "from" in out and "to" in out:  # walking with the material on the left reverses in a mirror
            out["from"], out["to"] = out["to"], out["from"]
        return out
    if isinstance(node, list):
        if key in ("center", "at", "from", "to") and len(node) == 2:
            return [node[0], -node[1]]
        if key == "through":
            return [[p[0], -p[1]] for p in node]
        return [_mirror(v, key) for v in node]
    if key in ("angle", "direction", "bending", "shear", "txy", "y") and isinstance(node, (int, float)) \
            and not isinstance(node, bool):
        return -node
    if key == "side" and node in ("top", "bottom"):
        return {"top": "bottom", "bottom": "top"}[node]
    return node


def mirror_symmetric(part: Part) -> bool:
    """Whether the part is its own mirror image in y = 0 (its physical data unchanged by `mirrored`)."""
    def canonical(node: Any, key: str = "") -> Any:
        if isinstance(node, dict):
            return {k: canonical(v, k) for k, v in node.items()}
        if isinstance(node, list):
            return [canonical(v) for v in node]
        if key == "angle":  # a cut-out's axis: -180, 0 and 180 degrees are one direction
            return round(node % 180.0, 9) % 180.0 + 0.0
        if isinstance(node, float):
            return round(node, 9) + 0.0
        return node

    return canonical(part.data) == canonical(part.mirrored().data)


def centred(part: Part) -> bool:
    """Whether every raiser is a cut-out centred on the origin (no notch, step or lug end): such a part
    under a remote or end load is its own image through the origin, up to the held end."""
    data = part.data
    if any(key in data for key in ("notch", "step", "lug")):
        return False
    return all(item["center"] == [0.0, 0.0] for key in ("hole", "ellipse", "slot", "window")
               for item in data.get(key, []))


# --- the generator -----------------------------------------------------------------------------------

RAISER_KINDS = ("none", "hole", "holes", "ellipse", "slot", "notch", "window", "step", "lug", "drawn")
LOAD_KINDS = ("axial", "bending", "shear", "combined", "pin", "rigid pin", "remote", "edge", "cases", "fasteners")
ASPECTS = (1.2, 2.0, 3.0, 4.0, 6.0, 10.0, 30.0, 200.0)  # length / width


def log_uniform(low: float, high: float):
    return st.floats(math.log10(low), math.log10(high)).map(lambda e: 10.0**e)


def fraction(low: float, high: float):
    return st.floats(low, high)


@st.composite
def parts(draw, raisers=RAISER_KINDS, loads=LOAD_KINDS, budget: int = 12_000, units=tuple(UNITS)) -> Part:
    """A valid-looking part (physical values in mm, N, MPa) of one of the `raisers` families under one of
    the `loads`, written in one of `units`, with a small element budget."""
    size = draw(st.one_of(st.just(50.0), log_uniform(0.05, 50_000.0)))  # the width, mm
    width = size
    length = width * draw(st.sampled_from(ASPECTS))
    thickness = width * draw(st.one_of(st.just(0.1), log_uniform(0.01, 1.0)))
    stress = draw(st.one_of(st.just(100.0), log_uniform(0.5, 400.0)))  # the nominal stress level, MPa
    data: dict[str, Any] = {"title": "generated part", "plate": {"length": length, "width": width,
                                                                 "thickness": thickness}}
    near_incompressible = draw(st.integers(0, 9)) == 0
    if near_incompressible or draw(st.integers(0, 7)) == 0:
        data["plate"]["condition"] = "plane-strain"
    raiser = draw(st.sampled_from(raisers))
    load = draw(st.sampled_from(loads))
    if raiser == "drawn" and load not in ("edge", "fasteners"):  # a drawn outline has no loaded end
        load = draw(st.sampled_from(["edge", "fasteners"]))
    _raisers(draw, data, raiser, length, width)
    holes = data.get("hole", [])
    data["material"] = _material(draw, near_incompressible)
    data.update(_loads(draw, load, holes, length, width, thickness, stress))
    if load in ("edge", "fasteners") and "support" in data:
        data.pop("support")
    if draw(st.integers(0, 5)) == 0:
        data["section"] = [{"x": draw(st.floats(-0.45, 0.45)) * length}]
    if load == "fasteners" or raiser == "drawn":  # four graded bolt holes, or a graded recess: more elements
        budget = max(budget, 40_000)
    mesh = {"tolerance": 0.05, "max_levels": 3, "max_elements": budget}
    if near_incompressible and draw(st.booleans()) or draw(st.integers(0, 11)) == 0:
        mesh["order"] = 2
    data["mesh"] = mesh
    return Part(data, draw(st.sampled_from(units)), (raiser, load))


def _material(draw, near_incompressible: bool) -> dict[str, Any]:
    if near_incompressible:
        nu = draw(st.sampled_from([0.45, 0.49, 0.499, 0.4999]))
    else:
        nu = draw(st.one_of(st.sampled_from([0.0, 0.3, 0.33]), st.floats(-0.5, 0.45)))
    E = draw(st.one_of(st.sampled_from([70_000.0, 210_000.0]), log_uniform(1.0, 1.2e6)))
    material: dict[str, Any] = {"E": E, "nu": nu}
    if draw(st.booleans()):
        material["yield"] = draw(st.floats(100.0, 1000.0))
    return material


def _raisers(draw, data: dict[str, Any], kind: str, length: float, width: float) -> None:
    reach = 0.5 * length - 0.6 * width  # keep raisers off the ends' zones, mostly
    x = draw(st.floats(-1.0, 1.0)) * max(reach, 0.0)
    gap = width * draw(st.sampled_from([0.002, 0.01, 0.05, 0.2]))  # to an edge or another raiser
    if kind == "hole":
        d = width * draw(st.one_of(st.sampled_from([0.2, 0.5]), fraction(0.01, 0.9)))
        y = draw(st.sampled_from([0.0, 1.0, -1.0])) * max(0.5 * width - 0.5 * d - gap, 0.0)
        data["hole"] = [{"center": [x, y], "diameter": d}]
    elif kind == "holes":
        d = width * draw(fraction(0.02, 0.4))
        count = draw(st.integers(2, 4))
        across = draw(st.booleans())
        step = d + gap
        items = []
        for n in range(count):
            offset = (n - 0.5 * (count - 1)) * step
            items.append({"center": [x, offset] if across else [x + offset, 0.0], "diameter": d})
        data["hole"] = items
    elif kind == "ellipse":
        a = width * draw(fraction(0.02, 0.8))
        data["ellipse"] = [{"center": [x, 0.0], "length": a, "width": a * draw(log_uniform(0.02, 1.0)),
                            "angle": draw(st.one_of(st.sampled_from([0.0, 90.0]), st.floats(-180.0, 180.0)))}]
    elif kind == "slot":
        a = width * draw(fraction(0.05, 0.8))
        data["slot"] = [{"center": [x, 0.0], "length": a, "width": a * draw(fraction(0.05, 0.95)),
                         "angle": draw(st.one_of(st.sampled_from([0.0, 90.0]), st.floats(-180.0, 180.0)))}]
    elif kind == "notch":
        shape = draw(st.sampled_from(["U", "V", "semicircle"]))
        side = draw(st.sampled_from(["top", "bottom", "both"]))
        depth = width * draw(fraction(0.01, 0.45))
        notch: dict[str, Any] = {"x": x, "side": side, "shape": shape}
        if shape == "semicircle":
            notch["radius"] = depth
        elif shape == "U":
            notch.update(depth=depth, radius=depth * draw(log_uniform(0.02, 3.0)))
        else:
            notch.update(depth=depth, radius=depth * draw(fraction(0.01, 0.9)),
                         angle=draw(st.one_of(st.sampled_from([60.0, 90.0, 120.0]), st.floats(0.0, 170.0))))
        data["notch"] = [notch]
    elif kind == "window":
        a = width * draw(fraction(0.05, 0.8))
        b = a * draw(fraction(0.1, 1.0))
        data["window"] = [{"center": [x, 0.0], "length": a, "width": b,
                           "radius": 0.5 * min(a, b) * draw(fraction(0.02, 0.98)),
                           "angle": draw(st.one_of(st.sampled_from([0.0, 90.0]), st.floats(-180.0, 180.0)))}]
    elif kind == "step":
        data["step"] = {"x": x, "width": width * draw(fraction(0.2, 0.97)),
                        "radius": width * draw(log_uniform(0.005, 1.5)),
                        "narrow": draw(st.sampled_from(["loaded", "held"]))}
    elif kind == "drawn":  # the plate drawn by points, a recess in its top edge (a concave arc: corner 1)
        half_l, half_w = 0.5 * length, 0.5 * width
        r = width * draw(fraction(0.05, 0.3))
        bulge = -draw(st.sampled_from([1.0, math.tan(math.radians(22.5)), 0.2]))  # a half, quarter, shallow arc
        data["plate"] = {k: v for k, v in data["plate"].items() if k not in ("length", "width")}
        data["outline"] = {"points": [[-half_l, -half_w], [half_l, -half_w], [half_l, half_w], [x + r, half_w],
                                      {"to": [x - r, half_w], "bulge": bulge}, [-half_l, half_w]]}
        if draw(st.booleans()):
            data["hole"] = [{"center": [x, -0.2 * width], "diameter": width * draw(fraction(0.05, 0.3))}]
    elif kind == "lug":
        d = width * draw(fraction(0.15, 0.8))
        data["hole"] = [{"center": [0.5 * length - 0.5 * width, 0.0], "diameter": d}]
        data["lug"] = {"hole": 1}


def _loads(draw, kind: str, holes: list, length: float, width: float, thickness: float, stress: float
           ) -> dict[str, Any]:
    sign = draw(st.sampled_from([1.0, 1.0, 1.0, -1.0]))
    axial = sign * stress * width * thickness
    moment = stress * width**2 * thickness / 6
    out: dict[str, Any] = {}
    if draw(st.integers(0, 3)) == 0:
        out["support"] = {"held": "clamped"}
    if kind == "pin" or kind == "rigid pin":
        if not holes:
            kind = "axial"
        else:
            pin: dict[str, Any] = {"hole": draw(st.integers(1, len(holes))), "force": abs(axial),
                                   "direction": draw(st.one_of(st.just(0.0), st.floats(-60.0, 60.0)))}
            if kind == "rigid pin":
                d = holes[pin["hole"] - 1]["diameter"]
                pin.update(contact="rigid", clearance=d * draw(st.sampled_from([0.0, 0.005, 0.05])))
            out["load"] = {"pin": pin}
            return out
    if kind == "axial":
        out["load"] = {"axial": axial}
    elif kind == "bending":
        out["load"] = {"bending": sign * moment}
    elif kind == "shear":
        out["load"] = {"shear": sign * 0.2 * stress * width * thickness}
    elif kind == "combined":
        out["load"] = {"axial": axial, "bending": draw(st.floats(-1.0, 1.0)) * moment,
                       "shear": draw(st.floats(-0.2, 0.2)) * stress * width * thickness}
    elif kind == "remote":
        out.pop("support", None)
        out["load"] = {"remote": {"sx": stress, "sy": stress * draw(st.floats(-1.0, 1.0)),
                                  "txy": stress * draw(st.sampled_from([0.0, 0.0, 0.3]))}}
    elif kind == "edge":
        out["hold"] = [{"at": [-0.5 * length, 0.0], "mode": "fixed"}]
        if draw(st.booleans()):
            out["load"] = {"edge": [{"at": [0.5 * length, 0.0], "force": abs(axial),
                                     "direction": draw(st.sampled_from([0.0, 90.0, 180.0, 30.0]))}]}
        else:  # a pad pressing on part of the top edge, walking from right to left
            a = draw(st.floats(0.0, 0.4)) * length
            out["load"] = {"edge": [{"from": [a, 0.5 * width], "to": [a - 0.3 * width, 0.5 * width],
                                     "pressure": 0.2 * stress}]}
    elif kind == "fasteners":  # two bolts near each end: the left pair holds, the right pair pulls
        e, d = 0.5 * length - 0.3 * width, 0.12 * width
        first = len(holes) + 1
        added = [{"center": [sx * e, sy * 0.2 * width], "diameter": d} for sx in (-1, 1) for sy in (-1, 1)]
        clearance = d * draw(st.sampled_from([0.0, 0.005, 0.05]))
        out.pop("support", None)
        out["hole"] = holes + added
        out["fasteners"] = [{"name": "held", "holes": [first, first + 1], "clearance": clearance, "holds": True},
                            {"name": "pulled", "holes": [first + 2, first + 3], "clearance": clearance}]
        pull: dict[str, Any] = {"group": "pulled", "force": abs(axial),
                                "direction": draw(st.sampled_from([0.0, 30.0, 90.0, -45.0, 180.0]))}
        if draw(st.booleans()):
            pull["moment"] = draw(st.floats(-0.2, 0.2)) * moment
        out["load"] = {"fasteners": [pull]}
    elif kind == "cases":
        out["load"] = [{"name": "pull", "axial": axial}, {"name": "bend", "bending": moment},
                       {"name": "both", "axial": -0.5 * axial, "shear": 0.1 * stress * width * thickness}]
    return out


pipeline_parts = parts()

# the dozen parts the invariance properties are checked on: one raiser, a plain load, mm and the default
# budget of the solved cases
invariance_parts = parts(raisers=("hole", "ellipse", "slot", "notch", "window", "step", "lug"),
                         loads=("axial", "bending", "pin", "remote"), budget=30_000, units=("mm-N-MPa",))

COUNTS: dict[str, dict[str, int]] = {}  # each fuzz test's case counts, printed by tests/conftest.py
