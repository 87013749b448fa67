"""The review report, the warnings and printed locations in the part file's unit system; the Kt rows name
their nominal stress.

Sources of the expected values:
- Unit factors: NIST SP 811 (2008), appendix B: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N (exact), so
  1 psi = 1 lbf/in² and 1 ksi = 1000 psi.
- The results themselves come from the JSON record of the same run (mm, N, MPa): the report is checked
  against it after converting back with the NIST factors, within 0.1 % (the display rounding is far below).
- Hand checks on the example's dimensions (examples/dock_lift_strap_inch.toml: a 10 x 2 x 0.25 in strap
  with a 0.5 in hole, 4000 lbf) are worked beside their assertions.
"""

from __future__ import annotations

import contextlib
import html
import io
import json
import math
import re
from dataclasses import replace
from types import SimpleNamespace

import pytest

import stressraiser.cli.report as report_module
import stressraiser.compare.check as check_module
from matplotlib.text import Text
from stressraiser.cli import plots
from stressraiser.cli.display_units import point_text, shown, shown_point, unsigned_zero, warning_text
from stressraiser.cli.loads_summary import nominal_rows
from stressraiser.cli.main import main
from stressraiser.cli.summary import kt_rows
from stressraiser.compare.check import KtResult
from stressraiser.compare.nominal import Nominal, NominalSet
from stressraiser.compare.notices import Amount, notice
from stressraiser.geometry.units import format_number, format_point

from conftest import EXAMPLES

INCH, LBF = 25.4, 4.4482216152605  # NIST SP 811, exact
PSI = LBF / INCH**2  # MPa per psi (psi = lbf/in², NIST SP 811)
KSI = 1000 * PSI
REL = 1e-3  # within 0.1 %
NUMBER = r"(−?-?\d+(?:\.\d+)?)"
METRIC = r"MPa|\bmm\b|mm²|\bkN\b|\d N\b|N·"


def _value(text: str) -> float:
    return float(text.replace("−", "-"))


def _one(pattern: str, text: str) -> tuple[float, ...]:
    found = re.findall(pattern, text, flags=re.MULTILINE)
    assert len(found) == 1, f"{pattern!r} found {len(found)} times"
    return tuple(_value(v) for v in (found[0] if isinstance(found[0], tuple) else (found[0],)))


@pytest.fixture(scope="module")
def inch_report(tmp_path_factory):
    """The inch example checked with a requested cut, --report and --json, with two guards made to fire on a
    wrong peak (turned compressive and moved to the held end's top corner) and every cut made to earn the
    statics warning: warnings that name a stress, a point, a length and a cut."""
    folder = tmp_path_factory.mktemp("inch_report")
    real = check_module.result_warnings

    def faulty(spec, study, solution, peak, section, kt):
        corner = (-0.5 * spec.plate.length, 0.5 * spec.plate.width)
        return real(spec, study, solution, replace(peak, stress=-peak.stress, location=corner), section, kt)

    printed = io.StringIO()
    results = []
    write_report = report_module.write_report

    def kept(result, *args, **kwargs):  # the result the report is written from, to draw its figures again
        results.append(result)
        return write_report(result, *args, **kwargs)

    with pytest.MonkeyPatch.context() as patch, contextlib.redirect_stdout(printed):
        patch.setattr(report_module, "write_report", kept)
        patch.setattr(check_module, "result_warnings", faulty)
        patch.setattr(check_module, "EQUILIBRIUM_WARNING", 0.0)
        patch.setenv("COLUMNS", "200")  # no wrapped warnings
        code = main(["check", str(EXAMPLES / "dock_lift_strap_inch.toml"), "--section", "x=1.5",
                     "--report", str(folder / "review"), "--json", str(folder / "record.json")])
    assert code == 0
    review = folder / "review"
    page = html.unescape((review / "report.html").read_text(encoding="utf-8"))
    svg = {p.stem: "\n".join(re.findall(r"<!-- (.*?) -->", p.read_text(encoding="utf-8")))
           for p in (review / "figures").glob("*.svg")}  # the text of each figure (matplotlib's comments)
    # the mesh and the stress map have no SVG (pictures of a dense mesh): their words from the figures drawn
    for name, build in (("mesh", plots.mesh_figure), ("stress_map", plots.stress_map_figure)):
        svg[name] = "\n".join(t.get_text() for t in build(results[0]).findobj(Text) if t.get_visible())
    return json.loads((folder / "record.json").read_text()), page, svg, printed.getvalue()


