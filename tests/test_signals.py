"""Ctrl-C and SIGTERM stop any command within two seconds at any stage, leaving no child process and no
partial output; a killed sweep leaves no worker behind; a mesher that crashes is an error of the check.

Each test starts the command line as a real process (tests/process_tree.py), in its own process group as a
shell job is, and sends it real signals: SIGINT to the whole group as a terminal's Ctrl-C does, SIGTERM or
SIGKILL to the command's process as `kill` does. Fault injection (a mesher made slow, a solve made long)
goes into the process as a few lines run before the command.
"""

from __future__ import annotations

import os
import signal
import time

import pytest

from conftest import EXAMPLES, STRAP_TEXT
from process_tree import alive, descendants, start_command, stop_tree, wait_until

STOP_WITHIN = 2.0  # s from the signal to the end of the command (and of everything it started)

# gmsh made to mesh the strap with elements of 0.04 mm: tens of millions of triangles, minutes inside gmsh's
# compiled mesher, which does not return to Python (the element budget is estimated with the usual sizes,
# so the check goes ahead)
SLOW_MESHER = """
from stressraiser.geometry import meshing
meshing.mesh_part.__defaults__ = (1.0, meshing.Sizing(far_fraction=0.0005, growth=0.005, edge_fraction=0.01))
"""

# the solve replaced by one long call into compiled code (LAPACK, a few seconds on one thread) that does not
# return to Python until it is done, as a sparse factorisation of a big mesh does
LONG_SOLVE = """
import numpy as np
from stressraiser.fem import analysis
def long_solve(*args, **kwargs):
    matrix = np.random.default_rng(0).random((2000, 2000))
    print("SOLVING", file=sys.stderr, flush=True)
    np.linalg.eigvals(matrix)
    raise SystemExit("the solve was not interrupted")
analysis.solve_system = long_solve
"""


def _strap(tmp_path):
    part = tmp_path / "strap.toml"
    part.write_text('title = "signal test strap"\n' + STRAP_TEXT)
    return part


def _stop_and_time(process, pgid_signal=None, pid_signal=None) -> tuple[float, set[int]]:
    """Send the signal (to the group, as Ctrl-C; or to the command's process, as `kill`), and return the
    seconds until the command and every process it had started had ended (at most a few seconds more than
    STOP_WITHIN), and those still running then."""
    started = descendants(process.pid)
    sent = time.monotonic()
    if pgid_signal is not None:
        os.killpg(process.pid, pgid_signal)
    else:
        os.kill(process.pid, pid_signal)
    wait_until(lambda: process.poll() is not None and not alive(started), STOP_WITHIN + 3.0, step=0.01)
    return time.monotonic() - sent, alive(started)


def _wait_for_child(process, timeout=60.0) -> set[int]:
    """The command's child processes once it has one (the mesher), or an empty set after `timeout`."""
    return wait_until(lambda: process.poll() is None and descendants(process.pid), timeout)


@pytest.mark.parametrize("sent, code", [(signal.SIGINT, 130), (signal.SIGTERM, 143)], ids=["ctrl-c", "sigterm"])
def test_signal_stops_the_mesher_at_once(tmp_path, sent, code):
    # Before meshing moved into a child process, gmsh held Ctrl-C for as long as it meshed (600 s were seen on
    # a long plate): the handler only runs when the compiled mesher returns.
    process = start_command(["check", str(_strap(tmp_path))], prelude=SLOW_MESHER)
    try:
        assert _wait_for_child(process), "the check never started its mesher"
        time.sleep(1.0)  # well inside gmsh's mesher by now
        assert process.poll() is None
        if sent == signal.SIGINT:
            took, left = _stop_and_time(process, pgid_signal=sent)
        else:
            took, left = _stop_and_time(process, pid_signal=sent)
        assert process.returncode == code, process.stderr.read()
        assert took < STOP_WITHIN, f"took {took:.2f} s"
        assert not left, f"processes left running: {left}"
        assert process.stderr.read().strip().splitlines() == ["stressraiser: interrupted"]
        assert process.stdout.read() == ""
    finally:
        stop_tree(process)


def test_ctrl_c_stops_a_long_solve(tmp_path):
    # a signal handler cannot run while the main thread is inside one long compiled call; the watcher thread
    # (cli/interrupts.py) ends the process after its grace time instead
    process = start_command(["check", str(_strap(tmp_path))], prelude=LONG_SOLVE)
    try:
        assert wait_until(lambda: process.poll() is not None or "SOLVING" in process.stderr.readline(), 60.0)
        time.sleep(0.3)
        took, left = _stop_and_time(process, pgid_signal=signal.SIGINT)
        assert process.returncode == 130, process.stderr.read()
        assert took < STOP_WITHIN, f"took {took:.2f} s"
        assert not left
        assert process.stderr.read().strip() == "stressraiser: interrupted"
    finally:
        stop_tree(process)


