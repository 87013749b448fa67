"""The review report of a check: one self-contained HTML file plus its figures, fields and record.

`write_report(result, directory)` writes, each file whole or not at all (cli/files.py):

    report.html          the report; figures embedded as base64 PNG, no network access needed
    figures/NAME.png     every figure as a PNG (150 dpi) ...
    figures/NAME.svg     ... and the figures of lines and text also as an SVG (the mesh and the stress map are
                         pictures of a dense mesh: a PNG says all they have to say)
    part.vtu             finest-mesh displacement and stress fields (cli/fields.py)
    check.json           the JSON record (cli/record.py, schema cli/check.schema.json)

The figures are drawn in two processes where the machine has two cores or more (`render_figures`): a
child forked with the result in memory draws part of them while this process draws the rest and the
fields; a child that fails leaves its figures to this process. All text placed in the HTML is escaped.
Every number the report and its figures show is in the part file's unit system (`spec.units`), converted
by cli/display_units.py like the terminal summary; part.vtu and check.json stay in mm, N, MPa (the report
says so beside them).
"""

from __future__ import annotations

import base64
import dataclasses
import html
import io
import math
import multiprocessing
import os
import signal
import time
import warnings
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from .. import __version__
from ..compare.check import CheckResult, design_margin
from ..compare.design import DesignCheck, design_statements
from ..compare.fatigue import FatigueScreen
from ..compare.method_of_sections import SectionResult
from ..compare.signoff import cycle_words
from ..geometry.kinds.hole import named as named_hole
from ..geometry.process_lifetime import end_with_parent
from ..geometry.registry import kind_of, named, raiser_label
from ..geometry.spec import Load, Material, PartSpec
from ..geometry.units import DEFAULT_SYSTEM, format_number, format_stated
from . import plots
from .loads_summary import bearing_rows, boundary_rows
from .summary import estimate_basis, estimate_how
from .display_units import cut_label, label, point_text, quantity_text, shown, significant, warning_text
from .fields import CELL_FIELDS, POINT_FIELDS, vtu_bytes
from .files import write_atomic, write_json
from .record import SCHEMA, check_record
from .signoff_summary import CHECK_HEADER, check_caption, check_rows, fatigue_statements, notch_words
from .summary import fe_kt_for, kt_rows, on_edge_cut, peak_state, range_words, verdict
from .text_cache import cached_text_layouts

PNG_DPI = 150
PNG_COMPRESSION = 1  # zlib level of the PNG files: a little larger than at the default 6, in a fraction of the time
REPORT_NAME = "report.html"
FIELDS_NAME = "part.vtu"
RECORD_NAME = "check.json"
FIGURES_DIR = "figures"


@dataclass(frozen=True)
class Rendered:
    """A rendered figure: file stem, the report section it belongs to, caption, PNG bytes and SVG bytes (None
    for a picture of a dense mesh, where an SVG adds nothing to the PNG)."""

    name: str
    section: str
    caption: str
    png: bytes
    svg: bytes | None
    width: int  # display width in CSS pixels (96 per inch of figure)

    @property
    def files(self) -> tuple[tuple[str, bytes], ...]:
        """(suffix, bytes) of each file of the figure."""
        return (("png", self.png),) + ((("svg", self.svg),) if self.svg is not None else ())


@dataclass(frozen=True)
class ReportFiles:
    """What write_report wrote: every path, and the wall time of each stage (s)."""

    directory: Path
    paths: tuple[Path, ...]
    seconds: dict[str, float]

    @property
    def report(self) -> Path:
        return self.directory / REPORT_NAME


def write_report(result: CheckResult, directory: str | Path, part_file: str | Path | None = None) -> ReportFiles:
    """Render the figures and write the report folder; `part_file` (optional) is quoted in the report."""
    directory = Path(directory)
    seconds: dict[str, float] = {}
    clock = time.perf_counter()
    figures, fields = render_figures(result, beside=lambda: vtu_bytes(result.spec, result.solution))
    seconds["figures and fields"], clock = time.perf_counter() - clock, time.perf_counter()
    part_text = _read_text(part_file)
    page = report_html(result, figures, part_text=part_text, part_name=None if part_file is None else Path(part_file).name)
    paths = []
    for fig in figures:
        for suffix, data in fig.files:
            path = directory / FIGURES_DIR / f"{fig.name}.{suffix}"
            write_atomic(path, data)
            paths.append(path)
    write_atomic(directory / FIELDS_NAME, fields)
    write_json(directory / RECORD_NAME, check_record(result))
    write_atomic(directory / REPORT_NAME, page.encode("utf-8"))
    paths += [directory / FIELDS_NAME, directory / RECORD_NAME, directory / REPORT_NAME]
    seconds["write"] = time.perf_counter() - clock
    return ReportFiles(directory, tuple(paths), seconds)


# --- figures ----------------------------------------------------------------------------------------

@dataclass(frozen=True)
class FigureJob:
    """One figure of the report: file stem, report section, caption, the function that draws it, whether
    it is a figure of lines and text (written as SVG too) and how long it takes to draw and write, relative
    to the outline drawing (measured by benchmarks/report_write.py; to share the figures between two
    processes)."""

    name: str
    section: str
    caption: str
    build: Callable[[CheckResult], Any]
    vector: bool = True
    cost: float = 1.0


