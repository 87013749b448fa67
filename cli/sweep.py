"""`stressraiser sweep PART --vary KEY=VALUES ...`: one check per point of a parameter grid, a Kt table and
a Kt curve with the handbook curve beside it.

KEY is a dotted key of the part file (geometry/partkeys.py: plate.width, hole.1.diameter, hole.1.center.y,
mesh.tolerance); a `*` in place of an entry number sets that value in every entry of the array together
(hole.*.diameter: every hole of a row). VALUES is START:STOP:COUNT (COUNT evenly spaced values, both ends included) or a comma
list (10,15,20); numbers are in the part file's unit system. Several --vary give every combination; the
first one is the plot's horizontal axis.

Everything goes into the output folder (--out, default PARTNAME-sweep/):
    rows.jsonl     the log: one JSON line per finished case, appended and flushed as each one finishes
    sweep.csv      the table, rebuilt from the log when the sweep is complete (written whole or not at all)
    sweep.json     the same table with the sweep's description
    kt.png, kt.svg the Kt curve
An interrupted sweep keeps its log; `--resume` skips every case the log holds (keyed by the whole part-file
dictionary of the case) except those that failed by a crash or a bug, which run again.
"""

from __future__ import annotations

import argparse
import csv
import io
import itertools
import json
import math
import os
import re
import tomllib
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from ..geometry.errors import PartError
from .errors import CommandLineError, OutputError
from .batch import RETRY_ON_RESUME, ROW_FIELDS, STATUS_OK, add_execution_options, execution_from_args, load_cases_text

NAME = "sweep"
SCHEMA = "stressraiser.sweep/1"
LOG_NAME, CSV_NAME, JSON_NAME, PLOT_NAME = "rows.jsonl", "sweep.csv", "sweep.json", "kt"
MAX_POINTS = 1_000_000
_INTEGER = re.compile(r"^[-+]?\d+$")
TABLE_FIELDS = (  # kt_* / converged: the part's governing peak; case_*: the raiser the handbook case describes
    "status", "kt_net", "kt_error", "converged", "kt_gross", "handbook_case", "handbook_kt_net",
    "handbook_kt_gross", "handbook_in_range", "case_raiser", "case_kt_net", "case_kt_error", "case_kt_gross",
    "case_converged", "handbook_difference", "peak", "average", "gross_average", "peak_fe",
    "peak_x", "peak_y", "feature", "equilibrium_error", "levels", "elements", "load_case", "load_cases", "seconds",
    "error",
)


@dataclass(frozen=True)
class VaryKey:
    """The key of one --vary as written (`text`) and the part-file keys it sets: one, or one per entry of
    an array of tables for a key with `*` (geometry.partkeys.KeyPath each)."""

    text: str
    paths: tuple[Any, ...]


@dataclass(frozen=True)
class Vary:
    """One --vary option: the key and its values (in the part file's units)."""

    key: VaryKey
    values: tuple[int | float, ...]


def set_vary(part: dict[str, Any], key: VaryKey, value: float) -> dict[str, Any]:
    """A copy of `part` with every value the --vary key names set to `value`."""
    from ..geometry.partkeys import set_value

    for path in key.paths:
        part = set_value(part, path, value)
    return part


@dataclass(frozen=True)
class Point:
    """One case of the sweep: the varied values, the case's part-file dictionary, and its key."""

    inputs: dict[str, int | float]
    part: dict[str, Any]
    key: str


def add_parser(commands) -> None:
    parser = commands.add_parser(NAME, help="check a part over a grid of values and draw the Kt curve",
                                 description="One check per point of a parameter grid; a Kt table (CSV, JSON) "
                                             "and a Kt curve with the handbook curve where one applies.")
    parser.add_argument("part", help="part file (TOML) that the sweep starts from")
    parser.add_argument("--vary", action="append", required=True, metavar="KEY=VALUES",
                        help="a dotted part-file key and its values: START:STOP:COUNT or a comma list, e.g. "
                             "hole.1.diameter=10:60:6 or plate.width=60,80,100; repeat for a grid")
    parser.add_argument("--out", metavar="DIR",
                        help="output folder for the log, tables and plot (default: PARTNAME-sweep)")
    parser.add_argument("--resume", action="store_true",
                        help="continue the sweep whose log is in the output folder, skipping finished cases")
    add_execution_options(parser)


