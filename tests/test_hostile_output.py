"""Outputs around the pipeline: every output path is checked before any work and written only onto a
regular file or a new path; a write that still fails at the end loses no result; a report folder is
replaced whole; a standard output that cannot be written is an output error.

No test here writes to a real device: a named pipe (FIFO) the test makes stands for any special file.
"""

from __future__ import annotations

import errno
import io
import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from stressraiser.cli import files
from stressraiser.cli.main import main
from stressraiser.compare import check as check_module

from conftest import EXAMPLES, REPO, STRAP_TEXT
from process_tree import start_command, stop_tree, wait_until

STRAP = EXAMPLES / "winch_strap.toml"
QUICK = "[mesh]\ntolerance = 0.05\n"  # three levels: the report is what these tests look at


@pytest.fixture
def no_computing(monkeypatch):
    """Fail the test if a check starts: the command must refuse before it."""
    def refuse(*args, **kwargs):
        raise AssertionError("the check ran before the output was refused")
    monkeypatch.setattr(check_module, "check_part", refuse)


def _one_error_line(capsys) -> str:
    captured = capsys.readouterr()
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1, captured.err
    return lines[0]


def test_fifo_as_json_is_refused_before_computing(tmp_path, capsys, no_computing):
    fifo = tmp_path / "record.json"
    os.mkfifo(fifo)
    link = tmp_path / "link.json"
    link.symlink_to(fifo)
    for target in (fifo, link):
        assert main(["check", str(STRAP), "--json", str(target), "--quiet"]) == 2
        assert _one_error_line(capsys) == (f"stressraiser: --json {target}: is a named pipe (FIFO); an output is "
                                           "written only onto a regular file or a new path")
    assert fifo.is_fifo()  # not replaced by a regular file


def test_special_file_is_never_replaced_at_the_write_either(tmp_path):
    # the last line of defence, at the rename: a target that became a FIFO while the run computed
    fifo = tmp_path / "out.json"
    os.mkfifo(fifo)
    with pytest.raises(files.OutputError, match="is a named pipe"):
        files.write_json(fifo, {"a": 1})
    assert fifo.is_fifo()
    assert [p.name for p in tmp_path.iterdir()] == ["out.json"]  # no temporary file left


def test_empty_output_paths_are_refused(tmp_path, capsys, no_computing):
    # `--json ""` was silently ignored: the user asked for a record and got none
    for option in ("--json", "--report"):
        assert main(["check", str(STRAP), option, "", "--quiet"]) == 2
        assert _one_error_line(capsys) == f"stressraiser: {option}: an empty path was given; name the output or " \
                                          "leave the option out"


def test_output_under_a_file_is_refused_before_computing(tmp_path, capsys, no_computing):
    plain = tmp_path / "notes.txt"
    plain.write_text("not a folder")
    assert main(["check", str(STRAP), "--json", str(plain / "r.json"), "--quiet"]) == 2
    assert _one_error_line(capsys) == (f"stressraiser: --json {plain / 'r.json'}: {plain} is not a folder; the output "
                                       "cannot be made under it")


def test_output_onto_the_part_file_is_refused(tmp_path, capsys, no_computing):
    part = tmp_path / "part.toml"
    part.write_text(STRAP_TEXT)
    assert main(["check", str(part), "--json", str(part), "--quiet"]) == 2
    assert "is the command's input file" in _one_error_line(capsys)
    assert part.read_text() == STRAP_TEXT


def test_report_folder_with_other_files_is_refused(tmp_path, capsys, no_computing):
    # a report replaces its folder whole: a folder holding anything else (here the user's notes) is refused
    folder = tmp_path / "review"
    folder.mkdir()
    (folder / "notes.txt").write_text("mine")
    assert main(["check", str(STRAP), "--report", str(folder), "--quiet"]) == 2
    assert _one_error_line(capsys) == (f"stressraiser: --report {folder}: the folder holds 'notes.txt', which is not "
                                       "part of a report; the report replaces its folder whole: give a new folder, "
                                       "an empty one or an earlier report's")
    assert (folder / "notes.txt").read_text() == "mine"


