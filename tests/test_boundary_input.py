"""Part-file keys for supports and loads on the part's own boundary ([[hold]], [[load.edge]]) and for load
cases ([[load]]): what they read to, and one clear error line for every mistake (exit 2, the key named,
nothing written)."""

from __future__ import annotations

import pytest

from stressraiser.geometry.partfile import part_from_dict

from conftest import STRAP_TEXT, assert_refused

BASE = {"plate": {"length": 300.0, "width": 80.0, "thickness": 10.0},
        "hole": [{"center": [0.0, 0.0], "diameter": 22.0}, {"center": [-100.0, 0.0], "diameter": 16.0}],
        "material": {"E": 210000.0, "nu": 0.3}}
HELD = [{"at": [-150.0, 0.0], "mode": "fixed"}]
PULL = {"edge": [{"at": [150.0, 5.0], "force": "12 kN", "direction": 0.0}]}


def _part(load, hold=HELD, **extra):
    data = {**BASE, "load": load, **extra}
    if hold is not None:
        data["hold"] = hold
    return part_from_dict(data)


def test_holds_edge_loads_and_cases_read():
    spec = _part([{"name": "working", **PULL}, {"edge": [{"from": [150, -40], "to": [150, 40], "pressure": "-2 MPa"}]},
                  {"name": "pinned", "pin": {"hole": 1, "force": "3 kN", "direction": 90}}],
                 hold=[{"at": [-150.0, 0.0], "mode": "roller"}, {"pin": 2}])
    assert [c.name for c in spec.load_cases] == ["working", "load 2", "pinned"]
    assert spec.load is spec.cases[0].load and spec.load.kind == "boundary"
    edge = spec.cases[0].load.edges[0]
    assert (edge.force, edge.direction, edge.where.at) == (12000.0, 0.0, (150.0, 5.0))
    assert spec.cases[1].load.edges[0].pressure == -2.0 and spec.cases[1].load.edges[0].where.end == (150.0, 40.0)
    assert spec.cases[2].load.kind == "pin"
    holds = spec.support.holds
    assert spec.support.held == "none" and holds[0].mode == "roller" and holds[1].pin == 2
    single = part_from_dict({**BASE, "load": {"axial": 1.0}})
    assert single.cases == () and [c.name for c in single.load_cases] == ["load"]


def _toml(load: str, hold: str = '[[hold]]\nat = [-150.0, 0.0]\n', extra: str = "") -> str:
    return STRAP_TEXT.replace("[load]\naxial = 120000.0\n", "") + hold + load + extra


EDGE = '[load]\n[[load.edge]]\nat = [150.0, 0.0]\nforce = 1000.0\ndirection = 0.0\n'


