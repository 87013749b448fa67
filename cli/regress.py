"""`stressraiser regress SUITE` / `stressraiser regress --builtin`: check every case of a suite of reference
Kt values and fail loudly (exit 1, the failing rows named) when a number has drifted.

The suite file format is described in compare/suite.py. Identical parts in a suite are checked once.
"""

from __future__ import annotations

import argparse
import math
from typing import Any

from .errors import CommandLineError
from .batch import add_execution_options, execution_from_args

NAME = "regress"
SCHEMA = "stressraiser.regress/1"
EXIT_FAILED = 1
TEXT_LIMIT = 120  # characters of a suite's title, case name or source shown on the terminal (the record has all)


def add_parser(commands) -> None:
    parser = commands.add_parser(NAME, help="run a suite of reference Kt values; exit 1 if any case fails",
                                 description="Check every case of a suite (a TOML table of parts with reference "
                                             "Kt values) or of the built-in handbook suite; exit 1 if any fails.")
    parser.add_argument("suite", nargs="?", help="suite file (TOML); see the README")
    parser.add_argument("--builtin", action="store_true",
                        help="run the built-in suite: every handbook case with a part builder, at points "
                             "inside its range")
    parser.add_argument("--json", metavar="FILE", help="also write the verdicts as a JSON record")
    add_execution_options(parser)


def run(args: argparse.Namespace) -> int:
    from ..compare.suite import builtin_suite, judge, load_suite, part_digest
    from .batch import run_batch
    from .files import output_file
    from .terminal import out_console

    if bool(args.suite) == bool(args.builtin):
        raise CommandLineError("command line: give a suite file or --builtin (one of them)")
    execution = execution_from_args(args)
    suite = builtin_suite() if args.builtin else load_suite(args.suite)
    record = output_file(args.json, "--json", inputs=() if args.builtin else (args.suite,))  # before any case runs
    out = out_console()
    runnable = {part_digest(c.part): c.part for c in suite.cases if not c.problem}
    rows = run_batch(list(runnable.items()), execution, lambda key, row: None,
                     f"regress: {len(runnable)} parts")
    case_rows = [{} if c.problem else rows[part_digest(c.part)] for c in suite.cases]
    verdicts = [judge(c, row) for c, row in zip(suite.cases, case_rows)]
    print_verdicts(out, suite.title, verdicts)  # before the record: shown even if the record cannot be written
    if record is not None:
        from .files import write_json

        write_json(record, regress_record(suite.title, verdicts, [r.get("seconds") for r in case_rows]))
    return 0 if all(v.passed for v in verdicts) else EXIT_FAILED


def print_verdicts(console, title: str, verdicts: list) -> None:
    """The pass/fail table, then one line per failing row naming it and its reference's source.

    "FE Kt" is the Kt compared with the reference. When a handbook case describes a raiser other than the
    one where the part's peak is (the middle hole of a row of holes), the Kt carries a mark and a note under
    the table names that raiser and gives the part's own governing Kt and where its peak is, so that the
    case's Kt is never read as the part's peak."""
    from rich.markup import escape
    from rich.table import Table

    from ..geometry.errors import clipped

    table = Table(title=escape(clipped(title, TEXT_LIMIT)), title_justify="left", box=None, pad_edge=False)
    for name, justify in (("#", "right"), ("case", "left"), ("reference", "right"), ("on", "left"),
                          ("FE Kt", "right"), ("difference", "right"), ("tolerance", "right"), ("result", "left")):
        table.add_column(name, justify=justify, overflow="fold")
    for n, v in enumerate(verdicts, start=1):
        c = v.case
        kt = f"{v.kt:.3f}" + ("*" if _apart(v) else "") if v.kt is not None else "—"
        table.add_row(str(n), escape(clipped(c.name, TEXT_LIMIT)),
                      f"{c.reference:.3f}" if math.isfinite(c.reference) else "—", c.definition,
                      kt, f"{v.difference:+.2%}" if v.difference is not None else "—", f"±{c.tolerance:.1%}",
                      "[green]pass[/green]" if v.passed else "[bold red]FAIL[/bold red]")
    console.print(table)
    for n, v in enumerate(verdicts, start=1):
        if _apart(v):
            console.print(f"* row {n}: the Kt of {v.raiser}, the raiser the case describes; the part's peak is at "
                          f"{v.governing_feature}, Kt {v.governing_kt:.3f}", markup=False)
    failed = [(n, v) for n, v in enumerate(verdicts, start=1) if not v.passed]
    for n, v in failed:
        console.print(f"FAILED row {n} {clipped(v.case.name, TEXT_LIMIT)!r}: {v.reason} (reference from "
                      f"{clipped(v.case.source, TEXT_LIMIT)})", markup=False)
    console.print(f"{len(verdicts)} cases: {len(verdicts) - len(failed)} passed, {len(failed)} failed", markup=False)


def _apart(verdict) -> bool:
    """True when the Kt compared is not the part's governing Kt (a case that names another raiser)."""
    return verdict.raiser is not None and verdict.raiser != verdict.governing_feature \
        and verdict.governing_kt is not None


def regress_record(title: str, verdicts: list, seconds: list[float | None]) -> dict[str, Any]:
    """The verdicts as JSON-ready data (seconds: the time of each case's check, None if it did not run).

    Per case: kt is the FE Kt compared with the reference, of `raiser` (kt_of "case": the raiser the part's
    handbook case describes; "part": the governing peak's feature); governing_kt / governing_feature are
    the part's own governing Kt on the same section and where its peak is."""
    from .. import __version__

    return {
        "schema": SCHEMA,
        "version": __version__,
        "suite": title,
        "passed": all(v.passed for v in verdicts),
        "cases": [
            {"row": n, "name": v.case.name, "reference": v.case.reference if math.isfinite(v.case.reference) else None,
             "definition": v.case.definition, "tolerance": v.case.tolerance, "source": v.case.source,
             "kt_of": v.case.kt_of, "kt": v.kt, "raiser": v.raiser, "difference": v.difference,
             "converged": v.converged, "passed": v.passed, "reason": v.reason, "governing_kt": v.governing_kt,
             "governing_feature": v.governing_feature, "seconds": t}
            for n, (v, t) in enumerate(zip(verdicts, seconds), start=1)
        ],
    }