def figure_jobs(result: CheckResult) -> list[FigureJob]:
    """Every figure of the report, in reading order (a job may draw None: nothing to show)."""
    units = result.spec.units
    jobs = [
        FigureJob("outline", "part", "Outline of the part with its main dimensions, the held end, the load and the "
                  "critical section (dashed).", plots.outline_figure),
        FigureJob("mesh", "mesh", "The finest mesh of the study, and a close-up where the peak is: the elements "
                  "shrink towards the raiser edge.", plots.mesh_figure, vector=False, cost=1.4),
        FigureJob("stress_map", "stress", "Maximum principal stress on the finest mesh; the circle marks the peak.",
                  plots.stress_map_figure, vector=False, cost=2.1),
    ]
    for n, view in enumerate(plots.critical_sections(result), start=1):
        jobs.append(FigureJob(f"section_{n}", "section", f"Normal stress across {view.label} ({view.where(units)}): "
                              "the FE distribution against the flat net-section average a hand calculation uses.",
                              lambda r, v=view: plots.section_figure(r, v), cost=1.4))
    for n, section in enumerate(result.sections, start=1):
        jobs.append(FigureJob(f"cut_{n}", "cuts", f"Tractions along the requested cut {_cut_name(section, units)}.",
                              lambda r, c=section: plots.cut_figure(r, c), cost=1.2))
    jobs.append(FigureJob("convergence", "convergence", "Peak stress of each mesh level against element size, and "
                          "the converged value with its error band at zero element size.", plots.convergence_figure, cost=1.1))
    jobs.append(FigureJob("handbook", "handbook", "This part's Kt beside the published cases that match its geometry.",
                          plots.handbook_figure, cost=1.4))
    design, fatigue = signoff_records(result)
    jobs.append(FigureJob("design", "design", "Each stress of the design check against its own allowable (dashed).",
                          lambda r: plots.design_figure(design, units)))
    jobs.append(FigureJob("fatigue", "fatigue", "Fatigue screen on a modified Goodman diagram (notched stresses).",
                          lambda r: plots.fatigue_figure(fatigue, units)))
    return jobs


def render_figures(result: CheckResult, beside: Callable[[], Any] = lambda: None) -> tuple[list[Rendered], Any]:
    """Every figure of the report, in reading order, rendered to PNG (and SVG for figures of lines and
    text), and the value of `beside()` (other work, e.g. the fields file). With two cores or more a forked
    child draws about half of the figures (by their cost) while this process draws the others and then runs
    `beside`."""
    jobs = figure_jobs(result)
    mine, theirs = _share(jobs) if _cores() >= 2 and _can_fork() else (jobs, [])
    with cached_text_layouts():
        child = _Child(result, theirs) if theirs else None
        try:
            drawn = {job.name: _render(result, job) for job in mine}
            extra = beside()
            drawn.update(child.collect() if child is not None else {})
        finally:
            if child is not None:
                child.stop()
    return [fig for job in jobs if (fig := drawn.get(job.name)) is not None], extra


def _render(result: CheckResult, job: FigureJob) -> Rendered | None:
    fig = job.build(result)
    if fig is None:
        return None
    return Rendered(job.name, job.section, job.caption, *figure_bytes(fig, svg=job.vector),
                    width=round(96 * fig.get_figwidth()))


BESIDE_COST = 0.6  # the fields file this process writes beside its figures, in figure-cost units


def _share(jobs: list[FigureJob]) -> tuple[list[FigureJob], list[FigureJob]]:
    """The jobs for this process and for the child: the costliest first to the less loaded of the two, this
    process starting with BESIDE_COST for the other work it does meanwhile."""
    loads, shares = [BESIDE_COST, 0.0], ([], [])
    for job in sorted(jobs, key=lambda j: -j.cost):
        k = 0 if loads[0] <= loads[1] else 1
        loads[k] += job.cost
        shares[k].append(job)
    return shares


def _cores() -> int:
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:  # not on Linux
        return os.cpu_count() or 1


def _can_fork() -> bool:
    return "fork" in multiprocessing.get_all_start_methods()


class _Child:
    """A forked process drawing `jobs` of `result` (inherited in memory, nothing pickled but the bytes it
    sends back). `collect` returns its figures by name; if the child fails or dies, this process draws them."""

    def __init__(self, result: CheckResult, jobs: list[FigureJob]) -> None:
        self.result, self.jobs = result, jobs
        context = multiprocessing.get_context("fork")
        self.receive, send = context.Pipe(duplex=False)
        with warnings.catch_warnings():  # Python 3.12+ warns about forking a process with threads: the child
            warnings.simplefilter("ignore", DeprecationWarning)  # uses none of them (no BLAS, no gmsh)
            self.process = context.Process(target=_draw_in_child, args=(send, result, jobs, os.getpid()), daemon=True)
            self.process.start()
        send.close()

    def collect(self) -> dict[str, Rendered | None]:
        try:
            status, value = self.receive.recv()
        except (EOFError, OSError):
            status, value = "failed", None
        self.process.join()
        if status == "done":
            return value
        return {job.name: _render(self.result, job) for job in self.jobs}  # its error, if any, raised here

    def stop(self) -> None:
        if self.process.is_alive():
            self.process.terminate()
        self.process.join()
        self.receive.close()