def test_ctrl_c_while_the_report_is_written_leaves_no_partial_report(tmp_path):
    # the report is drawn into a hidden folder beside the target; an interrupt removes it, and the target
    # (here absent) is never made
    slow_figures = """
import time
from stressraiser.cli import report
drawn = report.render_figures
def slow(result, *args, **kwargs):
    print("DRAWING", file=sys.stderr, flush=True)
    time.sleep(60)
    return drawn(result, *args, **kwargs)
report.render_figures = slow
"""
    target = tmp_path / "strap-report"
    process = start_command(["check", str(_strap(tmp_path)), "--report", str(target)], prelude=slow_figures)
    try:
        assert wait_until(lambda: process.poll() is not None or "DRAWING" in process.stderr.readline(), 120.0)
        assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".strap-report.")], "no fresh folder"
        took, left = _stop_and_time(process, pgid_signal=signal.SIGINT)
        assert process.returncode == 130 and took < STOP_WITHIN and not left
        assert sorted(p.name for p in tmp_path.iterdir()) == ["strap.toml"]  # nothing visible or hidden
    finally:
        stop_tree(process)


@pytest.mark.parametrize("sent", [signal.SIGINT, signal.SIGKILL], ids=["ctrl-c", "sigkill"])
def test_a_stopped_report_leaves_no_figure_drawing_child(tmp_path, sent):
    # the report's figures are shared with a forked child (cli/report.py); made slow here, the child is still
    # drawing when the command is stopped: Ctrl-C stops both, and a killed command's child dies with it
    slow_child = """
import os, time
from stressraiser.cli import report
report._cores = lambda: 2
parent = os.getpid()
render = report._render
def slow(result, job):
    if os.getpid() != parent:
        print("CHILD DRAWING", file=sys.stderr, flush=True)
        time.sleep(60)
    return render(result, job)
report._render = slow
"""
    target = tmp_path / "strap-report"
    process = start_command(["check", str(_strap(tmp_path)), "--report", str(target)], prelude=slow_child)
    try:
        assert wait_until(lambda: process.poll() is not None or "CHILD DRAWING" in process.stderr.readline(), 120.0)
        time.sleep(0.3)
        if sent == signal.SIGINT:
            took, left = _stop_and_time(process, pgid_signal=sent)
            assert process.returncode == 130
        else:
            took, left = _stop_and_time(process, pid_signal=sent)
        assert took < STOP_WITHIN and not left, (took, left)
        assert not target.exists()
    finally:
        stop_tree(process)


SWEEP_VARY = "hole.1.diameter=10:30:40"  # forty cases: the sweep is still running when it is killed


@pytest.mark.parametrize("sent", [signal.SIGKILL, signal.SIGTERM], ids=["sigkill", "sigterm"])
def test_killed_sweep_leaves_no_worker(tmp_path, sent):
    # A sweep's main process killed by SIGKILL runs no clean-up at all: before the workers watched it, its
    # fork server, resource tracker and workers (about 150 MB each) ran on, holding standard error.
    process = start_command(["sweep", str(EXAMPLES / "winch_strap.toml"), "--vary", SWEEP_VARY,
                             "--out", str(tmp_path / "out"), "--workers", "2"])
    try:
        # the pool's fork server, its two workers and the meshers they start
        assert wait_until(lambda: process.poll() is None and len(descendants(process.pid)) >= 4, 60.0), \
            process.stderr.read() if process.poll() is not None else "the pool never started"
        time.sleep(1.0)
        took, left = _stop_and_time(process, pid_signal=sent)
        if sent == signal.SIGKILL:  # nothing in the command runs: its children notice by themselves
            assert wait_until(lambda: not alive(left), 5.0), f"still running 5 s after the kill: {alive(left)}"
        else:
            assert process.returncode == 143 and took < STOP_WITHIN and not left
    finally:
        stop_tree(process)


def test_mesher_that_aborts_is_a_mesh_error(tmp_path):
    # gmsh aborting the process (as it does on some internal errors) ended the whole program silently; now
    # only the mesher's child process ends, and the check says how, with exit code 3
    aborting = """
import os, gmsh
gmsh.model.mesh.generate = lambda dim: os.abort()
"""
    process = start_command(["check", str(_strap(tmp_path))], prelude=aborting)
    try:
        out, err = process.communicate(timeout=120)
        assert process.returncode == 3, err
        assert err.strip().splitlines() == ["stressraiser: the mesher stopped without a mesh: its process ended by "
                                            "SIGABRT (gmsh aborted on an internal error)"]
        assert out == ""
    finally:
        stop_tree(process)