def test_report_tables_are_in_the_part_files_units(inch_report) -> None:
    r, page, _, _ = inch_report
    ns = r["net_section"]
    peak, = _one(rf'Peak \(max principal, extrapolated, converged\)</td><td class="num">{NUMBER} psi', page)
    assert peak * PSI == pytest.approx(r["peak"]["stress"], rel=REL)
    fe, = _one(rf"finest mesh {NUMBER} psi</td>", page)
    assert fe * PSI == pytest.approx(r["peak"]["fe_stress"], rel=REL)
    x, y = _one(rf"hole 1 at \({NUMBER}, {NUMBER}\) in; finest", page)
    assert (x * INCH, y * INCH) == (pytest.approx(r["peak"]["location"][0], abs=REL * INCH),
                                    pytest.approx(r["peak"]["location"][1], rel=REL))
    average, area = _one(rf'Net-section average</td><td class="num">{NUMBER} psi</td><td>force / net area '
                         rf"{NUMBER} in²", page)
    assert average * PSI == pytest.approx(ns["average"], rel=REL)
    # hand check: net area (2 - 0.5) x 0.25 = 0.375 in², 4000 lbf / 0.375 in² = 10667 psi
    assert (area, average) == (pytest.approx(0.375, rel=REL), pytest.approx(4000 / 0.375, rel=REL))
    gross, = _one(rf"nominal N / \(W t\) = {NUMBER} psi", page)
    assert gross == pytest.approx(4000 / (2.0 * 0.25), rel=REL)  # hand check: 4000 lbf / (2 in x 0.25 in)
    force, = _one(rf"FE force {NUMBER} lbf", page)
    assert force * LBF == pytest.approx(ns["fe_force"], rel=REL)
    # the part as given in the file, in inches
    assert "10 × 2 in, thickness 0.25 in" in page
    assert "<td>hole 1</td><td>Ø0.5 in, centre (0, 0) in</td>" in page
    # the critical section's table and the mesh levels
    cells = (rf'<td class="num">{NUMBER} in</td><td class="num">{NUMBER} in²</td>'
             + 2 * rf'<td class="num">{NUMBER} psi</td>')
    width, net_area, sec_average, sec_peak = _one(cells, page)
    assert (width, net_area) == (pytest.approx(1.5, rel=REL), pytest.approx(0.375, rel=REL))
    assert (sec_average * PSI, sec_peak * PSI) == (pytest.approx(ns["average"], rel=REL),
                                                   pytest.approx(r["peak"]["stress"], rel=REL))
    assert "<th>peak (psi)</th>" in page and "<th>edge size (in)</th>" in page
    for level in r["mesh"]["levels"]:
        value, = _one(rf'<td class="num">{level["elements"]:,}</td><td class="num">[\d,]+</td>'
                      rf'<td class="num">{NUMBER}</td>', page)
        assert value * PSI == pytest.approx(level["peak"], rel=REL)
    # the design check's own numbers
    allowable, = _one(rf'<td>allowable \(psi\)</td><td class="num">{NUMBER}</td>', page)
    assert allowable * PSI == pytest.approx(r["design"]["allowable"]["governing"], rel=REL)


