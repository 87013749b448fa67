"""The command line around the commands: --version, output to a file or a pipe, option values that start
with a minus sign, and an import of the package that leaves the interpreter as it was."""

from __future__ import annotations

import json
import os
import re
import subprocess
import sys

import pytest

from stressraiser import __version__
from stressraiser.cli.main import main

from conftest import EXAMPLES, REPO


NO_COLUMNS = {k: v for k, v in os.environ.items() if k != "COLUMNS"}  # COLUMNS asks for a width explicitly


def _run(*args: str, **kwargs) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "stressraiser", *args], capture_output=True, text=True, cwd=REPO,
                          timeout=300, **kwargs)


def test_version():
    done = _run("--version")
    assert done.returncode == 0 and done.stdout == f"stressraiser {__version__}\n" and done.stderr == ""


def test_piped_summary_is_neither_padded_nor_broken():
    # Into a pipe, rich laid everything out at 80 columns: the verdict line broke after "converged in",
    # table rows were padded with spaces to column 80, long notes were folded.
    done = _run("check", str(EXAMPLES / "winch_strap.toml"), env=NO_COLUMNS)  # as a file or pipe usually is
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert lines[1].startswith("Kt(net) 2.39") and re.search(r"converged in \d mesh levels$", lines[1])
    assert not [line for line in lines if line != line.rstrip()]
    assert any(line.startswith(" • Linear-elastic") and line.endswith("through-thickness effects.") for line in lines)


def test_piped_suite_table_keeps_names_whole(tmp_path):
    # `regress ... > out.txt`: a case name longer than its column fitted in 80 columns was broken mid-word
    name = "BR-60-13 strap bracket, hole on the centre line, drawing BR-60-13-REV-C-SHEET-2-OF-2"
    suite = tmp_path / "suite.toml"
    suite.write_text(f'[[case]]\nname = "{name.strip()}"\nfamily = "central-hole-tension"\n'
                     'parameters = { "d/W" = 0.3 }\nset = { "mesh.tolerance" = 0.05 }\nreference = 3.36\n'
                     'definition = "gross"\ntolerance = 0.2\nsource = "R. C. J. Howland (1930), d/W = 0.3"\n')
    done = _run("regress", str(suite), "--workers", "1", env=NO_COLUMNS)
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert [line for line in lines if name.strip() in line], done.stdout
    assert not [line for line in lines if line != line.rstrip()]


def test_section_value_may_start_with_a_minus_sign(tmp_path, capsys):
    # argparse took "-10,-20:10,20" for an option and refused the command; "--section=..." was needed
    record = tmp_path / "r.json"
    assert main(["check", str(EXAMPLES / "winch_strap.toml"), "--section", "-10,-20:10,20", "--quiet",
                 "--json", str(record)]) == 0
    (cut,) = json.loads(record.read_text())["sections"]
    assert cut["point"] == [-10.0, -20.0]
    from stressraiser.cli.main import attach_negative_values

    assert attach_negative_values(["check", "p", "--section", "-5,0:5,0", "--section", "x=-3", "--quiet"]) == \
        ["check", "p", "--section=-5,0:5,0", "--section", "x=-3", "--quiet"]


def test_importing_the_package_changes_nothing_in_the_interpreter():
    # cli/main.py disabled and froze the garbage collector when imported; now only the console script's
    # entry point does that, for the command-line process
    probe = ("import gc, signal\n"
             "before = (gc.isenabled(), gc.get_freeze_count(), signal.getsignal(signal.SIGINT), "
             "signal.getsignal(signal.SIGTERM))\n"
             "import stressraiser, stressraiser.cli.main, stressraiser.cli.check, stressraiser.compare.check\n"
             "after = (gc.isenabled(), gc.get_freeze_count(), signal.getsignal(signal.SIGINT), "
             "signal.getsignal(signal.SIGTERM))\n"
             "print(before == after, after[:2])\n")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, cwd=REPO, timeout=120)
    assert done.stdout.strip() == "True (True, 0)", done.stderr


def test_main_restores_the_signal_handlers():
    import signal

    before = signal.getsignal(signal.SIGINT), signal.getsignal(signal.SIGTERM), signal.set_wakeup_fd(-1)
    signal.set_wakeup_fd(before[2])
    with pytest.raises(SystemExit):
        main(["--version"])
    assert main(["cases"]) == 0
    after = signal.getsignal(signal.SIGINT), signal.getsignal(signal.SIGTERM), signal.set_wakeup_fd(-1)
    signal.set_wakeup_fd(after[2])
    assert after == before


@pytest.mark.parametrize("text, shown", [
    ("plain ± — × ²", "plain ± — × ²"),  # printable Unicode stays
    ("a\tb\nc", "a\tb\nc"),  # tabs and line breaks stay
    ("\x1b[2J\x1b]8;;http://x\x1b\\", "\\x1b[2J\\x1b]8;;http://x\\x1b\\"),  # CSI and OSC (a hyperlink)
    ("\x07\x08\r\x7f\x9b", "\\x07\\x08\\r\\x7f\\x9b"),  # BEL, backspace, CR, DEL, C1 CSI
    ("\u202eabc\u2066d\u2069", "\\u202eabc\\u2066d\\u2069"),  # bidirectional overrides and isolates
])
def test_terminal_safe(text, shown):
    from stressraiser.cli.terminal import terminal_safe

    assert terminal_safe(text) == shown
