"""The report's figures read cleanly and say where things are.

- No label lies on another: in every figure of the report of bundled examples of every family (hole, notch,
  slot, ellipse, window, shoulder step, pin and lug, remote stress, bending, a row of holes; millimetre and
  inch parts), no drawn text's window extent overlaps another's, a legend's or an axis label's, and every
  text and legend lies inside the figure (nothing cut at its edge).
- The peak dot of a section figure is on the part's edge, at the point of the cut nearest to the peak.
- A small notch's stress map has a close-up whose view holds the peak and spans a few root radii.
- The handbook figure's Kt axis spans at least a fifth of the Kt and shows the FE band as a band.

The expected values are geometry: the part's exact outline (shapely, from the part file), the peak's
location from the check, and the radii of the part file. The checks here measure the figures as drawn (the
renderer's extents), independently of how cli/label_placement.py places the labels.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import replace
from functools import cache

import numpy as np
import pytest
import shapely
from matplotlib.axes import Axes
from matplotlib.axis import Axis
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.legend import Legend
from matplotlib.patches import Rectangle
from matplotlib.text import Text

from stressraiser.cli import plots
from stressraiser.cli.report import PNG_DPI, figure_jobs
from stressraiser.compare.check import check_part
from stressraiser.geometry.outline import part_polygon
from stressraiser.geometry.partfile import load_part, part_from_dict

from conftest import EXAMPLES

# one example of every family; the dock-lift strap is in inches and has the design and fatigue figures
FAMILIES = ["dock_lift_strap_inch", "fence_tensioner_strap", "conveyor_take_up_link", "greenhouse_vent_arm",
            "hoist_plate_inspection_window", "shelf_bracket_tenon", "gate_hinge_strap", "tank_port_doubler",
            "awning_bracket_arm", "trailer_hitch_bracket"]


def _quick(spec):
    """The part with a shorter mesh study (3 levels, 5 % target): the figures' layout does not depend on the
    last digits of the peak, and the tests stay quick."""
    return replace(spec, mesh=replace(spec.mesh, tolerance=0.05, max_levels=3))


@cache
def example(name: str):
    return check_part(_quick(load_part(EXAMPLES / f"{name}.toml")))


@cache
def drawn(name: str):
    """Every figure of the example's report as drawn at the report's resolution: [(name, figure)]."""
    result = example(name)
    out = []
    for job in figure_jobs(result):
        fig = job.build(result)
        if fig is not None:  # drawn at the report's resolution, as the report's PNG is
            FigureCanvasAgg(fig)
            fig.set_dpi(PNG_DPI)
            fig.canvas.draw()
            out.append((job.name, fig))
    return out


def _drawn_texts(fig, renderer) -> list[tuple[str, object]]:
    """(words, window extent) of every text drawn: free texts, titles, annotations (without their arrows),
    axis labels and the tick labels the axes show; legends' own texts are measured with their legend."""
    in_legends = {id(t) for legend in fig.findobj(Legend) for t in [*legend.get_texts(), legend.get_title()]}
    tick_labels, shown = set(), []
    for axis in fig.findobj(Axis):
        for tick in axis.get_major_ticks() + axis.get_minor_ticks():
            tick_labels |= {id(tick.label1), id(tick.label2)}
        for tick in axis._update_ticks():  # the ticks inside the view: those the axis draws
            shown += [t for t in (tick.label1, tick.label2) if t.get_visible()]
    texts = [t for t in fig.findobj(Text) if id(t) not in in_legends and id(t) not in tick_labels] + shown
    out = []
    for t in texts:
        if t.get_visible() and t.get_text().strip() and t.get_figure(root=True) is fig:
            box = Text.get_window_extent(t, renderer)
            if box.width > 0 and box.height > 0:
                out.append((t.get_text(), box))
    return out


def _overlap(a, b) -> float:
    w = min(a.x1, b.x1) - max(a.x0, b.x0)
    h = min(a.y1, b.y1) - max(a.y0, b.y0)
    return w * h if w > 0 and h > 0 else 0.0


@pytest.mark.parametrize("name", FAMILIES)
def test_no_label_lies_on_another_or_off_the_figure(name) -> None:
    for figure, fig in drawn(name):
        renderer = fig.canvas.get_renderer()
        texts = _drawn_texts(fig, renderer)
        legends = [legend.get_window_extent(renderer) for legend in fig.findobj(Legend) if legend.get_visible()]
        page = fig.bbox
        for (a, box_a), (b, box_b) in itertools.combinations(texts, 2):
            # a pixel's overlap is the anti-aliasing of touching glyph boxes, not one label on another
            assert _overlap(box_a, box_b) <= 1.0, (name, figure, a, b)
        for words, box in texts:
            for legend in legends:
                assert _overlap(box, legend) <= 1.0, (name, figure, words, "legend")
            assert page.x0 - 1 <= box.x0 and box.x1 <= page.x1 + 1 and page.y0 - 1 <= box.y0 and box.y1 <= page.y1 + 1, \
                (name, figure, words, "outside the figure")
        for legend in legends:
            assert page.x0 - 1 <= legend.x0 and legend.x1 <= page.x1 + 1, (name, figure, "legend cut off")


