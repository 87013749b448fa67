"""Regression suites: tables of parts with a reference Kt each, and the built-in suite of handbook cases.

A suite file (TOML) lists cases; each names its part either as a part file (path relative to the suite
file, optionally with values replaced by dotted keys, see geometry/partkeys.py) or as a handbook family
and its parameters (the family's part builder in compare/handbook.py makes the part). Each case carries
the reference Kt, whether it is referred to the net or the gross section, a relative tolerance and the
source of the reference:

    title = "BR-series strap brackets"

    [defaults]                      # optional: any case key except name and reference; a case that
                                    # names its own part or family takes none of part/family/parameters
    part = "br_plate.toml"
    definition = "net"
    tolerance = 0.02
    source = "BR-series sign-off records, rev B"

    [[case]]
    name = "BR-60-14"
    set = { "hole.1.diameter" = 14.0 }
    reference = 2.43

    [[case]]
    name = "central hole d/W 0.3"
    family = "central-hole-tension"
    parameters = { "d/W" = 0.3 }
    reference = 3.36
    definition = "gross"
    tolerance = 0.01
    source = "Howland (1930), as tabulated"

A `set` key may hold `*` for every entry of an array of tables, as a sweep's --vary key does
(`"hole.*.diameter" = 8.0` sets every hole's diameter). A family's parameters are checked before anything
runs: each must be one the family takes, inside the range of the family's published cases, and the part
they make must pass the part-file reader.

A case passes when its check converged and its FE Kt is within the tolerance of the reference.

A part with several load cases ([[load]] entries) is judged on its governing case, or on the load case a
row names with `load_case = "NAME"` (its own converged Kt; kt_of "part" only).

Which FE Kt: `kt_of = "case"` compares the Kt of the raiser the part's handbook case describes (the middle
hole of a row of holes; compare/case_kt.py), `kt_of = "part"` the part's governing Kt (its largest peak).
The two differ only for a case that names a raiser. A row that names a handbook family (and every built-in
row) compares "case" by default, since its reference is that case's value; a row that names a part file
compares "part" by default, since an in-house reference is the part's own peak.

The built-in suite takes every handbook case whose family has a part builder and checks it at
POINT_FRACTIONS of each parameter's validity range. Tolerances follow the handbook's own scatter
(docs/references.md): a tabulated solution (the case's formula text says it comes from a table) 1 %, a
curve fit to charts 3 %; TOLERANCE_OVERRIDES holds any case whose published scatter warrants another band.
Each built-in part asks the FE for an error band equal to its tolerance, kept within BUILTIN_MESH_LIMITS
(so mesh.tolerance 0.01 for a table, 0.02 for a curve fit): fast enough for CI, and the Richardson
estimate is well inside that band in practice (tests/test_central_hole.py).
"""

from __future__ import annotations

import hashlib
import json
import math
import tomllib
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..geometry.errors import PartError, clipped
from ..geometry.partfile import MAX_PART_BYTES, part_from_dict
from ..geometry.partkeys import check_key_known, expand_key, flatten_keys, resolve_key, set_value
from ..geometry.textfile import read_input_text
from . import handbook
from .handbook import Case, handbook_matches

DEFINITIONS = ("net", "gross")
CASE_KEYS = {"name", "part", "set", "family", "parameters", "reference", "definition", "tolerance", "source",
             "kt_of", "load_case"}
KT_OF = ("case", "part")  # the raiser the handbook case describes, or the part's governing peak
TOP_KEYS = {"title", "defaults", "case"}
MAX_SUITE_BYTES = 4_000_000  # longest suite file read (thousands of cases)