def test_sweep_and_regress_outputs_are_checked_before_any_case(tmp_path, capsys, monkeypatch):
    from stressraiser.cli import batch

    def refuse(*args, **kwargs):
        raise AssertionError("cases ran before the output was refused")
    monkeypatch.setattr(batch, "run_batch", refuse)
    out = tmp_path / "sweep"
    out.mkdir()
    os.mkfifo(out / "sweep.csv")
    assert main(["sweep", str(STRAP), "--vary", "hole.1.diameter=10,12", "--out", str(out)]) == 2
    assert _one_error_line(capsys) == (f"stressraiser: --out {out}: sweep.csv: is a named pipe (FIFO); an output is "
                                       "written only onto a regular file or a new path")
    fifo = tmp_path / "verdicts.json"
    os.mkfifo(fifo)
    assert main(["regress", str(EXAMPLES / "suites" / "br_series.toml"), "--json", str(fifo)]) == 2
    assert "is a named pipe (FIFO)" in _one_error_line(capsys)


def test_a_write_that_fails_at_the_end_still_shows_the_results(tmp_path, capsys, monkeypatch):
    # The target is taken away while the check computes (a folder appears at its path): the write fails at
    # the end. The summary is printed all the same, then one error line, and the exit code says so (2).
    target = tmp_path / "record.json"
    real = check_module.check_part

    def check_then_block(spec, progress=None):
        result = real(spec, progress)
        target.mkdir()
        return result
    monkeypatch.setattr(check_module, "check_part", check_then_block)
    assert main(["check", str(STRAP), "--json", str(target)]) == 2
    captured = capsys.readouterr()
    assert captured.out.startswith("Winch strap with a 22 mm shackle hole\nKt(net) 2.39")
    assert "Cautions" in captured.out
    assert captured.err.strip().splitlines() == [
        f"stressraiser: {target}: is a folder; an output is written only onto a regular file or a new path"]


def _report(part: Path, folder: Path) -> None:
    assert main(["check", str(part), "--report", str(folder), "--quiet"]) == 0


def _listing(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def _two_parts(folder: Path) -> tuple[Path, Path]:
    """Two strap part files in `folder`: the first with a requested cut (its report has the figure
    figures/cut_1.*), the second without."""
    first = folder / "first.toml"
    first.write_text('title = "first part"\n' + STRAP_TEXT + "[[section]]\nx = -60.0\n" + QUICK)
    second = folder / "second.toml"
    second.write_text('title = "second part"\n' + STRAP_TEXT + QUICK)
    return first, second


def _modified_since(path, started: float) -> bool:
    """Whether `path` was written at or after `started`; a file that vanished meanwhile (the command's
    short-lived write probe) was not."""
    try:
        return path.stat().st_mtime >= started
    except FileNotFoundError:
        return False


def test_report_folder_is_replaced_whole(tmp_path):
    # A run killed (SIGKILL: no clean-up) while it writes a new report over an earlier one must leave the
    # earlier report exactly as it was (or the new one whole): never a mix of two parts' figures. And a
    # complete re-run must leave no figure of the earlier part (here its cut figure, figures/cut_1.*).
    first, second = _two_parts(tmp_path)
    folder = tmp_path / "review"
    _report(first, folder)
    assert (folder / "figures" / "cut_1.png").exists()
    before = _listing(folder)
    started = time.time()
    process = start_command(["check", str(second), "--report", str(folder), "--quiet"])
    try:
        def writing() -> bool:  # a fresh folder beside it with a figure in it, or any file of the folder touched
            fresh = [p for p in tmp_path.iterdir() if p.name.startswith(".review.")]
            touched = [p for p in folder.rglob("*") if _modified_since(p, started)] if folder.exists() else []
            return bool(fresh and list(fresh[0].rglob("*.png")) or touched)
        assert wait_until(lambda: process.poll() is not None or writing(), 120.0, step=0.002)
        process.send_signal(signal.SIGKILL)
        process.wait(timeout=30)
    finally:
        stop_tree(process)
    after = _listing(folder)
    title = json.loads(after["check.json"])["title"]
    if title == "first part":
        assert after == before
    else:  # the kill came after the swap: the new report, whole
        assert title == "second part" and not any(name.startswith("figures/cut_") for name in after)
    _report(second, folder)
    assert json.loads((folder / "check.json").read_text())["title"] == "second part"
    assert not list((folder / "figures").glob("cut_*"))
    # nothing beside it but what the kill may leave: the hidden fresh folder it was writing into
    assert sorted(p.name for p in tmp_path.iterdir() if not p.name.startswith(".review.")) == \
        ["first.toml", "review", "second.toml"]


class _FullStream(io.StringIO):
    """A standard output on a full disk."""

    def write(self, text):
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

    def flush(self):
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))


