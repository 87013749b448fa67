"""`stressraiser cases`: list the published handbook cases the check compares against, with their
formulas, nominal stresses, validity ranges and sources."""

from __future__ import annotations

import argparse

NAME = "cases"


def add_parser(commands) -> None:
    parser = commands.add_parser(NAME, help="list the handbook cases with their sources and ranges")
    parser.add_argument("--family", help="list only the cases of this family (e.g. opposite-u-notches)")


def _range_text(ranges: dict[str, tuple[float, float]]) -> str:
    def bound(v: float) -> str:
        return "∞" if v >= 1e5 else f"{v:g}"
    return "; ".join(f"{bound(lo)} ≤ {name} ≤ {bound(hi)}" for name, (lo, hi) in ranges.items())


def run(args: argparse.Namespace) -> int:
    from rich.markup import escape

    from ..compare.handbook import BUILDERS, case_table
    from .errors import CommandLineError

    cases = case_table()
    if args.family:
        families = sorted({c.family for c in cases})
        cases = [c for c in cases if c.family == args.family]
        if not cases:
            raise CommandLineError(f"--family: {args.family!r} is not a case family; use one of {', '.join(families)}")
    from .terminal import out_console

    out = out_console()
    out.print(f"[bold]{len(cases)} handbook cases[/bold] (a part is compared with a case only when its geometry "
              "is that case)")
    for case in cases:
        out.print()
        out.print(f"[bold]{escape(case.key)}[/bold] — {escape(case.title)}")
        out.print(f"  family     {escape(case.family)}" + ("  (part builder for sweeps and suites)"
                                                            if case.family in BUILDERS else ""))
        out.print(f"  formula    {escape(case.formula)}")
        out.print(f"  nominal    {case.nominal}: {escape(case.nominal_text)}")
        out.print(f"  range      {escape(_range_text(case.ranges))}")
        if case.checked:
            out.print(f"  FE-checked {escape(_range_text(case.checked))}")
        out.print(f"  source     {escape(case.source)}")
    return 0
