"""Text layouts measured once per report, not once per use.

matplotlib lays a text out (its lines, their widths and heights from the font, the box and the offsets of
its alignment) every time anything asks where the text is: the layout engine, the label placement, the
tick labels' positions, the axis labels' and titles' positions, the drawing itself, each of them several
times per figure. The layout of a text does not depend on where the text is, only on its words, its font
and its alignment, so a report's drawing can measure each distinct text once: `cached_text_layouts` makes
matplotlib's layout of a text a look-up while it is active (about a sixth of the report's drawing time).

The key holds everything the layout reads; a text that wraps to its figure's width (where the layout
depends on the position) and anything the key cannot be made of are laid out as usual. The cache is
active only inside the `with` block, in this process (and in a child forked inside it).
"""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager

from matplotlib.text import Text


def _key(text: Text, renderer) -> tuple | None:
    """Everything a text's layout depends on, or None when it cannot be cached."""
    if text.get_wrap():
        return None
    try:
        font = text.get_fontproperties()
        face = (tuple(font.get_family()), font.get_slant(), font.get_variant(), font.get_weight(),
                font.get_stretch(), font.get_size_in_points(), font.get_file(), font.get_math_fontfamily())
        return (type(renderer), text.get_figure(root=True).dpi, text.get_text(), face,
                text.get_usetex(), text.get_parse_math(), text.get_linespacing(), text._get_multialignment(),
                text.get_rotation(), text.get_horizontalalignment(), text.get_verticalalignment(),
                text.get_rotation_mode())
    except (AttributeError, TypeError):  # another matplotlib than the one this was written for: no cache
        return None


@contextmanager
def cached_text_layouts() -> Iterator[None]:
    """While active, each distinct text is laid out once (matplotlib's Text._get_layout, memoised)."""
    original = Text._get_layout
    layouts: dict[tuple, object] = {}

    def layout(self: Text, renderer):
        key = _key(self, renderer)
        if key is None:
            return original(self, renderer)
        found = layouts.get(key)
        if found is None:
            found = layouts[key] = original(self, renderer)
        return found

    Text._get_layout = layout
    try:
        yield
    finally:
        Text._get_layout = original