def test_full_standard_output_is_an_output_error(monkeypatch, capsys):
    # `check > /dev/full` was reported as "internal error, please report it" (exit 4)
    monkeypatch.setattr(sys, "stdout", _FullStream())
    assert main(["check", str(STRAP), "--quiet"]) == 2
    assert _one_error_line(capsys) == "stressraiser: standard output: cannot be written (No space left on device)"


def test_closed_pipe_on_standard_output_is_an_output_error(tmp_path):
    # the reader of the pipe has gone (`check ... | head -c0`): one line, exit 2, no traceback
    read_end, write_end = os.pipe()
    os.close(read_end)
    try:
        done = subprocess.run([sys.executable, "-m", "stressraiser", "cases"], stdout=write_end,
                              stderr=subprocess.PIPE, text=True, cwd=REPO, timeout=120)
    finally:
        os.close(write_end)
    assert done.returncode == 2
    assert done.stderr.strip().splitlines() == ["stressraiser: standard output: cannot be written (Broken pipe)"]


@pytest.mark.parametrize("one_step", [True, False], ids=["exchange", "two renames"])
def test_atomic_folder(tmp_path, monkeypatch, one_step):
    # the report folder's swap, with Linux's one-step exchange and with the two renames used elsewhere
    if not one_step:
        import ctypes

        def no_c_library(*args, **kwargs):
            raise OSError("no C library here")
        monkeypatch.setattr(ctypes, "CDLL", no_c_library)
    target = tmp_path / "out"
    with files.atomic_folder(target) as fresh:
        (fresh / "a.txt").write_text("first")
    assert _listing(target) == {"a.txt": b"first"}
    with files.atomic_folder(target) as fresh:
        (fresh / "b.txt").write_text("second")
    assert _listing(target) == {"b.txt": b"second"}  # nothing of the first is left
    with pytest.raises(KeyboardInterrupt):
        with files.atomic_folder(target) as fresh:
            (fresh / "c.txt").write_text("half")
            raise KeyboardInterrupt
    assert _listing(target) == {"b.txt": b"second"}
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]  # no hidden folder left either


def test_the_report_folder_check_leaves_nothing_in_the_folder(tmp_path, monkeypatch):
    # The report replaces its folder whole from a fresh folder beside it, so the writability probe goes
    # beside it too: a run killed during the check (test_report_folder_is_replaced_whole once caught one)
    # left the probe file inside an earlier report.
    from stressraiser.cli import files
    from stressraiser.cli.check import report_folder

    folder = tmp_path / "review"
    folder.mkdir()
    (folder / "check.json").write_text("{}")
    probed = []
    real = files.tempfile.mkstemp

    def spy(*args, **kwargs):
        probed.append(Path(kwargs["dir"]))
        return real(*args, **kwargs)

    monkeypatch.setattr(files.tempfile, "mkstemp", spy)
    report_folder(str(folder))
    assert probed == [tmp_path]
    assert sorted(p.name for p in folder.iterdir()) == ["check.json"]
