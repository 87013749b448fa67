"""Labels placed by measuring, not by fixed offsets.

A figure is laid out once (its constrained layout engine) and the layout is frozen (`settle`); every label
that could land on another is then tried at candidate positions, measured with the renderer (its window
extent in pixels), and left at the first candidate that lies inside its region (its axes, or the figure) and
clear of every other text, legend, axis label and tick label (`place`). When no candidate is clear, the one
that overlaps least is kept. Nothing here changes a number or a position of data; it moves words.

Measuring needs a renderer, so figures are given an Agg canvas here (the Agg and SVG backends draw the
same text metrics). The layout is frozen because laying a figure out again would move the axes under
labels already placed, and because it costs as much as drawing it.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator, Sequence

from matplotlib.artist import Artist
from matplotlib.axis import Axis
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.legend import Legend
from matplotlib.text import Annotation, Text
from matplotlib.transforms import Bbox

Candidate = Callable[[Text], None]  # moves a text to one candidate position


def settle(fig: Figure):
    """Lay `fig` out once with its layout engine, freeze that layout, and return a renderer to measure with."""
    canvas = fig.canvas if isinstance(fig.canvas, FigureCanvasAgg) else FigureCanvasAgg(fig)
    engine = fig.get_layout_engine()
    if engine is not None:
        engine.execute(fig)
    fig.set_layout_engine("none")
    for ax in fig.axes:
        ax.apply_aspect()  # an equal-aspect axes takes its drawn size now, not at the first draw
    return canvas.get_renderer()


def extent(text: Text, renderer) -> Bbox:
    """The window extent (pixels) of a text's words and box, without an annotation's arrow."""
    if isinstance(text, Annotation):
        text.update_positions(renderer)  # where its text goes follows its text coordinates only once drawn
    box = Text.get_window_extent(text, renderer)
    patch = text.get_bbox_patch()
    if patch is not None:
        text.update_bbox_position_size(renderer)
        box = Bbox.union([box, patch.get_window_extent(renderer)])
    return box


def _texts(artist: Artist) -> Iterator[Text]:
    """Every text drawn under `artist`, leaving out axes' tick marks and labels and legends (measured whole)."""
    for child in artist.get_children():
        if isinstance(child, (Axis, Legend)):
            continue
        if isinstance(child, Text):
            yield child
        yield from _texts(child)


def obstacles(fig: Figure, renderer, skip: Iterable[Artist] = ()) -> list[Bbox]:
    """The window extents of everything a label must keep clear of: every visible text (but those in
    `skip`), every legend, and each axis with its tick labels and its label."""
    skipped = {id(a) for a in skip}
    boxes = [extent(t, renderer) for t in _texts(fig)
             if id(t) not in skipped and t.get_visible() and t.get_text().strip()]
    for legend in fig.findobj(Legend):
        if legend.get_visible() and id(legend) not in skipped:
            boxes.append(legend.get_window_extent(renderer))
    for axis in fig.findobj(Axis):
        if axis.get_visible() and axis.axes.get_visible():
            box = axis.get_tightbbox(renderer)
            if box is not None and box.width > 0 and box.height > 0:
                boxes.append(box)
    return boxes


def _overlap(a: Bbox, b: Bbox) -> float:
    """Area (pixels²) where two boxes overlap."""
    w = min(a.x1, b.x1) - max(a.x0, b.x0)
    h = min(a.y1, b.y1) - max(a.y0, b.y0)
    return w * h if w > 0 and h > 0 else 0.0


def _outside(box: Bbox, region: Bbox) -> float:
    """Area (pixels²) of `box` outside `region`."""
    return box.width * box.height - _overlap(box, region)


def place(text: Text, candidates: Sequence[Candidate], renderer, avoid: list[Bbox], region: Bbox,
          sizes: Sequence[float] = ()) -> Bbox:
    """Move `text` to the first candidate whose extent lies inside `region` and overlaps nothing in `avoid`
    (trying each candidate at the text's own size, then at each smaller font size of `sizes`), else to the
    least bad one; add its extent to `avoid` and return it."""
    best: tuple[float, int, float] | None = None
    for size in (text.get_fontsize(), *sizes):
        text.set_fontsize(size)
        for n, candidate in enumerate(candidates):
            candidate(text)
            box = extent(text, renderer)
            cost = 4.0 * _outside(box, region) + sum(_overlap(box, other) for other in avoid)
            if cost <= 0.0:
                avoid.append(box)
                return box
            if best is None or cost < best[0]:
                best = (cost, n, size)
    if best is not None:
        text.set_fontsize(best[2])
        candidates[best[1]](text)
    box = extent(text, renderer)
    avoid.append(box)
    return box


def annotation_at(dx: float, dy: float, ha: str = "center", va: str = "center") -> Candidate:
    """A candidate for an annotation: its text at (`dx`, `dy`) in the annotation's text coordinates (offset
    points from the point it names, or data coordinates)."""
    def move(text: Text) -> None:
        text.xyann = (dx, dy)  # type: ignore[attr-defined]
        text.set_horizontalalignment(ha)
        text.set_verticalalignment(va)
    return move


def at_position(x: float, y: float, ha: str = "center", va: str = "center") -> Candidate:
    """A candidate for a text: at (x, y) in its own coordinates, with this alignment."""
    def move(text: Text) -> None:
        text.set_position((x, y))
        text.set_horizontalalignment(ha)
        text.set_verticalalignment(va)
    return move


def axes_region(ax, renderer, pad: float = 2.0) -> Bbox:
    """The inside of an axes (pixels), `pad` pixels in from its frame."""
    box = ax.get_window_extent(renderer)
    return Bbox.from_extents(box.x0 + pad, box.y0 + pad, box.x1 - pad, box.y1 - pad)


def figure_region(fig: Figure, pad: float = 1.0) -> Bbox:
    """The whole figure (pixels), `pad` pixels in from its edge."""
    box = fig.bbox
    return Bbox.from_extents(box.x0 + pad, box.y0 + pad, box.x1 - pad, box.y1 - pad)