POINT_FRACTIONS = (0.2, 0.5, 0.8)  # where the built-in points sit inside each parameter's range
TABLE_TOLERANCE = 0.01  # tabulated solutions (Howland's table): 1 % (docs/references.md)
CURVE_FIT_TOLERANCE = 0.03  # curve fits to handbook charts: 3 % (docs/references.md)
TOLERANCE_OVERRIDES: dict[str, float] = {  # case key -> tolerance, where a case's scatter warrants another
    # in-plane bending fits (compare/bending_cases.py, from memory): this project's FE lies -4.0 ... +3.8 %
    # from them at the checked points (tests/test_bending_handbook.py), as it lies ~3 % from the tension fits
    "opposite-u-notches-bending": 0.05,
    "stepped-bar-fillets-bending": 0.05,
}
BUILTIN_MESH_LIMITS = (0.005, 0.02)  # the built-in cases ask the FE for the case's tolerance, within these


@dataclass(frozen=True)
class SuiteCase:
    """One row of a suite: a part-file dictionary and its reference Kt (on the `definition` section, net or
    gross), the relative tolerance, and the source text. `problem` holds why the row cannot run, if so.
    kt_of: "case" (compare the Kt of the raiser the part's handbook case describes) or "part" (the part's
    governing Kt); see the module text."""

    name: str
    part: dict[str, Any]
    reference: float
    definition: str
    tolerance: float
    source: str
    problem: str | None = None
    kt_of: str = "case"
    load_case: str | None = None  # the part's load case to judge, by name (None: the governing case)


@dataclass(frozen=True)
class Suite:
    title: str
    cases: tuple[SuiteCase, ...]


@dataclass(frozen=True)
class Verdict:
    """A suite case judged: the FE Kt on the case's definition, its relative difference from the
    reference, and whether it passed, with the reason in words. raiser: whose Kt `kt` is (the raiser the
    handbook case describes, or the governing feature); governing_kt / governing_feature: the part's own
    Kt on the same definition and where its peak is (the same as kt / raiser unless the case names a
    raiser that does not govern)."""

    case: SuiteCase
    kt: float | None
    difference: float | None
    converged: bool | None
    passed: bool
    reason: str
    raiser: str | None = None
    governing_kt: float | None = None
    governing_feature: str | None = None


def part_digest(part: Mapping[str, Any]) -> str:
    """A short stable fingerprint of a part-file dictionary (identical parts share it)."""
    text = json.dumps(part, sort_keys=True, separators=(",", ":"), default=str)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()[:20]


def judge(case: SuiteCase, row: Mapping[str, Any]) -> Verdict:
    """Compare a check's row (cli.batch.run_case: status, error, kt_net, kt_gross, kt_error, converged,
    feature and the case_* keys) with the case's reference, on the Kt `case.kt_of` names."""
    if case.problem:
        return Verdict(case, None, None, None, False, case.problem)
    if row.get("status") != "ok":
        return Verdict(case, None, None, None, False, f"the check failed ({row.get('status')}): {row.get('error')}")
    if case.load_case is not None:
        row = _load_case_row(row, case.load_case)
    feature, governing = row.get("feature"), row.get(f"kt_{case.definition}")
    prefix = "case_" if case.kt_of == "case" else ""
    raiser = row.get("case_raiser") if case.kt_of == "case" else feature
    value, band = row.get(f"{prefix}kt_{case.definition}"), row.get(f"{prefix}kt_error")
    whose = "" if raiser == feature else f" of {raiser}, the raiser the handbook case describes"
    seen = {"raiser": raiser, "governing_kt": governing, "governing_feature": feature}
    if value is None:
        return Verdict(case, None, None, None, False, f"the check gave no Kt{whose or ' for the part'}", **seen)
    kt = float(value)
    diff = kt / case.reference - 1.0
    if not row.get(f"{prefix}converged"):
        band_text = f"{band:.2%}" if band is not None else "unknown"
        return Verdict(case, kt, diff, False, False, f"the peak{whose}{',' if whose else ''} did not converge (error band {band_text})",
                       **seen)
    note = f" (Kt{whose}; the part's peak is at {feature}, Kt {governing:.3f})" if whose and governing else ""
    if abs(diff) > case.tolerance:
        return Verdict(case, kt, diff, True, False, f"off by {diff:+.2%}; tolerance ±{case.tolerance:.2%}{note}",
                       **seen)
    return Verdict(case, kt, diff, True, True, f"within ±{case.tolerance:.2%}{note}", **seen)


