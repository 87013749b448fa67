"""The window: a rounded-rectangular cut-out, added through the registry alone (geometry/kinds/window.py).

No handbook case for it is built in: its Kt is checked against a much finer quadratic study of the same
part (6-node triangles curved along the corner arcs, a tolerance fifty times tighter), an independent
discretisation of the same elasticity problem. Its outline against the closed-form area, its grading at
the corner arcs, its peak, net section, mirror image, placement checks and record are checked too.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from stressraiser.cli.main import main
from stressraiser.compare.check import check_part
from stressraiser.compare.handbook import handbook_matches
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.outline import part_polygon
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RaiserId

from conftest import EXAMPLES, assert_refused, strap, toml_text
from test_registry import BASES, recogniser_of, with_extra

WINDOW = RaiserId("window", 1)
W, T, P = 80.0, 10.0, 120000.0  # the strap's width and thickness (mm), its load (N)


def window(x=0.0, y=0.0, length=30.0, width=16.0, radius=4.0, angle=0.0) -> dict:
    return {"center": [x, y], "length": length, "width": width, "radius": radius, "angle": angle}


def part(*windows: dict, **tables) -> dict:
    return strap(hole=None, window=list(windows), **tables)


def test_kt_agrees_with_a_much_finer_quadratic_study():
    # No handbook case is built in for a rounded-rectangular hole. The reference is the same part solved with
    # quadratic triangles curved along the corner arcs to a band a hundred times tighter (mesh.order = 2,
    # tolerance 0.0001), on meshes with several times the nodes: the linear check's Kt must lie within its
    # own band (plus the reference's) of it.
    spec = part(window(), mesh={"tolerance": 0.01})
    fine = part(window(), mesh={"tolerance": 0.0001, "order": 2, "max_levels": 9})
    result, reference = check_part(part_from_dict(spec)), check_part(part_from_dict(fine))
    assert result.handbook == () and reference.handbook == ()  # no handbook case
    assert result.kt.converged and reference.kt.converged
    assert reference.study.levels[-1].nodes >= 3 * result.study.levels[-1].nodes
    band = result.kt.error + reference.kt.error
    assert result.kt.net == pytest.approx(reference.kt.net, rel=band)
    # the net section: the cut across the load through the window's centre, 80 - 16 = 64 mm of material,
    # the average force / net area (statics)
    assert result.net_section.x == 0.0 and result.net_section.width == pytest.approx(W - 16.0, rel=1e-9)
    assert result.net_section.average == pytest.approx(P / ((W - 16.0) * T), rel=1e-9)


def test_peak_is_on_a_corner_arc_and_belongs_to_the_window():
    # An inclined, off-centre window: the peak lies on one of its corner arcs (at the corner radius from that
    # corner's centre: the corners concentrate the stress, not the straight sides), is attributed to the
    # window, and its net section passes through the window's centre.
    spec = part_from_dict(part(window(x=-20.0, y=5.0, angle=30.0), mesh={"tolerance": 0.02}))
    result = check_part(spec)
    assert result.kt.converged and result.peak.feature == WINDOW
    t = math.radians(30.0)
    e, n = np.array([math.cos(t), math.sin(t)]), np.array([-math.sin(t), math.cos(t)])
    corners = [np.array([-20.0, 5.0]) + su * 11.0 * e + sq * 4.0 * n for su in (-1, 1) for sq in (-1, 1)]
    gap = min(abs(np.linalg.norm(np.asarray(result.peak.location) - c) - 4.0) for c in corners)
    assert gap < 1e-6 * W
    assert result.net_section.x == pytest.approx(-20.0)


def test_outline_area_and_grading_at_the_corners():
    # Area removed: the rectangle less the four corner squares' parts the arcs round off,
    # L W - (4 - pi) r^2 (elementary geometry; the polygon's chord error is about 2e-5 of the radius).
    spec = part_from_dict(part(window(angle=37.0)))
    assert part_polygon(spec).area == pytest.approx(300.0 * W - (30.0 * 16.0 - (4.0 - math.pi) * 16.0), rel=1e-6)
    mesh = mesh_part(spec)
    feature = next(f for f in mesh.features if f.name == WINDOW)
    assert feature.radius == 4.0  # graded by its corner radius
    pairs = mesh.edges[WINDOW]
    lengths = np.linalg.norm(mesh.nodes[pairs[:, 1]] - mesh.nodes[pairs[:, 0]], axis=1)
    assert np.max(lengths) <= feature.edge_size * (1 + 1e-9)  # the structured bands along corners and sides
    assert math.isclose(lengths.sum(), 2 * (30.0 + 16.0) - (8.0 - 2.0 * math.pi) * 4.0, rel_tol=1e-3)


def test_mirrored_windows_keep_their_own_names_and_peaks():
    # Two windows mirrored in x = 0, modelled as a half: each is reported under its own name with its own
    # peak; the two peaks are mirror images (within the band, exactly in fact).
    spec = part_from_dict(part(window(x=-60.0, angle=20.0), window(x=60.0, angle=160.0),
                               support={"symmetry": ["x"]}, mesh={"tolerance": 0.02}))
    result = check_part(spec)
    peaks = {p.feature: p for p in result.peaks}
    a, b = peaks[WINDOW], peaks[RaiserId("window", 2)]
    assert abs(a.stress - b.stress) <= max(a.error, b.error) * a.stress
    assert a.location[0] < 0.0 < b.location[0]


def test_never_matches_a_handbook_case():
    # A window alone matches no case; beside the raiser of any handbook case it keeps that case from
    # matching (the case does not describe a window).
    assert handbook_matches(part_from_dict(part(window()))) == []
    for family, base in BASES.items():
        spec = part_from_dict(with_extra(base, "window", lambda x, s: window(x=x, length=2.0 * s, width=s,
                                                                             radius=0.25 * s)))
        assert all(m.recognised.family != family for m in handbook_matches(spec)), family
        assert recogniser_of(family)(spec) is None


@pytest.mark.parametrize("what, entry, words", [
    ("off the plate", window(x=400.0), ["window 1", "off the plate"]),
    ("across the side", window(y=33.0), ["window 1", "crosses", "the side y = 40"]),
    ("across the loaded end", window(x=140.0), ["window 1", "crosses", "loaded end x = 150"]),
    ("overlapping a hole", window(x=10.0), ["window 1", "hole 1", "crosses"]),
    ("corners too round", window(radius=8.0), ["window 1.radius", "half the width"]),
    ("no radius", {k: v for k, v in window().items() if k != "radius"}, ["window 1.radius", "missing"]),
    ("unknown key", {**window(), "corner": 3.0}, ["window 1.corner", "unknown key"]),
])
def test_bad_windows_are_refused_naming_them(tmp_path, capsys, what, entry, words):
    tables = {"window": [entry]}
    if what == "overlapping a hole":
        tables["hole"] = [{"center": [20.0, 0.0], "diameter": 10.0}]
    text = toml_text(strap(**{"hole": None, **tables}))
    assert_refused(tmp_path, capsys, text, words)


def test_example_records_the_window(tmp_path):
    out = tmp_path / "r.json"
    assert main(["check", str(EXAMPLES / "hoist_plate_inspection_window.toml"), "--json", str(out), "--quiet"]) == 0
    record = json.loads(out.read_text())
    assert record["part"]["raisers"] == [{"name": "window 1", "kind": "window", "number": 1, "center": [0.0, 0.0],
                                          "length": 50.0, "width": 30.0, "angle": 90.0, "radius": 6.0}]
    assert record["peak"]["feature"] == "window 1" and record["handbook"] is None
    # the long side across the load: 100 - 50 = 50 mm of material on the net section (12 mm thick)
    assert record["net_section"]["width"] == pytest.approx(50.0, rel=1e-9)
    assert record["net_section"]["average"] == pytest.approx(130000.0 / (50.0 * 12.0), rel=1e-9)
