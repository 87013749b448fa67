"""Helpers for the tests that start the command line as a real process and send it real signals: the
command's process tree (read from /proc, so only the processes the test started are ever looked at) and
waits with deadlines."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

from conftest import REPO

PROC = Path("/proc")


def children_of(pid: int) -> set[int]:
    """The processes whose parent is `pid` (Linux /proc)."""
    found = set()
    for entry in PROC.iterdir():
        if not entry.name.isdigit():
            continue
        try:
            stat = (entry / "stat").read_text()
        except OSError:  # ended while listing
            continue
        fields = stat[stat.rindex(")") + 2:].split()  # after "pid (comm) ": state, ppid, ...
        if int(fields[1]) == pid:
            found.add(int(entry.name))
    return found


def descendants(pid: int) -> set[int]:
    """Every process below `pid`: children, their children, ..."""
    found, todo = set(), [pid]
    while todo:
        for child in children_of(todo.pop()):
            if child not in found:
                found.add(child)
                todo.append(child)
    return found


def alive(pids: set[int]) -> set[int]:
    """Those of `pids` that still run (a zombie, ended but not yet reaped, counts as ended)."""
    running = set()
    for pid in pids:
        try:
            state = (PROC / str(pid) / "stat").read_text()
        except OSError:
            continue
        if state[state.rindex(")") + 2] != "Z":
            running.add(pid)
    return running


def wait_until(condition, timeout: float, step: float = 0.02):
    """Poll `condition()` until it returns something true or `timeout` seconds pass; its last value."""
    deadline = time.monotonic() + timeout
    while True:
        value = condition()
        if value or time.monotonic() > deadline:
            return value
        time.sleep(step)


def start_command(args: list[str], prelude: str = "", **popen) -> subprocess.Popen:
    """Start `stressraiser ARGS` as its console script runs it (cli.main.entry), in a new process group,
    after the Python lines `prelude` (a test's fault injection: slow meshing, a long solve)."""
    script = (f"import sys\n{prelude}\nfrom stressraiser.cli.main import entry\n"
              f"sys.argv = ['stressraiser', *sys.argv[1:]]\nentry()\n")
    env = {**os.environ, "OPENBLAS_NUM_THREADS": "1", "OMP_NUM_THREADS": "1"}
    return subprocess.Popen([sys.executable, "-c", script, *args], cwd=REPO, env=env, start_new_session=True,
                            stdout=popen.pop("stdout", subprocess.PIPE), stderr=popen.pop("stderr", subprocess.PIPE),
                            text=True, **popen)


def stop_tree(process: subprocess.Popen) -> None:
    """Make sure nothing the test started keeps running: kill the process group `start_command` made for it
    (the command, and any process it started that is still in the group)."""
    try:
        os.killpg(process.pid, signal.SIGKILL)
    except (ProcessLookupError, PermissionError):
        pass
    process.wait()