@pytest.mark.parametrize("text, words", [
    # a point on no boundary piece: the point, the nearest piece and how far it is
    (_toml(EDGE, '[[hold]]\nat = [-140.0, 0.0]\n'), ["hold 1.at", "(-140, 0) mm", "no boundary piece",
                                                     "the held end x = -150", "10 mm away"]),
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 90.0]\nforce = 1.0\ndirection = 0.0\n'),
     ["load.edge 1.at", "no boundary piece", "the loaded end x = 150"]),
    # a point where two pieces meet
    (_toml(EDGE, '[[hold]]\nat = [-150.0, 40.0]\n'), ["hold 1.at", "two pieces meet"]),
    # not held against rigid-body motion: the free motion named
    (_toml(EDGE, '[[hold]]\nat = [-150.0, 0.0]\nmode = "roller"\n'), ["hold", "translation along y"]),
    (_toml(EDGE, '[[hold]]\npin = 1\n'), ["hold", "rotation about (0, 0) mm"]),
    (_toml(EDGE, '[[hold]]\nat = [0.0, 40.0]\nmode = "roller"\n'), ["hold", "translation along x"]),
    # a force or pressure of zero, or given wrongly
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 0.0]\nforce = 0.0\ndirection = 0.0\n'),
     ["load.edge 1.force", "greater than zero"]),
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 0.0]\npressure = 0.0\n'), ["load.edge 1.pressure", "zero"]),
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 0.0]\nforce = 10.0\n'), ["load.edge 1.direction", "missing"]),
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 0.0]\nforce = 10.0\npressure = 1.0\ndirection = 0\n'),
     ["load.edge 1", "exactly one of force"]),
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 0.0]\npressure = 1.0\ndirection = 0.0\n'),
     ["load.edge 1.direction", "normal to the edge"]),
    (_toml('[load]\n[[load.edge]]\nat = [150.0, 0.0]\nforce = "1 mm"\ndirection = 0.0\n'), ["load.edge 1.force"]),
    (_toml('[load]\n[[load.edge]]\nforce = 1.0\ndirection = 0.0\n'), ["load.edge 1", "`at = [x, y]`"]),
    (_toml('[load]\n[[load.edge]]\nfrom = [150.0, -40.0]\nforce = 1.0\ndirection = 0.0\n'),
     ["load.edge 1.to", "missing"]),
    # a stretch across two boundaries, of no length, or ending inside a layered raiser edge
    (_toml('[load]\n[[load.edge]]\nfrom = [150.0, -40.0]\nto = [11.0, 0.0]\nforce = 1.0\ndirection = 0.0\n'),
     ["load.edge 1", "one boundary"]),
    (_toml('[load]\n[[load.edge]]\nfrom = [150.0, 10.0]\nto = [150.0, 10.0]\nforce = 1.0\ndirection = 0.0\n'),
     ["load.edge 1.to", "no length"]),
    (_toml(EDGE, '[[hold]]\nfrom = [11.0, 0.0]\nto = [0.0, 11.0]\n'), ["hold 1.from", "structured layers"]),
    # keys that do not go together
    (_toml(EDGE, '[[hold]]\nat = [-150.0, 0.0]\n', '[support]\nheld = "clamped"\n'), ["support.held", "[[hold]]"]),
    (_toml(EDGE, '[[hold]]\npin = 1\nmode = "fixed"\n'), ["hold 1.mode", "pin hold"]),
    (_toml(EDGE, '[[hold]]\npin = 3\n'), ["hold 1.pin", "names no hole"]),
    (_toml(EDGE, '[[hold]]\nat = [-150.0, 0.0]\nmode = "glued"\n'), ["hold 1.mode", "roller"]),
    (_toml('[load]\n[load.pin]\nhole = 1\nforce = 1.0\n', '[[hold]]\nat = [-150.0, 0.0]\n[[hold]]\npin = 1\n'),
     ["load.pin.hole", "held by a pin"]),
    (_toml('[load]\n[load.remote]\nsx = 10.0\n'), ["load.remote", "[[hold]]"]),
    (_toml(EDGE, '[[hold]]\nat = [-150.0, 0.0]\n[[hold]]\nat = [11.0, 0.0]\n[[hold]]\npin = 1\n'),
     ["hold 2", "hole 1's edge", "takes a pin"]),
    # load cases
    (_toml('[[load]]\nname = "a"\naxial = 1.0\n[[load]]\nname = "a"\naxial = 2.0\n', ""), ["load 2.name", "'a'"]),
    (_toml('[[load]]\nname = ""\naxial = 1.0\n', ""), ["load 1.name", "1 to 60 characters"]),
    (_toml('[[load]]\naxial = 1.0\n[[load]]\n[load.remote]\nsx = 1.0\n', ""), ["load 2.remote", "cannot share"]),
    (_toml('[[load]]\naxial = 1.0\n[[load]]\nbending = 0.0\n', ""), ["load 2.bending", "zero"]),
    (_toml('[[load]]\naxial = 1.0\n[[load]]\naxial = -2.0\n', "", '[design]\n'), ["load 2.axial", "tensile"]),
    (_toml('[[load]]\naxial = 1.0\n[[load]]\naxial = 2.0\n', "", '[fatigue]\nmin_force = 0.0\nmax_force = 1.0\n'),
     ["fatigue.max_force", "several load cases"]),
])
def test_each_mistake_is_one_line_naming_the_key(tmp_path, capsys, text, words):
    assert_refused(tmp_path, capsys, text, words)


def test_symmetry_needs_mirror_images(tmp_path, capsys):
    # A symmetric model holds and loads only the positive side: every stretch must be its own mirror image
    assert part_from_dict({**BASE, "hole": BASE["hole"][:1], "load": {"edge": [{"at": [11.0, 0.0], "pressure": 10.0}]},
                           "support": {"symmetry": ["x", "y"]}}).support.symmetry == ("x", "y")
    patch = '[load]\n[[load.edge]]\nfrom = [150.0, 10.0]\nto = [150.0, 30.0]\npressure = 10.0\n'
    assert_refused(tmp_path, capsys, _toml(patch, "", '[support]\nsymmetry = ["y"]\n'), ["load.edge 1", "mirror"])
    assert_refused(tmp_path, capsys, _toml('[load]\n[[load.edge]]\nat = [0.0, 40.0]\nforce = 1.0\ndirection = 0\n',
                                           '[[hold]]\nat = [-150.0, 0.0]\nmode = "roller"\n',
                                           '[support]\nsymmetry = ["y"]\n'), ["load.edge 1", "mirror"])


def test_rigid_body_check_is_exact_for_every_kind_of_support():
    from dataclasses import replace

    from stressraiser.geometry.boundaryfile import read_holds
    from stressraiser.geometry.rigid_body import free_motions

    spec = _part({"axial": 1.0})

    def free(hold):
        return free_motions(replace(spec, support=replace(spec.support, holds=read_holds(hold, "mm-N-MPa")))).shape[1]

    # statics of a plane body (common practice): a fixed edge holds all three motions; a roller along a
    # straight edge two (the translation along it is free); one pin two (it turns about the pin); two
    # pins, or a pin and a roller whose normal misses the pin, all three
    assert free([{"at": [-150.0, 0.0]}]) == 0
    assert free([{"at": [-150.0, 0.0], "mode": "roller"}]) == 1
    assert free([{"pin": 1}]) == 1
    assert free([{"pin": 1}, {"pin": 2}]) == 0
    assert free([{"pin": 1}, {"at": [0.0, 40.0], "mode": "roller"}]) == 0
    # a roller round a whole hole holds both translations; the hole can still turn about its centre
    assert free([{"at": [11.0, 0.0], "mode": "roller"}]) == 1
    assert free([{"at": [-150.0, 0.0], "mode": "roller"}, {"at": [11.0, 0.0], "mode": "roller"}]) == 0