def _load_case_row(row: Mapping[str, Any], name: str) -> dict[str, Any]:
    """The row with the governing numbers replaced by those of the load case `name` (cli.batch.load_cases)."""
    entry = next((e for e in row.get("load_cases") or () if e.get("name") == name), None)
    if entry is None:
        return {**row, "kt_net": None, "kt_gross": None}
    return {**row, **{k: entry.get(k) for k in ("kt_net", "kt_gross", "kt_error", "converged", "feature")}}


# --- suite files ---------------------------------------------------------------------------------------

def load_suite(path: str | Path) -> Suite:
    """Read and validate a suite file; every mistake raises PartError naming the case and the key."""
    path = Path(path)
    try:
        data = tomllib.loads(read_input_text(path, "suite file", MAX_SUITE_BYTES))
    except tomllib.TOMLDecodeError as exc:
        raise PartError(f"{path}: not valid TOML: {exc}") from None
    _known(data, TOP_KEYS, f"{path}")
    title = data.get("title", path.stem)
    if not isinstance(title, str):
        raise PartError(f"{path}: title: must be a text string")
    defaults = data.get("defaults", {})
    if not isinstance(defaults, dict):
        raise PartError(f"{path}: defaults: must be a table written [defaults]")
    _known(defaults, CASE_KEYS - {"name", "reference"}, f"{path}: [defaults]")
    rows = data.get("case")
    if not isinstance(rows, list) or not rows or not all(isinstance(r, dict) for r in rows):
        raise PartError(f"{path}: case: the suite needs at least one case, each written [[case]]")
    cases, names = [], set()
    for n, row in enumerate(rows, start=1):
        inherited = {k: v for k, v in defaults.items()
                     if not ({"part", "family"} & row.keys() and k in {"part", "family", "parameters"})}
        case = _suite_case({**inherited, **row}, f"{path}: case {n}", path.parent)
        if case.name in names:
            raise PartError(f"{path}: case {n}: name {case.name!r} is used by an earlier case; names must differ")
        names.add(case.name)
        cases.append(case)
    return Suite(title, tuple(cases))


def _suite_case(row: dict[str, Any], where: str, folder: Path) -> SuiteCase:
    name = row.get("name")
    if not isinstance(name, str) or not name.strip():
        raise PartError(f"{where}: name: a non-empty text naming the case is required")
    where = f"{where} ({clipped(name, 60)})"
    _known(row, CASE_KEYS, where)
    if ("part" in row) == ("family" in row):
        raise PartError(f"{where}: give either part (a part file) or family (a handbook family), not "
                        f"{'both' if 'part' in row else 'neither'}")
    part = _row_part(row, where, folder)
    overrides = row.get("set", {})
    if not isinstance(overrides, dict):
        raise PartError(f"{where}: set: must be a table of dotted keys and values, e.g. "
                        "set = { \"hole.1.diameter\" = 14.0 }")
    for text, value in flatten_keys(overrides).items():
        try:
            for each in expand_key(part, text):  # hole.*.diameter: every [[hole]] entry
                key = resolve_key(part, each)
                check_key_known(part, key, value, part_from_dict)
                part = set_value(part, key, value)
        except PartError as exc:
            raise PartError(f"{where}: set: {exc}") from None
    if "family" in row:
        try:
            part_from_dict(part)
        except PartError as exc:
            raise PartError(f"{where}: parameters: the {row['family']} part they make is refused: {exc}") from None
    definition = row.get("definition")
    if definition not in DEFINITIONS:
        raise PartError(f"{where}: definition: {definition!r} is not allowed; use \"net\" or \"gross\" "
                        "(the section the reference Kt is referred to)")
    source = row.get("source")
    if not isinstance(source, str) or not source.strip():
        raise PartError(f"{where}: source: a text naming where the reference comes from is required")
    kt_of = row.get("kt_of", "case" if "family" in row else "part")
    if kt_of not in KT_OF:
        raise PartError(f"{where}: kt_of: {kt_of!r} is not allowed; use \"case\" (the Kt of the raiser the part's "
                        "handbook case describes) or \"part\" (the part's governing Kt)")
    load_case = _load_case(row, part, kt_of, where)
    return SuiteCase(name=name, part=part, reference=_number(row, "reference", where, 0.0, math.inf),
                     definition=definition, tolerance=_number(row, "tolerance", where, 0.0, 1.0), source=source,
                     kt_of=kt_of, load_case=load_case)