def _draw_in_child(send, result: CheckResult, jobs: list[FigureJob], parent: int) -> None:
    """The child's work: draw its figures and send them back, or say that it failed (the parent draws them).
    Like the mesher's child it leaves signals to its parent (which stops it) and dies with it."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    signal.set_wakeup_fd(-1)  # the parent's, inherited: the parent's watcher is not this process's
    end_with_parent(parent)
    try:
        send.send(("done", {job.name: _render(result, job) for job in jobs}))
    except BaseException:  # noqa: BLE001 - any failure: the parent draws these figures itself
        send.send(("failed", None))
    finally:
        send.close()


def figure_bytes(fig, svg: bool = True) -> tuple[bytes, bytes | None]:
    """PNG bytes of a matplotlib Figure, and SVG bytes when `svg` (None otherwise); no dates in the metadata,
    fixed SVG ids: files repeat run to run. The PNG is compressed quickly (PNG_COMPRESSION)."""
    import matplotlib

    png = io.BytesIO()
    fig.savefig(png, format="png", dpi=PNG_DPI, facecolor="white", metadata={"Software": None},
                pil_kwargs={"compress_level": PNG_COMPRESSION})
    if not svg:
        return png.getvalue(), None
    fig.set_layout_engine("none")  # keep the layout just computed: laying out again costs as much as drawing
    vector = io.BytesIO()
    with matplotlib.rc_context({"svg.hashsalt": "stressraiser"}):  # element ids repeat run to run
        fig.savefig(vector, format="svg", dpi=PNG_DPI, facecolor="white", metadata={"Date": None})
    return png.getvalue(), vector.getvalue()


# --- HTML -------------------------------------------------------------------------------------------

def esc(value: Any) -> str:
    """Text escaped for HTML content and attributes."""
    return html.escape(str(value), quote=True)


def report_html(result: CheckResult, figures: list[Rendered], part_text: str | None = None,
                part_name: str | None = None) -> str:
    """The whole report page."""
    spec = result.spec
    by_section: dict[str, list[Rendered]] = {}
    for fig in figures:
        by_section.setdefault(fig.section, []).append(fig)
    body = [
        f"<h1>{esc(spec.title)}</h1>",
        f'<p class="meta">stressraiser {esc(__version__)} · record schema {esc(SCHEMA)} · '
        f"{esc(datetime.now(timezone.utc).strftime('%Y-%m-%d %H:%M UTC'))}"
        + (f" · part file {esc(part_name)}" if part_name else "") + "</p>",
        _verdict_section(result),
        _cases_section(result),
        _part_section(result, by_section.get("part", []), part_text),
        _mesh_section(result, by_section.get("mesh", [])),
        _stress_section(result, by_section.get("stress", [])),
        _sections_section(result, by_section.get("section", [])),
        _cuts_section(result, by_section.get("cuts", [])),
        _joints_section(result),
        _convergence_section(result, by_section.get("convergence", [])),
        _handbook_section(result, by_section.get("handbook", [])),
        _design_section(result, by_section.get("design", [])),
        _fatigue_section(result, by_section.get("fatigue", [])),
        _cautions_section(result),
        _files_section(figures),
    ]
    return (
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
        "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
        f"<title>{esc(spec.title)} — stressraiser check</title>\n<style>{STYLE}</style>\n</head>\n<body>\n"
        + "\n".join(part for part in body if part) + "\n</body>\n</html>\n"
    )


STYLE = """
body { font-family: system-ui, -apple-system, "Segoe UI", Roboto, "DejaVu Sans", sans-serif; color: #222;
       max-width: 1000px; margin: 2em auto; padding: 0 1.2em; line-height: 1.45; }
