"""`stressraiser check PART`: converge the peak of one part and report it."""

from __future__ import annotations

import argparse
import os
import threading
from importlib import import_module
from pathlib import Path

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
    from ..compare.check import check_part
    from ..geometry.partfile import load_part
    from .errors import OutputError
    from .files import output_file, write_json
    from .main import EXIT_INPUT
    from .progress import LevelProgress
    from .record import check_record
    from .summary import print_summary, signoff_verdicts, verdict
    from .terminal import err_console, out_console, shown_path

    spec = with_max_elements(with_sections(load_part(args.part), args.section), args.max_elements)
    # every output is checked before any work, so that a long run never ends unable to write
    report_dir = report_folder(args.report) if args.report is not None else None
    json_path = output_file(args.json, "--json", inputs=(args.part,))
    if json_path is not None and report_dir is not None and json_path.is_relative_to(os.path.realpath(report_dir)):
        raise OutputError(f"--json {args.json}: lies inside the --report folder, which the report replaces whole "
                          "(the report holds its own check.json)")
    loading = preload(REPORT_MODULES) if report_dir is not None else None
    out = out_console()
    failed: list[OutputError] = []
    written = None
    with LevelProgress(err_console(), enabled=not args.quiet, units=spec.units) as progress:
        result = check_part(spec, progress)
        if report_dir is not None:
            progress.stage(f"drawing the figures and writing the report to {shown_path(report_dir)}")
            loading.join()
            try:
                written = _write_report(result, report_dir, args.part)
            except OutputError as exc:
                failed.append(exc)
    if json_path is not None:
        try:
            write_json(json_path, check_record(result))
        except OutputError as exc:
            failed.append(exc)
    # the results are shown even when an output could not be written, so that the run is not lost
    if args.quiet:
        out.print(verdict(result) + signoff_verdicts(result), markup=False)
    else:
        print_summary(result, out)
        if written is not None:
            out.print(f"report: {report_dir / written.report.name} ({len(written.paths)} files in {report_dir})",
                      markup=False)
    for exc in failed:
        err_console().print(f"stressraiser: {exc}", markup=False)
    code = max(unconverged_exit(result), sharp_corner_exit(result))
    return EXIT_INPUT if failed else code  # an output to fix: another path, or space freed


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


REPORT_MODULES = ("stressraiser.cli.report", "meshio")  # the report's libraries: matplotlib and the VTU writer


def preload(modules: tuple[str, ...]) -> threading.Thread:
    """Import `modules` in a thread while the check runs, and return the thread (join it before using them).
    The check spends much of its time in gmsh and the sparse solvers, outside the interpreter lock, so on a
    machine with two cores the report's imports (about 0.3 s, mostly matplotlib) then cost it nothing. The
    modules take no lock the check's own imports take (imports run one way, cli -> compare -> fem ->
    geometry, and the check imports no plotting library). A failure is left to the report's own import,
    which reports it."""
    def load() -> None:
        for name in modules:
            try:
                import_module(name)
            except Exception:  # noqa: BLE001 - the report's own import raises it again, where it is reported
                return

    thread = threading.Thread(target=load, name="report imports", daemon=True)
    thread.start()
    return thread


def report_folder(value: str) -> Path:
    """The --report folder, checked before any work: a folder or a new path in a folder that can be
    written in. The report replaces its folder whole, so an existing folder must be empty or hold only an
    earlier report's files; a folder with anything else in it (the part file, notes) is refused."""
    from .errors import OutputError
    from .files import output_folder

    folder = output_folder(value, "--report", swapped=True)
    stray = _not_of_a_report(folder) if folder.is_dir() else None
    if stray is not None:
        raise OutputError(f"--report {value}: the folder holds {stray!r}, which is not part of a report; the report "
                          "replaces its folder whole: give a new folder, an empty one or an earlier report's")
    return Path(value)


def _not_of_a_report(folder: Path) -> str | None:
    """The first entry of `folder` that an earlier report did not write, or None."""
    from .report import FIELDS_NAME, FIGURES_DIR, RECORD_NAME, REPORT_NAME

    for entry in folder.iterdir():
        name = entry.name
        if name.startswith(".") and name.endswith(".part"):  # a temporary file a killed run left
            continue
        if name in (REPORT_NAME, RECORD_NAME, FIELDS_NAME) and entry.is_file() and not entry.is_symlink():
            continue
        if name == FIGURES_DIR and entry.is_dir() and not entry.is_symlink():
            inside = next((f.name for f in entry.iterdir() if not (f.is_file() and f.suffix in (".png", ".svg")
                                                                    or f.name.endswith(".part"))), None)
            if inside is None:
                continue
            return f"{FIGURES_DIR}/{inside}"
        return name
    return None


def _write_report(result, folder: Path, part: str):
    """Write the report into a fresh folder beside `folder` and swap it in whole (cli/files.py
    `atomic_folder`); what was written (report.ReportFiles, its paths as they were in the fresh folder)."""
    from .errors import OutputError
    from .files import atomic_folder
    from .report import write_report

    try:
        with atomic_folder(folder) as fresh:
            written = write_report(result, fresh, part_file=part)
    except OSError as exc:  # a library writing by itself (not through cli/files.py)
        raise OutputError(f"--report {folder}: cannot write the report ({exc.strerror or exc})") from None
    return written


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


def sharp_corner_exit(result) -> int:
    """0 unless a sharp inside corner's zone peak exceeds the governing peak in some load case: then one line
    on stderr naming the corner and exit code 3 (the results stand, but the part cannot be judged until the
    corner has a radius)."""
    from .main import EXIT_NUMERICS
    from .terminal import err_console

    worst = [(r, s) for r in result.every_case for s in r.sharp_corners if s.exceeds]
    if not worst:
        return 0
    case, sharp = max(worst, key=lambda rs: rs[1].peaks[-1])
    from .display_units import point_text, quantity_text

    units = result.spec.units
    err_console().print(
        f"stressraiser: the sharp inside corner at {point_text(sharp.corner.point, units)} ({sharp.corner.on}) peaks at "
        f"{quantity_text(sharp.peaks[-1], 'stress', units)} on the finest mesh, above the governing "
        f"{quantity_text(sharp.governing, 'stress', units)}, and grows under refinement; give it a radius to judge "
        "the part", markup=False)
    return EXIT_NUMERICS


def unconverged_exit(result) -> int:
    """0 when the peak converged; else one line on stderr saying so and why, and exit code 3. The summary
    and any output files are still written (with the same warning), so the levels can be reviewed."""
    from .main import EXIT_NUMERICS
    from .terminal import err_console

    if result.kt.converged:
        return 0
    study = result.study
    error = study.estimate.error
    shown = f"estimated error {error:.2%}" if error < float("inf") else "error unknown with fewer than three levels"
    err_console().print(
        f"stressraiser: the peak did not converge to mesh.tolerance = {result.spec.mesh.tolerance:.2%} "
        f"({study.stop_reason or 'too few levels'}; {shown}); the results above are for review only, not for "
        "sign-off", markup=False)
    return EXIT_NUMERICS
