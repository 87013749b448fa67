"""Command line: `stressraiser COMMAND ...`; each command lives in its own module listed in COMMANDS
(a module with NAME, add_parser(subparsers) and run(args) -> exit code).

Exit codes: 0 done, 1 a batch ran but some of its cases failed (sweep, regress), 2 a part file or option
the user must fix, 3 the mesher or solver failed,
4 an internal error (a bug: please report it).
"""

from __future__ import annotations

import gc

gc.disable()  # while the libraries below load; see the note after the imports

import argparse  # noqa: E402
import os  # noqa: E402
import sys  # noqa: E402
from collections.abc import Sequence  # noqa: E402

from rich.console import Console  # noqa: E402

from ..fem.solve import SolverError  # noqa: E402
from ..geometry.errors import InputError, one_line  # noqa: E402
from ..geometry.meshing import MeshError  # noqa: E402
from . import cases, check, materials_table, regress, sweep  # noqa: E402
from .errors import CommandLineError  # noqa: E402

# Start-up of the command-line process: loading numpy, scipy, gmsh, shapely and rich makes hundreds of
# thousands of objects that live as long as the process. Collecting cycles while they are made, and scanning
# them again in every later collection, cost about 0.25 s of a 1.9 s check of the bundled example
# (measured with benchmarks/check_stages.py); so the collector waits until they are loaded, then sets them
# aside for good (gc.freeze) and runs as usual for everything the command itself makes.
gc.freeze()
gc.enable()

COMMANDS = (check, sweep, regress)
COMMANDS += (materials_table,)
COMMANDS += (cases,)

EXIT_INPUT, EXIT_NUMERICS, EXIT_INTERNAL = 2, 3, 4


class _Parser(argparse.ArgumentParser):
    """argparse that reports usage mistakes as one line and exit code 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        raise CommandLineError(f"command line: {message}")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="stressraiser", description="Peak stress and Kt of flat plates by converged 2-D FE.")
    commands = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)
    for command in COMMANDS:
        command.add_parser(commands)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    err = Console(stderr=True, highlight=False, soft_wrap=True)
    try:
        args = build_parser().parse_args(argv)
        return _run(args)
    except InputError as exc:
        err.print(f"stressraiser: {exc}", markup=False)
        return EXIT_INPUT
    except (MeshError, SolverError) as exc:
        err.print(f"stressraiser: {one_line(str(exc))}", markup=False)
        return EXIT_NUMERICS
    except MemoryError:
        err.print("stressraiser: out of memory while meshing or solving; lower mesh.max_elements (or "
                  "--max-elements) or mesh.tolerance", markup=False)
        return EXIT_NUMERICS
    except KeyboardInterrupt:
        err.print("stressraiser: interrupted", markup=False)
        return 130
    except Exception as exc:  # a bug: one line unless debugging
        if os.environ.get("STRESSRAISER_DEBUG"):
            raise
        err.print(f"stressraiser: internal error ({type(exc).__name__}: {one_line(str(exc))}); set STRESSRAISER_DEBUG=1 "
                  "for the traceback and please report it", markup=False)
        return EXIT_INTERNAL


def _run(args: argparse.Namespace) -> int:
    for command in COMMANDS:
        if command.NAME == args.command:
            return command.run(args)
    raise CommandLineError(f"command line: unknown command {args.command!r}")


def entry() -> None:
    """Console-script entry point."""
    sys.exit(main())
