"""The figures of a check: pure functions from a CheckResult (or one of its parts) to a matplotlib Figure.

Data stay in the internal units (lengths in mm, stresses in MPa; Kt dimensionless); what a reader sees is
in the part file's unit system (`spec.units`): each dimensional axis places its ticks at round numbers of
the display unit and labels them in it (`unit_axis`, `unit_colorbar`), and every number written on a
figure goes through cli/display_units.py, the one place that converts for display. Figures are built
with `matplotlib.figure.Figure` directly (no pyplot, no global state) and rendered by the Agg/SVG
backends when saved, so nothing here needs a display. matplotlib is slow to import: import this module
only when figures are wanted.

Colour maps are perceptually uniform (viridis); line colours are this project's own small palette.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib import rcParams
from matplotlib.figure import Figure
from matplotlib.font_manager import FontProperties
from matplotlib.lines import Line2D
from matplotlib.text import Annotation
from matplotlib.patches import FancyArrowPatch, Polygon as PolygonPatch
from matplotlib.ticker import AutoLocator, Formatter
from matplotlib.transforms import Bbox
from matplotlib.tri import Triangulation
from scipy.sparse import coo_matrix
from scipy.sparse.csgraph import connected_components

from ..compare.check import CheckResult, NetSection
from ..compare.design import DesignCheck
from ..compare.fatigue import FatigueScreen
from ..compare.method_of_sections import SectionResult
from ..geometry.kinds.base import RaiserId
from ..geometry.outline import cutout_regions, part_polygon, plate_polygon
from ..geometry.registry import kind_of, named, outline_raisers, raiser_label
from ..geometry.units import DEFAULT_SYSTEM
from .citation import short_source
from .label_placement import annotation_at, at_position, axes_region, figure_region, obstacles, place, settle
from .summary import estimate_how
from .display_units import cut_label, display_unit, label as unit_label, point_text, quantity_text, shown, unsigned_zero

INK = "#222222"
FE_LINE = "#2a5f8f"  # finite-element values
AVERAGE_LINE = "#c8641e"  # net-section average (hand calculation)
GROSS_LINE = "#7a7a7a"
HANDBOOK_MARK = "#6b3fa0"
PASS_FILL, FAIL_FILL = "#3f8f5a", "#b8392b"
MATERIAL_FILL = "#e9edf2"
STRESS_MAP = "viridis"
WIDTH_IN = 9.0  # figure width, inches


def cut_where(point: tuple[float, float], normal: tuple[float, float], units: str = DEFAULT_SYSTEM) -> str:
    """Where a cut is, in words and in `units`: "x = 0 mm" across the load, else "through (x, y) mm,
    normal (nx, ny)"."""
    n = np.asarray(normal, dtype=float) / np.hypot(*normal)
    if np.allclose(n, (1.0, 0.0)):
        return f"x = {quantity_text(point[0], 'length', units, 'g')}"
    return f"through {point_text(tuple(point), units, '.4g')}, normal ({n[0]:.3f}, {n[1]:.3f})"


@dataclass(frozen=True)
class SectionView:
    """One critical section to draw: a label, the net section, the converged peak (MPa) and where it is
    (mm), the raiser it belongs to (None: at no raiser), and Kt on that section."""

    label: str
    section: NetSection
    peak: float
    location: tuple[float, float]
    feature: RaiserId | None
    kt_net: float

    @property
    def point(self) -> np.ndarray:
        """A point of the cut (mm); positions along the cut are measured from it."""
        return np.asarray(self.section.point, dtype=float)

    @property
    def normal(self) -> np.ndarray:
        """Unit normal of the cut (the load direction for a cut across the load)."""
        n = np.asarray(self.section.normal, dtype=float)
        return n / np.hypot(*n)

    @property
    def direction(self) -> np.ndarray:
        """Unit vector along the cut, d = (-n_y, n_x): for a cut across x this is +y."""
        n = self.normal
        return np.array([-n[1], n[0]])

    @property
    def across_x(self) -> bool:
        return bool(np.allclose(self.normal, (1.0, 0.0)))

    def where(self, units: str = DEFAULT_SYSTEM) -> str:
        """Where the cut is, in words and in `units` (see `cut_where`)."""
        return cut_where(self.section.point, self.section.normal, units)

    def position(self, xy: tuple[float, float]) -> tuple[float, float]:
        """(position along the cut, distance off the cut) of a point, mm."""
        r = np.asarray(xy, dtype=float) - self.point
        return float(r @ self.direction), float(r @ self.normal)

    def ends(self, lo: float, hi: float) -> tuple[np.ndarray, np.ndarray]:
        """The points of the cut at positions lo and hi along it (mm)."""
        return self.point + lo * self.direction, self.point + hi * self.direction


def critical_sections(result: CheckResult) -> list[SectionView]:
    """The critical sections of a result, the governing one first: one per competing raiser (result.peaks),
    else the single governing section."""
    views = [SectionView(f"section {n}", p.section, p.stress, p.location, p.feature, p.kt_net)
             for n, p in enumerate(result.peaks, start=1)]
    return views or [governing_view(result)]


def governing_view(result: CheckResult) -> SectionView:
    """The governing critical section: the net section through the raiser with the largest peak."""
    return SectionView("section 1", result.net_section, result.peak.stress, tuple(result.peak.location),
                       result.peak.feature, result.kt.net)


# --- helpers ----------------------------------------------------------------------------------------

def _figure(height: float, width: float = WIDTH_IN) -> Figure:
    fig = Figure(figsize=(width, height), layout="constrained")
    return fig


def _outline_patches(result: CheckResult, ax, fill: str = MATERIAL_FILL, edge: str = INK, lw: float = 1.2) -> None:
    """Draw the part outline (exterior and holes) from the exact shapely polygon."""
    poly = part_polygon(result.spec)
    pieces = poly.geoms if isinstance(poly, shapely.MultiPolygon) else [poly]
    for piece in pieces:
        ax.add_patch(PolygonPatch(np.asarray(piece.exterior.coords), closed=True, facecolor=fill, edgecolor=edge,
                                  linewidth=lw, zorder=1))
        for ring in piece.interiors:
            ax.add_patch(PolygonPatch(np.asarray(ring.coords), closed=True, facecolor="white", edgecolor=edge,
                                      linewidth=lw, zorder=2))


def _bounds(result: CheckResult) -> tuple[float, float, float, float]:
    return tuple(float(v) for v in part_polygon(result.spec).bounds)  # type: ignore[return-value]


def _triangulation(result: CheckResult) -> Triangulation:
    mesh = result.solution.mesh
    return Triangulation(mesh.nodes[:, 0], mesh.nodes[:, 1], mesh.triangles)


def _peak_radius(result: CheckResult) -> float:
    """Radius of curvature (mm) of the raiser holding the peak, else a tenth of the plate width."""
    for feature in result.solution.mesh.features:
        if feature.name == result.peak.feature:
            return float(feature.radius)
    minx, miny, maxx, maxy = _bounds(result)
    return 0.1 * (maxy - miny)


def _raiser_points(result: CheckResult) -> np.ndarray | None:
    """Boundary nodes (mm) of the piece of the peak's raiser that holds the peak: the whole edge of a hole,
    the one notch of an opposite pair the peak is in. None when the finest mesh does not name the raiser."""
    mesh = result.solution.mesh
    edges = mesh.edges.get(result.peak.feature)
    if edges is None or not len(edges):
        return None
    nodes, local = np.unique(np.asarray(edges), return_inverse=True)
    local = local.reshape(-1, 2)
    graph = coo_matrix((np.ones(len(local)), (local[:, 0], local[:, 1])), shape=(len(nodes), len(nodes)))
    _, piece = connected_components(graph, directed=False)
    points = mesh.nodes[nodes]
    nearest = int(np.argmin(np.hypot(*(points - np.asarray(result.peak.location)).T)))
    return points[piece == piece[nearest]]


def _raiser_centre(result: CheckResult) -> tuple[float, float]:
    """Centre of the bounding box of the edge of the raiser piece holding the peak (a hole's centre), else the
    peak itself."""
    points = _raiser_points(result)
    if points is None:
        return tuple(result.peak.location)  # type: ignore[return-value]
    return tuple(0.5 * (points.min(axis=0) + points.max(axis=0)))  # type: ignore[return-value]