def run(args: argparse.Namespace) -> int:
    from .batch import run_batch
    from .files import output_folder
    from .main import EXIT_INPUT
    from .terminal import err_console, out_console

    out, err = out_console(), err_console()
    execution = execution_from_args(args)
    base = read_part_dict(args.part)
    varies = [parse_vary(text, base) for text in args.vary]
    points = sweep_points(base, varies)
    folder = Path(args.out if args.out is not None else f"{Path(args.part).stem}-sweep")
    # checked before any case runs: the folder, and each file the sweep writes in it
    output_folder(str(folder), "--out", files=(LOG_NAME, CSV_NAME, JSON_NAME, f"{PLOT_NAME}.png", f"{PLOT_NAME}.svg"))
    log = folder / LOG_NAME
    if log.exists() and not args.resume:
        raise CommandLineError(f"--out: {log} already holds a sweep log; pass --resume to finish that sweep, "
                               "or choose another --out")
    done = finished_rows(log) if args.resume else {}
    keys = {p.key for p in points}
    kept = {k: r for k, r in done.items() if k in keys and r["status"] not in RETRY_ON_RESUME}
    if args.resume:
        err.print(f"resuming: {len(kept)} of {len(points)} cases already finished"
                  + (f"; {len(done) - len(kept)} logged rows are not kept (other sweep, or to run again)"
                     if len(done) > len(kept) else ""), markup=False)
    jobs = [(p.key, p.part) for p in points if p.key not in kept]
    inputs = {p.key: p.inputs for p in points}
    try:
        folder.mkdir(parents=True, exist_ok=True)
        handle = open_log(log)
    except OSError as exc:
        raise OutputError(f"--out: cannot write the sweep log in {folder} ({exc.strerror or exc})") from None
    with handle:
        run_batch(jobs, execution, lambda key, row: append_row(handle, key, inputs[key], row),
                  f"sweep of {len(points)} cases")
    rows = table_rows(points, finished_rows(log))
    try:  # the table is shown even when the files cannot be written, so that the sweep is not lost
        write_tables(folder, args.part, base, varies, rows)
        plot_note = _plot(folder, base, varies, rows)
        written: OutputError | None = None
    except OutputError as exc:
        written = exc
    print_table(out, varies, rows)
    failed = sum(r["status"] != STATUS_OK for r in rows)
    wrote = (f"Wrote {folder / CSV_NAME}, {folder / JSON_NAME}{plot_note} (log {log})." if written is None
             else f"The tables were not written (log {log}).")
    out.print(f"{len(rows)} cases: {len(rows) - failed} ok, {failed} failed. {wrote}", markup=False)
    if written is not None:
        err.print(f"stressraiser: {written}", markup=False)
        return EXIT_INPUT
    return 0 if failed == 0 else 1


# --- the grid ----------------------------------------------------------------------------------------

def read_part_dict(path: str | Path) -> dict[str, Any]:
    """The part file as a dictionary, after checking that it is a valid part file itself."""
    from ..geometry.partfile import MAX_PART_BYTES, anchored, parse_part
    from ..geometry.textfile import read_input_text

    text = read_input_text(path, "part file", MAX_PART_BYTES)
    folder = Path(path).parent
    parse_part(text, folder)  # one-line PartError for anything wrong with the file
    return anchored(tomllib.loads(text), folder)  # a cut file named relative to the part file stays found


