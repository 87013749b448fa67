"""The registry of raiser and outline kinds: the (kind, number) names, the order of PartSpec.raisers, the
mirror images of every kind under symmetry planes, handbook matching that never matches a part with a
raiser or outline feature the case does not describe, and the one base of the errors a user must fix."""

from __future__ import annotations

import itertools

import pytest

from stressraiser.cli.errors import CommandLineError, OutputError, SchedulerError
from stressraiser.compare.check import check_part
from stressraiser.compare.handbook import BUILDERS, RECOGNISERS, handbook_matches
from stressraiser.compare.pin_cases import build_square_lug
from stressraiser.geometry.errors import InputError, PartError
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RAISER_KINDS, RaiserId, named, part_features, raiser_ids
from stressraiser.geometry.symmetry import mirror_names

from conftest import strap


def test_names_print_order_and_hash():
    names = [RaiserId("notch", 2), RaiserId("hole", 10), RaiserId("hole", 2)]
    assert [str(n) for n in sorted(names)] == ["hole 2", "hole 10", "notch 2"]
    assert {RaiserId("hole", 2): 1}[RaiserId("hole", 2)] == 1


def test_raisers_are_kinds_in_registry_order_entries_in_file_order():
    # the part file lists a notch, then holes, then an ellipse: PartSpec.raisers puts the kinds in the
    # registry's order, each kind's entries in the file's order, and numbers them within their kind
    spec = part_from_dict(strap(
        notch=[{"x": 100.0, "side": "top", "shape": "semicircle", "radius": 3.0}],
        hole=[{"center": [-60.0, 0.0], "diameter": 10.0}, {"center": [0.0, 0.0], "diameter": 12.0}],
        ellipse=[{"center": [60.0, 0.0], "length": 12.0, "width": 6.0}]))
    order = [k.NAME for k in RAISER_KINDS]
    assert [str(rid) for rid, _ in named(spec)] == ["hole 1", "hole 2", "ellipse 1", "notch 1"]
    assert [order.index(rid.kind) for rid, _ in named(spec)] == sorted(order.index(rid.kind) for rid, _ in named(spec))
    assert [h.diameter for h in spec.holes] == [10.0, 12.0]
    assert part_features(spec) == {"hole": 2, "ellipse": 1, "notch": 1}


def test_a_step_names_its_two_fillets():
    spec = part_from_dict(strap(hole=None, step={"x": 20.0, "width": 60.0, "radius": 6.0}))
    assert raiser_ids(spec) == (RaiserId("fillet", 1), RaiserId("fillet", 2))
    assert part_features(spec) == {"fillet": 2, "step": 1}
    assert mirror_names(spec, "y") == {RaiserId("fillet", 1): RaiserId("fillet", 2),
                                       RaiserId("fillet", 2): RaiserId("fillet", 1)}


# --- mirror images under symmetry planes ---------------------------------------------------------------

MIRRORED = [
    # (what, raisers, plane, the two names that mirror each other)
    ("holes", {"hole": [{"center": [-50.0, 10.0], "diameter": 16.0}, {"center": [50.0, 10.0], "diameter": 16.0}]},
     "x", ("hole 1", "hole 2")),
    ("slots", {"slot": [{"center": [-50.0, 0.0], "length": 30.0, "width": 10.0, "angle": 30.0},
                        {"center": [50.0, 0.0], "length": 30.0, "width": 10.0, "angle": 150.0}]},
     "x", ("slot 1", "slot 2")),
    ("ellipses", {"ellipse": [{"center": [0.0, 18.0], "length": 16.0, "width": 8.0, "angle": 30.0},
                              {"center": [0.0, -18.0], "length": 16.0, "width": 8.0, "angle": -30.0}]},
     "y", ("ellipse 1", "ellipse 2")),
    ("notches", {"notch": [{"x": 0.0, "side": "top", "shape": "U", "depth": 8.0, "radius": 4.0},
                           {"x": 0.0, "side": "bottom", "shape": "U", "depth": 8.0, "radius": 4.0}]},
     "y", ("notch 1", "notch 2")),
]


@pytest.mark.parametrize("what, raisers, plane, pair", MIRRORED, ids=[m[0] for m in MIRRORED])
def test_mirrored_raisers_keep_their_own_names_and_peaks(what, raisers, plane, pair):
    # A half model about `plane`: only one raiser of each mirror pair is meshed, the other is its image
    # when the model is unfolded. Each must be reported under its own name (before, every kind but holes
    # took the meshed one's name, and one of the two vanished), with its own peak on every level; the two
    # peaks are mirror images of each other, so they agree within the error band (exactly, in fact).
    spec = part_from_dict(strap(**{"hole": None, **raisers}, load={"axial": 100000.0},
                                support={"symmetry": [plane]}, mesh={"tolerance": 0.02}))
    a, b = (RaiserId(name.split()[0], int(name.split()[1])) for name in pair)
    assert mirror_names(spec, plane) == {a: b, b: a}
    result = check_part(spec)
    for level in result.study.levels:
        assert {a, b} <= set(level.raisers)
        assert level.raisers[a][0] == pytest.approx(level.raisers[b][0], rel=1e-12)
    peaks = {p.feature: p for p in result.peaks}
    assert {a, b} <= set(peaks)
    band = max(peaks[a].error, peaks[b].error)
    assert abs(peaks[a].stress - peaks[b].stress) <= band * abs(peaks[a].stress)
    # each on its own side of the plane
    axis = 0 if plane == "x" else 1
    assert peaks[a].location[axis] * peaks[b].location[axis] < 0.0


# --- handbook matching: a case must describe the whole part --------------------------------------------