def _zoom_window(result: CheckResult, centre: tuple[float, float], half: float
                 ) -> tuple[tuple[float, float], tuple[float, float]]:
    """x and y limits of a square window of half-size `half` (mm) around `centre`, kept inside the part."""
    minx, miny, maxx, maxy = _bounds(result)
    half = min(half, 0.5 * (maxx - minx), 0.5 * (maxy - miny))
    cx = min(max(centre[0], minx + half), maxx - half)
    cy = min(max(centre[1], miny + half), maxy - half)
    return (cx - half, cx + half), (cy - half, cy + half)


def _raiser_window(result: CheckResult):
    """Window showing the whole raiser piece that holds the peak (one notch of a pair): around the bounding box
    of its boundary edges when the mesh names them (else the peak), at least 2.2 of its smallest radii each
    way."""
    points = _raiser_points(result)
    half = 2.2 * _peak_radius(result)
    if points is not None:
        half = max(half, 0.55 * float(np.max(points.max(axis=0) - points.min(axis=0))) * 1.25)
    return _zoom_window(result, _raiser_centre(result), half)


def _peak_window(result: CheckResult, radii: float = 0.33):
    """Close window at the peak itself, `radii` raiser radii each way, shifted away from the raiser's centre
    so that it shows mostly material."""
    half = radii * _peak_radius(result)
    (px, py), (cx, cy) = result.peak.location, _raiser_centre(result)
    away = np.hypot(px - cx, py - cy)
    shift = 0.8 * half / away if away > 0 else 0.0
    return _zoom_window(result, (px + shift * (px - cx), py + shift * (py - cy)), half)


def _window_triangulation(result: CheckResult, window) -> Triangulation:
    """Triangulation of only the triangles with a node inside (or touching) the window: fast close-ups."""
    mesh = result.solution.mesh
    (x0, x1), (y0, y1) = window
    dx, dy = 0.05 * (x1 - x0), 0.05 * (y1 - y0)
    inside = ((mesh.nodes[:, 0] >= x0 - dx) & (mesh.nodes[:, 0] <= x1 + dx)
              & (mesh.nodes[:, 1] >= y0 - dy) & (mesh.nodes[:, 1] <= y1 + dy))
    keep = inside[mesh.triangles].any(axis=1)
    return Triangulation(mesh.nodes[:, 0], mesh.nodes[:, 1], mesh.triangles[keep])


def _box(ax, window, colour: str) -> None:
    (x0, x1), (y0, y1) = window
    ax.add_patch(PolygonPatch([(x0, y0), (x1, y0), (x1, y1), (x0, y1)], closed=True, fill=False, edgecolor=colour,
                              lw=1.2, zorder=5))


class DisplayLocator(AutoLocator):
    """Ticks at round numbers of a display unit on an axis whose data are in internal units; `factor` is
    internal units per display unit (cli/display_units.display_unit). On a horizontal axis the ticks thin
    out until their labels, measured by their characters at the tick labels' font size, fit the axis's
    length with a gap between them (long labels such as "−0.075" on a small close-up)."""

    def __init__(self, factor: float) -> None:
        super().__init__()
        self.factor = factor
        self._found: dict[tuple, np.ndarray] = {}  # ticks by (limits, room): an axis asks again and again

    def tick_values(self, vmin: float, vmax: float) -> np.ndarray:
        low, high = sorted((vmin / self.factor, vmax / self.factor))
        room = self._room()
        key = (low, high, room, None if room is None else self._font_px())
        if key not in self._found:
            ticks = self._round(low, high, "auto")
            while room is not None and len(ticks) > 2 and _label_width(ticks, low, high, key[3]) > room:
                fewer = self._round(low, high, max(1, len(ticks) - 3))
                if len(fewer) >= len(ticks):
                    break
                ticks = fewer
            self._found[key] = ticks * self.factor
        return self._found[key].copy()

    def _round(self, low: float, high: float, nbins) -> np.ndarray:
        """Round ticks in the display unit with at most `nbins` intervals ("auto": matplotlib's choice)."""
        self.set_params(nbins=nbins)
        try:
            return np.asarray(super().tick_values(low, high))
        finally:
            self.set_params(nbins="auto")

    def _room(self) -> float | None:
        """Length (pixels) of a horizontal axis; None for a vertical one, or before the axis has an axes."""
        axis = self.axis
        if axis is None or getattr(axis, "axis_name", None) != "x" or axis.axes is None:
            return None
        return float(axis.axes.bbox.width)

    def _font_px(self) -> float:
        """Font size (pixels) of the axis's tick labels."""
        size = FontProperties(size=rcParams["xtick.labelsize"]).get_size_in_points()
        return size * self.axis.axes.figure.dpi / 72.0


def _label_width(ticks: np.ndarray, low: float, high: float, font_px: float) -> float:
    """Pixels the labels of the ticks inside [low, high] take in a row, with a gap of a character and a half
    between neighbours (a digit of DejaVu Sans is about 0.64 of the font size wide)."""
    shown = [t for t in ticks if low - 1e-9 * abs(high - low) <= t <= high + 1e-9 * abs(high - low)]
    decimals = _decimals(shown)
    chars = sum(len(f"{t:.{decimals}f}") for t in shown)
    return 0.64 * font_px * (chars + 1.5 * max(len(shown) - 1, 0))


def _decimals(values) -> int:
    """The fewest decimals (at most 6) that show every value exactly."""
    return next((d for d in range(7) if all(abs(round(v, d) - v) <= 1e-9 * max(1.0, abs(v)) for v in values)), 6)


class DisplayFormatter(Formatter):
    """Tick labels in a display unit: data / factor with the fewest decimals (at most 6) that show every
    tick exactly, the same for all ticks of the axis; a zero carries no sign."""

    def __init__(self, factor: float) -> None:
        self.factor = factor
        self.decimals = 0

    def set_locs(self, locs) -> None:
        super().set_locs(locs)
        self.decimals = _decimals([float(v) / self.factor for v in locs])

    def __call__(self, x: float, pos: int | None = None) -> str:
        return unsigned_zero(f"{x / self.factor:.{self.decimals}f}").replace("-", "\N{MINUS SIGN}")


def unit_axis(axis, quantity: str, units: str, text: str) -> None:
    """Ticks of a matplotlib `axis` (x or y, data in internal units) at round numbers of `quantity`'s
    display unit in `units`, labelled in it; the axis title is "text (unit)"."""
    name, factor = display_unit(quantity, units)
    axis.set_major_locator(DisplayLocator(factor))
    axis.set_major_formatter(DisplayFormatter(factor))
    axis.set_label_text(f"{text} ({name})")


def unit_colorbar(colorbar, quantity: str, units: str, text: str) -> None:
    """A colour bar of data in internal units ticked and labelled in the display unit, like unit_axis."""
    name, factor = display_unit(quantity, units)
    colorbar.locator = DisplayLocator(factor)
    colorbar.formatter = DisplayFormatter(factor)
    colorbar.set_label(f"{text} ({name})")


def _frame(ax, xlim, ylim, units: str) -> None:
    """An equal-aspect view of the part, limits in mm, axes x and y in the display length unit."""
    ax.set_aspect("equal")
    ax.set_xlim(*xlim)
    ax.set_ylim(*ylim)
    unit_axis(ax.xaxis, "length", units, "x")
    unit_axis(ax.yaxis, "length", units, "y")


def _padded(result: CheckResult, pad: float = 0.04) -> tuple[tuple[float, float], tuple[float, float]]:
    minx, miny, maxx, maxy = _bounds(result)
    p = pad * max(maxx - minx, maxy - miny)
    return (minx - p, maxx + p), (miny - p, maxy + p)


def _dimension(ax, a: tuple[float, float], b: tuple[float, float], text: str, offset: tuple[float, float],
               rotation: float = 0.0) -> None:
    """A dimension line between points a and b shifted by `offset` (mm), with extension lines and text."""
    a2 = (a[0] + offset[0], a[1] + offset[1])
    b2 = (b[0] + offset[0], b[1] + offset[1])
    for p, q in ((a, a2), (b, b2)):
        ax.plot([p[0], q[0] + 0.15 * np.sign(offset[0] or 0) * abs(offset[0])],
                [p[1], q[1] + 0.15 * np.sign(offset[1] or 0) * abs(offset[1])], color=GROSS_LINE, lw=0.6)
    ax.add_patch(FancyArrowPatch(a2, b2, arrowstyle="<|-|>", mutation_scale=9, color=INK, lw=0.8,
                                 shrinkA=0, shrinkB=0))
    mid = (0.5 * (a2[0] + b2[0]), 0.5 * (a2[1] + b2[1]))
    ax.text(*mid, text, ha="center", va="center", rotation=rotation, fontsize=9, color=INK,
            bbox=dict(boxstyle="round,pad=0.2", facecolor="white", edgecolor="none"))