h1 { font-size: 1.6em; margin-bottom: 0.1em; }
h2 { font-size: 1.25em; border-bottom: 2px solid #2a5f8f; padding-bottom: 0.15em; margin-top: 2em; }
h3 { font-size: 1.05em; margin-bottom: 0.3em; }
.meta { color: #666; font-size: 0.9em; margin-top: 0; }
.verdict { border-left: 6px solid #2a5f8f; background: #f1f5f9; padding: 0.6em 1em; font-size: 1.05em; }
.verdict.fails { border-left-color: #b8392b; background: #fbeeec; }
.verdict.caution { border-left-color: #c99a06; background: #fdf7e1; }
.verdict.passes { border-left-color: #3f8f5a; background: #eef7f1; }
.warn { border-left: 6px solid #c8641e; background: #fdf3ea; padding: 0.4em 1em; }
table { border-collapse: collapse; margin: 0.6em 0 1em; font-size: 0.92em; }
th, td { border-bottom: 1px solid #dde2e8; padding: 0.25em 0.7em 0.25em 0; text-align: left; vertical-align: top; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
figure { margin: 1em 0 1.6em; }
figure img { max-width: 100%; height: auto; border: 1px solid #e4e4e4; }
figcaption { color: #444; font-size: 0.9em; }
figcaption a { color: #2a5f8f; }
pre { background: #f6f6f6; padding: 0.7em; overflow-x: auto; font-size: 0.85em; }
.small { font-size: 0.85em; color: #555; }
ul.cautions li { margin-bottom: 0.3em; }
"""


def _figures(figures: Iterable[Rendered]) -> str:
    out = []
    for fig in figures:
        data = base64.b64encode(fig.png).decode("ascii")
        out.append(
            f'<figure id="fig-{esc(fig.name)}"><img src="data:image/png;base64,{data}" width="{fig.width}" '
            f'alt="{esc(fig.caption)}">'
            f"<figcaption>{esc(fig.caption)} Files: "
            + ", ".join(f"<a href=\"{FIGURES_DIR}/{esc(fig.name)}.{suffix}\">{suffix.upper()}</a>" for suffix, _ in fig.files)
            + ".</figcaption></figure>"
        )
    return "\n".join(out)


def _table(rows: Iterable[Iterable[Any]], header: Iterable[str] | None = None, numeric: Iterable[int] = ()) -> str:
    """An HTML table of escaped cells; columns listed in `numeric` are right-aligned."""
    numeric = set(numeric)
    head = "" if header is None else "<tr>" + "".join(f"<th>{esc(h)}</th>" for h in header) + "</tr>"
    lines = []
    for row in rows:
        cells = "".join(f'<td class="num">{esc(c)}</td>' if i in numeric else f"<td>{esc(c)}</td>"
                        for i, c in enumerate(row))
        lines.append(f"<tr>{cells}</tr>")
    return f"<table>{head}{''.join(lines)}</table>"


def _section(key: str, heading: str, *parts: str) -> str:
    return f'<section id="{esc(key)}">\n<h2>{esc(heading)}</h2>\n' + "\n".join(p for p in parts if p) + "\n</section>"


def _p(text: str, cls: str | None = None) -> str:
    return f'<p class="{cls}">{esc(text)}</p>' if cls else f"<p>{esc(text)}</p>"


def _num(value: Any, digits: int = 4, unit: str = "") -> str:
    """Format a number to `digits` significant figures (text passes through; None is a dash)."""
    if value is None:
        return "—"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (int, float)):
        if isinstance(value, float) and not math.isfinite(value):
            return "∞" if value > 0 else "—"
        text = format_number(value, digits) if isinstance(value, float) else str(value)
        return f"{text} {unit}".strip()
    return str(value)


def _amount(value: Any, quantity: str, units: str, digits: int = 4, resultant: bool = False, unit: bool = True) -> str:
    """An internal value (mm, N, MPa, mm², N·mm) in the unit system `units` to `digits` significant figures,
    with its unit label unless `unit` is False; None is a dash, anything not a number passes through _num."""
    if not isinstance(value, (int, float)) or isinstance(value, bool):
        return _num(value)
    if not math.isfinite(value):
        return "∞" if value > 0 else "—"
    text = significant(float(value), quantity, units, digits, resultant)
    return text if unit else text.rsplit(" ", 1)[0]


def _cut_name(section: SectionResult, units: str) -> str:
    """A requested cut's label in `units` (unnamed cuts are labelled in mm by the part reader)."""
    return cut_label(section.label, tuple(section.point), units)


# --- report sections: one function each ---------------------------------------------------------------

def _verdict_section(result: CheckResult) -> str:
    ns, peak, units = result.net_section, result.peak, result.spec.units
    design, fatigue = signoff_records(result)
    lines = [esc(verdict(result))]
    if design is not None:
        lines.append(f"<strong>Design check ({esc(design.governing_check)} governs): "
                     f"{'passes' if design.passes else 'FAILS'}</strong>")
    if fatigue is not None:
        yielding = " — FIRST-CYCLE YIELD at the notch" if fatigue.first_cycle_yield else ""
        wider = " — a wider range elsewhere is NOT SCREENED" if result.fatigue.wider is not None else ""
        lines.append(f"Fatigue screen: {'passes' if fatigue.passes else 'FAILS'}{yielding}{wider}")
    under = result.understatement
    rows = [
        (f"Peak ({peak.component}, {peak_state(result)})", _amount(peak.stress, "stress", units, 5),
         f"{raiser_label(peak.feature)} at {point_text(peak.location, units)}; finest mesh "
         f"{quantity_text(peak.fe_stress, 'stress', units)}"),
        ("Net-section average", _amount(ns.average, "stress", units, 5),
         f"force / net area {quantity_text(ns.area, 'area', units)}, {plots.governing_view(result).where(units)}"),
        ("Average understates the peak by", "—" if under is None else f"{under:.1%}",
         "" if under is not None else "the average and the peak differ in sign"),
        *kt_rows(result),
        *bearing_rows(result),
        ("Equilibrium on the net section", f"{ns.equilibrium_error:+.3%}",
         f"FE force {quantity_text(ns.fe_force, 'force', units)}"),
    ]
    warnings = "".join(f'<p class="warn">{esc(warning_text(w, units))}</p>' for w in result.warnings)
    cls = "verdict " + verdict_state(result)
    return _section("verdict", "Verdict", f'<div class="{cls}">' + "<br>".join(lines) + "</div>", warnings,
                    _table(rows, numeric=(1,)))


def verdict_state(result: CheckResult) -> str:
    """The verdict box's state: "fails" (a design check failed: red), "caution" (a fatigue screen failed or
    the study did not converge: amber), "passes" (a design check passed, converged: green), or "plain"
    (converged, nothing to sign off: blue)."""
    design, fatigue = signoff_records(result)
    if design is not None and not design.passes:
        return "fails"
    if (fatigue is not None and not fatigue.passes) or not result.kt.converged:
        return "caution"
    return "passes" if design is not None else "plain"


def _part_section(result: CheckResult, figures: list[Rendered], part_text: str | None) -> str:
    spec = result.spec
    plate, material, units = spec.plate, spec.material, spec.units
    rows = [
        ("Plate", f"{_amount(plate.length, 'length', units, unit=False)} × {_amount(plate.width, 'length', units)}, "
         f"thickness {_amount(plate.thickness, 'length', units)}, {plate.condition}"),
        ("Material", material_text(material, units)),
        *((("Load", _load_text(spec.load, units, spec)),) if len(result.cases) < 2 else
          ((f"Load case {r.case}", _load_text(r.spec.load, units, r.spec)) for r in result.cases)),
        ("Mesh study", f"target error {spec.mesh.tolerance:.2%}, at most {spec.mesh.max_levels} levels and "
         f"{spec.mesh.max_elements:,} triangles"),
        ("Units", f"{units}, the part file's system: every number of this report and its figures is in it"
         + ("" if units == DEFAULT_SYSTEM else f"; {FIELDS_NAME} and {RECORD_NAME} are in mm, N, MPa")),
    ]
    raisers = [(str(rid), kind_of(item).describe(item, units)) for rid, item in named(spec)]
    parts = [_table(rows), _figures(figures)]
    if raisers:
        parts.append(_table(raisers, header=("raiser", "as given")))
    boundary = [row for r in result.every_case for row in boundary_rows(r)
                if r.case == result.case or not row[0].lower().startswith("hold")]
    if boundary:
        parts.append("<h3>Supports and loads on the part's own boundary</h3>" + _table(boundary, numeric=(1,)))
    if part_text is not None:
        parts.append("<h3>The part file as read</h3><pre>" + esc(part_text) + "</pre>")
    return _section("part", "The part and what it carries", *parts)


def material_text(material: Material, units: str) -> str:
    """E, ν and the strengths in `units`; a value taken from the material table whose source states it in
    another unit system is followed by the source's own number ("yield 241.3 MPa (35 ksi as stated)")."""
    stated = dict(material.stated)

    def value(key: str, mpa: float | None) -> str:
        own = stated.get(key)
        text = _amount(mpa, "stress", units) if own is None else format_stated(own, units)
        return text if own is None or own.native_to(units) else f"{text} ({own} as stated)"

    parts = [f"E {value('E', material.E)}", f"ν {_num(material.nu)}", f"yield {value('yield', material.yield_strength)}",
             f"ultimate {value('ultimate', material.ultimate)}"]
    if material.fatigue_strength is not None:
        life = "" if material.fatigue_life is None else f" at {material.fatigue_life:.0e} cycles"
        parts.append(f"fatigue strength {value('fatigue_strength', material.fatigue_strength)}{life}")
    return ", ".join(parts)


def _load_text(load: Load, units: str, spec: PartSpec) -> str:
    """The load as text in `units`: the end force, moment and shear, a pin's force and direction, the
    remote stresses, or the loads on the boundary, whichever the load has; and how the part is held."""
    parts = []
    for name, value, quantity in (("axial", load.axial, "force"), ("bending", load.bending, "moment"),
                                  ("shear", load.shear, "force")):
        if value:
            parts.append(f"{name} {_amount(value, quantity, units)}"
                         + (f" ({'tension' if value > 0 else 'compression'})" if name == "axial" else ""))
    pin, remote = load.pin, load.remote
    if pin is not None:
        parts.append(f"pin in {named_hole(pin.hole)}: {_amount(pin.force, 'force', units)} at "
                     f"{_num(float(pin.direction))}°")
    if remote is not None:
        parts.append("remote stress " + ", ".join(f"{name} {_amount(value, 'stress', units)}" for value, name in
                                                  ((remote.sx, "σx"), (remote.sy, "σy"), (remote.txy, "τxy"))))
    edges = load.edges
    if edges:
        parts.append(f"{len(edges)} load{'s' if len(edges) > 1 else ''} on the boundary (below)")
    text = "; ".join(parts) or "none"
    held_by_holds = bool(spec.support.holds)
    if remote is None:
        text += ("; held by the supports below" if held_by_holds else "; the left end is held") + (
            ", the end loads act on the right end" if load.has_end_loads else "")
    return text


def _cases_section(result: CheckResult) -> str:
    """With several load cases: each case's governing peak, nominal, Kt and band (and design margin), and
    which case governs."""
    cases = result.every_case
    if len(cases) < 2:
        return ""
    units = result.spec.units
    rows = []
    for r in cases:
        nominal = r.nominal.net if r.nominal is not None else None
        margin = "—"
        if r.design is not None:
            margin = f"{design_margin(r.design):+.3f}"
        rows.append((r.case + (" (governs)" if r.case == result.case else ""), _amount(r.peak.stress, "stress", units, 5),
                     raiser_label(r.peak.feature), _amount(nominal.stress if nominal else r.net_section.average, "stress", units, 5),
                     esc(nominal.formula if nominal else "N / A"), f"{r.kt.net:.3f}",
                     f"±{r.kt.error:.2%}" if r.kt.error < 1.0 else "unknown", f"{r.kt.gross:.3f}", margin,
                     "yes" if r.kt.converged else "NO"))
    text = (f"The part has {len(cases)} load cases on one mesh and one stiffness: each mesh level was solved for "
            "all of them at once, and the levels went on until every case's peak had converged. Each case has "
            "its own peak, critical section, nominal stress and Kt. The governing case, whose numbers the rest of "
            "this report gives, is the one with the " + ("smallest design margin." if all(r.design for r in cases)
                                                          else "largest peak."))
    table = _table(rows, header=("load case", "peak", "at", "nominal", "nominal is", "Kt net", "band", "Kt gross",
                                 "margin", "converged"), numeric=(1, 3, 5, 6, 7, 8))
    return _section("cases", "Load cases", _p(text), table)


def _mesh_section(result: CheckResult, figures: list[Rendered]) -> str:
    mesh, units = result.solution.mesh, result.spec.units
    features = [(str(f.name), _amount(f.radius, "length", units), _amount(f.edge_size, "length", units, 3))
                for f in mesh.features]
    text = (f"The finest level has {mesh.n_nodes:,} nodes and {mesh.n_elements:,} linear triangles "
            f"({2 * mesh.n_nodes:,} degrees of freedom). Element sizes shrink towards each raiser edge.")
    table = _table(features, header=("raiser", "edge radius", "element size at the edge"), numeric=(1, 2)) if features else ""
    return _section("mesh", "How the part was meshed", _p(text), table, _figures(figures))


def _stress_section(result: CheckResult, figures: list[Rendered]) -> str:
    s1 = result.solution.principal[:, 0]
    vm = result.solution.von_mises
    units = result.spec.units

    def stress(value: float) -> str:
        return quantity_text(float(value), "stress", units)

    text = (f"Maximum principal stress ranges from {stress(s1.min())} to {stress(s1.max())} on the finest mesh; "
            f"the largest von Mises stress is {stress(vm.max())}. The converged peak is "
            f"{stress(result.peak.stress)} at {raiser_label(result.peak.feature)}.")
    return _section("stress", "Where the stress gathers", _p(text), _figures(figures))


def _sections_section(result: CheckResult, figures: list[Rendered]) -> str:
    units = result.spec.units
    rows = []
    for view in plots.critical_sections(result):
        ns = view.section
        ligaments = ", ".join(f"{_amount(a, 'length', units, unit=False)} … {_amount(b, 'length', units, unit=False)}"
                              for a, b in ns.ligaments)
        rows.append((view.label, raiser_label(view.feature), view.where(units), ligaments, _amount(ns.width, "length", units, 5),
                     _amount(ns.area, "area", units, 5), _amount(ns.average, "stress", units, 5),
                     _amount(view.peak, "stress", units, 5), f"{view.kt_net:.3f}", f"{ns.equilibrium_error:+.3%}"))
    table = _table(rows, header=("section", "raiser", "where", f"ligaments ({label('length', units)} along the cut)",
                                 "net width", "net area", "average", "peak", "Kt net", "equilibrium"),
                   numeric=(4, 5, 6, 7, 8, 9))
    text = ("The critical section is the cut across the load through the raiser that carries the peak. A hand "
            "calculation spreads the force evenly over the net area (the flat line); the FE solution shows "
            "how the stress actually gathers at the raiser edge.")
    if on_edge_cut(result):
        text = ("The part is held or loaded on its own boundary, so there is no load axis to cut across: the critical "
                "section is the cut through the peak along the edge's inward normal, across the shortest run of "
                "ligaments on that line that cuts the part in two. The hand calculation is N / A + M s / I in the "
                "peak's fibre, from the statics of the piece the cut separates.")
    return _section("sections", "Across the critical section", _p(text), _figures(figures), table)


def _cuts_section(result: CheckResult, figures: list[Rendered]) -> str:
    """The cuts the part file asked for: FE resultants against statics (method of sections)."""
    if not result.sections:
        return ""
    units = result.spec.units

    def amount(value: float, quantity: str, digits: int = 5) -> str:
        return _amount(value, quantity, units, digits)

    rows = [(_cut_name(c, units), amount(c.area, "area"), amount(c.fe_normal_force, "force"),
             amount(c.statics.normal_force, "force"), amount(c.fe_shear_force, "force"), amount(c.fe_moment, "moment"),
             _percent(c.normal_error), _percent(c.shear_error), _percent(c.moment_error),
             amount(c.average_normal, "stress", 4), amount(c.peak_normal, "stress", 4)) for c in result.sections]
    table = _table(rows, header=("cut", "area", "N (FE)", "N (statics)", "V (FE)", "M (FE)", "N error", "V error",
                                 "M error", "average N/A", "largest normal"), numeric=range(1, 11))
    text = ("Each cut integrates the FE stresses across the part (normal force N, shear force V, moment M about "
            "the centroid of its material) and compares them with what statics requires of the applied loads.")
    return _section("cuts", "The cuts you asked for", _p(text), table, _figures(figures))


def _joints_section(result: CheckResult) -> str:
    """The fastener groups: per fastener and per hole, the hand checks beside the FE (compare/joint_result.py)."""
    joints = result.joints
    if joints is None:
        return ""
    units = result.spec.units
    parts = [_p("Each group's fasteners share its load as the FE finds it: every fastener bears on its hole by "
                "frictionless contact and is joined to the group's rigid connecting member by its stiffness. "
                "Bearing F / (d t) and the fastener's average shear F / (n pi d^2 / 4) are common practice; the "
                "bypass is the plate's load passing the hole (statics of the cut through its centre, across the "
                "group's load; a concentric group only), Kt net is the hole's converged tensile peak over N / A_net "
                "on that cut and Kt brg over the group's mean bearing. The hand column is the hand method's force "
                "on the fastener (equal shares, or the elastic method for an eccentric group).")]
    for g in joints.groups:
        fit = "neat fit" if g.clearance == 0.0 else f"clearance {_amount(g.clearance, 'length', units)}"
        stiff = "rigid" if math.isinf(g.stiffness) else f"{_amount(g.stiffness, 'stiffness', units)} ({g.stiffness_source})"
        parts.append(f"<h3>{esc(g.name)} ({'holds the part' if g.holds else 'loads the part'})</h3>")
        parts.append(_p(f"Fastener d {_amount(g.diameter, 'length', units)}, {fit}, {g.shear_planes} shear "
                        f"plane(s), {stiff}. {'Reaction' if g.holds else 'Load'} "
                        f"{_amount(math.hypot(*g.load[:2]), 'force', units, resultant=True)}, moment "
                        f"{_amount(g.load[2], 'moment', units, resultant=True)} about its reference point; the "
                        f"fasteners' forces sum to it within {g.statics_error:.1e}. Hand sharing: {g.hand_method}, "
                        f"{g.hand_source}."))
        rows = [(f.hole, _amount(f.magnitude, "force", units, resultant=True), f"{f.direction:.1f}", f"{f.share:.1%}",
                 _amount(f.bearing, "stress", units), _amount(f.shear, "stress", units),
                 _amount(f.bypass, "force", units, resultant=True), _amount(f.peak, "stress", units),
                 _num(f.kt_net), _num(f.kt_bearing), f"{f.edge:.2f}", _num(f.pitch, 3),
                 _amount(math.hypot(*f.hand), "force", units, resultant=True)) for f in g.fasteners]
        parts.append(_table(rows, header=("hole", "force", "direction °", "share", "bearing", "shear", "bypass",
                                          "peak", "Kt net", "Kt brg", "edge / d", "pitch / d", "hand"),
                            numeric=range(13)))
        items = [f"{a.words(lambda v: _amount(v, 'stress', units))} ({a.check.source})" for a in g.averages]
        p = g.net_path
        if p is not None:
            through = ("holes " + ", ".join(str(h) for h in p.holes)) if p.holes else "no hole (the gross width)"
            fe = "" if p.fe_hole is None else (f"; the FE's largest tensile peak of the group is at hole {p.fe_hole} "
                                               f"({'on' if p.fe_on_path else 'off'} that path)")
            items.insert(0, f"critical net path by s^2/(4g) ({p.source}): through {through}, net width "
                            f"{_amount(p.width, 'length', units)} of {_amount(p.gross, 'length', units)}{fe}")
        parts.append(_list(items))
    passes = ", ".join("—" if p is None else str(p) for p in joints.passes)
    parts.append(_p(f"Contact passes per mesh level: {passes}. {joints.cautions[0]}", "small"))
    return _section("fasteners", "Fastener groups, per fastener and per hole", *parts)


def _percent(value: float | None) -> str:
    return "—" if value is None else f"{value:+.3%}"


def _convergence_section(result: CheckResult, figures: list[Rendered]) -> str:
    study, est, units = result.study, result.study.estimate, result.spec.units
    h, raiser = plots.level_sizes(result)
    rows = [(str(i), _num(lv.scale, 3),
             _num(float(x), 3) if raiser is None else _amount(float(x), "length", units, 3, unit=False),
             f"{lv.nodes:,}", f"{lv.elements:,}", f"{2 * lv.nodes:,}", shown(lv.peak, "stress", units, ".2f"),
             f"{sum(lv.seconds.values()):.2f}")
            for i, (lv, x) in enumerate(zip(study.levels, h), start=1)]
    text = (f"Estimate of {result.peak.feature}'s own peak: {estimate_how(est)}{estimate_basis(result)}: "
            f"{quantity_text(est.value, 'stress', units, '.2f')} "
            f"± {est.error:.2%} (target "
            f"{result.spec.mesh.tolerance:.2%}); {'converged' if study.converged else 'NOT converged'}"
            + (f"; stopped because {study.stop_reason}" if study.stop_reason else "") + ".")
    size = "relative edge size" if raiser is None else f"edge size ({label('length', units)})"
    table = _table(rows, header=("level", "scale", size, "nodes", "triangles", "DOFs",
                                 f"peak ({label('stress', units)})", "time (s)"), numeric=range(1, 8))
    return _section("convergence", "Does the peak settle? The mesh study", _p(text), _figures(figures), table)


def _handbook_section(result: CheckResult, figures: list[Rendered]) -> str:
    if not result.handbook:
        return _section("handbook", "Against published values",
                        _p("No handbook case covers this geometry: the FE result stands on its own, with the "
                           "error band of the mesh study."))
    rows = []
    for m in result.handbook:
        params = ", ".join(f"{k} = {v:.4g}" for k, v in m.recognised.params.items())
        rows.append((m.case.title, f"{m.kt_net:.3f}", f"{m.kt_gross:.3f}", f"{fe_kt_for(result, m) / m.kt_net - 1:+.2%}",
                     params, range_words(m), m.case.source))
    table = _table(rows, header=("published case", "Kt net", "Kt gross", "FE differs by", "parameters",
                                 "validity range", "source"), numeric=(1, 2, 3))
    return _section("handbook", "Against published values", _figures(figures), table,
                    _p("The first row is the preferred case. Handbook values are for the idealised shape; "
                       "differences beyond the FE band mean the part is not quite that shape, or the chart's "
                       "own scatter.", "small"))


def signoff_records(result: CheckResult) -> tuple[DesignCheck | None, FatigueScreen | None]:
    """The design check and fatigue screen of a result (None when not asked for), out of their sign-off
    envelopes."""
    return (None if result.design is None else result.design.check,
            None if result.fatigue is None else result.fatigue.screen)


def _design_section(result: CheckResult, figures: list[Rendered]) -> str:
    design, _ = signoff_records(result)
    heading = "Sign-off: allowable stress and margins"
    if design is None:
        return _section("design", heading, _p("No design check was requested for this part: add a [design] "
                                               "table to the part file to compare with an allowable stress."))
    units = result.spec.units
    lines = list(design_statements(design, units)) + list(result.design.basis)
    checks = (_table(check_rows(result.design, units), header=CHECK_HEADER, numeric=range(1, 7))
              + _p(check_caption(units), "small"))
    return _section("design", heading, checks, _list(lines), _figures(figures),
                    _p(f"All the numbers of the check (in {result.spec.units}):", "small"),
                    _record_table(design, result.spec.units))


def _fatigue_section(result: CheckResult, figures: list[Rendered]) -> str:
    _, fatigue = signoff_records(result)
    if fatigue is None:
        return ""
    units, signoff = result.spec.units, result.fatigue
    lines = fatigue_statements(signoff, units) + list(signoff.basis)
    cycle = f"Load cycle {cycle_words(signoff, bool(result.spec.cases))}"
    if signoff.between_cases:
        cycle += f"; the notch is {notch_words(signoff, units)}"
    feature = signoff.feature
    head = [cycle + "."] + ([f"Notch root radius taken from {feature}."] if feature is not None else [])
    return _section("fatigue", "Fatigue screen", _list(head + lines), _figures(figures),
                    _p(f"All the numbers of the screen (in {result.spec.units}, lives in cycles):", "small"),
                    _record_table(fatigue, result.spec.units),
                    _p("A screen, not a life prediction.", "small"))


def _list(items: Iterable[str]) -> str:
    items = list(items)
    return "<ul>" + "".join(f"<li>{esc(s)}</li>" for s in items) + "</ul>" if items else ""


FIELD_QUANTITIES = (("_mpa", "stress"), ("_mm2", "area"), ("_mm", "length"), ("_n", "force"))  # internal units


def _record_table(record: Any, units: str = DEFAULT_SYSTEM) -> str:
    """Every plain field of a dataclass record as a two-column table; a field's suffix names its quantity
    (_mpa, _mm2, _mm, _n: shown in `units`) or its unit (_cycles)."""
    if not dataclasses.is_dataclass(record):
        return ""
    rows = []
    for f in dataclasses.fields(record):
        value = getattr(record, f.name)
        if f.name == "statements" or not isinstance(value, (int, float, str, bool, type(None))):
            continue
        name, shown_value = f.name, _num(value, 4)
        for suffix, quantity in FIELD_QUANTITIES:
            if name.endswith(suffix):
                name = f"{name[: -len(suffix)]} ({label(quantity, units)})"
                shown_value = _amount(value, quantity, units, unit=False)
                break
        else:
            if name.endswith("_cycles"):
                name = f"{name.removesuffix('_cycles')} (cycles)"
        rows.append((name.replace("_", " "), shown_value))
    return _table(rows, numeric=(1,))


def _cautions_section(result: CheckResult) -> str:
    items = "".join(f"<li>{esc(c)}</li>" for c in result.cautions)
    return _section("cautions", "Read this before relying on the numbers", f'<ul class="cautions">{items}</ul>')


def _files_section(figures: list[Rendered]) -> str:
    rows = [(FIELDS_NAME, "finest-mesh fields for a VTK viewer: point data " + ", ".join(POINT_FIELDS)
             + "; cell data " + ", ".join(CELL_FIELDS) + " (in mm and MPa whatever the part file's units)"),
            (RECORD_NAME, f"the JSON record ({SCHEMA}; numbers in mm, N, MPa, its display_units names the "
                          "part file's system)")]
    rows += [(f"{FIGURES_DIR}/{fig.name}." + ", .".join(suffix for suffix, _ in fig.files), fig.caption)
             for fig in figures]
    return _section("files", "Files beside this report", _table(rows, header=("file", "contents")))


def _read_text(path: str | Path | None) -> str | None:
    if path is None:
        return None
    try:
        return Path(path).read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError):
        return None
