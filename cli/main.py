"""Command line: `stressraiser COMMAND ...`; each command lives in its own module listed in COMMANDS
(a module with NAME, add_parser(subparsers) and run(args) -> exit code).

Exit codes: 0 done, 1 a batch ran but some of its cases failed (sweep, regress), 2 a part file, option or
output the user must fix (an output file that cannot be written, a full standard output), 3 the mesher or
solver failed, 4 an internal error (a bug: please report it), 130 stopped by Ctrl-C (SIGINT), 143 stopped
by SIGTERM (cli/interrupts.py).

Importing this module changes nothing in the interpreter and loads no numerical library; `entry`, the
console script, does what only a whole command-line process should (see `entry`).
"""

from __future__ import annotations

import argparse
import gc
import importlib
import os
import re
import sys
from collections.abc import Sequence

from .. import __version__
from ..geometry.errors import InputError, one_line
from .errors import CommandLineError

COMMANDS = ("check", "sweep", "regress", "materials_table", "cases")  # modules of cli/, in the order of --help
EXIT_INPUT, EXIT_NUMERICS, EXIT_INTERNAL = 2, 3, 4

# Options whose value may start with a minus sign (`--section -10,-20:10,20`): argparse would read such a
# value as an option, so it is attached with "=" before parsing.
NEGATIVE_VALUE_OPTIONS = ("--section",)
_NEGATIVE_VALUE = re.compile(r"^-\.?\d")

# What every command needs loaded: the terminal, numerical and meshing libraries (see `entry`).
LIBRARIES = ("rich.console", "..fem.solve", "..geometry.meshing")  # relative ones: of this package


class _Parser(argparse.ArgumentParser):
    """argparse that reports usage mistakes as one line and exit code 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        raise CommandLineError(f"command line: {message}")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="stressraiser", description="Peak stress and Kt of flat plates by converged 2-D FE.")
    parser.add_argument("--version", action="version", version=f"stressraiser {__version__}")
    commands = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)
    for command in command_modules():
        command.add_parser(commands)
    return parser


def command_modules() -> list:
    """The modules of COMMANDS, imported."""
    return [importlib.import_module(f"{__package__}.{name}") for name in COMMANDS]


def attach_negative_values(argv: Sequence[str]) -> list[str]:
    """The arguments with each value of NEGATIVE_VALUE_OPTIONS that starts with a minus sign and a number
    attached to its option ("--section", "-10,-20:10,20" -> "--section=-10,-20:10,20")."""
    out: list[str] = []
    args = list(argv)
    i = 0
    while i < len(args):
        if args[i] in NEGATIVE_VALUE_OPTIONS and i + 1 < len(args) and _NEGATIVE_VALUE.match(args[i + 1]):
            out.append(f"{args[i]}={args[i + 1]}")
            i += 2
            continue
        out.append(args[i])
        i += 1
    return out


def main(argv: Sequence[str] | None = None) -> int:
    from ..fem.solve import SolverError
    from ..geometry.errors import MeshError
    from .interrupts import exit_code, stopping_on_signals
    from .terminal import err_console

    err = err_console()
    try:
        with stopping_on_signals():
            args = build_parser().parse_args(attach_negative_values(sys.argv[1:] if argv is None else argv))
            return _run(args)
    except InputError as exc:  # also OutputError: an output file or a standard stream that cannot be written
        return _report(err, str(exc), EXIT_INPUT)
    except (MeshError, SolverError) as exc:
        return _report(err, one_line(str(exc)), EXIT_NUMERICS)
    except MemoryError:
        return _report(err, "out of memory while meshing or solving; lower mesh.max_elements (or --max-elements) "
                            "or mesh.tolerance", EXIT_NUMERICS)
    except KeyboardInterrupt as exc:  # Ctrl-C or SIGTERM: everything under way has been cleaned up
        return _report(err, "interrupted", exit_code(exc))
    except Exception as exc:  # a bug: one line unless debugging
        if os.environ.get("STRESSRAISER_DEBUG"):
            raise
        return _report(err, f"internal error ({type(exc).__name__}: {one_line(str(exc))}); set STRESSRAISER_DEBUG=1 "
                            "for the traceback and please report it", EXIT_INTERNAL)


def _report(err, message: str, code: int) -> int:
    """Print the one error line on standard error (as far as it can be written) and give back `code`."""
    try:
        err.print(f"stressraiser: {message}", markup=False)
    except InputError:  # standard error itself cannot be written: the exit code still tells
        pass
    return code


def _run(args: argparse.Namespace) -> int:
    for command in command_modules():
        if command.NAME == args.command:
            return command.run(args)
    raise CommandLineError(f"command line: unknown command {args.command!r}")


def entry() -> None:
    """Console-script entry point.

    Start-up: loading numpy, scipy, gmsh, shapely and rich makes hundreds of thousands of objects that live
    as long as the process. Collecting cycles while they are made, and scanning them again in every later
    collection, cost about 0.25 s of a 1.9 s check of the bundled example (benchmarks/check_stages.py); so
    the collector waits while they are loaded, then sets them aside for good (gc.freeze) and runs as usual
    for everything the command itself makes. This is done here, for the command-line process only:
    importing the package leaves the interpreter as it was.

    At the end, standard output is flushed; if that fails (a full disk, a closed pipe) the error is
    reported like any output error, and the stream is pointed at the null device so that the interpreter's
    own final flush cannot fail again."""
    gc.disable()
    try:
        for name in LIBRARIES:
            importlib.import_module(name, __package__)
        command_modules()
    finally:
        gc.freeze()
        gc.enable()
    try:
        code = main()
    except SystemExit as stop:  # --help, --version
        code = stop.code if isinstance(stop.code, int) else int(stop.code is not None)
    sys.exit(_flushed(code))


def _flushed(code: int) -> int:
    try:
        sys.stdout.flush()
        return code
    except OSError as exc:
        try:
            os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        except (OSError, ValueError):
            pass
        if code != 0:  # the failure was already reported by the command
            return code
        from .terminal import err_console

        return _report(err_console(), f"standard output: cannot be written ({exc.strerror or exc})", EXIT_INPUT)