def _load_case(row: dict[str, Any], part: dict[str, Any], kt_of: str, where: str) -> str | None:
    """The row's `load_case`: the name of one of the part's load cases (checked against the part)."""
    if "load_case" not in row:
        return None
    name = row["load_case"]
    if kt_of != "part":
        raise PartError(f"{where}: load_case: compares that load case's own Kt; it goes with kt_of = \"part\"")
    names = [c.name for c in part_from_dict(part).load_cases]
    if name not in names:
        raise PartError(f"{where}: load_case: {name!r} names no load case of the part; it has {', '.join(map(repr, names))}")
    return name


def _row_part(row: dict[str, Any], where: str, folder: Path) -> dict[str, Any]:
    if "part" in row:
        name = row["part"]
        if not isinstance(name, str):
            raise PartError(f"{where}: part: must be the path of a part file (relative to the suite file)")
        path = folder / name
        try:
            return tomllib.loads(read_input_text(path, "part file", MAX_PART_BYTES))
        except PartError as exc:
            raise PartError(f"{where}: part: {exc}") from None
        except tomllib.TOMLDecodeError as exc:
            raise PartError(f"{where}: part: {path}: cannot be read as TOML ({exc})") from None
    family = row["family"]
    if family not in handbook.BUILDERS:
        raise PartError(f"{where}: family: {family!r} has no part builder; known families: "
                        f"{', '.join(sorted(handbook.BUILDERS))}")
    params = row.get("parameters")
    if not isinstance(params, dict) or not params or not all(
            isinstance(v, (int, float)) and not isinstance(v, bool) for v in params.values()):
        raise PartError(f"{where}: parameters: a table of the family's numbers is required, e.g. "
                        "parameters = { \"d/W\" = 0.3 }")
    check_family_parameters(family, params, f"{where}: parameters")
    try:
        return handbook.BUILDERS[family]({k: float(v) for k, v in params.items()})
    except KeyError as exc:
        raise PartError(f"{where}: parameters: {exc.args[0]} is missing; the {family} family takes "
                        f"{', '.join(family_ranges(family))}") from None
    except Exception as exc:  # the builder's own refusal (an impossible combination)
        raise PartError(f"{where}: parameters: the {family} builder cannot make this part "
                        f"({type(exc).__name__}: {exc})") from None


def family_ranges(family: str) -> dict[str, tuple[float, float]]:
    """Each parameter of a handbook family and the widest range its published cases cover."""
    ranges: dict[str, tuple[float, float]] = {}
    for case in handbook.CASES:
        if case.family == family:
            for name, (lo, hi) in case.ranges.items():
                low, high = ranges.get(name, (lo, hi))
                ranges[name] = (min(low, lo), max(high, hi))
    return ranges


def check_family_parameters(family: str, params: Mapping[str, float], where: str) -> None:
    """Refuse, before anything runs, a parameter the family does not take or a value outside the range of
    every published case of the family (naming the parameter and the range)."""
    ranges = family_ranges(family)
    for name, value in params.items():
        if name not in ranges:
            raise PartError(f"{where}: {clipped(name, 60)!r} is not a parameter of the {family} family; it takes "
                            f"{', '.join(ranges)}")
        lo, hi = ranges[name]
        if not lo <= value <= hi:
            raise PartError(f"{where}: {name} = {value:g} is outside the range of the {family} family's published "
                            f"cases, {lo:g} <= {name} <= {hi:g}")


