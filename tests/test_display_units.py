"""The terminal summary prints every dimensional number in the part file's unit system; JSON stays in mm-N-MPa.

Sources of the expected values:
- Unit factors: NIST SP 811 (2008), appendix B: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N (exact), so
  1 psi = 1 lbf/in² and 1 ksi = 1000 psi, 1 kip = 1000 lbf.
- The numbers themselves come from the JSON record of the same run (mm, N, MPa): the summary is checked
  against it after converting back with the NIST factors, within 0.1 % (issue 5: "each report is in its own
  units"; the display rounding is far below that).
"""

from __future__ import annotations

import contextlib
import io
import json
import re

import pytest

from stressraiser.cli.display_units import cut_label, quantity_text, shown
from stressraiser.cli.main import main

from conftest import EXAMPLES

INCH, LBF = 25.4, 4.4482216152605  # NIST SP 811, exact
PSI = LBF / INCH**2  # MPa per psi (psi = lbf/in², NIST SP 811)
REL = 1e-3  # issue 5 acceptance: within 0.1 %
NUMBER = r"(-?\d+(?:\.\d+)?)"


def _run(args: list[str], json_path) -> tuple[dict, str]:
    """(JSON record, printed summary) of `stressraiser check ARGS --json json_path`, printed 200 wide."""
    printed = io.StringIO()
    with pytest.MonkeyPatch.context() as patch, contextlib.redirect_stdout(printed):
        patch.setenv("COLUMNS", "200")  # no wrapped rows: each row's numbers stay on one line
        assert main(["check", *args, "--json", str(json_path)]) == 0
    return json.loads(json_path.read_text()), printed.getvalue()


@pytest.fixture(scope="module")
def inch_run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("inch")
    return _run([str(EXAMPLES / "dock_lift_strap_inch.toml"), "--section", "x=1.5"], folder / "inch.json")


@pytest.fixture(scope="module")
def mm_run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("mm")
    return _run([str(EXAMPLES / "winch_strap.toml"), "--section", "x=40"], folder / "mm.json")


def _one(pattern: str, text: str) -> tuple[float, ...]:
    found = re.findall(pattern, text, flags=re.MULTILINE)
    assert len(found) == 1, f"{pattern!r} found {len(found)} times"
    return tuple(float(v) for v in (found[0] if isinstance(found[0], tuple) else (found[0],)))


def test_inch_summary_has_only_inch_units(inch_run) -> None:
    record, printed = inch_run
    assert record["display_units"] == "in-lbf-psi"
    for label in (" psi", " in", " lbf", " in²", "lbf·in", "peak psi"):
        assert label in printed, label
    # no metric unit anywhere in the terminal text. N alone is also the symbol of the normal force (the
    # formula "N / A_net", the column "N lbf"), so a newton is looked for only after a number
    for metric in (r"MPa", r"\bmm\b", r"mm²", r"\bkN\b", r"\d N\b", r"N·"):
        assert re.search(metric, printed) is None, metric


