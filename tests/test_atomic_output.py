"""An interrupted run leaves the previous output file or none, never a truncated one.

A child process runs `stressraiser check --json FILE` with the file writer slowed down: it writes half
of the record, tells the parent, and stalls. The parent kills it (SIGKILL: no clean-up runs) at that
moment and reads FILE. A writer that wrote the target in place would leave half a record there.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import textwrap
import time

import pytest

from conftest import REPO

CHILD = textwrap.dedent("""\
    import sys, time
    import stressraiser.cli.files as files
    from stressraiser.cli.main import main

    real_open = open

    class Stalling:
        def __init__(self, handle):
            self.handle = handle
        def write(self, data):
            half = len(data) // 2
            self.handle.write(data[:half])
            self.handle.flush()
            print("WRITING", flush=True)
            time.sleep(120)
            return self.handle.write(data[half:]) + half
        def __enter__(self):
            return self
        def __exit__(self, *exc):
            return self.handle.__exit__(*exc)
        def __getattr__(self, name):
            return getattr(self.handle, name)

    def stalling_open(path, mode="r", *args, **kwargs):
        handle = real_open(path, mode, *args, **kwargs)
        return Stalling(handle) if "w" in mode else handle

    files.open = stalling_open  # the module's writes go through its global name `open`
    sys.exit(main(["check", sys.argv[1], "--json", sys.argv[2], "--quiet"]))
    """)


PLAIN = """title = "plain strap"
[plate]
length = 200.0
width = 40.0
thickness = 5.0
[material]
E = 200000.0
nu = 0.3
[load]
axial = 10000.0
"""


def _kill_while_writing(part, target) -> str:
    """Start the child, wait until it is half-way through writing, SIGKILL it; return its stdout."""
    child = subprocess.Popen([sys.executable, "-c", CHILD, str(part), str(target)],
                             stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, cwd=REPO)
    try:
        deadline = time.monotonic() + 120
        seen = ""
        while time.monotonic() < deadline:
            line = child.stdout.readline()
            if not line:
                break
            seen += line
            if line.strip() == "WRITING":
                break
        assert "WRITING" in seen, f"the child never reached the write: {seen}{child.stderr.read()}"
        os.kill(child.pid, signal.SIGKILL)
        child.wait(timeout=30)
        assert child.returncode == -signal.SIGKILL
        return seen
    finally:
        if child.poll() is None:
            child.kill()
            child.wait()


@pytest.mark.parametrize("previous", ['{"previous": "record"}\n', None], ids=["previous file", "no file"])
def test_killed_while_writing_leaves_no_truncated_file(tmp_path, previous):
    target = tmp_path / "result.json"
    part = tmp_path / "part.toml"
    part.write_text(PLAIN)  # a plain strap: the check takes a fraction of a second
    if previous is not None:
        target.write_text(previous)
    _kill_while_writing(part, target)
    if previous is None:
        assert not target.exists()
    else:
        assert target.read_text() == previous  # the old record, whole
        json.loads(target.read_text())
    # only the hidden temporary file may remain beside it (a killed process cannot remove it)
    assert all(p.name.startswith(".result.json.") and p.name.endswith(".part")
               for p in tmp_path.iterdir() if p not in (target, part))
