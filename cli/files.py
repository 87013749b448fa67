"""Output files written whole or not at all: write to a temporary file beside the target, flush it to disk,
then rename it onto the target (an atomic step on one file system). A run that is killed at any moment
leaves the previous file (or none) at the target, never a truncated one; at worst a hidden temporary
file ".NAME.*.part" stays beside it.

Every file a command writes goes through here: `write_atomic` (bytes), `write_text`, `write_json`, or
`atomic_path` for a library that insists on writing a file by name itself (meshio, matplotlib).
A target that cannot be written (a folder, no permission, a full disk) raises OutputError (cli/errors.py):
one line naming the file, exit code 2.
"""

from __future__ import annotations

import json
import math
import os
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

from .errors import OutputError


def write_atomic(path: str | Path, data: bytes) -> None:
    """Write `data` to `path` so that readers see the old file or the new one, never a partial one."""
    with atomic_path(path) as tmp:
        with open(tmp, "wb") as handle:
            handle.write(data)


def write_text(path: str | Path, text: str) -> None:
    """Write UTF-8 text atomically."""
    write_atomic(path, text.encode("utf-8"))


def write_json(path: str | Path, record: dict[str, Any]) -> None:
    """Write a JSON record atomically (UTF-8, indented, keys in insertion order). JSON has no NaN or
    infinity: a non-finite number is written as null (the record's warnings say why it is missing)."""
    write_atomic(path, (json.dumps(finite_or_null(record), indent=2, allow_nan=False) + "\n").encode("utf-8"))


def finite_or_null(node: Any) -> Any:
    """A copy of a JSON-ready structure with every non-finite float replaced by None."""
    if isinstance(node, float):
        return node if math.isfinite(node) else None
    if isinstance(node, dict):
        return {k: finite_or_null(v) for k, v in node.items()}
    if isinstance(node, (list, tuple)):
        return [finite_or_null(v) for v in node]
    return node


@contextmanager
def atomic_path(path: str | Path) -> Iterator[Path]:
    """A temporary path beside `path` to write to; when the block ends without an exception the file is
    flushed to disk and renamed onto `path`, otherwise it is removed and `path` is untouched."""
    path = Path(path)
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd, name = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
        os.close(fd)
    except OSError as exc:
        raise _cannot(path, exc) from None
    tmp = Path(name)
    try:
        yield tmp
        with open(tmp, "rb+") as handle:
            os.fsync(handle.fileno())
        os.chmod(tmp, 0o666 & ~_umask())  # the permissions an ordinary new file gets (mkstemp makes it private)
        os.replace(tmp, path)
    except OSError as exc:
        tmp.unlink(missing_ok=True)
        raise _cannot(path, exc) from None
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


def _cannot(path: Path, exc: OSError) -> OutputError:
    return OutputError(f"{path}: cannot write this output file ({exc.strerror or exc.__class__.__name__})")


def _umask() -> int:
    mask = os.umask(0o022)
    os.umask(mask)
    return mask