def parse_vary(text: str, base: dict[str, Any]) -> Vary:
    """KEY=VALUES checked against the part-file dictionary `base`."""
    from ..geometry.partfile import part_from_dict
    from ..geometry.partkeys import check_key_known, expand_key, resolve_key

    name, sep, spec = text.partition("=")
    if not sep or not name.strip() or not spec.strip():
        raise CommandLineError(f"--vary {text}: write KEY=START:STOP:COUNT or KEY=V1,V2,..., e.g. hole.1.diameter=10:60:6")
    try:
        paths = [resolve_key(base, each) for each in expand_key(base, name.strip())]
        values = parse_values(spec.strip())
        for path in paths:
            check_key_known(base, path, values[0], part_from_dict)
    except PartError as exc:
        raise PartError(f"--vary {exc}") from None
    return Vary(VaryKey(name.strip(), tuple(paths)), values)


def parse_values(text: str) -> tuple[int | float, ...]:
    """START:STOP:COUNT (evenly spaced, ends included) or V1,V2,...; whole numbers stay whole."""
    if ":" in text:
        parts = text.split(":")
        if len(parts) != 3:
            raise PartError(f"{text}: a range is START:STOP:COUNT, e.g. 10:60:6")
        start, stop = _value(parts[0]), _value(parts[1])
        if not _INTEGER.match(parts[2].strip()) or not 2 <= int(parts[2]) <= MAX_POINTS:
            raise PartError(f"{text}: COUNT must be a whole number from 2 to {MAX_POINTS}; got {parts[2]!r}")
        count = int(parts[2])
        values = [float(f"{start + (stop - start) * i / (count - 1):.12g}") for i in range(count)]
        if isinstance(start, int) and isinstance(stop, int) and all(v.is_integer() for v in values):
            values = [int(v) for v in values]
    else:
        values = [_value(token) for token in text.split(",")]
    if len(set(values)) != len(values):
        raise PartError(f"{text}: a value is repeated; each value must appear once")
    return tuple(values)


def _value(token: str) -> int | float:
    token = token.strip()
    try:
        value: int | float = int(token) if _INTEGER.match(token) else float(token)
    except ValueError:
        raise PartError(f"{token!r} is not a number (values are plain numbers in the part file's units)") from None
    if not math.isfinite(value):
        raise PartError(f"{token!r}: values must be finite numbers")
    return value


def sweep_points(base: dict[str, Any], varies: list[Vary]) -> list[Point]:
    """Every combination of the varied values (the first --vary changes slowest), as part dictionaries."""
    from ..compare.suite import part_digest

    names = [v.key.text for v in varies]
    if len(set(names)) != len(names):
        raise CommandLineError("--vary: a key is given twice; give each key once with all its values")
    if math.prod(len(v.values) for v in varies) > MAX_POINTS:
        raise CommandLineError(f"--vary: the grid has more than {MAX_POINTS} points; split the sweep")
    title = base.get("title", "untitled part")
    points = []
    for combo in itertools.product(*(v.values for v in varies)):
        part = base
        for vary, value in zip(varies, combo):
            part = set_vary(part, vary.key, value)
        inputs = dict(zip(names, combo))
        part["title"] = f"{title} [{', '.join(f'{k} = {v:g}' for k, v in inputs.items())}]"
        points.append(Point(inputs, part, part_digest(part)))
    return points


# --- the log -------------------------------------------------------------------------------------------

def open_log(path: Path):
    """The log opened for appending, starting on a fresh line if a killed run left half a line."""
    handle = open(path, "a+b")
    handle.seek(0, os.SEEK_END)
    if handle.tell() > 0:
        handle.seek(-1, os.SEEK_END)
        if handle.read(1) != b"\n":
            handle.write(b"\n")
    return handle


def append_row(handle, key: str, inputs: dict[str, Any], row: dict[str, Any]) -> None:
    """Append one finished case to the log and push it to the disk before the next one."""
    record = {"key": key, "inputs": inputs, "finished": datetime.now(timezone.utc).isoformat(timespec="seconds"),
              **row}
    try:
        handle.write((json.dumps(record, allow_nan=False) + "\n").encode("utf-8"))
        handle.flush()
        os.fsync(handle.fileno())
    except OSError as exc:  # a full disk: the cases logged so far stay, --resume goes on from them
        raise OutputError(f"--out: cannot append to the sweep log {handle.name} ({exc.strerror or exc})") from None