@pytest.mark.parametrize("name", ["shelf_bracket_tenon", "hoist_plate_inspection_window", "fence_tensioner_strap",
                                  "dock_lift_strap_inch"])
def test_the_peak_dot_is_on_the_edge_where_the_peak_is(name) -> None:
    result = example(name)
    outline = part_polygon(result.spec)
    width = outline.bounds[3] - outline.bounds[1]
    views = {f"section_{n}": view for n, view in enumerate(plots.critical_sections(result), start=1)}
    for figure, fig in drawn(name):
        if figure not in views:
            continue
        view = views[figure]
        ax = fig.axes[0]
        dots = [line for line in ax.get_lines() if line.get_marker() == "o" and len(line.get_xdata()) == 1]
        assert len(dots) == 1, (name, figure)
        along = float(dots[0].get_xdata()[0])
        assert float(dots[0].get_ydata()[0]) == pytest.approx(view.peak, rel=1e-12)  # the converged peak's level
        point = view.point + along * view.direction  # the dot's place on the part (mm)
        # on the part's boundary (the exact outline), within a thousandth of the width ...
        assert outline.boundary.distance(shapely.Point(point)) <= 1e-3 * width, (name, figure, point)
        # ... and no farther from the peak than the peak is from the cut, plus 2 % of the width: the edge
        # where the peak is, not the cut's other end
        _, off = view.position(view.location)
        assert math.dist(point, view.location) <= abs(off) + 0.02 * width, (name, figure, point, view.location)


SMALL_NOTCHES = {
    # a 400 x 50 mm strap with an opposite pair of 1 mm semicircular notches, and one with a sharp V notch
    # (root radius 0.4 mm, 8 mm deep); invented parts
    "notch pair": {"notch": [{"x": 0.0, "side": "both", "shape": "semicircle", "radius": 1.0}]},
    "sharp V": {"notch": [{"x": 40.0, "side": "top", "shape": "V", "depth": 8.0, "radius": 0.4, "angle": 60.0}]},
}


@pytest.mark.parametrize("name", SMALL_NOTCHES)
def test_a_small_notch_gets_a_close_up_of_its_hot_spot(name) -> None:
    part = {"plate": {"length": 400.0, "width": 50.0, "thickness": 6.0}, **SMALL_NOTCHES[name],
            "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 30000.0}}
    result = check_part(_quick(part_from_dict(part)))
    radius = min(n["radius"] for n in SMALL_NOTCHES[name]["notch"])
    fig = plots.stress_map_figure(result)
    px, py = result.peak.location
    close = []
    for ax in fig.findobj(Axes):  # the panels, and any inset in them
        if not ax.collections:  # colour bars hold no mesh
            continue
        (x0, x1), (y0, y1) = sorted(ax.get_xlim()), sorted(ax.get_ylim())
        if x0 <= px <= x1 and y0 <= py <= y1 and (x1 - x0) <= 6.0 * radius:
            close.append(ax)
    # a view of at most 6 root radii holds the peak: the hot spot (a root radius across) fills a sixth of it
    assert close, [(ax.get_xlim(), ax.get_ylim()) for ax in fig.findobj(Axes)]
    # and the whole part is still shown above it
    part_width = 400.0
    assert any(abs(ax.get_xlim()[1] - ax.get_xlim()[0]) >= part_width for ax in fig.axes)


@pytest.mark.parametrize("name", ["shelf_bracket_tenon", "dock_lift_strap_inch", "gate_hinge_strap"])
def test_the_handbook_plot_shows_the_band_on_an_honest_scale(name) -> None:
    result = example(name)
    fig = dict(drawn(name)).get("handbook")
    assert fig is not None, name
    kt, band = result.kt.net, result.kt.net * result.kt.error
    dots = fig.axes[-1]  # the panel of Kt values, this part's and each case's
    low, high = dots.get_xlim()
    values = [kt - band, kt + band] + [m.kt_net for m in result.handbook]
    assert low <= min(values) and max(values) <= high
    # a fifth of the Kt at least: a 2 % difference takes a tenth of the axis, never its whole width
    assert high - low >= 0.2 * kt - 1e-12
    # the FE band is drawn as a band: a shaded span from Kt - band to Kt + band
    spans = [p for p in dots.patches if not isinstance(p, Rectangle) or p.get_width() > 0]
    extents = [np.asarray(p.get_path().transformed(p.get_patch_transform()).vertices)[:, 0]
               if isinstance(p, Rectangle) else np.asarray(p.get_xy())[:, 0] for p in spans]
    assert any(math.isclose(e.min(), kt - band, rel_tol=1e-9) and math.isclose(e.max(), kt + band, rel_tol=1e-9)
               for e in extents), extents
