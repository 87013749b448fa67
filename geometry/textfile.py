"""Reading a text file a user names as input (a part file, a suite file): a regular file only, read up
to a bound, as UTF-8 with or without a byte-order mark.

The file is opened without blocking and its type checked on the open descriptor before a byte is read,
so that a named pipe (FIFO), a device (/dev/zero, a terminal) or a socket is refused at once instead of
hanging the reader or feeding it forever, and a file swapped for one of them after a check cannot slip
through. Every problem raises PartError naming the path.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

from .errors import PartError

_KINDS = ((stat.S_ISDIR, "a folder"), (stat.S_ISFIFO, "a named pipe (FIFO)"), (stat.S_ISCHR, "a character device"),
          (stat.S_ISBLK, "a block device"), (stat.S_ISSOCK, "a socket"))


def file_kind(mode: int) -> str:
    """What a file of st_mode `mode` is, in words ("a regular file", "a named pipe (FIFO)", ...)."""
    if stat.S_ISREG(mode):
        return "a regular file"
    return next((name for test, name in _KINDS if test(mode)), "a special file")


def read_input_text(path: str | Path, what: str, limit: int) -> str:
    """The text of the regular file at `path` (a leading UTF-8 byte-order mark dropped); `what` names
    the file in messages ("part file"); a file longer than `limit` bytes is refused unread past it."""
    path = Path(path)
    try:
        fd = os.open(path, os.O_RDONLY | os.O_NONBLOCK | os.O_CLOEXEC)
    except FileNotFoundError:
        raise PartError(f"{path}: no such {what}") from None
    except OSError as exc:
        raise PartError(f"{path}: cannot be read ({exc.strerror or exc.__class__.__name__})") from None
    try:
        mode = os.fstat(fd).st_mode
        if not stat.S_ISREG(mode):
            raise PartError(f"{path}: cannot be read as a {what}: it is {file_kind(mode)}; a {what} is a regular "
                            "text file")
        with open(fd, "rb", closefd=False) as handle:
            raw = handle.read(limit + 1)
    except OSError as exc:
        raise PartError(f"{path}: cannot be read ({exc.strerror or exc.__class__.__name__})") from None
    finally:
        os.close(fd)
    if len(raw) > limit:
        raise PartError(f"{path}: longer than {limit} bytes; a {what} is a short text description")
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise PartError(f"{path}: cannot be read as UTF-8 text ({exc.__class__.__name__})") from None