def _fmt(value: float, quantity: str, units: str, resultant: bool = False) -> str:
    """An internal value written on a drawing: 4 significant figures in `units`, with the unit label."""
    return quantity_text(value, quantity, units, ".4g", resultant)


# --- the part ---------------------------------------------------------------------------------------

def outline_figure(result: CheckResult) -> Figure:
    """Dimensioned outline of the part: overall length and width, each raiser named beside it (its
    dimensions listed below the drawing, in its kind's words), the held end, the loads and the critical
    sections."""
    spec, units = result.spec, result.spec.units
    minx, miny, maxx, maxy = _bounds(result)
    length, width = maxx - minx, maxy - miny
    step = 0.09 * max(length, width)
    xlim, ylim = (minx - 1.6 * step, maxx + 1.6 * step), (miny - 2.0 * step, maxy + 1.8 * step)
    raisers = named(spec)
    rows = math.ceil(len(raisers) / 2)
    fig = _figure(height=(WIDTH_IN - 0.8) * (ylim[1] - ylim[0]) / (xlim[1] - xlim[0]) + 0.8 + 0.22 * rows)
    ax = fig.add_subplot()
    _outline_patches(result, ax)
    _dimension(ax, (minx, miny), (maxx, miny), _fmt(length, "length", units), (0.0, -1.3 * step))
    _dimension(ax, (minx, miny), (minx, maxy), _fmt(width, "length", units), (-0.9 * step, 0.0), rotation=90)
    _draw_support(ax, spec, (minx, miny, maxx, maxy), step)
    _draw_loads(ax, spec, (minx, miny, maxx, maxy), step)
    _draw_raisers(ax, result)
    legend = _raiser_legend(fig, result)
    # critical sections; sections on the same cut share one line and one label
    cuts: dict[tuple, list[SectionView]] = {}
    for view in critical_sections(result):
        key = tuple(np.round(np.concatenate([view.point, view.normal]), 6))
        cuts.setdefault(key, []).append(view)
    section_labels = []
    for views in cuts.values():
        view = views[0]
        lo = min(a for v in views for a, _ in v.section.ligaments) - 0.25 * step
        hi = max(b for v in views for _, b in v.section.ligaments) + 0.25 * step
        a, b = view.ends(lo, hi)
        ax.plot([a[0], b[0]], [a[1], b[1]], color=FE_LINE, lw=1.0, ls="--")
        low, high = (a, b) if a[1] <= b[1] else (b, a)
        names = ", ".join(v.label.removeprefix("section ") for v in views)
        label = ("sections " if len(views) > 1 else "section ") + names
        text = ax.text(low[0], low[1] - 0.1 * step, label + (f"\n{view.where(units)}" if view.across_x else ""),
                       ha="center", va="top", fontsize=8, color=FE_LINE)
        gap = 0.1 * step
        section_labels.append((text, [at_position(low[0], low[1] - gap, "center", "top"),
                                      at_position(high[0], high[1] + gap, "center", "bottom"),
                                      at_position(low[0] + gap, low[1], "left", "bottom"),
                                      at_position(low[0] - gap, low[1], "right", "bottom"),
                                      at_position(high[0] + gap, high[1], "left", "top"),
                                      at_position(high[0] - gap, high[1], "right", "top")]))
    origin = "origin as drawn" if spec.drawing is not None else "origin at the plate centre"
    ax.text(0.99, 0.01, f"thickness {_fmt(spec.plate.thickness, 'length', units)} · {origin}",
            transform=ax.transAxes, ha="right", va="bottom", fontsize=8, color=GROSS_LINE)
    _frame(ax, xlim, ylim, units)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    _fit_legend(fig, legend, 2, handlelength=0, handletextpad=0)
    names = [(t, [annotation_at(dx, dy, ha, va) for dx, dy, ha, va in RAISER_NAME_SPOTS], ax) for t in ax.texts
             if isinstance(t, Annotation)]
    _settle_and_place(fig, [(text, spots, ax) for text, spots in section_labels] + names)
    return fig


# offsets (points) and alignment of a raiser's name from the corner of its cut-out, in order of preference
RAISER_NAME_SPOTS = ((4, 4, "left", "bottom"), (-4, 4, "right", "bottom"), (4, -4, "left", "top"),
                     (-4, -4, "right", "top"), (14, 0, "left", "center"), (-14, 0, "right", "center"))


# offsets (points) and alignment of a label from the point it names, in order of preference
AROUND = ((0, 9, "center", "bottom"), (0, -9, "center", "top"), (9, 0, "left", "center"), (-9, 0, "right", "center"),
          (9, 9, "left", "bottom"), (-9, 9, "right", "bottom"), (9, -9, "left", "top"), (-9, -9, "right", "top"))


def around(first: tuple[float, float, str, str] | None = None, reach: float = 1.0) -> list:
    """Candidates for a label of a point: `first` (offset points and alignment), then AROUND scaled by
    `reach`."""
    spots = ([first] if first else []) + [(reach * dx, reach * dy, ha, va) for dx, dy, ha, va in AROUND]
    return [annotation_at(*spot) for spot in spots]


def _settle_and_place(fig: Figure, labels, sizes=()) -> None:
    """Lay the figure out once, then place each (text, candidates, axes) in order, inside its axes (the figure
    when axes is None) and clear of everything else and of the labels placed before it."""
    renderer = settle(fig)
    avoid = obstacles(fig, renderer, skip=[text for text, _, _ in labels])
    for text, candidates, ax in labels:
        place(text, candidates, renderer, avoid, figure_region(fig) if ax is None else axes_region(ax, renderer), sizes)


def _raiser_legend(fig: Figure, result: CheckResult):
    """Below the drawing, each raiser's dimensions in its kind's words (None without raisers)."""
    units = result.spec.units
    raisers = named(result.spec)
    if not raisers:
        return None
    handles = [Line2D([], [], ls="none", label=f"{rid}: {kind_of(item).describe(item, units)}")
               for rid, item in raisers]
    return fig.legend(handles=handles, loc="outside lower center", ncols=min(2, len(handles)), fontsize=9,
                      frameon=False, handlelength=0, handletextpad=0, columnspacing=1.5)


def _fit_legend(fig: Figure, legend, ncols: int = 2, **options) -> None:
    """A figure legend below the axes ("outside lower center", `ncols` columns, drawn with `options`) whose
    columns are wider than the figure goes to one column (the figure grows to hold its rows), and to a
    smaller type if one entry is still too wide: no entry is cut at the figure's edge."""
    if legend is None:
        return
    renderer = (fig.canvas if isinstance(fig.canvas, FigureCanvasAgg) else FigureCanvasAgg(fig)).get_renderer()
    room = 0.98 * fig.bbox.width
    if legend.get_window_extent(renderer).width <= room:
        return
    handles, labels = legend.legend_handles, [t.get_text() for t in legend.get_texts()]
    rows_before = math.ceil(len(labels) / min(ncols, len(labels)))
    legend.remove()
    for size in (9, 8, 7):
        legend = fig.legend(handles, labels, loc="outside lower center", ncols=1, fontsize=size, frameon=False,
                            **options)
        if legend.get_window_extent(renderer).width <= room or size == 7:
            break
        legend.remove()
    fig.set_figheight(fig.get_figheight() + 0.22 * (len(labels) - rows_before))


