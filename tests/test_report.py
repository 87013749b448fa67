"""The review report: HTML with embedded figures (opened in headless Chromium), PNG/SVG figures, the VTU
fields, the JSON record against its schema, and the terminal summary's layout."""

from __future__ import annotations

import base64
import contextlib
import html
import io
import json
import os
import re
import shutil
import subprocess
import xml.etree.ElementTree as ET

import numpy as np
import pytest

from stressraiser.cli.citation import short_source
from stressraiser.cli.main import main

from conftest import EXAMPLES

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
CHROMIUM_FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
                  "--disable-component-update", "--disable-sync", "--no-first-run", "--hide-scrollbars"]


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    """One check of the bundled example through the command line with --report and --json, at 80 columns."""
    folder = tmp_path_factory.mktemp("report")
    out = io.StringIO()
    columns = os.environ.get("COLUMNS")
    os.environ["COLUMNS"] = "80"
    try:
        with contextlib.redirect_stdout(out):
            code = main(["check", str(EXAMPLES / "winch_strap.toml"), "--report", str(folder / "review"),
                         "--json", str(folder / "record.json")])
    finally:
        if columns is None:
            os.environ.pop("COLUMNS", None)
        else:
            os.environ["COLUMNS"] = columns
    assert code == 0
    return folder / "review", json.loads((folder / "record.json").read_text()), out.getvalue()


def _png_size(data: bytes) -> tuple[int, int]:
    assert data[:8] == PNG_SIGNATURE
    return int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")


def test_report_folder_holds_every_output(report):
    folder, record, _ = report
    names = {p.stem for p in (folder / "figures").glob("*.png")}
    # the sections a reviewer expects for a part with a handbook case (no [design] table in this example)
    assert {"outline", "mesh", "stress_map", "section_1", "convergence", "handbook"} <= names
    for name in names:
        width, height = _png_size((folder / "figures" / f"{name}.png").read_bytes())
        assert width >= 600 and height >= 250
    # figures of lines and text come as SVG too; the mesh and the stress map are pictures of a dense mesh
    assert {p.stem for p in (folder / "figures").glob("*.svg")} == names - {"mesh", "stress_map"}
    for name in names - {"mesh", "stress_map"}:
        root = ET.parse(folder / "figures" / f"{name}.svg").getroot()
        assert root.tag.endswith("svg")
    assert (folder / "part.vtu").stat().st_size > 0
    assert json.loads((folder / "check.json").read_text())["kt"] == record["kt"]
    assert not list(folder.rglob("*.part"))  # no temporary files left behind


def test_html_is_self_contained_and_embeds_every_figure(report):
    folder, record, _ = report
    page = (folder / "report.html").read_text(encoding="utf-8")
    embedded = re.findall(r'<img src="data:image/png;base64,([A-Za-z0-9+/=]+)"', page)
    files = sorted((folder / "figures").glob("*.png"))
    assert len(embedded) == len(files)
    assert {base64.b64decode(e) for e in embedded} == {f.read_bytes() for f in files}
    # nothing is fetched from the network: no remote sources, stylesheets or scripts
    assert not re.search(r'(src|href)="(https?:)?//', page)
    assert "<script" not in page and "@import" not in page
    for heading in ("Verdict", "The part and what it carries", "How the part was meshed", "Where the stress gathers",
                    "Across the critical section", "Does the peak settle?", "Against published values",
                    "Read this before relying on the numbers"):
        assert f"<h2>{html.escape(heading)}" in page
    for caution in record["cautions"]:
        assert html.escape(caution) in page


def _chromium() -> str | None:
    return shutil.which("chromium") or shutil.which("chromium-browser")


PROBE = """<script>
window.addEventListener("load", () => {
  const rows = Array.from(document.images).map(i => [i.closest("figure") ? i.closest("figure").id : "",
                                                     i.complete, i.naturalWidth, i.naturalHeight]);
  const pre = document.createElement("pre");
  pre.id = "image-probe";
  pre.textContent = JSON.stringify(rows);
  document.body.appendChild(pre);
});
</script>
"""


def test_report_opens_in_headless_chromium(report, tmp_path):
    browser = _chromium()
    if browser is None:
        pytest.skip("chromium is not installed (Debian package 'chromium'; .ci/run installs it)")
    folder, _, _ = report
    page = (folder / "report.html").read_text(encoding="utf-8")
    probe = folder / "probe.html"  # a copy with a script that lists every image as the browser decoded it
    probe.write_text(page.replace("</body>", PROBE + "</body>"), encoding="utf-8")
    common = [browser, *CHROMIUM_FLAGS, f"--user-data-dir={tmp_path / 'profile'}"]
    dom = subprocess.run([*common, "--virtual-time-budget=10000", "--dump-dom", probe.as_uri()],
                         capture_output=True, text=True, timeout=180, check=True).stdout
    found = re.search(r'<pre id="image-probe">(.*?)</pre>', dom, re.DOTALL)
    assert found, "the probe script did not run"
    images = json.loads(html.unescape(found.group(1)))
    files = {p.stem: _png_size(p.read_bytes()) for p in (folder / "figures").glob("*.png")}
    assert len(images) == len(files)
    for figure_id, complete, width, height in images:
        # decoded, at the size the PNG file says: no broken image
        assert complete and (width, height) == files[figure_id.removeprefix("fig-")], figure_id
    shot = tmp_path / "report.png"
    subprocess.run([*common, "--window-size=1200,2400", f"--screenshot={shot}", (folder / "report.html").as_uri()],
                   capture_output=True, timeout=180, check=True)
    assert _png_size(shot.read_bytes()) == (1200, 2400)


