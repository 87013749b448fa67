"""The exact outline of every raiser (areas against closed forms), the names of the mesh's boundary edges,
the grading of the mesh by each raiser's own radius of curvature, and determinism."""

from __future__ import annotations

import math

import numpy as np
import pytest

from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.outline import part_polygon, plate_polygon
from stressraiser.geometry.registry import cuts
from stressraiser.geometry.partfile import part_from_dict

L, W, T = 300.0, 80.0, 10.0
PLATE_AREA = L * W


def spec(**raisers):
    load = {"axial": 100000.0}
    if "lug" in raisers:
        load = {"pin": {"hole": raisers["lug"]["hole"], "force": 10000.0}}
    return part_from_dict({"title": "geometry", "plate": {"length": L, "width": W, "thickness": T},
                           "material": {"E": 210000.0, "nu": 0.3}, "load": load, **raisers})


# Areas by elementary geometry (common practice); the outline's polygons have a chord error of about
# 2e-5 of each radius, so 1e-5 relative on the area is ample.
@pytest.mark.parametrize("raisers, removed", [
    ({"ellipse": [{"center": [10.0, 5.0], "length": 30.0, "width": 10.0, "angle": 37.0}]}, math.pi * 15.0 * 5.0),
    ({"slot": [{"center": [0.0, 0.0], "length": 40.0, "width": 12.0, "angle": 120.0}]}, 28.0 * 12.0 + math.pi * 36.0),
    ({"notch": [{"x": 0.0, "side": "top", "shape": "U", "depth": 10.0, "radius": 3.0}]}, 6.0 * 7.0 + 0.5 * math.pi * 9.0),
    ({"notch": [{"x": 0.0, "side": "both", "shape": "semicircle", "radius": 6.0}]}, 2 * 0.5 * math.pi * 36.0),
    # a shallow U: circular segment of radius 10 and depth 4
    ({"notch": [{"x": 0.0, "side": "bottom", "shape": "U", "depth": 4.0, "radius": 10.0}]},
     100.0 * math.acos(6.0 / 10.0) - 6.0 * math.sqrt(100.0 - 36.0)),
    # V with a 60 degree opening, depth 10, root radius 2: triangle to the flanks' apex less the part the
    # root arc rounds off
    ({"notch": [{"x": 0.0, "side": "top", "shape": "V", "depth": 10.0, "radius": 2.0, "angle": 60.0}]},
     (10.0 + 2.0 / math.sin(math.radians(30.0)) - 2.0) ** 2 * math.tan(math.radians(30.0))
     - (4.0 / math.tan(math.radians(30.0)) - math.radians(120.0) * 4.0 / 2.0)),
])
def test_cutout_areas(raisers, removed):
    assert part_polygon(spec(**raisers)).area == pytest.approx(PLATE_AREA - removed, rel=1e-5)


@pytest.mark.parametrize("narrow, r", [("loaded", 5.0), ("held", 5.0), ("loaded", 20.0)])
def test_stepped_outline_area(narrow, r):
    # Step from W = 80 to d = 60 at x = 0 (h = 10). A fillet r <= h adds r^2 - pi r^2 / 4 of material per
    # corner; a fillet r > h (tangent to the narrow edge only, reaching c = sqrt(2 r h - h^2) along x) adds
    # the integral of the arc's height over the narrow edge, r c - (c sqrt(r^2 - c^2) + r^2 asin(c / r)) / 2.
    h = 10.0
    if r <= h:
        extra = r * r - math.pi * r * r / 4.0
    else:
        c = math.sqrt(2 * r * h - h * h)
        extra = r * c - (0.5 * c * math.sqrt(r * r - c * c) + 0.5 * r * r * math.asin(c / r))
    expected = 0.5 * L * 80.0 + 0.5 * L * 60.0 + 2 * extra
    s = spec(step={"x": 0.0, "width": 60.0, "radius": r, "narrow": narrow})
    assert plate_polygon(s).area == pytest.approx(expected, rel=1e-6)


def test_lug_outline_area():
    # Loaded end rounded about the pin hole: rectangle to the hole centre plus a half disc of radius W/2.
    s = spec(hole=[{"center": [L / 2 - W / 2, 0.0], "diameter": 20.0}], lug={"hole": 1})
    expected = (L - W / 2) * W + 0.5 * math.pi * (W / 2) ** 2 - math.pi * 100.0
    assert part_polygon(s).area == pytest.approx(expected, rel=1e-5)


def test_sections_of_each_raiser():
    s = spec(ellipse=[{"center": [-100.0, 0.0], "length": 20.0, "width": 8.0}],
             slot=[{"center": [-50.0, 10.0], "length": 30.0, "width": 8.0, "angle": 90.0}],
             notch=[{"x": 20.0, "side": "both", "shape": "U", "depth": 6.0, "radius": 2.0}],
             step={"x": 60.0, "width": 50.0, "radius": 8.0})
    sections = {str(name): cut.point[0] for name, cut in cuts(s).items()}
    assert sections == {"ellipse 1": -100.0, "slot 1": -50.0, "notch 1": 20.0, "fillet 1": 68.0, "fillet 2": 68.0}


def test_mesh_names_every_edge_and_grades_by_curvature():
    s = spec(hole=[{"center": [-110.0, 10.0], "diameter": 12.0}],
             ellipse=[{"center": [-60.0, 0.0], "length": 24.0, "width": 8.0, "angle": 30.0}],
             slot=[{"center": [-10.0, -15.0], "length": 24.0, "width": 8.0, "angle": 0.0}],
             notch=[{"x": 40.0, "side": "top", "shape": "V", "depth": 8.0, "radius": 1.5, "angle": 60.0}],
             step={"x": 90.0, "width": 56.0, "radius": 6.0})
    mesh = mesh_part(s)
    assert set(map(str, mesh.edges)) == {"held", "loaded", "side", "hole 1", "ellipse 1", "slot 1", "notch 1",
                                         "fillet 1", "fillet 2", "shoulder"}
    radius = {str(f.name): f.radius for f in mesh.features}
    # each raiser graded by its own smallest radius of curvature: the ellipse at the ends of its major axis
    # b^2 / a, the slot by its end radius, the notch and fillet by their root radii
    assert radius == pytest.approx({"hole 1": 6.0, "ellipse 1": 16.0 / 12.0, "slot 1": 4.0, "notch 1": 1.5,
                                    "fillet 1": 6.0, "fillet 2": 6.0})
    for f in mesh.features:
        pairs = mesh.edges[f.name]
        lengths = np.linalg.norm(mesh.nodes[pairs[:, 1]] - mesh.nodes[pairs[:, 0]], axis=1)
        # the structured band puts two elements per edge size along every curved raiser edge
        assert np.median(lengths) <= f.edge_size
        assert f.edge_size <= 0.12 * f.radius + 1e-12


def test_same_part_same_mesh():
    s = spec(notch=[{"x": 0.0, "side": "both", "shape": "U", "depth": 8.0, "radius": 3.0}],
             ellipse=[{"center": [-80.0, 0.0], "length": 20.0, "width": 10.0, "angle": 45.0}])
    a, b = mesh_part(s), mesh_part(s)
    assert np.array_equal(a.nodes, b.nodes) and np.array_equal(a.triangles, b.triangles)