def _draw_raisers(ax, result: CheckResult) -> None:
    """Each raiser's name beside its cut-out, and centre lines through every cut-out inside the outline."""
    regions = cutout_regions(result.spec)
    plate = plate_polygon(result.spec)
    for rid, item in named(result.spec):
        region = shapely.union_all(regions[rid]).intersection(plate)
        if region.is_empty:
            continue
        x0, y0, x1, y1 = region.bounds
        cx, cy, hx, hy = 0.5 * (x0 + x1), 0.5 * (y0 + y1), 0.5 * (x1 - x0), 0.5 * (y1 - y0)
        if not kind_of(item).mouths(result.spec, item):
            for dx, dy in ((hx, 0.0), (0.0, hy)):
                ax.plot([cx - 1.25 * dx, cx + 1.25 * dx], [cy - 1.25 * dy, cy + 1.25 * dy],
                        color=GROSS_LINE, lw=0.6, ls=(0, (6, 2, 1, 2)))
        ax.annotate(str(rid), xy=(cx + 0.71 * hx, cy + 0.71 * hy), xytext=(4, 4), textcoords="offset points",
                    fontsize=8, fontweight="bold", color=INK)
    for raiser in outline_raisers(result.spec):  # a drawn outline's corners, named at their tightest arc
        if result.spec.drawing is not None:
            ax.annotate(str(raiser.id), xy=raiser.cut.point, xytext=(4, 4), textcoords="offset points",
                        fontsize=8, fontweight="bold", color=INK)


def _draw_support(ax, spec, bounds, step: float) -> None:
    """Hatching at the held end (left), with how it is held; none under a remote (self-equilibrated) load.
    A part held by [[hold]] supports: each stretch drawn thick with hatching on its outer side and its
    mode, and each pin hold as a cross in its hole."""
    minx, miny, maxx, maxy = bounds
    if spec.load.remote is not None:
        return
    holds = spec.support.holds
    if holds:
        _draw_holds(ax, spec, holds, step)
        return
    for y in np.linspace(miny, maxy, 9):
        ax.plot([minx, minx - 0.12 * step], [y, y - 0.12 * step], color=INK, lw=0.8)
    text = "held end\n(clamped)" if spec.support.held == "clamped" else "held end\n(x fixed)"
    ax.text(minx, maxy + 0.3 * step, text, ha="center", va="bottom", fontsize=9, color=INK)


def _draw_holds(ax, spec, holds, step: float) -> None:
    from ..geometry.boundary import outward_normals, segment_samples, stretch

    for hold in holds:
        if hold.pin is not None:
            hole = spec.holes[hold.pin - 1]
            r = 0.5 * hole.radius
            (cx, cy) = hole.center
            ax.plot([cx - r, cx + r], [cy, cy], color=INK, lw=1.2)
            ax.plot([cx, cx], [cy - r, cy + r], color=INK, lw=1.2)
            ax.text(cx, cy + hole.radius + 0.2 * step, f"{hold.key}: pin", ha="center", va="bottom", fontsize=8,
                    color=INK)
            continue
        picked = stretch(spec, hold.where)
        for seg in picked.pieces:
            points = segment_samples(seg, 24)
            ax.plot(points[:, 0], points[:, 1], color=INK, lw=2.4, solid_capstyle="butt")
            ticks = segment_samples(seg, 9)
            out = outward_normals(seg, ticks)
            for p, n in zip(ticks, out):
                tip = p + 0.12 * step * (n + np.array([-n[1], n[0]]))
                ax.plot([p[0], tip[0]], [p[1], tip[1]], color=INK, lw=0.8)
        points = picked.samples(9)
        top = points[int(np.argmax(points[:, 1]))]
        ax.text(top[0], top[1] + 0.3 * step, f"{hold.key}: {hold.mode}", ha="center", va="bottom", fontsize=8,
                color=INK)


def _draw_edge_loads(ax, spec, step: float) -> list[str]:
    """Arrows along each [[load.edge]]'s stretch (the force's direction, or into the material for a
    pressure) and one note per load."""
    from ..geometry.boundary import outward_normals, segment_samples, stretch

    units = spec.units
    notes = []
    for edge in spec.load.edges:
        picked = stretch(spec, edge.where)
        for seg in picked.pieces:
            points = segment_samples(seg, 5)[1:-1]
            out = outward_normals(seg, points)
            for p, n in zip(points, out):
                if edge.pressure != 0.0:
                    u = -np.sign(edge.pressure) * n
                else:
                    a = math.radians(edge.direction)
                    u = np.array([math.cos(a), math.sin(a)])
                inward = float(u @ n) < 0.0  # the arrow points into the material: draw it outside, ending at p
                tail, head = (p - 0.9 * step * u, p) if inward else (p, p + 0.9 * step * u)
                _arrow(ax, tail, head, FE_LINE)
        value = (f"p = {_fmt(edge.pressure, 'stress', units)} {unit_label('stress', units)}" if edge.pressure != 0.0
                 else f"F = {_fmt(edge.force, 'force', units, True)} at {edge.direction:.4g}°")
        notes.append(f"{edge.where.key}: {value}")
    return notes


def _arrow(ax, tail, head, colour: str = AVERAGE_LINE) -> None:
    ax.add_patch(FancyArrowPatch(tuple(tail), tuple(head), arrowstyle="-|>", mutation_scale=12, color=colour,
                                 lw=1.4, zorder=6))


def _draw_loads(ax, spec, bounds, step: float) -> None:
    """Arrows and labels for the loads the part file gives: end force, moment and shear, a pin through a
    hole, or a remote stress state. Forces and moments in the section-resultant units of the part file's
    system (kN and kN·m in mm-N-MPa), stresses in its stress unit."""
    minx, miny, maxx, maxy = bounds
    load, units = spec.load, spec.units
    width = maxy - miny
    notes = []
    axial = load.axial
    if axial:
        tail, head = (maxx + 0.2 * step, maxx + 1.3 * step) if axial > 0 else (maxx + 1.3 * step, maxx + 0.2 * step)
        for y in np.linspace(miny + 0.2 * width, maxy - 0.2 * width, 3):
            _arrow(ax, (tail, y), (head, y))
        notes.append(f"P = {_fmt(abs(axial), 'force', units, True)} " + ("tension" if axial > 0 else "compression"))
    shear = load.shear
    if shear:
        x = maxx + 1.45 * step
        y0, y1 = (miny + 0.1 * width, maxy - 0.1 * width) if shear > 0 else (maxy - 0.1 * width, miny + 0.1 * width)
        _arrow(ax, (x, y0), (x, y1), FE_LINE)
        notes.append(f"V = {_fmt(shear, 'force', units, True)} along y")
    bending = load.bending
    if bending:
        centre = (maxx + 0.75 * step, 0.5 * (miny + maxy))
        ax.add_patch(FancyArrowPatch((centre[0], centre[1] - 0.35 * width), (centre[0], centre[1] + 0.35 * width),
                                     connectionstyle=f"arc3,rad={0.6 if bending > 0 else -0.6}", arrowstyle="-|>",
                                     mutation_scale=12, color=HANDBOOK_MARK, lw=1.4))
        notes.append(f"M = {_fmt(bending, 'moment', units, True)}")
    pin = load.pin
    if pin is not None:
        hole = spec.holes[pin.hole - 1]
        angle = pin.angle
        u = np.array([math.cos(angle), math.sin(angle)])
        start = np.asarray(hole.center, dtype=float)
        _arrow(ax, start, start + (0.5 * hole.diameter + 1.2 * step) * u)
        notes.append(f"pin in hole {pin.hole}: F = {_fmt(pin.force, 'force', units, True)} at "
                     f"{math.degrees(angle):.4g}°")
    notes += _draw_edge_loads(ax, spec, step)
    remote = load.remote
    if remote is not None:
        sx, sy = remote.sx, remote.sy
        for sign, x in ((-1, minx), (1, maxx)):
            if sx:
                d = 0.9 * step * np.sign(sx) * sign
                _arrow(ax, (x + (0.15 * step * sign if sx > 0 else d + 0.15 * step * sign), 0.5 * (miny + maxy)),
                       (x + (d if sx > 0 else 0.15 * step * sign), 0.5 * (miny + maxy)))
        for sign, y in ((-1, miny), (1, maxy)):
            if sy:
                d = 0.9 * step * np.sign(sy) * sign
                cx = 0.5 * (minx + maxx)
                _arrow(ax, (cx, y + (0.15 * step * sign if sy > 0 else d + 0.15 * step * sign)),
                       (cx, y + (d if sy > 0 else 0.15 * step * sign)))
        sxy = (shown(v, "stress", units, ".4g") for v in (sx, sy, remote.txy))
        notes.append("remote stress σx {}, σy {}, τxy {} ".format(*sxy) + unit_label("stress", units))
    if notes:
        ax.text(maxx, maxy + 0.3 * step, "\n".join(notes), ha="right", va="bottom", fontsize=9, color=AVERAGE_LINE)


# --- the mesh ---------------------------------------------------------------------------------------