def test_inch_summary_numbers_match_the_record(inch_run) -> None:
    r, text = inch_run
    mpa = lambda psi: psi * PSI  # noqa: E731 - psi shown -> MPa in the record
    mm = lambda inch: inch * INCH  # noqa: E731
    # the verdict line and the peak rows
    assert mpa(_one(rf"— peak {NUMBER} psi \(max principal, extrapolated\) at", text)[0]) == pytest.approx(r["peak"]["stress"], rel=REL)
    (peak,) = _one(rf"^Peak \(max principal\)\s+{NUMBER} psi", text)
    assert mpa(peak) == pytest.approx(r["peak"]["stress"], rel=REL)
    (fe,) = _one(rf"on the finest mesh\s+{NUMBER} psi", text)
    assert mpa(fe) == pytest.approx(r["peak"]["fe_stress"], rel=REL)
    x, y = _one(rf"hole 1 at \({NUMBER}, {NUMBER}\) in", text)
    assert mm(x) == pytest.approx(r["peak"]["location"][0], abs=REL * INCH)  # at x = 0: within 0.001 in
    assert mm(y) == pytest.approx(r["peak"]["location"][1], rel=REL)
    # von Mises / Tresca
    vm, tr = _one(rf"von Mises / Tresca\s+{NUMBER} / {NUMBER} psi", text)
    assert mpa(vm) == pytest.approx(r["stresses"]["von_mises"]["value"], rel=REL)
    assert mpa(tr) == pytest.approx(r["stresses"]["tresca"]["value"], rel=REL)
    # the net section: average, area, where
    average, area, where = _one(rf"Net-section average\s+{NUMBER} psi\s+N / {NUMBER} in² at x = {NUMBER} in", text)
    ns = r["net_section"]
    assert mpa(average) == pytest.approx(ns["average"], rel=REL)
    assert area * INCH**2 == pytest.approx(ns["area"], rel=REL)
    assert mm(where) == pytest.approx(ns["x"], abs=REL * INCH)
    # hand check (NIST SP 811): (2 - 0.5) x 0.25 = 0.375 in², 4000 lbf / 0.375 in² = 10667 psi
    assert (area, average) == (pytest.approx(0.375, rel=REL), pytest.approx(4000 / 0.375, rel=REL))
    # the Kt rows, each naming the nominal stress it uses and its value
    kt_net, band, net = _one(rf"^Kt on net section\s+{NUMBER} ± {NUMBER}%\s+nominal N / A_net = {NUMBER} psi\s*$",
                             text)
    kt_gross, gross = _one(rf"^Kt on gross section\s+{NUMBER}\s+nominal N / \(W t\) = {NUMBER} psi\s*$", text)
    assert (kt_net, kt_gross) == (pytest.approx(r["kt"]["net"], abs=5e-4), pytest.approx(r["kt"]["gross"], abs=5e-4))
    assert band / 100 == pytest.approx(r["kt"]["error"], abs=5e-5)
    assert mpa(net) == pytest.approx(ns["average"], rel=REL)
    assert mpa(gross) == pytest.approx(r["gross_average"], rel=REL)
    assert gross == pytest.approx(4000 / (2.0 * 0.25), rel=REL)  # hand check: 4000 lbf / (2 in x 0.25 in) = 8000 psi
    assert not re.search(r"^Other nominals", text, flags=re.MULTILINE)  # an axial load has no other nominal
    # equilibrium forces
    fe_force, statics = _one(rf"FE {NUMBER} lbf vs statics {NUMBER} lbf", text)
    assert fe_force * LBF == pytest.approx(ns["fe_force"], rel=REL)
    assert statics * LBF == pytest.approx(ns["applied_force"], rel=REL)
    # the section cut: label, resultant and stresses
    cut = r["sections"][0]
    n, avg, peak_cut = _one(rf"^x = 1\.5 in\s+{NUMBER}\s+-?\d+(?:\.\d+)?\s+-?\d+\s+{NUMBER}\s+-?\d+\s+{NUMBER}", text)
    assert n * LBF == pytest.approx(cut["fe"]["normal_force"], rel=REL)
    assert mpa(avg) == pytest.approx(cut["average_normal_stress"], rel=REL)
    assert mpa(peak_cut) == pytest.approx(cut["peak_normal_stress"]["value"], rel=REL)
    # the mesh levels' peak column
    for i, level in enumerate(r["mesh"]["levels"], start=1):
        (value,) = _one(rf"^\s+{i}\s+{level['nodes']}\s+{level['elements']}\s+{NUMBER}\s", text)
        assert mpa(value) == pytest.approx(level["peak"], rel=REL)


def test_json_record_stays_in_mm(inch_run) -> None:
    r = inch_run[0]
    # the record is in mm, N, MPa whatever the part file's units: 0.375 in² = 241.935 mm² (NIST SP 811)
    assert r["net_section"]["area"] == pytest.approx(0.375 * INCH**2, rel=1e-9)
    assert r["sections"][0]["label"] == "x = 38.1"  # the cut at 1.5 in, labelled in mm in the record


