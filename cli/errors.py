"""The kinds of InputError (exit code 2, one line) that come from outside the part file: the command line,
an output path and the scheduler address. PartError (geometry/errors.py) is the part file's."""

from __future__ import annotations

from ..geometry.errors import InputError


class CommandLineError(InputError):
    """An option or argument that is malformed, missing or in conflict with another."""


class OutputError(InputError):
    """An output file or folder that cannot be written (the user picks another path or frees space)."""


class SchedulerError(InputError):
    """A Dask scheduler address that cannot be reached, or a cluster that cannot be used."""