def _map_layout(result: CheckResult, bottom_height: float = 3.6):
    """A figure with the whole part on top (full width) and two square close-ups below."""
    (x0, x1), (y0, y1) = _padded(result, 0.01)
    top_height = (WIDTH_IN - 1.2) * (y1 - y0) / (x1 - x0) + 0.7
    fig = _figure(height=top_height + bottom_height + 0.2)
    grid = fig.add_gridspec(2, 2, height_ratios=[top_height, bottom_height])
    return fig, fig.add_subplot(grid[0, :]), fig.add_subplot(grid[1, 0]), fig.add_subplot(grid[1, 1]), ((x0, x1), (y0, y1))


def mesh_figure(result: CheckResult) -> Figure:
    """The finest mesh: the whole part above; below, the raiser that holds the peak and a closer view
    of the peak itself, where the layered elements along the edge are visible."""
    mesh, units = result.solution.mesh, result.spec.units
    fig, ax, near, closest, limits = _map_layout(result)
    raiser, peak = _raiser_window(result), _peak_window(result)
    ax.triplot(_triangulation(result), color=INK, lw=0.15, rasterized=True)
    _box(ax, raiser, AVERAGE_LINE)
    ax.set_title(f"finest level: {mesh.n_nodes:,} nodes, {mesh.n_elements:,} triangles", fontsize=10, loc="left")
    _frame(ax, *limits, units)
    near.triplot(_window_triangulation(result, raiser), color=INK, lw=0.3, rasterized=True)
    _box(near, peak, FE_LINE)
    near.set_title(f"around {raiser_label(result.peak.feature)} (orange box above)", fontsize=10, loc="left")
    _frame(near, *raiser, units)
    closest.triplot(_window_triangulation(result, peak), color=INK, lw=0.5, rasterized=True)
    closest.plot(*result.peak.location, "o", ms=9, mfc="none", mec=AVERAGE_LINE, mew=1.8)
    size = next((f.edge_size for f in mesh.features if f.name == result.peak.feature), None)
    closest.set_title("at the peak (blue box)" + (f": edge elements {quantity_text(size, 'length', units, '.3g')}"
                                                  if size else ""), fontsize=10, loc="left")
    _frame(closest, *peak, units)
    for axis, colour in ((near, AVERAGE_LINE), (closest, FE_LINE)):
        for spine in axis.spines.values():
            spine.set_edgecolor(colour)
            spine.set_linewidth(1.2)
    settle(fig)
    return fig


# --- the stress map ---------------------------------------------------------------------------------

def stress_map_figure(result: CheckResult) -> Figure:
    """Maximum principal stress on the finest mesh (viridis): the whole part, a close-up of the raiser
    with the peak marked and labelled, and von Mises stress over the same close-up."""
    s1 = result.solution.principal[:, 0]
    vm = result.solution.von_mises
    units = result.spec.units
    limits = (float(np.min(s1)), float(np.max(s1)))
    fig, ax, near, other, whole = _map_layout(result)
    image = ax.tripcolor(_triangulation(result), s1, shading="gouraud", cmap=STRESS_MAP, vmin=limits[0],
                         vmax=limits[1], rasterized=True)
    px, py = result.peak.location
    for view in critical_sections(result):
        a, b = view.ends(min(lo for lo, _ in view.section.ligaments), max(hi for _, hi in view.section.ligaments))
        ax.plot([a[0], b[0]], [a[1], b[1]], color="white", lw=0.8, ls="--")
    ax.plot(px, py, marker="o", ms=8, mfc="none", mec="white", mew=1.6)
    window = _raiser_window(result)
    _box(ax, window, AVERAGE_LINE)
    ax.set_title(f"max principal stress; peak {quantity_text(result.peak.stress, 'stress', units)} at "
                 f"{point_text((px, py), units)} ({raiser_label(result.peak.feature)}); dashed: critical section", fontsize=10,
                 loc="left")
    _frame(ax, *whole, units)
    unit_colorbar(fig.colorbar(image, ax=ax, shrink=0.95, pad=0.01, aspect=12), "stress", units, "max principal")
    close = _window_triangulation(result, window)
    image = near.tripcolor(close, s1, shading="gouraud", cmap=STRESS_MAP, vmin=limits[0], vmax=limits[1],
                           rasterized=True)
    _outline_patches(result, near, fill="none", edge=INK, lw=0.8)
    near.plot(px, py, marker="o", ms=9, mfc="none", mec="white", mew=2.0)
    label = near.annotate(f"peak {quantity_text(result.peak.stress, 'stress', units)}\n(finest mesh "
                          f"{shown(result.peak.fe_stress, 'stress', units)})", xy=(px, py),
                          xytext=(0.5 * sum(window[0]), 0.5 * sum(window[1])), fontsize=9, color="white",
                          ha="center", va="center",
                          arrowprops=dict(arrowstyle="-|>", color=INK, lw=0.9, shrinkA=4, shrinkB=6),
                          bbox=dict(boxstyle="round,pad=0.3", facecolor=INK, edgecolor="none", alpha=0.85))
    label.set_in_layout(False)
    near.set_title(f"max principal around {raiser_label(result.peak.feature)}", fontsize=10, loc="left")
    _frame(near, *window, units)
    unit_colorbar(fig.colorbar(image, ax=near, shrink=0.9, pad=0.02), "stress", units, "max principal")
    hot_spot = _hot_spot_inset(result, near, window, s1, limits)
    image = other.tripcolor(close, vm, shading="gouraud", cmap=STRESS_MAP, rasterized=True,
                            vmin=0.0, vmax=float(np.max(vm[np.unique(close.triangles)])))
    _outline_patches(result, other, fill="none", edge=INK, lw=0.8)
    other.set_title("von Mises, same close-up", fontsize=10, loc="left")
    _frame(other, *window, units)
    unit_colorbar(fig.colorbar(image, ax=other, shrink=0.9, pad=0.02), "stress", units, "von Mises")
    renderer = settle(fig)
    avoid = obstacles(fig, renderer, skip=[label])
    # the label keeps clear of the hot spot itself (a ring of the peak marker's size and the root radius)
    peak_px = near.transData.transform((px, py))
    reach = max(16.0, float(near.transData.transform((px + _peak_radius(result), py))[0] - peak_px[0]))
    avoid.append(Bbox.from_extents(*(peak_px - reach), *(peak_px + reach)))
    if hot_spot is not None:
        avoid += [hot_spot.get_window_extent(renderer), *(patch.get_window_extent(renderer) for patch in
                                                          near.patches if patch.get_label() == HOT_SPOT_BOX)]
    (x0, x1), (y0, y1) = window
    spots = [annotation_at(x0 + fx * (x1 - x0), y0 + fy * (y1 - y0))
             for fx, fy in ((0.5, 0.5), (0.5, 0.78), (0.5, 0.22), (0.28, 0.5), (0.72, 0.5), (0.28, 0.78),
                            (0.72, 0.78), (0.28, 0.22), (0.72, 0.22))]
    place(label, spots, renderer, avoid, axes_region(near, renderer), (8,))
    return fig


HOT_SPOT_FRACTION = 0.12  # a peak radius below this fraction of the close-up's half width gets an inset
HOT_SPOT_RADII = 2.5  # the inset's half width, in peak radii
HOT_SPOT_BOX = "hot spot"  # the label of the box the inset zooms on


def _hot_spot_inset(result: CheckResult, near, window, s1: np.ndarray, limits: tuple[float, float]):
    """An inset in the raiser close-up `near`, zoomed on the peak, when the raiser's radius at the peak is
    small against the close-up (a sharp notch root, a small hole in a long edge): the hot spot itself,
    HOT_SPOT_RADII of that radius each way. Placed in the corner of the close-up farthest from the peak;
    returns the inset axes, or None when the close-up already shows the hot spot."""
    radius = _peak_radius(result)
    half = 0.5 * (window[0][1] - window[0][0])
    if radius >= HOT_SPOT_FRACTION * half:
        return None
    zoom = _peak_window(result, HOT_SPOT_RADII)
    px, py = result.peak.location
    (x0, x1), (y0, y1) = window
    corners = [(fx, fy) for fx in (0.02, 0.58) for fy in (0.02, 0.58)]
    fx, fy = max(corners, key=lambda c: math.hypot(x0 + (c[0] + 0.2) * (x1 - x0) - px,
                                                   y0 + (c[1] + 0.2) * (y1 - y0) - py))
    inset = near.inset_axes([fx, fy, 0.4, 0.4])
    inset.tripcolor(_window_triangulation(result, zoom), s1, shading="gouraud", cmap=STRESS_MAP, vmin=limits[0],
                    vmax=limits[1], rasterized=True)
    _outline_patches(result, inset, fill="none", edge=INK, lw=0.8)
    inset.plot(px, py, marker="o", ms=7, mfc="none", mec="white", mew=1.5)
    inset.set_aspect("equal")
    inset.set_xlim(*zoom[0])
    inset.set_ylim(*zoom[1])
    inset.set_xticks([])
    inset.set_yticks([])
    for spine in inset.spines.values():
        spine.set_edgecolor("white")
        spine.set_linewidth(1.2)
    box = near.indicate_inset_zoom(inset, edgecolor="white", alpha=0.9)
    (box.rectangle if hasattr(box, "rectangle") else box[0]).set_label(HOT_SPOT_BOX)
    return inset