def _number(row: dict[str, Any], key: str, where: str, low: float, high: float) -> float:
    value = row.get(key)
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) \
            or not low < value < high:
        span = f"greater than {low:g}" if math.isinf(high) else f"between {low:g} and {high:g}"
        raise PartError(f"{where}: {key}: a number {span} is required; got {value!r}")
    return float(value)


def _known(t: dict[str, Any], allowed: set[str], where: str) -> None:
    for key in t:
        if key not in allowed:
            raise PartError(f"{where}: {clipped(str(key), 60)}: unknown key; allowed here: {', '.join(sorted(allowed))}")


# --- the built-in suite --------------------------------------------------------------------------------

def case_tolerance(case: Case) -> float:
    """The relative tolerance a handbook case earns: an override, else 1 % for a table, 3 % for a fit."""
    if case.key in TOLERANCE_OVERRIDES:
        return TOLERANCE_OVERRIDES[case.key]
    return TABLE_TOLERANCE if "table" in case.formula.lower() else CURVE_FIT_TOLERANCE


def builtin_points(case: Case, fractions: tuple[float, ...] = POINT_FRACTIONS) -> list[dict[str, float]]:
    """Parameter sets inside the case's validity range: every parameter at the same fraction of its range,
    or of the sub-range the case says the FE was checked over (`Case.checked`) when it gives one (an open
    end is taken as twice the closed one, or one above it when that is zero)."""
    points = []
    for f in fractions:
        params = {}
        for name, (lo, hi) in (getattr(case, "checked", None) or case.ranges).items():
            if not math.isfinite(hi):
                hi = 2.0 * lo if lo > 0 else lo + 1.0
            if not math.isfinite(lo):
                lo = 0.5 * hi if hi > 0 else hi - 1.0
            params[name] = float(f"{lo + f * (hi - lo):.6g}")
        points.append(params)
    return points


def builtin_suite(fractions: tuple[float, ...] = POINT_FRACTIONS) -> Suite:
    """Every handbook case whose family has a part builder, at `fractions` of its range, referred to the
    case's own nominal section. The reference is the case's Kt at the parameters the part is recognised
    with; a builder whose part is refused or not recognised as the case gives a failing row."""
    cases = []
    for case in handbook.CASES:  # read at call time: every family with a builder is picked up
        build = handbook.BUILDERS.get(case.family)
        if build is None:
            continue
        tolerance = case_tolerance(case)
        mesh = min(BUILTIN_MESH_LIMITS[1], max(BUILTIN_MESH_LIMITS[0], tolerance))
        for params in builtin_points(case, fractions):
            label = ", ".join(f"{k} = {v:g}" for k, v in params.items())
            part, reference, problem = _builtin_part(case, build, params, mesh)
            cases.append(SuiteCase(f"{case.key} at {label}", part, reference, case.nominal, tolerance,
                                   case.source, problem))
    return Suite("built-in handbook suite", tuple(cases))


def _builtin_part(case: Case, build, params: dict[str, float], mesh_tolerance: float
                  ) -> tuple[dict[str, Any], float, str | None]:
    try:
        part = dict(build(dict(params)))
    except Exception as exc:  # another family's builder: report, do not stop the suite
        return {}, math.nan, f"the {case.family} builder failed at these parameters ({type(exc).__name__}: {exc})"
    part["mesh"] = {**part.get("mesh", {}), "tolerance": mesh_tolerance}
    try:
        spec = part_from_dict(part)
    except PartError as exc:
        return part, math.nan, f"the {case.family} builder made a part the reader refuses: {exc}"
    match = next((m for m in handbook_matches(spec) if m.case.key == case.key), None)
    if match is None:
        return part, math.nan, f"the {case.family} builder's part is not recognised as {case.key}"
    if not match.in_range:
        return part, math.nan, f"the {case.family} builder's part lies outside the range of {case.key}"
    return part, match.kt_net if case.nominal == "net" else match.kt_gross, None
