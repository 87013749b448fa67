"""`stressraiser sweep`: the Kt curve of the central-hole plate against Peterson's chart, the tables and the
plot, a failed case in its row, and an interrupted sweep finished by --resume."""

from __future__ import annotations

import csv
import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

import stressraiser
from stressraiser.cli.main import main

PLATE = """title = "sweep test plate"
[plate]
length = 600.0
width = 100.0
thickness = 10.0
[[hole]]
center = [0.0, 0.0]
diameter = 20.0
[material]
E = 210000.0
nu = 0.3
[load]
axial = 100000.0
[mesh]
tolerance = {tolerance}
"""


def peterson_chart_4_1(x: float) -> float:
    """Ktn of a central hole in a finite-width plate, x = d/W: W. D. Pilkey and D. F. Pilkey, Peterson's
    Stress Concentration Factors, 3rd ed. (2008), chart 4.1 curve fit (from memory; docs/references.md [Howland], [Peterson])."""
    return 2 + 0.284 * (1 - x) - 0.600 * (1 - x) ** 2 + 1.32 * (1 - x) ** 3


def write_plate(folder: Path, tolerance: float) -> Path:
    path = folder / "plate.toml"
    path.write_text(PLATE.format(tolerance=tolerance))
    return path


def test_central_hole_sweep_follows_peterson_chart(tmp_path, capsys):
    part = write_plate(tmp_path, 0.01)
    out = tmp_path / "curve"
    assert main(["sweep", str(part), "--vary", "hole.1.diameter=10:60:6", "--out", str(out), "--workers", "2"]) == 0
    with open(out / "sweep.csv", newline="") as handle:
        rows = list(csv.DictReader(handle))
    table = json.loads((out / "sweep.json").read_text())
    assert [float(r["hole.1.diameter"]) for r in rows] == [10, 20, 30, 40, 50, 60]
    assert [r["inputs"]["hole.1.diameter"] for r in table["rows"]] == [10, 20, 30, 40, 50, 60]
    for row, record in zip(rows, table["rows"]):
        x = float(row["hole.1.diameter"]) / 100.0
        assert row["status"] == "ok" and row["converged"] == "True"
        # Peterson's chart 4.1 fit (Pilkey & Pilkey, 3rd ed., 2008; from memory), tolerance 2 % (issue 7)
        assert float(row["kt_net"]) == pytest.approx(peterson_chart_4_1(x), rel=0.02)
        # the table's handbook column is the same published fit, and gross = net / (1 - d/W)
        assert record["handbook_case"] == "central-hole-tension-peterson"
        assert record["handbook_kt_net"] == pytest.approx(peterson_chart_4_1(x), rel=1e-12)
        assert record["kt_gross"] == pytest.approx(record["kt_net"] / (1 - x), rel=1e-9)
        assert record["handbook_difference"] == pytest.approx(record["kt_net"] / record["handbook_kt_net"] - 1)
    # the plot exists in both formats and draws the FE points and the handbook curve
    assert (out / "kt.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    svg = (out / "kt.svg").read_text()
    assert "FE, converged Kt net" in svg and "handbook: central-hole-tension-peterson" in svg
    printed = capsys.readouterr().out
    assert "6 cases: 6 ok, 0 failed" in printed


def test_failed_case_is_reported_in_its_row_and_the_rest_go_on(tmp_path, capsys):
    part = write_plate(tmp_path, 0.02)
    out = tmp_path / "mixed"
    # a 120 mm hole does not fit in the 100 mm plate: the reader refuses that case only
    assert main(["sweep", str(part), "--vary", "hole.1.diameter=120,30", "--out", str(out), "--workers", "1"]) == 1
    table = json.loads((out / "sweep.json").read_text())
    bad, good = table["rows"]
    assert bad["status"] == "input" and "hole 1" in bad["error"] and bad["kt_net"] is None
    assert good["status"] == "ok" and good["kt_net"] == pytest.approx(peterson_chart_4_1(0.3), rel=0.03)
    assert table["failed"] == 1 and table["ok"] == 1
    printed = capsys.readouterr().out
    assert "case hole.1.diameter = 120 failed (input)" in printed


def test_existing_log_needs_resume(tmp_path, capsys):
    part = write_plate(tmp_path, 0.02)
    out = tmp_path / "s"
    out.mkdir()
    (out / "rows.jsonl").write_text("")
    assert main(["sweep", str(part), "--vary", "hole.1.diameter=20,30", "--out", str(out)]) == 2
    assert "pass --resume" in capsys.readouterr().err


def _package_path() -> str:
    """The folder holding the stressraiser package being tested (for a child interpreter)."""
    return str(Path(stressraiser.__file__).parent.parent)


def _logged(data: bytes) -> list[dict]:
    """The complete rows of a sweep log (a kill may leave half a line, which the sweep skips too)."""
    rows = []
    for line in data.splitlines():
        try:
            rows.append(json.loads(line))
        except json.JSONDecodeError:
            continue
    return rows


def test_killed_sweep_resumes_without_redoing_finished_rows(tmp_path, capsys):
    part = write_plate(tmp_path, 0.02)
    out = tmp_path / "killed"
    log = out / "rows.jsonl"
    argv = ["sweep", str(part), "--vary", "hole.1.diameter=15:45:4", "--out", str(out)]
    env = {**os.environ, "PYTHONPATH": os.pathsep.join(filter(None, [_package_path(), os.environ.get("PYTHONPATH")]))}
    child = subprocess.Popen([sys.executable, "-m", "stressraiser", *argv, "--workers", "1"], env=env,
                             stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, start_new_session=True)
    try:
        deadline = time.monotonic() + 120
        while time.monotonic() < deadline and child.poll() is None:
            if log.exists() and log.read_bytes().count(b"\n") >= 1:
                break
            time.sleep(0.02)
    finally:
        os.killpg(child.pid, signal.SIGKILL)  # the sweep and its workers, as a killed job
        child.wait()
    before = log.read_bytes()
    finished = _logged(before)
    assert 1 <= len(finished) < 4, "the sweep was to be killed part-way"
    assert not (out / "sweep.csv").exists()  # tables are written only when the sweep is complete

    assert main([*argv, "--resume", "--workers", "1"]) == 0
    assert f"resuming: {len(finished)} of 4 cases already finished" in capsys.readouterr().err
    after = log.read_bytes()
    assert after.startswith(before)  # finished rows are kept as they were ...
    keys = [row["key"] for row in _logged(after)]
    assert len(keys) == 4 and len(set(keys)) == 4  # ... and none was run again
    with open(out / "sweep.csv", newline="") as handle:
        rows = list(csv.DictReader(handle))
    assert [float(r["hole.1.diameter"]) for r in rows] == [15, 25, 35, 45]
    assert all(r["status"] == "ok" for r in rows)


def test_log_survives_half_a_line(tmp_path):
    from stressraiser.cli.batch import failed_row
    from stressraiser.cli.sweep import append_row, finished_rows, open_log

    log = tmp_path / "rows.jsonl"
    log.write_bytes(b'{"key": "a", "status": "ok", "inputs": {}}\n{"key": "b", "sta')  # killed mid-write
    assert set(finished_rows(log)) == {"a"}
    with open_log(log) as handle:
        append_row(handle, "c", {"plate.width": 80}, failed_row("input", "plate.width: too small"))
    rows = finished_rows(log)
    assert set(rows) == {"a", "c"} and rows["c"]["inputs"] == {"plate.width": 80}
    assert log.read_bytes().endswith(b"\n")