# --- the signature picture: stress across a critical section -----------------------------------------

def section_figure(result: CheckResult, view: SectionView) -> Figure:
    """Normal stress across one critical section from the FE solution, the net-section average drawn
    flat over each ligament, the gross average for reference, and the converged peak annotated."""
    ns, units = view.section, result.spec.units
    cut = ns.cut
    fig = _figure(height=4.6)
    ax = fig.add_subplot()
    lo = min(a for a, _ in ns.ligaments)
    hi = max(b for _, b in ns.ligaments)
    # gaps between ligaments carry no material
    for (a0, b0), (a1, _) in zip(ns.ligaments[:-1], ns.ligaments[1:]):
        ax.axvspan(b0, a1, color="#dddddd", zorder=0)
        ax.text(0.5 * (b0 + a1), 0.03, "no material", transform=ax.get_xaxis_transform(), ha="center",
                va="bottom", fontsize=8, color=GROSS_LINE)
    y, s = np.asarray(cut.positions), np.asarray(cut.normal_stress)
    for k, (a, b) in enumerate(ns.ligaments):
        inside = (y >= a - 1e-9) & (y <= b + 1e-9)
        ax.fill_between(y[inside], ns.average, s[inside], color=FE_LINE, alpha=0.12, lw=0, zorder=1)
        ax.plot(y[inside], s[inside], color=FE_LINE, lw=2.0, zorder=3,
                label="FE normal stress on the section (finest mesh)" if k == 0 else None)
        ax.plot([a, b], [ns.average, ns.average], color=AVERAGE_LINE, lw=2.0, zorder=4,
                label=f"net-section average, force / net area: {quantity_text(ns.average, 'stress', units)}"
                if k == 0 else None)
    gross = result.gross_average
    ax.axhline(gross, color=GROSS_LINE, lw=1.0, ls=":", zorder=2,
               label=f"gross-section average {quantity_text(gross, 'stress', units)}")
    # Kt may refer to another nominal than force / net area (bending, combined loads): draw it too
    nominal = view.peak / view.kt_net if view.kt_net else ns.average
    own_nominal = abs(nominal - ns.average) > 0.01 * max(abs(ns.average), 1e-9 * abs(view.peak), 1e-12)
    if own_nominal:
        name = nominal_label(result, view)
        ax.axhline(nominal, color=HANDBOOK_MARK, lw=1.2, ls="--", zorder=2,
                   label=f"nominal stress of Kt ({name}) {quantity_text(nominal, 'stress', units)}")
    # the converged peak: at its own position when it lies on this cut, else (a fillet's peak beside the
    # cut through the fillets' ends) at the end of the ligament nearest to it, the edge where it is
    along, off = view.position(view.location)
    on_cut = abs(off) <= 1e-6 * max(1.0, abs(hi - lo))
    yp = along if on_cut else peak_edge(view)
    ax.plot(yp, view.peak, marker="o", ms=7, color=INK, zorder=5)
    ax.vlines(yp, ns.average, view.peak, colors=INK, lw=0.8, ls="--", zorder=5)
    # the label sits in a band above all the curves, pointing down at the peak; it never covers data
    top = max(view.peak, float(np.max(s)))
    bottom = min(0.0, float(np.min(s)))
    span = max(top - bottom, 1e-9)
    left, right = lo - 0.02 * (hi - lo), hi + 0.02 * (hi - lo)
    where = (yp - left) / (right - left)
    ha = "left" if where < 0.3 else "right" if where > 0.7 else "center"
    offside = "" if on_cut else (f"\nit lies {quantity_text(abs(off), 'length', units, '.2f')} off this cut, at "
                                 f"{point_text(view.location, units)}:\nmarked at the edge nearest to it")
    basis = "the nominal stress of Kt" if own_nominal else "net-section average"
    band = top + 0.13 * span
    label = ax.annotate(
        f"peak {quantity_text(view.peak, 'stress', units)} ({raiser_label(view.feature)}, converged)\n"
        f"= {view.kt_net:.2f} × {basis}: the {basis.removeprefix('the ').removeprefix('net-section ')} understates "
        f"it by {1 - nominal / view.peak if view.peak else 0.0:.0%}{offside}",
        xy=(yp, view.peak), xytext=(yp, band), ha=ha, va="bottom", fontsize=9, color=INK,
        arrowprops=dict(arrowstyle="-|>", color=INK, lw=0.8, shrinkA=2, shrinkB=5),
        bbox=dict(boxstyle="round,pad=0.3", facecolor="white", edgecolor=INK, lw=0.6), zorder=6)
    label.set_in_layout(False)
    inset = 0.01 * (right - left)
    label_spots = [annotation_at(yp, band, ha, "bottom"), annotation_at(left + inset, band, "left", "bottom"),
                   annotation_at(right - inset, band, "right", "bottom"), annotation_at(0.5 * (left + right), band)]
    ax.set_xlim(left, right)
    ax.set_ylim(bottom - 0.05 * span, top + (0.36 if on_cut else 0.56) * span)
    # the three levels a reviewer compares, named on the right-hand axis
    def level(value: float) -> str:
        return shown(value, "stress", units, ".0f")

    marks = [(view.peak, f"peak {level(view.peak)}", INK), (ns.average, f"average {level(ns.average)}", AVERAGE_LINE)]
    if own_nominal and abs(nominal - ns.average) > 0.06 * span:
        marks.append((nominal, f"nominal {level(nominal)}", HANDBOOK_MARK))
    if all(abs(gross - m[0]) > 0.06 * span for m in marks):
        marks.append((gross, f"gross {level(gross)}", GROSS_LINE))
    side = ax.secondary_yaxis("right")
    side.set_yticks([m[0] for m in marks], [m[1] for m in marks], fontsize=8)
    for tick, (_, _, colour) in zip(side.get_yticklabels(), marks):
        tick.set_color(colour)
    side.set_ylabel(unit_label("stress", units), fontsize=8)
    unit_axis(ax.xaxis, "length", units, "position across the section, y" if view.across_x
              else "position along the cut")
    unit_axis(ax.yaxis, "stress", units, "normal stress on the section")
    ax.set_title(f"{view.label}, {view.where(units)}: net width {quantity_text(ns.width, 'length', units, '.2f')}, "
                 f"net area {quantity_text(ns.area, 'area', units)}", fontsize=10, loc="left")
    ax.grid(True, color="#e4e4e4", lw=0.6)
    ax.set_axisbelow(True)
    ncols = 2 if own_nominal else 3
    _fit_legend(fig, fig.legend(loc="outside lower center", ncols=ncols, fontsize=8, frameon=False), ncols)
    _settle_and_place(fig, [(label, label_spots, ax)], (8, 7))
    return fig


def peak_edge(view: SectionView) -> float:
    """Position along the cut (mm) of the ligament end nearest to the peak's own position projected onto the
    cut: the edge where a peak that lies off the cut is."""
    along, _ = view.position(view.location)
    ends = [end for ligament in view.section.ligaments for end in ligament]
    return float(min(ends, key=lambda end: abs(end - along)))


def nominal_label(result: CheckResult, view: SectionView) -> str:
    """Words for the nominal stress a section's Kt refers to: the check's own label for its headline net
    nominal when that is the one, else "peak / Kt"."""
    net = result.nominal.net if result.nominal is not None else None
    if net is not None and view.kt_net and math.isclose(abs(net.stress), abs(view.peak / view.kt_net), rel_tol=1e-6):
        return net.label
    return "peak / Kt"


