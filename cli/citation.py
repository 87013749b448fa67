"""Short citations for tight places (terminal rows, figure labels); full sources go in the JSON and HTML."""

from __future__ import annotations

import re

_YEAR = re.compile(r"\((\d{4})\)|\b(1[89]\d\d|20\d\d)\b")
_WHERE = re.compile(r"\b(?:chart|table|fig\.|figure|eq\.|equation)\s+\d+(?:\.\d+)*[a-z]?", re.IGNORECASE)


def short_source(source: str, limit: int = 40) -> str:
    """First author's surname, year and chart or table, e.g. "Pilkey 2008, chart 4.1"; a source that
    does not parse so is cut at `limit` characters with an ellipsis."""
    year = _YEAR.search(source)
    where = _WHERE.search(source)
    head = re.split(r",| and ", source, maxsplit=1)[0].strip()
    words = head.split()
    if year and words and len(head) <= 40:
        text = f"{words[-1]} {year.group(1) or year.group(2)}" + (f", {where.group(0)}" if where else "")
        if len(text) <= limit:
            return text
    return source if len(source) <= limit else source[: limit - 1].rstrip() + "…"
