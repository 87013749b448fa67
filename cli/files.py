"""Output files written whole or not at all: write to a temporary file beside the target, then rename."""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path
from typing import Any


def write_atomic(path: str | Path, data: bytes) -> None:
    """Write `data` to `path` so that readers see the old file or the new one, never a partial one."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def write_json(path: str | Path, record: dict[str, Any]) -> None:
    """Write a JSON record atomically (UTF-8, indented, keys in insertion order)."""
    write_atomic(path, (json.dumps(record, indent=2, allow_nan=False) + "\n").encode("utf-8"))
