"""The part's own boundary as exact pieces, the stretches a part file picks, and the mesh edges on them.

Independent values: the exact lengths of lines and arcs of the invented parts below (plane geometry), and
shapely's own boundary of the same part (a fine polygon) for the loops' total length."""

from __future__ import annotations

import math

import numpy as np
import pytest

from stressraiser.fem.stretches import stretch_edges
from stressraiser.geometry.boundary import boundary_loops, segment_length, split_points, stretch
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.outline import loop_polygon, part_polygon
from stressraiser.geometry.partfile import load_part, part_from_dict
from stressraiser.geometry.shapes import segment_points
from stressraiser.geometry.spec import BoundaryPick

from conftest import EXAMPLES

NOTCHED = {"plate": {"length": 200.0, "width": 50.0, "thickness": 5.0},
           "notch": [{"x": 0.0, "side": "both", "shape": "U", "depth": 6.0, "radius": 2.0}],
           "slot": [{"center": [60.0, 0.0], "length": 30.0, "width": 10.0}],
           "material": {"E": 200000.0, "nu": 0.3}, "load": {"axial": 1000.0}}


@pytest.mark.parametrize("example", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_loops_close_and_match_the_outline(example):
    spec = load_part(example)
    loops = boundary_loops(spec)
    total = 0.0
    for loop in loops:
        pieces = [p.segment for p in loop]
        if pieces == [None]:  # an elliptical hole: one piece, named only; its length is shapely's
            total += loop_polygon(loop[0].ellipse).exterior.length
            continue
        for a, b in zip(pieces, pieces[1:] + pieces[:1]):  # each piece starts where the one before ends
            assert math.dist(segment_points(a)[1], segment_points(b)[0]) < 1e-9 * spec.plate.width
        total += sum(segment_length(p) for p in pieces)
    # the exact pieces' length against shapely's fine polygon: a circle drawn as a 512-gon is short by
    # pi^2 / (6 512^2) = 6.3e-6 of its length (plane geometry), so they agree within 1e-5
    assert total == pytest.approx(part_polygon(spec).length, rel=1e-5)


def test_notches_split_their_edge_and_arcs_are_whole():
    spec = part_from_dict(NOTCHED)
    outline = boundary_loops(spec)[0]
    names = [str(p.name) for p in outline]
    # bottom side, notch (flank, root, flank), bottom side, right end, top side, notch, top side, left end
    assert names == ["side", "notch 1", "notch 1", "notch 1", "side", "loaded", "side", "notch 1", "notch 1",
                     "notch 1", "side", "held"]
    root = outline[2].segment
    assert root.radius == 2.0 and root.span == pytest.approx(math.pi)  # one piece, not two quarter arcs
    assert outline[2].banded and not outline[1].banded
    slot = boundary_loops(spec)[1]
    assert [type(p.segment).__name__ for p in slot] == ["Line", "Arc", "Line", "Arc"]
    assert sum(p.length for p in slot) == pytest.approx(2 * 20.0 + 2 * math.pi * 5.0)


def test_a_stretch_from_one_point_to_another_runs_with_the_material_on_the_left():
    spec = part_from_dict(NOTCHED)
    # from the bottom side round the right end to the top side: 40 + 50 + 40 mm
    picked = stretch(spec, BoundaryPick("s", start=(60.0, -25.0), end=(60.0, 25.0)))
    assert tuple(map(str, picked.names)) == ("side", "loaded", "side")
    assert picked.length == pytest.approx(130.0)
    # the other way round passes both notches and the left end: the rest of the outline
    back = stretch(spec, BoundaryPick("s", start=(60.0, 25.0), end=(60.0, -25.0)))
    outline = sum(p.length for p in boundary_loops(spec)[0])
    assert back.length + picked.length == pytest.approx(outline)
    # a stretch may start and end at a notch root's corners; `at` on the root takes its whole arc
    root = stretch(spec, BoundaryPick("s", at=(0.0, -19.0)))
    assert root.length == pytest.approx(2.0 * math.pi) and tuple(map(str, root.names)) == ("notch 1",)


def test_the_mesh_has_a_node_at_each_end_of_a_stretch_and_its_edges_add_up():
    data = {**NOTCHED, "load": {"edge": [{"from": [90.0, 25.0], "to": [37.5, 25.0], "pressure": 1.0}]},
            "hold": [{"at": [-100.0, 0.0]}]}
    spec = part_from_dict(data)
    assert sorted(split_points(spec)) == [(37.5, 25.0), (90.0, 25.0)]
    mesh = mesh_part(spec)
    for point in split_points(spec):
        assert np.min(np.linalg.norm(mesh.nodes - point, axis=1)) < 1e-9
    picked = stretch(spec, spec.load.edges[0].where)
    edges = stretch_edges(mesh, picked.pieces)
    length = np.linalg.norm(mesh.nodes[edges[:, 1]] - mesh.nodes[edges[:, 0]], axis=1).sum()
    assert length == pytest.approx(52.5, rel=1e-12)  # straight: the chords are the stretch
    hole = part_from_dict({**NOTCHED, "hole": [{"center": [-50.0, 0.0], "diameter": 12.0}],
                           "load": {"edge": [{"at": [-44.0, 0.0], "pressure": 1.0}]}})
    ring = stretch_edges(mesh_part(hole), stretch(hole, hole.load.edges[0].where).pieces)
    chords = np.linalg.norm(mesh_part(hole).nodes[ring[:, 1]] - mesh_part(hole).nodes[ring[:, 0]], axis=1).sum()
    # a polygon inscribed in the hole: a little shorter than the circle, by the chords' sagitta (plane geometry)
    assert 0.995 * 12.0 * math.pi < chords < 12.0 * math.pi