def _bases() -> dict[str, dict]:
    """A part each handbook family recognises (its own builder's), keyed by family."""
    return {
        "central-hole-tension": BUILDERS["central-hole-tension"]({"d/W": 0.3}),
        "elliptical-hole-wide-plate": BUILDERS["elliptical-hole-wide-plate"]({"a/b": 2.0, "load angle": 90.0,
                                                                              "hole span/W": 0.04}),
        "opposite-u-notches": BUILDERS["opposite-u-notches"]({"h/r": 1.0, "2h/D": 0.2}),
        "edge-u-notch-semi-infinite": BUILDERS["edge-u-notch-semi-infinite"]({"h/r": 2.0, "h/W": 0.01}),
        "stepped-bar-fillets": BUILDERS["stepped-bar-fillets"]({"h/r": 1.0, "2h/D": 0.4}),
        "row-of-holes": BUILDERS["row-of-holes"]({"d/l": 0.4, "holes": 7}),
        "opposite-u-notches-bending": BUILDERS["opposite-u-notches-bending"]({"h/r": 1.0, "2h/D": 0.3}),
        "stepped-bar-fillets-bending": BUILDERS["stepped-bar-fillets-bending"]({"h/r": 1.0, "2h/D": 0.4}),
        "pin-loaded-square-lug": build_square_lug({"d/H": 0.4}),
    }


# one small raiser of each kind, at x (mm) in a plate of width W (mm), as a part-file entry
EXTRA_RAISERS = {
    "hole": lambda x, s: {"center": [x, 0.0], "diameter": s},
    "ellipse": lambda x, s: {"center": [x, 0.0], "length": s, "width": 0.5 * s, "angle": 30.0},
    "slot": lambda x, s: {"center": [x, 0.0], "length": 2.0 * s, "width": s, "angle": 0.0},
    "notch": lambda x, s: {"x": x, "side": "top", "shape": "semicircle", "radius": 0.5 * s},
}


def with_extra(part: dict, kind: str, entry=None) -> dict:
    """`part` with one more raiser (or outline feature) of `kind`, small (4 % of the width), a third of the
    way from the held end to the middle, clear of everything else; `entry(x, size)` makes the part-file
    entry of a raiser kind (default: EXTRA_RAISERS)."""
    L, W = part["plate"]["length"], part["plate"]["width"]
    x, s = -0.35 * L, 0.04 * W
    out = dict(part)
    if kind == "step":
        out["step"] = {"x": -0.25 * L, "width": 0.9 * W, "radius": 0.02 * W, "narrow": "held"}
    elif kind == "lug":  # the loaded end rounded about the pin's hole, which moves to half a width from it
        out["hole"] = [{**part["hole"][0], "center": [0.5 * (L - W), 0.0]}]
        out["lug"] = {"hole": 1}
    else:
        out[kind] = list(part.get(kind, [])) + [(entry or EXTRA_RAISERS[kind])(x, s)]
    return out


def recogniser_of(family: str):
    """The recogniser of a handbook family (the one that accepts that family's base part)."""
    return next(r for r in RECOGNISERS if (found := r(part_from_dict(BASES[family]))) and found.family == family)


BASES = _bases()
EXTRAS = list(EXTRA_RAISERS) + ["step", "lug"]


def _can_take(family: str, extra: str) -> bool:
    """A part has at most one step and one lug end, and a lug end is loaded through its pin."""
    if extra == "lug":
        return BASES[family]["load"].get("pin") is not None
    return extra != "step" or "step" not in BASES[family]


@pytest.mark.parametrize("family, extra", [p for p in itertools.product(BASES, EXTRAS) if _can_take(*p)])
def test_a_case_never_matches_a_part_it_does_not_describe(family, extra):
    base = BASES[family]
    recogniser = recogniser_of(family)
    spec = part_from_dict(with_extra(base, extra))
    assert all(m.recognised.family != family for m in handbook_matches(spec)), (family, extra)
    assert recogniser(spec) is None


ONE_RAISER_CASES = {"central-hole-tension": "hole", "elliptical-hole-wide-plate": "ellipse",
                    "pin-loaded-square-lug": "hole"}  # and the kind of that raiser


@pytest.mark.parametrize("family, extra", [(f, e) for f, own in ONE_RAISER_CASES.items() for e in EXTRA_RAISERS
                                           if e != own])
def test_the_declared_kinds_not_the_rule_keep_a_far_raiser_out(family, extra):
    # The silent wrong answer this guards against: a central hole plus a small raiser of another kind far
    # away still satisfies the central-hole rule (which looks at the first hole only), and was matched to
    # the central-hole case. The rule alone is fooled; the declared kinds are not.
    recogniser = recogniser_of(family)
    spec = part_from_dict(with_extra(BASES[family], extra))
    assert recogniser.rule(spec) is not None
    assert recogniser(spec) is None


# --- errors a user must fix --------------------------------------------------------------------------

def test_input_errors_are_one_base_with_sibling_kinds():
    kinds = (PartError, CommandLineError, OutputError, SchedulerError)
    assert all(issubclass(k, InputError) for k in kinds)
    assert not any(issubclass(a, b) for a, b in itertools.permutations(kinds, 2))
    assert str(OutputError("a\nb")) == "a\\nb"  # one line by construction, whatever the kind


@pytest.mark.parametrize("kind", [PartError, CommandLineError, OutputError, SchedulerError])
def test_every_input_error_kind_exits_2_in_one_line(monkeypatch, capsys, kind):
    from stressraiser.cli import cases, main

    def refuse(args):
        raise kind("what: is wrong\nand how to fix it")

    monkeypatch.setattr(cases, "run", refuse)
    assert main.main(["cases"]) == 2
    err = capsys.readouterr().err.strip()
    assert err == "stressraiser: what: is wrong\\nand how to fix it"
