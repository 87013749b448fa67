"""Output files written whole or not at all: write to a temporary file beside the target, flush it to disk,
then rename it onto the target (an atomic step on one file system). A run that is killed at any moment
leaves the previous file (or none) at the target, never a truncated one; at worst a hidden temporary
file ".NAME.*.part" stays beside it. A folder of files (the --report folder) is written into a fresh
hidden folder beside it and swapped in whole (`atomic_folder`).

Every file a command writes goes through here: `write_atomic` (bytes), `write_text`, `write_json`, or
`atomic_path` for a library that insists on writing a file by name itself (meshio, matplotlib).
Only a regular file or a new path is ever replaced: a folder, a named pipe, a device or a socket at the
target is refused (`--json /dev/null` must never replace the null device), and a link is followed to the
file it names. Every output path is checked before any work (`output_file`, `output_folder`: the target's
kind, and that its folder can be written in), so a run never computes for minutes and then finds it
cannot write. A target that still cannot be written at the end (a full disk) raises OutputError
(cli/errors.py): one line naming the file, exit code 2.
"""

from __future__ import annotations

import errno
import json
import math
import os
import shutil
import stat
import tempfile
from collections.abc import Iterable, Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

from ..geometry.textfile import file_kind
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
    flushed to disk and renamed onto `path`, otherwise it is removed and `path` is untouched. `path` must
    be a regular file or a new path (a link: the file it names); anything else raises OutputError."""
    path = Path(os.path.realpath(path))
    try:
        _check_kind(path, str(path), want_folder=False)
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
        _check_kind(path, str(path), want_folder=False)  # not made a FIFO or a folder while we wrote
        os.replace(tmp, path)
    except OSError as exc:
        tmp.unlink(missing_ok=True)
        raise _cannot(path, exc) from None
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


@contextmanager
def atomic_folder(path: str | Path) -> Iterator[Path]:
    """A fresh hidden folder beside `path` to write a set of files into. When the block ends without an
    exception the fresh folder takes the place of `path` in one step (the folder there before, if any, is
    removed after); otherwise it is removed and `path` is untouched. A run killed at any moment leaves the
    earlier folder or the new one whole at `path`, never a mix (at worst a hidden ".NAME.*.swap" folder
    beside it)."""
    path = Path(os.path.realpath(path))
    try:
        _check_kind(path, str(path), want_folder=True)
        path.parent.mkdir(parents=True, exist_ok=True)
        fresh = Path(tempfile.mkdtemp(prefix=f".{path.name}.", suffix=".swap", dir=path.parent))
    except OSError as exc:
        raise _cannot(path, exc) from None
    try:
        yield fresh
        os.chmod(fresh, 0o777 & ~_umask())  # as an ordinary new folder (mkdtemp makes it private)
        _check_kind(path, str(path), want_folder=True)
        if not os.path.lexists(path):
            os.rename(fresh, path)
            return
        _swap(fresh, path)  # `fresh` now names the earlier folder
    except OSError as exc:
        shutil.rmtree(fresh, ignore_errors=True)
        raise _cannot(path, exc) from None
    except BaseException:
        shutil.rmtree(fresh, ignore_errors=True)
        raise
    shutil.rmtree(fresh, ignore_errors=True)


def _swap(a: Path, b: Path) -> None:
    """Exchange the folders at `a` and `b`: in one step where the system can (Linux renameat2 with
    RENAME_EXCHANGE), else by two renames (`b` is then briefly absent, never mixed)."""
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        exchange = libc.renameat2
    except (OSError, AttributeError):
        exchange = None
    if exchange is not None:
        at_cwd, rename_exchange = -100, 2  # AT_FDCWD, RENAME_EXCHANGE (linux/fs.h)
        if exchange(at_cwd, os.fsencode(a), at_cwd, os.fsencode(b), rename_exchange) == 0:
            return
        code = ctypes.get_errno()
        if code not in (errno.ENOSYS, errno.EINVAL, errno.ENOTSUP):
            raise OSError(code, os.strerror(code), str(b))
    parked = Path(tempfile.mkdtemp(prefix=f".{b.name}.", suffix=".swap", dir=b.parent))
    try:
        os.rename(b, parked)  # replaces the empty folder just made
    except OSError:
        parked.rmdir()
        raise
    try:
        os.rename(a, b)
    except OSError:
        os.rename(parked, b)
        raise
    os.rename(parked, a)


def output_file(value: str | None, option: str, inputs: Iterable[str | Path] = ()) -> Path | None:
    """The file an output option names (None when the option is not given), checked before any work: a
    path is given, it is a regular file or a new path, not one of the command's `inputs` (a part file,
    a suite), and its folder can be written in. Raises OutputError naming the option."""
    if value is None:
        return None
    where = _named(value, option)
    path = Path(os.path.realpath(value))
    _check_kind(path, where, want_folder=False)
    for source in inputs:
        if os.path.realpath(source) == str(path):
            raise OutputError(f"{where}: is the command's input file; give another name for the output")
    _check_writable(path.parent, where)
    return path


def output_folder(value: str, option: str, files: Iterable[str] = (), swapped: bool = False) -> Path:
    """The folder an output option names, checked before any work: a path is given, it is a folder or a
    new path, each of `files` (names the command writes in it) is a regular file or new, and it can be
    written in (or, when new, its nearest existing parent). A folder `swapped` in whole (`atomic_folder`)
    is written beside it, so its parent is what must be writable, and the probe goes there: a run killed
    during the check leaves nothing inside the folder. Raises OutputError naming the option."""
    where = _named(value, option)
    path = Path(os.path.realpath(value))
    _check_kind(path, where, want_folder=True)
    for name in files:
        _check_kind(path / name, f"{where}: {name}", want_folder=False)
    _check_writable(path.parent if swapped else path, where)
    return path


def _named(value: str, option: str) -> str:
    if not value.strip():
        raise OutputError(f"{option}: an empty path was given; name the output or leave the option out")
    return f"{option} {value}"


def _check_kind(path: Path, where: str, want_folder: bool) -> None:
    """Refuse a target that exists and is not what is written there: a regular file (or, `want_folder`,
    a folder). A missing target is fine: it is made."""
    try:
        mode = os.stat(path).st_mode  # follows links: a link to /dev/null is the device
    except (FileNotFoundError, NotADirectoryError):
        return
    except OSError as exc:
        raise OutputError(f"{where}: cannot be used ({exc.strerror or exc.__class__.__name__})") from None
    if want_folder and not stat.S_ISDIR(mode):
        raise OutputError(f"{where}: is {file_kind(mode)}; give a folder (it is created if missing)")
    if not want_folder and not stat.S_ISREG(mode):
        raise OutputError(f"{where}: is {file_kind(mode)}; an output is written only onto a regular file or "
                          "a new path")


def _check_writable(folder: Path, where: str) -> None:
    """Make and remove a hidden file in `folder`, or in its nearest existing parent when it is new (the
    one its missing folders will be made in): the permissions, a read-only file system and ownership all
    answer at once."""
    existing = folder
    while not os.path.lexists(existing) and existing.parent != existing:
        existing = existing.parent
    if not existing.is_dir():
        raise OutputError(f"{where}: {existing} is not a folder; the output cannot be made under it")
    try:
        fd, probe = tempfile.mkstemp(prefix=".stressraiser-", suffix=".probe", dir=existing)
        os.close(fd)
        os.unlink(probe)
    except OSError as exc:
        raise OutputError(f"{where}: cannot write in {existing} ({exc.strerror or exc.__class__.__name__})") from None


def _cannot(path: Path, exc: OSError) -> OutputError:
    return OutputError(f"{path}: cannot write this output file ({exc.strerror or exc.__class__.__name__})")


def _umask() -> int:
    mask = os.umask(0o022)
    os.umask(mask)
    return mask