def finished_rows(path: Path) -> dict[str, dict[str, Any]]:
    """The log's rows by case key (a later row of the same case wins); unreadable lines (half a line left
    by a killed run) are skipped."""
    rows: dict[str, dict[str, Any]] = {}
    if not path.exists():
        return rows
    for line in path.read_bytes().splitlines():
        try:
            record = json.loads(line)
        except (json.JSONDecodeError, UnicodeDecodeError):
            continue
        if isinstance(record, dict) and isinstance(record.get("key"), str) and "status" in record:
            rows[record["key"]] = record
    return rows


# --- tables --------------------------------------------------------------------------------------------

def table_rows(points: list[Point], logged: dict[str, dict[str, Any]]) -> list[dict[str, Any]]:
    """One row per point, in grid order: the inputs, the logged numbers and the FE/handbook difference,
    taken on the Kt of the raiser the handbook case describes (case_kt_net: the part's own Kt unless the
    case names a raiser, as the middle hole of a row of holes)."""
    from .batch import STATUS_INTERNAL, failed_row

    rows = []
    for p in points:
        row = logged.get(p.key) or failed_row(STATUS_INTERNAL, "no result was logged for this case")
        row = {"inputs": p.inputs, **{f: row.get(f) for f in ROW_FIELDS}}
        net, book = row["case_kt_net"], row["handbook_kt_net"]
        row["handbook_difference"] = net / book - 1.0 if net is not None and book else None
        rows.append(row)
    return rows


def write_tables(folder: Path, part_path: str, base: dict[str, Any], varies: list[Vary],
                 rows: list[dict[str, Any]]) -> None:
    """sweep.csv and sweep.json, each written whole or not at all."""
    from .. import __version__
    from ..compare.check import general_cautions
    from .files import write_atomic, write_json

    names = [v.key.text for v in varies]
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([*names, *TABLE_FIELDS])
    for row in rows:
        writer.writerow([*(row["inputs"][n] for n in names),
                         *(_csv(load_cases_text(row.get(f)) if f == "load_cases" else row.get(f)) for f in TABLE_FIELDS)])
    write_atomic(folder / CSV_NAME, buffer.getvalue().encode("utf-8"))
    failed = sum(r["status"] != STATUS_OK for r in rows)
    write_json(folder / JSON_NAME, {
        "schema": SCHEMA,
        "version": __version__,
        "part": str(part_path),
        "title": base.get("title", "untitled part"),
        "part_units": base.get("units", "mm-N-MPa"),
        "units": {"length": "mm", "force": "N", "stress": "MPa", "kt_error": "relative",
                  "case_kt_error": "relative",
                  "handbook_difference": "relative (case_kt_net / handbook Kt net - 1)"},
        "columns": {"kt_net, kt_gross, kt_error, converged": "the part's governing peak (feature: where it is)",
                    "case_raiser, case_kt_net, case_kt_gross, case_kt_error, case_converged":
                        "the raiser the handbook case describes (the middle hole of a row of holes); the "
                        "governing values when the case describes the part's peak or no case covers the part",
                    "load_case, load_cases": "the governing load case's name, and each load case's Kt, band, "
                                             "convergence, peak and where it is (the other columns are the "
                                             "governing case's)"},
        "vary": [{"key": v.key.text, "values": list(v.values)} for v in varies],
        "cases": len(rows),
        "ok": len(rows) - failed,
        "failed": failed,
        "rows": [{"inputs": r["inputs"], **{f: r.get(f) for f in TABLE_FIELDS}} for r in rows],
        "cautions": list(general_cautions(_condition(base))),
    })


def _condition(base: dict[str, Any]) -> str:
    """The base part's plate.condition as written (its default when absent)."""
    plate = base.get("plate")
    return str(plate.get("condition", "plane-stress")) if isinstance(plate, dict) else "plane-stress"