def test_mm_summary_is_unchanged(mm_run) -> None:
    r, text = mm_run
    assert r["display_units"] == "mm-N-MPa"
    # "in" is also a word ("converged in 4 mesh levels"): an inch is looked for only after a number or point
    for imperial in (r"psi", r"lbf", r"in²", r"[\d)] in\b", r"ksi", r"kip"):
        assert re.search(imperial, text) is None, imperial
    ns, peak = r["net_section"], r["peak"]
    # the same text as before units were applied to the summary (fixed formats in MPa, mm, N)
    assert f"— peak {peak['stress']:.1f} MPa (max principal, extrapolated) at" in text
    x, y = (round(c, 2) + 0.0 for c in peak["location"])  # + 0.0: a coordinate that rounds to zero has no sign
    assert f"hole 1 at ({x:.2f}, {y:.2f}) mm" in text
    assert abs(peak["location"][0]) < 0.005  # the peak is on the axis x = 0 ...
    assert re.search(r"-0\.0+(?!\d)", text) is None  # ... and no number anywhere is shown as -0.00
    assert re.search(rf"Net-section average\s+{ns['average']:.1f} MPa\s+N / {ns['area']:.1f} mm² at x = "
                     rf"{ns['x']:g} mm", text)
    assert f"FE {ns['fe_force']:.1f} N vs statics {ns['applied_force']:.1f} N" in text
    assert re.search(rf"^Kt on gross section\s+{r['kt']['gross']:.3f}\s+nominal N / \(W t\) = "
                     rf"{r['gross_average']:.1f} MPa", text, flags=re.MULTILINE)
    cut = r["sections"][0]
    assert re.search(r"^cut\s+N kN\s+V kN\s+M kN·m\s+avg σ MPa\s+avg τ MPa\s+peak σ MPa", text, flags=re.MULTILINE)
    assert re.search(rf"^x = 40\s+{cut['fe']['normal_force'] / 1e3:.3f}\s", text, flags=re.MULTILINE)
    assert re.search(r"level\s+nodes\s+elements\s+peak MPa\s+time s", text)
    assert f"{r['mesh']['levels'][0]['peak']:.2f}" in text


def test_shown_keeps_the_resolution() -> None:
    # NIST SP 811: 1 ksi = 1000 lbf / in² = 6.894757 MPa; 1 in = 25.4 mm; 1 kip = 4448.2216 N
    ksi = 1000 * PSI
    assert quantity_text(179.2149, "stress", "in-kip-ksi") == f"{179.2149 / ksi:.2f} ksi"  # 0.01 ksi ~ 0.07 MPa
    assert quantity_text(179.2149, "stress", "in-lbf-psi") == f"{179.2149 / PSI:.0f} psi"
    assert quantity_text(6.35, "length", "in-lbf-psi", ".2f") == "0.250 in"
    assert quantity_text(241.935, "area", "in-lbf-psi") == "0.3750 in²"
    assert quantity_text(1000 * LBF, "force", "in-kip-ksi") == "1.00000 kip"
    assert quantity_text(17798.4, "force", "in-lbf-psi", ".3f", resultant=True) == "4001.2 lbf"
    # in mm-N-MPa the text is the format spec applied to the value, unchanged (but a zero has no sign)
    for value, spec in ((179.2149, ".1f"), (-0.0123, ".2f"), (38.1, "g"), (1234567.0, ".4f")):
        assert shown(value, "stress", "mm-N-MPa", spec) == format(value, spec)
    assert shown(-0.000123, "stress", "mm-N-MPa", ".2f") == "0.00"
    assert quantity_text(17798.4, "force", "mm-N-MPa", ".3f", resultant=True) == "17.798 kN"


def test_cut_labels() -> None:
    # unnamed cuts are restated in the file's units; names the user gave are kept
    assert cut_label("x = 38.1", (38.1, 0.0), "in-lbf-psi") == "x = 1.5 in"
    assert cut_label("through (0, -12.7) and (0, 12.7)", (0.0, -12.7), "in-kip-ksi") == \
        "through (0, -0.5) and (0, 0.5) in"
    assert cut_label("x = 1.5", (38.1, 0.0), "in-lbf-psi") == "x = 1.5"  # a name, not the mm label
    assert cut_label("x = 40", (40.0, 0.0), "mm-N-MPa") == "x = 40"


def test_signoff_statements_wrap_to_80_columns(tmp_path) -> None:
    # The sign-off's statements are sentences: at 80 columns (COLUMNS=80, a terminal's common width) each is
    # wrapped at words with its continuation lines indented, so no line but the verdict line runs past 80.
    printed = io.StringIO()
    with pytest.MonkeyPatch.context() as patch, contextlib.redirect_stdout(printed):
        patch.setenv("COLUMNS", "80")
        assert main(["check", str(EXAMPLES / "dock_lift_strap_inch.toml"), "--json", str(tmp_path / "r.json")]) == 0
    lines = printed.getvalue().splitlines()
    start = next(i for i, line in enumerate(lines) if line.startswith("Sign-off"))
    signoff = [line.rstrip() for line in lines[start:]]
    assert len(signoff) > 20 and max(len(line) for line in signoff) <= 80
    # a wrapped statement continues under its first word, not at the margin
    assert any(line.startswith("   ") and not line.startswith("    ") for line in signoff)
