"""The consoles every command prints to: standard output and standard error through rich, made safe.

- Terminal control sequences never reach the terminal from a string we print: every C0 and C1 control
  character but the line break and the tab (ESC, and with it CSI and OSC sequences; BEL, backspace,
  carriage return, DEL) and the bidirectional-text controls (U+202A-U+202E, U+2066-U+2069, the marks) are
  shown as their escapes, e.g. "\\x1b[31m". A part file's title, a suite's case names, a section's label
  and a file name can hold anything.
- Output to a file or a pipe is laid out at the width its content needs: no padding to 80 columns, no
  trailing spaces, and no word or name broken across lines (a terminal still gets its own width, and
  COLUMNS, when the environment sets it, is taken as an explicit request for that width).
- A stream that cannot be written (a full disk, `> /dev/full`, a pipe whose reader has gone) raises
  OutputError naming the stream, which the command line reports as an output error (exit code 2).
"""

from __future__ import annotations

import os
import sys
from typing import Any, TextIO

from rich.console import Console

from .errors import OutputError

UNWRAPPED_WIDTH = 100_000  # columns of a console that is not a terminal: in effect, no wrapping
_BIDI_CONTROLS = frozenset("\u061c\u200e\u200f\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069\u2028\u2029")


def terminal_safe(text: str) -> str:
    """`text` with every control character other than a line break or a tab, and every bidirectional-text
    control, written as its escape; everything else (any printable Unicode) as it is."""
    if text.isprintable():
        return text
    return "".join(c.encode("unicode_escape").decode("ascii") if _is_control(c) else c for c in text)


def _is_control(c: str) -> bool:
    code = ord(c)
    return (code < 0x20 and c not in "\n\t") or 0x7F <= code <= 0x9F or c in _BIDI_CONTROLS


def shown_path(path: object) -> str:
    """A path (or any user text) for a line that rich reads as markup and that does not pass through a
    console's strings (a progress display's description): controls escaped, brackets escaped."""
    from rich.markup import escape

    return escape(terminal_safe(str(path)))


class SafeConsole(Console):
    """A rich Console whose every string, before markup is read, goes through `terminal_safe`."""

    def render_str(self, text: str, **options: Any):  # type: ignore[override]
        return super().render_str(terminal_safe(text), **options)


class GuardedStream:
    """A text stream that raises OutputError (naming the stream) when writing or flushing fails, and, when
    it is not a terminal, drops the spaces at the end of each line it is given."""

    def __init__(self, stream: TextIO, name: str):
        self._stream = stream
        self._name = name
        self._strip = not _isatty(stream)

    def write(self, text: str) -> int:
        if self._strip and " \n" in text:
            *lines, rest = text.split("\n")
            text = "\n".join([*(line.rstrip(" ") for line in lines), rest])
        try:
            return self._stream.write(text)
        except OSError as exc:
            raise self._failed(exc) from None

    def flush(self) -> None:
        try:
            self._stream.flush()
        except OSError as exc:
            raise self._failed(exc) from None

    def isatty(self) -> bool:
        return _isatty(self._stream)

    def __getattr__(self, name: str) -> Any:  # encoding, fileno, ...: those of the stream
        return getattr(self._stream, name)

    def _failed(self, exc: OSError) -> OutputError:
        return OutputError(f"{self._name}: cannot be written ({exc.strerror or exc.__class__.__name__})")


def _isatty(stream: TextIO) -> bool:
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError):
        return False


def out_console() -> Console:
    """The console of standard output (the summary, tables)."""
    return _console(sys.stdout, "standard output")


def err_console() -> Console:
    """The console of standard error (error lines, warnings of the command line, progress)."""
    return _console(sys.stderr, "standard error")


def _console(stream: TextIO, name: str) -> Console:
    guarded = GuardedStream(stream, name)
    return SafeConsole(file=guarded, highlight=False, soft_wrap=True,  # type: ignore[arg-type]
                       width=None if guarded.isatty() else _asked_width())


def _asked_width() -> int:
    """The width of a console that is not a terminal: COLUMNS when the environment sets it (an explicit
    request, e.g. COLUMNS=80 for a fixed-width log), else in effect unlimited."""
    columns = os.environ.get("COLUMNS", "")
    return int(columns) if columns.isdigit() and int(columns) > 0 else UNWRAPPED_WIDTH