def cut_figure(result: CheckResult, section: SectionResult) -> Figure:
    """A cut the part file asked for (method of sections): normal and shear traction along the cut, the
    average normal stress N / A drawn flat over the material, and the largest normal traction marked."""
    units = result.spec.units
    name = cut_label(section.label, section.point, units)
    across_x = bool(np.allclose(np.asarray(section.normal) / np.hypot(*section.normal), (1.0, 0.0)))
    cut = section.cut
    y, sn, st = np.asarray(cut.positions), np.asarray(cut.normal_stress), np.asarray(cut.shear_stress)
    fig = _figure(height=4.2)
    ax = fig.add_subplot()
    spans = list(section.ligaments)
    for (a0, b0), (a1, _) in zip(spans[:-1], spans[1:]):
        ax.axvspan(b0, a1, color="#dddddd", zorder=0)
    for k, (a, b) in enumerate(spans):
        inside = (y >= a - 1e-9) & (y <= b + 1e-9)
        ax.plot(y[inside], sn[inside], color=FE_LINE, lw=2.0, label="FE normal traction" if k == 0 else None)
        ax.plot(y[inside], st[inside], color=HANDBOOK_MARK, lw=1.2, ls="--", label="FE shear traction" if k == 0 else None)
        ax.plot([a, b], [section.average_normal] * 2, color=AVERAGE_LINE, lw=2.0,
                label=f"average normal N / A = {quantity_text(section.average_normal, 'stress', units)}"
                if k == 0 else None)
    ax.axhline(0.0, color=GROSS_LINE, lw=0.6)
    peak, where = float(section.peak_normal), float(section.peak_position)
    ax.plot(where, peak, "o", ms=7, color=INK, zorder=5)
    first, last = float(y.min()), float(y.max())
    share = (where - first) / max(last - first, 1e-9)
    first = (0, 12 if peak >= 0 else -12, "left" if share < 0.3 else "right" if share > 0.7 else "center",
             "bottom" if peak >= 0 else "top")
    label = ax.annotate(f"largest normal traction {quantity_text(peak, 'stress', units)}",
                        xy=(where, peak), xytext=first[:2], textcoords="offset points", ha=first[2], va=first[3],
                        fontsize=9, bbox=dict(boxstyle="round,pad=0.25", facecolor="white", edgecolor="none",
                                              alpha=0.9))
    label.set_in_layout(False)
    values = np.concatenate([sn, st, [section.average_normal, 0.0]])
    low, high = float(values.min()), float(values.max())
    pad = 0.18 * max(high - low, 1e-9)
    ax.set_ylim(low - pad, high + pad)
    unit_axis(ax.xaxis, "length", units, "position across the section, y" if across_x
              else "position along the cut")
    unit_axis(ax.yaxis, "stress", units, "traction on the cut")
    where = cut_where(section.point, section.normal, units)
    ax.set_title(name if name == where else f"{name}, {where}", fontsize=10, loc="left")
    ax.grid(True, color="#e4e4e4", lw=0.6)
    ax.set_axisbelow(True)
    _fit_legend(fig, fig.legend(loc="outside lower center", ncols=3, fontsize=8, frameon=False), 3)
    _settle_and_place(fig, [(label, around(first, 1.4), ax)])
    return fig


# --- convergence ------------------------------------------------------------------------------------

def level_sizes(result: CheckResult) -> tuple[np.ndarray, RaiserId | None]:
    """(element size at the peak's raiser edge for every level in mm, scaled from the finest mesh, and that
    raiser's name); or (the relative size, finest = 1, and None) when the finest mesh does not name it."""
    scales = np.array([lv.scale for lv in result.study.levels])
    for feature in result.solution.mesh.features:
        if feature.name == result.peak.feature:
            return feature.edge_size * scales / scales[-1], feature.name
    return scales / scales[-1], None


def convergence_figure(result: CheckResult) -> Figure:
    """Peak stress of each mesh level against element size, the extrapolated peak at zero size and its
    band, and the fitted error curve when Richardson extrapolation applied."""
    study, units = result.study, result.spec.units
    h, raiser = level_sizes(result)
    peaks = np.array([lv.peak for lv in study.levels])
    est = study.estimate
    fig = _figure(height=4.4)
    ax = fig.add_subplot()
    band = est.error * abs(est.value) if math.isfinite(est.error) else 0.0
    if band > 0:
        ax.axhspan(est.value - band, est.value + band, color=FE_LINE, alpha=0.12, lw=0,
                   label=f"error band ± {est.error:.2%}")
    if est.method == "richardson" and est.used_order:
        reach = h[-3] if len(h) >= 3 else h[-1]
        hh = np.linspace(0.0, reach, 80)
        curve = est.value + (peaks[-1] - est.value) * (hh / h[-1]) ** est.used_order
        order = (f"observed order {est.order:.2f}" if est.used_order == est.order
                 else f"order {est.used_order:.2f} (observed {est.order:.2f})")
        ax.plot(hh, curve, color=FE_LINE, lw=1.0, ls="--", label=f"fitted error curve, {order}, Fs {est.safety:g}")
    ax.plot(h, peaks, "o-", color=INK, ms=6, lw=1.2, label="FE peak of each mesh level")
    dofs = [ax.annotate(f"{2 * lv.nodes:,} DOFs", xy=(x, p), xytext=(6, 5), textcoords="offset points", fontsize=8,
                        color=GROSS_LINE) for lv, x, p in zip(study.levels, h, peaks)]
    how = estimate_how(est)
    ax.errorbar([0.0], [est.value], yerr=[[band], [band]], fmt="D", color=FE_LINE, ms=7, capsize=4, lw=1.2,
                label=f"{how}: {quantity_text(est.value, 'stress', units)}")
    ax.set_xlim(-0.04 * h.max(), 1.15 * h.max())
    if raiser is None:
        ax.set_xlabel("relative element size (finest level = 1)")
    else:
        unit_axis(ax.xaxis, "length", units, f"element size at the {raiser} edge")
    unit_axis(ax.yaxis, "stress", units, f"peak {result.peak.component} stress, {result.peak.feature}")
    state = "converged" if study.converged else "NOT converged"
    ax.set_title(f"{len(study.levels)} levels, {state}; target error {result.spec.mesh.tolerance:.2%}",
                 fontsize=10, loc="left")
    ax.grid(True, color="#e4e4e4", lw=0.6)
    ax.set_axisbelow(True)
    _fit_legend(fig, fig.legend(loc="outside lower center", ncols=2, fontsize=8, frameon=False), 2)
    _settle_and_place(fig, [(label, around((6, 5, "left", "bottom")), ax) for label in dofs])
    return fig


# --- handbook ---------------------------------------------------------------------------------------