def test_vtu_reads_back_with_its_fields(report):
    import meshio

    folder, record, _ = report
    grid = meshio.read(folder / "part.vtu")
    finest = record["mesh"]["levels"][-1]
    n, m = finest["nodes"], finest["elements"]
    assert grid.points.shape == (n, 3) and np.all(grid.points[:, 2] == 0.0)
    assert grid.cells_dict["triangle"].shape == (m, 3)
    assert grid.point_data["displacement"].shape == (n, 3)
    for name in ("stress_xx", "stress_yy", "stress_xy", "principal_max", "principal_min", "von_mises"):
        assert grid.point_data[name].shape == (n,), name
    for name in ("element_stress_xx", "element_stress_yy", "element_stress_xy", "element_principal_max",
                 "element_von_mises"):
        assert grid.cell_data[name][0].shape == (m,), name
    s1 = grid.point_data["principal_max"]
    assert s1.max() == pytest.approx(record["peak"]["fe_stress"], rel=1e-12)
    top = int(np.argmax(s1))
    assert grid.points[top, :2] == pytest.approx(record["peak"]["location"], abs=1e-9)
    # At the hole edge on the section across the load the edge is traction free with its normal along y:
    # the stress there is uniaxial, s_xx = s1, s_yy = t_xy = 0 (equilibrium of a free edge; common practice).
    assert grid.point_data["stress_xx"][top] == pytest.approx(s1[top], rel=1e-3)
    assert abs(grid.point_data["stress_yy"][top]) < 0.02 * s1[top]
    assert grid.point_data["von_mises"][top] == pytest.approx(s1[top], rel=0.02)
    # the held end (x = -length/2) does not move along the load
    held = np.isclose(grid.points[:, 0], -0.5 * record["part"]["length"])
    assert held.sum() >= 2 and np.all(grid.point_data["displacement"][held, 0] == 0.0)


def test_schema_rejects_a_broken_record(report):
    import jsonschema

    from stressraiser.cli.schema import check_schema

    _, record, _ = report
    validator = jsonschema.Draft202012Validator(check_schema())
    validator.validate(record)
    missing = json.loads(json.dumps(record))
    del missing["kt"]["net"]
    wrong = json.loads(json.dumps(record))
    wrong["peak"]["stress"] = "494 MPa"
    other = json.loads(json.dumps(record))
    other["schema"] = "stressraiser.check/0"
    for broken in (missing, wrong, other):
        assert not validator.is_valid(broken)


def test_summary_puts_the_verdict_first_and_fits_80_columns(report):
    _, _, printed = report
    lines = printed.rstrip("\n").splitlines()
    assert lines[1].startswith("Kt(net)")
    assert max(len(line.rstrip()) for line in lines[:-1]) <= 80  # the last line names the folder: any length
    assert any(line.startswith("Net-section average") for line in lines)
    assert lines[-1].startswith("report: ") and lines[-1].rstrip().endswith("review)")


def test_report_into_a_file_is_refused(tmp_path, capsys):
    blocker = tmp_path / "taken"
    blocker.write_text("not a folder")
    assert main(["check", str(EXAMPLES / "winch_strap.toml"), "--report", str(blocker)]) == 2
    err = capsys.readouterr().err
    assert "--report" in err and len(err.strip().splitlines()) == 1


def test_progress_shows_on_a_terminal_only():
    from rich.console import Console

    from stressraiser.cli.progress import LevelProgress
    from stressraiser.fem.convergence import Level

    level = Level(scale=1.0, nodes=100, elements=180, peak=321.5, location=(0.0, 1.0), seconds={})
    shown = io.StringIO()
    with LevelProgress(Console(file=shown, force_terminal=True, width=100), delay=0.0) as progress:
        import time

        time.sleep(0.3)
        progress(level)
        progress.stage("writing the report")
        time.sleep(0.3)
    assert "level 1 done" in shown.getvalue() or "writing the report" in shown.getvalue()
    hidden = io.StringIO()
    with LevelProgress(Console(file=hidden, force_terminal=False), delay=0.0) as progress:
        progress(level)
    assert hidden.getvalue() == ""


def test_short_citations():
    assert short_source("W. D. Pilkey and D. F. Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (2008), "
                        "chart 4.1, curve fit") == "Pilkey 2008, chart 4.1"
    assert short_source("R. C. J. Howland, On the stresses in the neighbourhood of a circular hole in a strip "
                        "under tension, Phil. Trans. R. Soc. A 229 (1930); tabulated d/W = 0 ... 0.5") == "Howland 1930"
    long = "an unpublished table kept in the drawing office without author or year of any kind"
    assert short_source(long) == long[:39].rstrip() + "…"


def test_locations_show_no_negative_zero(report):
    # the example's peak is on the axis x = 0 (a node at x = -1e-16 or so): "(0.00, -11.00)", never "-0.00"
    folder, record, printed = report
    page = html.unescape((folder / "report.html").read_text(encoding="utf-8"))
    x, y = (round(c, 2) + 0.0 for c in record["peak"]["location"])  # + 0.0: a rounded zero has no sign
    assert abs(x) < 0.005
    assert f"hole 1 at ({x:.2f}, {y:.2f}) mm" in page and f"hole 1 at ({x:.2f}, {y:.2f}) mm" in printed
    for text in (page, printed):
        assert re.search(r"-0\.0+(?!\d)", text) is None