def case_raiser_differs(row: dict[str, Any]) -> bool:
    """True when the row's handbook case describes a raiser other than the one where the part's peak is."""
    return row["status"] == STATUS_OK and row.get("case_raiser") not in (None, row.get("feature"))


def _kt_text(row: dict[str, Any], key: str) -> str:
    return f"{row[key]:.3f}" if row.get(key) is not None else "—"


def _band(row: dict[str, Any], key: str) -> str:
    return f"±{row[key]:.2%}" if row.get(key) is not None else "±?"


def _csv(value: Any) -> Any:
    if value is None:
        return ""
    if isinstance(value, float):
        return f"{value:.6g}" if abs(value) < 1e-3 or abs(value) >= 1e6 else f"{value:.6f}".rstrip("0").rstrip(".")
    return value


def _plot(folder: Path, base: dict[str, Any], varies: list[Vary], rows: list[dict[str, Any]]) -> str:
    from .sweep_plot import plot_sweep

    if not any(r["status"] == STATUS_OK for r in rows):
        return "; no plot: no case finished"
    plot_sweep(folder / f"{PLOT_NAME}.png", folder / f"{PLOT_NAME}.svg", base, varies, rows)
    return f", {folder / PLOT_NAME}.png/.svg"


def print_table(console, varies: list[Vary], rows: list[dict[str, Any]]) -> None:
    """The sweep's table on the terminal: inputs, Kt with band, handbook Kt and the difference, status.

    When a handbook case describes a raiser other than the one where the part's peak is (the middle hole
    of a row of holes), the table shows both: the part's governing Kt and where its peak is, and the Kt
    of the case's raiser, which the handbook difference is taken on."""
    from rich.markup import escape
    from rich.table import Table

    split = any(case_raiser_differs(r) for r in rows)
    several = any(len(r.get("load_cases") or ()) > 1 for r in rows)
    table = Table(box=None, pad_edge=False)
    for v in varies:
        table.add_column(escape(v.key.text), justify="right", no_wrap=True, min_width=len(v.key.text))
    names = (("part Kt net", "band", "Kt gross", "peak at", "case raiser", "its Kt net", "its band")
             if split else ("Kt net", "band", "Kt gross"))
    if several:
        names = ("load case", *names)
    for name in (*names, "handbook Kt net", "its Kt vs handbook" if split else "FE vs handbook", "status"):
        table.add_column(name, justify="left" if name in ("status", "peak at", "case raiser", "load case") else "right")
    for r in rows:
        ok = r["status"] == STATUS_OK
        book = f"{r['handbook_kt_net']:.3f}" if r["handbook_kt_net"] else "—"
        diff = f"{r['handbook_difference']:+.2%}" if r["handbook_difference"] is not None else "—"
        state = ("ok" if r["converged"] else "NOT converged") if ok else f"failed ({r['status']})"
        if ok and case_raiser_differs(r) and not r.get("case_converged"):
            state += f"; {r['case_raiser']} NOT converged"
        cells = [_kt_text(r, "kt_net") if ok else "—", _band(r, "kt_error") if ok else "",
                 _kt_text(r, "kt_gross") if ok else "—"]
        if several:
            cells.insert(0, (r.get("load_case") or "—") if ok else "—")
        if split:
            cells += ([r["feature"] or "—", r["case_raiser"] or "—", _kt_text(r, "case_kt_net"),
                       _band(r, "case_kt_error")] if ok else ["—", "—", "—", ""])
        table.add_row(*(f"{r['inputs'][v.key.text]:g}" for v in varies), *cells,
                      book if ok else "—", diff if ok else "—", state)
    console.print(table)
    if several:
        console.print("Each row gives the governing load case (largest peak, or smallest design margin); sweep.csv "
                      "and sweep.json list every case's Kt under load_cases.", markup=False)
    for r in rows:
        if r["status"] != STATUS_OK:
            inputs = ", ".join(f"{k} = {v:g}" for k, v in r["inputs"].items())
            console.print(f"case {inputs} failed ({r['status']}): {r['error']}", markup=False)
