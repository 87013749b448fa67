"""`stressraiser check PART`: converge the peak of one part and report it."""

from __future__ import annotations

import argparse

NAME = "check"


def add_parser(commands) -> None:
    parser = commands.add_parser(NAME, help="check one part file")
    parser.add_argument("part", help="part file (TOML)")
    parser.add_argument("--json", metavar="FILE", help="write the result as a JSON record")
    parser.add_argument("--quiet", action="store_true", help="print only the verdict line")


def run(args: argparse.Namespace) -> int:
    from rich.console import Console

    from ..compare.check import check_part
    from ..geometry.partfile import load_part
    from .files import write_json
    from .record import check_record
    from .summary import print_summary, verdict

    spec = load_part(args.part)
    out = Console(highlight=False, soft_wrap=True)
    result = check_part(spec)
    if args.json:
        write_json(args.json, check_record(result))
    if args.quiet:
        out.print(verdict(result), markup=False)
    else:
        print_summary(result, out)
    return 0