def handbook_figure(result: CheckResult) -> Figure | None:
    """Kt of this part beside each matching handbook case (all on the net-section nominal), and the
    preferred case's curve over its validity range with this part on it. None without a match."""
    matches = list(result.handbook)
    if not matches:
        return None
    kt = result.kt
    band = kt.error * kt.net if math.isfinite(kt.error) else 0.0
    preferred = matches[0]
    case = preferred.case
    curve_key = next(iter(case.ranges)) if len(case.ranges) == 1 else None
    curve_key = curve_key if curve_key in preferred.recognised.params else None
    fig = _figure(height=3.9)
    axes = fig.subplots(1, 2, width_ratios=[1.1, 1.0]) if curve_key else [fig.add_subplot()]
    dots = axes[-1]
    labels = ["this part (FE, converged)"] + [short_source(m.case.source) for m in matches]
    rows = np.arange(len(labels))[::-1]
    dots.axvspan(kt.net - band, kt.net + band, color=FE_LINE, alpha=0.15, lw=0)
    dots.errorbar([kt.net], [rows[0]], xerr=[[band], [band]], fmt="D", color=FE_LINE, ms=7, capsize=4)
    dot_labels = []
    for row, m in zip(rows[1:], matches):
        dots.plot([m.kt_net], [row], "o", ms=8, color=HANDBOOK_MARK, mfc=HANDBOOK_MARK if m.in_range else "white",
                  mew=1.5)
        dot_labels.append(dots.annotate(
                      f"{m.kt_net:.3f} (FE {kt.net / m.kt_net - 1:+.1%})" + ("" if m.in_range else ", outside range"),
                      xy=(m.kt_net, row), xytext=(0, 9), textcoords="offset points", ha="center", fontsize=8))
    dot_labels.insert(0, dots.annotate(f"{kt.net:.3f} ± {kt.error:.2%}", xy=(kt.net, rows[0]), xytext=(0, 9),
                                       textcoords="offset points", ha="center", fontsize=8, color=FE_LINE))
    dots.set_xlim(*kt_span([kt.net - band, kt.net + band] + [m.kt_net for m in matches], kt.net))
    dots.set_ylim(-0.7, len(labels) - 0.4)
    dots.set_yticks(rows, labels, fontsize=8)
    dots.set_xlabel("Kt on the net section (–)")
    dots.set_title("filled: inside the case's validity range", fontsize=9, loc="left")
    dots.grid(True, axis="x", color="#e4e4e4", lw=0.6)
    if curve_key:
        ax = axes[0]
        lo, hi = case.ranges[curve_key]
        xs = np.linspace(lo, hi, 121)
        params = dict(preferred.recognised.params)
        ys = [case.kt({**params, curve_key: float(x)}) for x in xs]
        ax.plot(xs, ys, color=HANDBOOK_MARK, lw=1.6, label=short_source(case.source))
        x = params[curve_key]
        fe = kt.net if case.nominal == "net" else kt.gross
        fe_band = fe * kt.error if math.isfinite(kt.error) else 0.0
        ax.axhspan(fe - fe_band, fe + fe_band, color=FE_LINE, alpha=0.15, lw=0)
        ax.errorbar([x], [fe], yerr=[[fe_band]] * 2, fmt="D", color=FE_LINE, ms=7, capsize=4,
                    label=f"this part: {curve_key} = {x:.3g}, Kt = {fe:.3f}")
        ax.set_ylim(*kt_span(list(ys) + [fe - fe_band, fe + fe_band], fe))
        ax.set_xlabel(curve_key + " (–)")
        ax.set_ylabel(f"Kt, {case.nominal} nominal {case.nominal_text} (–)")
        ax.set_title("preferred case over its range", fontsize=9, loc="left")
        ax.grid(True, color="#e4e4e4", lw=0.6)
        ax.legend(fontsize=8, loc="best")
    _settle_and_place(fig, [(label, around(), dots) for label in dot_labels])
    return fig


MIN_KT_SPAN = 0.2  # the shortest Kt axis of the handbook figure, as a fraction of the FE Kt


def kt_span(values: list[float], kt: float) -> tuple[float, float]:
    """Limits of a Kt axis that shows `values` on an honest scale: their range with a margin, and never less
    than MIN_KT_SPAN of `kt` around their middle, so that a 2 % difference looks like 2 % of the axis's
    reach, not like its whole width."""
    low, high = min(values), max(values)
    margin = 0.15 * (high - low)
    low, high = low - margin, high + margin
    short = MIN_KT_SPAN * abs(kt) - (high - low)
    if short > 0:
        low, high = low - 0.5 * short, high + 0.5 * short
    return low, high


# --- design and fatigue (present when the part file asks for them) ------------------------------------

def design_figure(design: DesignCheck | None, units: str = DEFAULT_SYSTEM) -> Figure | None:
    """Every stress of the design check (the hand check, a pin's bearing, the peak by both criteria) as a bar
    against its own allowable (a dashed mark on its row), with margins, in the unit system `units` (the check
    is in MPa). None without a design check."""
    if design is None:
        return None
    checks = design.checks
    names = {"net-section": "hand check", "remote-stress": "hand check", "bearing": "pin bearing",
             "fastener-shear": "fastener shear",
             "peak-von-mises": "peak, von Mises", "peak-principal": "peak, max principal"}
    governs = design.peak if design.governing_check == "peak" else design.hand
    fig = _figure(height=1.2 + 0.55 * len(checks))
    ax = fig.add_subplot()
    rows = np.arange(len(checks))[::-1]
    labels = []
    for row, line in zip(rows, checks):
        colour = PASS_FILL if line.passes else FAIL_FILL
        ax.barh(row, line.actual_mpa, color=colour, height=0.55)
        ax.plot([line.allowable_mpa] * 2, [row - 0.38, row + 0.38], color=INK, lw=1.5, ls="--")
        text = quantity_text(line.actual_mpa, "stress", units)
        if math.isfinite(line.margin):
            text += f", margin {line.margin:+.2f}"
        text += ", passes" if line.passes else ", FAILS"
        labels.append(ax.annotate(text, xy=(max(line.actual_mpa, line.allowable_mpa), row), xytext=(6, 0),
                                  textcoords="offset points", va="center", ha="left", fontsize=9, color=INK, zorder=4,
                                  bbox=dict(boxstyle="round,pad=0.2", facecolor="white", edgecolor="none", alpha=0.9)))
    yield_mpa = design.yield_mpa
    ax.axvline(yield_mpa, color=GROSS_LINE, lw=1.0, ls=":")
    yield_label = ax.text(yield_mpa, -0.62, f" yield {quantity_text(yield_mpa, 'stress', units, '.0f')}", ha="left",
                          va="center", fontsize=8, color=GROSS_LINE)
    ax.set_yticks(rows, [names.get(c.key, c.key) + (" (governs)" if c is governs else "") for c in checks])
    top = max([c.actual_mpa for c in checks] + [c.allowable_mpa for c in checks] + [yield_mpa])
    ax.set_xlim(0, 1.75 * top)
    ax.set_ylim(-0.9, len(checks) - 0.4)
    ax.set_title("dashed: each check's allowable", fontsize=8, loc="left", color=GROSS_LINE)
    unit_axis(ax.xaxis, "stress", units, "stress")
    ax.grid(True, axis="x", color="#e4e4e4", lw=0.6)
    ax.set_axisbelow(True)
    _settle_and_place(fig, [(label, around((6, 0, "left", "center"), 0.8), ax) for label in labels]
                      + [(yield_label, [at_position(yield_mpa, -0.62, "left", "center"),
                                        at_position(yield_mpa, -0.62, "right", "center")], ax)])
    return fig


def fatigue_figure(fatigue: FatigueScreen | None, units: str = DEFAULT_SYSTEM) -> Figure | None:
    """Modified Goodman diagram: the fatigue strength line from Se to Su (flat at Se for a compressive mean,
    which is not credited), the same line divided by the required factor, and the notched (Kf-scaled)
    working point, in the unit system `units` (the screen is in MPa). None without a fatigue screen."""
    if fatigue is None:
        return None
    se, su, sa, sm = fatigue.se_mpa, fatigue.ultimate_mpa, fatigue.sa_mpa, fatigue.sm_mpa
    need = fatigue.required_factor
    left = min(0.0, sm) - 0.02 * su
    fig = _figure(height=4.0, width=6.4)
    ax = fig.add_subplot()
    ax.plot([left, 0, su], [se, se, 0], color=INK, lw=1.6,
            label=f"modified Goodman line (Se {shown(se, 'stress', units, '.0f')}, "
                  f"Su {quantity_text(su, 'stress', units, '.0f')}; flat for a compressive mean)")
    if need != 1.0:
        ax.plot([left, 0, su / need], [se / need, se / need, 0], color=INK, lw=1.0, ls="--",
                label=f"line / required factor {need:g}")
    passes = fatigue.passes
    ax.plot([sm], [sa], "o", ms=9, color=PASS_FILL if passes else FAIL_FILL, label="notched working point (Kf × nominal)")
    text = f"σa {shown(sa, 'stress', units)}, σm {quantity_text(sm, 'stress', units)}"
    if math.isfinite(fatigue.n_f):
        text += f"\nfactor of safety {fatigue.n_f:.2f}"
    text += ", passes" if passes else ", FAILS"
    label = ax.annotate(text, xy=(sm, sa), xytext=(10, 10), textcoords="offset points", fontsize=9, zorder=4,
                        bbox=dict(boxstyle="round,pad=0.25", facecolor="white", edgecolor="none", alpha=0.9))
    ax.set_xlim(left, 1.05 * max(su, sm))
    ax.set_ylim(0, 1.25 * max(se, sa))
    unit_axis(ax.xaxis, "stress", units, "mean stress σm")
    unit_axis(ax.yaxis, "stress", units, "alternating stress σa")
    ax.grid(True, color="#e4e4e4", lw=0.6)
    ax.set_axisbelow(True)
    ax.legend(fontsize=8, loc="upper right")
    _settle_and_place(fig, [(label, around((10, 10, "left", "bottom"), 1.2), ax)])
    return fig