def test_report_says_the_fields_and_record_stay_in_mm(inch_report) -> None:
    _, page, _, _ = inch_report
    assert "part.vtu and check.json are in mm, N, MPa" in page
    # apart from the sentences that say so, and the part file quoted as it is, no metric unit is shown
    text = re.sub(r"<pre>.*?</pre>", "", page, flags=re.DOTALL)
    for said in ("part.vtu and check.json are in mm, N, MPa", "(in mm and MPa whatever the part file's units)",
                 "numbers in mm, N, MPa"):
        assert said in text
        text = text.replace(said, "")
    text = re.sub(r"<style>.*?</style>", "", text, flags=re.DOTALL)
    text = re.sub(r"<img [^>]*>", "", text)
    assert re.search(METRIC, text) is None, re.search(METRIC, text)


def test_figures_are_in_the_part_files_units(inch_report) -> None:
    r, _, svg, _ = inch_report
    assert {"outline", "mesh", "stress_map", "section_1", "cut_1", "convergence", "design", "fatigue"} <= set(svg)
    for name, text in svg.items():
        assert re.search(METRIC, text) is None, (name, re.search(METRIC, text))
    axes = {
        "outline": ("x (in)", "y (in)"),
        "mesh": ("x (in)", "y (in)"),
        "stress_map": ("x (in)", "y (in)", "max principal (psi)", "von Mises (psi)"),
        "section_1": ("position across the section, y (in)", "normal stress on the section (psi)"),
        "cut_1": ("position across the section, y (in)", "traction on the cut (psi)"),
        "convergence": ("element size at the hole 1 edge (in)", "peak max principal stress, hole 1 (psi)"),
        "design": ("stress (psi)",),
        "fatigue": ("mean stress σm (psi)", "alternating stress σa (psi)"),
    }
    for name, labels in axes.items():
        for label in labels:
            assert label in svg[name].splitlines(), (name, label)
    # ticks at round inches across the 2 in wide section (y from -1 to 1 in)
    assert {"−1.00", "−0.50", "0.00", "0.50", "1.00"} <= set(svg["section_1"].splitlines())
    # the numbers written on the figures agree with the record
    peak, x, y = _one(rf"peak {NUMBER} psi at \({NUMBER}, {NUMBER}\) in \(hole 1\)", svg["stress_map"])
    assert peak * PSI == pytest.approx(r["peak"]["stress"], rel=REL)
    assert (x, y * INCH) == (0.0, pytest.approx(r["peak"]["location"][1], rel=REL))
    side, = _one(rf"^peak {NUMBER}$", svg["section_1"])
    assert side * PSI == pytest.approx(r["peak"]["stress"], rel=REL)
    extrapolated, = _one(rf"extrapolated \(Richardson\): {NUMBER} psi", svg["convergence"])
    assert extrapolated * PSI == pytest.approx(r["peak"]["stress"], rel=REL)
    # the outline's dimensions are the part file's: 10 x 2 in, hole 0.5 in at the centre
    for dimension in ("10 in", "2 in", "hole 1: Ø0.5 in, centre (0, 0) in", "P = 4000 lbf tension",
                      "thickness 0.25 in · origin at the plate centre"):
        assert dimension in svg["outline"], dimension


