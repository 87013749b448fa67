"""`stressraiser check PART`: converge the peak of one part and report it."""

from __future__ import annotations

import argparse
from pathlib import Path

from .errors import OutputError
from ..geometry.spec import MeshControls

NAME = "check"


def add_parser(commands) -> None:
    parser = commands.add_parser(NAME, help="check one part file")
    parser.add_argument("part", help="part file (TOML)")
    parser.add_argument("--json", metavar="FILE", help="write the result as a JSON record")
    parser.add_argument("--quiet", action="store_true", help="print only the verdict line")
    parser.add_argument("--max-elements", metavar="N", type=max_elements_option, default=None,
                        help="most triangles any mesh level may have (overrides mesh.max_elements; default "
                             f"{MeshControls().max_elements:,}, sized for a 24 GB machine): the coarsest mesh "
                             "is refused above it and refinement stops before it")
    parser.add_argument("--section", metavar="CUT", action="append", default=[],
                        help="also report the resultants of a straight cut through the whole part: x=VALUE "
                             "(across), y=VALUE (along) or X1,Y1:X2,Y2 (the line through two points), lengths "
                             "in the part file's units; repeat for more cuts")
    parser.add_argument("--report", metavar="DIR",
                        help="write a review report to the folder DIR: report.html (self-contained), the "
                             "figures as PNG and SVG, part.vtu (fields) and check.json")


def run(args: argparse.Namespace) -> int:
    from rich.console import Console

    from ..compare.check import check_part
    from ..geometry.partfile import load_part
    from .files import write_json
    from .progress import LevelProgress
    from .record import check_record
    from .summary import print_summary, verdict

    spec = with_max_elements(with_sections(load_part(args.part), args.section), args.max_elements)
    report_dir = _report_folder(args.report) if args.report else None
    out = Console(highlight=False, soft_wrap=True)
    with LevelProgress(Console(stderr=True, highlight=False), enabled=not args.quiet, units=spec.units) as progress:
        result = check_part(spec, progress)
        if report_dir is not None:
            progress.stage(f"drawing the figures and writing the report to {report_dir}")
            written = _write_report(result, report_dir, args.part)
    if args.json:
        write_json(args.json, check_record(result))
    if args.quiet:
        out.print(verdict(result), markup=False)
    else:
        print_summary(result, out)
        if report_dir is not None:
            out.print(f"report: {written.report} ({len(written.paths)} files in {report_dir})", markup=False)
    return unconverged_exit(result)


def with_sections(spec, options: list[str]):
    """The part with the --section cuts added after its own [[section]] entries (checked like them)."""
    if not options:
        return spec
    from dataclasses import replace

    from ..geometry.loading import validate_loading
    from ..geometry.partfile import parse_section_option

    spec = replace(spec, sections=spec.sections + tuple(parse_section_option(o, spec.units) for o in options))
    validate_loading(spec)
    return spec


def _report_folder(value: str) -> Path:
    """The --report folder, refused before any work if it names an existing file."""
    folder = Path(value)
    if folder.exists() and not folder.is_dir():
        raise OutputError(f"--report {value}: this is a file; give a folder (it is created if missing)")
    return folder


def _write_report(result, folder: Path, part: str):
    from .report import write_report

    try:
        return write_report(result, folder, part_file=part)
    except OSError as exc:
        raise OutputError(f"--report {folder}: cannot write the report ({exc.strerror or exc})") from None


MAX_ELEMENTS_RANGE = (1_000, 20_000_000)  # as mesh.max_elements in the part file


def max_elements_option(text: str) -> int:
    """The --max-elements value: a whole number in MAX_ELEMENTS_RANGE."""
    low, high = MAX_ELEMENTS_RANGE
    try:
        value = int(text.replace("_", ""))
    except ValueError:
        value = None
    if value is None or not low <= value <= high:
        raise argparse.ArgumentTypeError(f"must be a whole number from {low} to {high}; got {text!r}")
    return value


def with_max_elements(spec, value: int | None):
    """The part with mesh.max_elements replaced by the --max-elements option, when given."""
    if value is None:
        return spec
    from dataclasses import replace

    return replace(spec, mesh=replace(spec.mesh, max_elements=value))


def unconverged_exit(result) -> int:
    """0 when the peak converged; else one line on stderr saying so and why, and exit code 3. The summary
    and any output files are still written (with the same warning), so the levels can be reviewed."""
    from rich.console import Console

    from .main import EXIT_NUMERICS

    if result.kt.converged:
        return 0
    study = result.study
    error = study.estimate.error
    shown = f"estimated error {error:.2%}" if error < float("inf") else "error unknown with fewer than three levels"
    Console(stderr=True, highlight=False, soft_wrap=True).print(
        f"stressraiser: the peak did not converge to mesh.tolerance = {result.spec.mesh.tolerance:.2%} "
        f"({study.stop_reason or 'too few levels'}; {shown}); the results above are for review only, not for "
        "sign-off", markup=False)
    return EXIT_NUMERICS