def test_warnings_follow_the_part_files_units(inch_report) -> None:
    r, page, _, printed = inch_report
    lines = [line.strip() for line in printed.splitlines() if line.startswith("warning:")]
    assert lines and all(re.search(METRIC, line) is None for line in lines), lines
    text = "\n".join(lines)
    stress, = _one(rf"governing peak is {NUMBER} psi, of the opposite sign", text)
    assert stress * PSI == pytest.approx(-r["peak"]["stress"], rel=REL)
    # the held end's top corner of the 10 x 2 in strap, (-5, 1) in; from the 0.5 in hole's edge it is
    # sqrt(5² + 1²) - 0.25 = 4.849 in (hand check)
    x, y, gap = _one(rf"the peak at \({NUMBER}, {NUMBER}\) in is {NUMBER} in from the nearest raiser \(hole 1\)", text)
    assert (x, y) == (-5.0, 1.0) and gap == pytest.approx(math.hypot(5.0, 1.0) - 0.25, abs=0.005)
    assert "section x = 1.5 in: the FE resultants differ from statics" in text
    # the report shows the same words
    for line in lines:
        assert f'<p class="warn">{line.removeprefix("warning:").strip()}</p>' in page
    # the JSON record keeps them in mm and MPa, each number labelled
    record = "\n".join(r["warnings"])
    mpa, = _one(rf"governing peak is {NUMBER} MPa", record)
    assert mpa == pytest.approx(-r["peak"]["stress"], rel=REL)
    assert "the peak at (-127, 25.4) mm is 123 mm from the nearest raiser (hole 1)" in record  # 4.849 in = 123.2 mm
    assert "section x = 38.1: the FE resultants differ" in record


def test_a_warning_is_written_in_any_system() -> None:
    w = notice("peak ", Amount(-179.2, "stress"), " at ", Amount((12.7, -1e-15), "point"), ", ",
               Amount(6.35, "length", 3), " from ", Amount((38.1, 0.0), "cut", label="x = 38.1"))
    assert str(w) == "peak -179.2 MPa at (12.7, 0) mm, 6.35 mm from x = 38.1"
    # NIST SP 811: 179.2 MPa = 25.99 ksi, 12.7 mm = 0.5 in, 6.35 mm = 0.25 in
    assert warning_text(w, "in-kip-ksi") == "peak -25.99 ksi at (0.5, 0) in, 0.25 in from x = 1.5 in"
    assert warning_text("a plain warning", "in-lbf-psi") == "a plain warning"


def test_negative_zero_is_shown_as_zero() -> None:
    # a node on the axis y = 0 often has y = -1e-15 after meshing; its location is (12.50, 0.00), never -0.00
    assert shown_point((12.5, -1e-15), "mm-N-MPa") == "(12.50, 0.00)"
    assert point_text((12.7, -1e-12), "in-lbf-psi") == "(0.500, 0.000) in"
    assert shown(-0.004, "length", "mm-N-MPa", ".2f") == "0.00"
    assert shown(-0.006, "length", "mm-N-MPa", ".2f") == "-0.01"
    assert shown(-1e-9, "length", "mm-N-MPa", "g") == "-1e-09"  # not zero: the sign stays
    assert unsigned_zero("-0") == "0" and unsigned_zero("-0.0%") == "0.0%" and unsigned_zero("-inf") == "-inf"
    assert format_number(-0.0) == "0"
    assert format_point((12.5, -1e-13)) == "(12.5, 0) mm" and format_point((-0.0, 0.0)) == "(0, 0) mm"
    # one place for both coordinates, 3 figures of the larger (1.00 in): -0.001 in rounds to 0, -0.01 in stays
    assert format_point((25.4, -0.0254), "in-lbf-psi", 3) == "(1, 0) in"
    assert format_point((25.4, -0.254), "in-lbf-psi", 3) == "(1, -0.01) in"


def _fake_result(units: str, nominals: tuple[Nominal, ...], net: int = 0, gross: int = 1):
    return SimpleNamespace(kt=KtResult(2.1, 2.8, 0.005, True), gross_average=nominals[gross].stress,
                           nominal=NominalSet(nominals[net], nominals[gross], nominals),
                           spec=SimpleNamespace(units=units), gross=None,
                           net_section=SimpleNamespace(kind="across the load"))


def test_kt_rows_name_their_nominal() -> None:
    # invented stresses; 100 MPa = 14.50 ksi, 75 MPa = 10.88 ksi, 140 MPa = 20.31 ksi (NIST SP 811)
    pin = (Nominal("pin-net", "pin load, net section", "P / A_net", 100.0, 2.1),
           Nominal("pin-gross", "pin load, gross section", "P / (W t)", 75.0, 2.8),
           Nominal("bearing", "pin bearing", "P / (d t)", 140.0, 1.5))
    result = _fake_result("in-kip-ksi", pin)
    assert kt_rows(result) == [("Kt on net section", "2.100 ± 0.50%", "nominal P / A_net = 14.50 ksi"),
                               ("Kt on gross section", "2.800", "nominal P / (W t) = 10.88 ksi")]
    rows = nominal_rows(result)
    assert rows[0][0] == "Other nominals" and rows[1] == ("  pin bearing", "20.31 ksi", "Kt 1.500; P / (d t)")
    assert "bearing stress" in rows[2][2] and len(rows) == 3
    # one nominal for both Kt (a remote stress state): one row, named by it
    remote = (Nominal("remote", "remote stress", "largest remote principal stress in magnitude", 100.0, 2.1),
              Nominal("axial-net", "axial, net section", "N / A_net", 120.0, 1.75))
    result = _fake_result("mm-N-MPa", remote, net=0, gross=0)
    assert kt_rows(result) == [("Kt on remote stress", "2.100 ± 0.50%",
                                "nominal largest remote principal stress in magnitude = 100.0 MPa")]
    assert [row[0] for row in nominal_rows(result)] == ["Other nominals", "  axial, net section"]
    for label, value, note in kt_rows(_fake_result("in-lbf-psi", pin)):
        assert len(label) <= 24 and len(value) <= 17 and len(note) <= 37  # the key table's columns at 80


def test_material_values_are_the_sources_own_numbers(inch_report) -> None:
    # the example's 6061-T6: ASTM B209 minimum yield 35 ksi and tensile 42 ksi, ASM Handbook vol. 2 fatigue
    # strength 14 ksi and E = 68.9 GPa (from memory, the table row's source); 35 ksi is 35000 psi exactly
    r, page, _, printed = inch_report
    material = r["part"]["material"]
    assert material["stated"]["yield"] == {"value": 35.0, "unit": "ksi"}
    assert material["stated"]["E"] == {"value": 68.9, "unit": "GPa"}
    assert material["yield"] == pytest.approx(35.0 * KSI, rel=1e-12)  # converted once, exactly
    assert "yield 35000 psi, ultimate 42000 psi, fatigue strength 14000 psi at 5e+08 cycles" in page
    E, = _one(rf"E {NUMBER} psi \(68\.9 GPa as stated\)", page)  # an SI value in a psi part: both shown
    assert E * PSI == pytest.approx(68_900.0, rel=REL)
    assert "(yield 35000 psi / 1.5)" in printed  # the design statements of the summary
    assert not re.search(r"3480\d psi|3499\d psi", printed + page)  # no round trip through a rounded MPa value


def test_material_in_another_unit_system_names_the_sources_number() -> None:
    from stressraiser.cli.report import material_text
    from stressraiser.geometry.partfile import part_from_dict

    from conftest import strap

    # ASTM A36: Fy 36 ksi, Fu 58 ksi, E 29 000 ksi (AISC 360-16), from memory as in the table's row; in a
    # millimetre part each is converted (NIST SP 811: 36 ksi = 248.2 MPa) and the source's number follows
    spec = part_from_dict(strap(material={"grade": "a36", "ultimate": 420.0}))
    text = material_text(spec.material, spec.units)
    assert "yield 248.2 MPa (36 ksi as stated)" in text
    assert "E 199948 MPa (29000 ksi as stated)" in text
    assert "ultimate 420 MPa," not in text and text.endswith("ultimate 420 MPa")  # set in the file: no source
    # an EN grade in a millimetre part is its own number, nothing added
    spec = part_from_dict(strap(material={"grade": "s275"}))
    assert material_text(spec.material, spec.units) == "E 210000 MPa, ν 0.3, yield 275 MPa, ultimate 410 MPa"
