"""Property-based fuzzing of `stressraiser check` end to end: sloppy and hostile part files (generated as in
tests/fuzzparts.py) through the command line, in this process.

Allowed outcomes: exit 0 with a complete JSON record; exit 2 with one line on stderr that names a key and
no output file; exit 3 (the mesher or solver failed, a budget was exceeded, or the peak did not converge)
with a message and either no output file or a complete one. Never exit 4 (an internal error) or a
traceback, and no case may run long.

Every generated file goes through the reader; the files it accepts run the full check (mesh, solve,
converge, report) until FULL_CHECKS of them have, with --max-elements kept small so that each takes about
a second. The rest of the accepted files are only read (their geometry is validated).
"""

from __future__ import annotations

import json

from hypothesis import given, settings
from hypothesis import strategies as st

from fuzzparts import core_parts, mutated_examples, toml_text
from stressraiser.cli.main import main
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import parse_part
from test_fuzz_partfile import FUZZ, MESSAGE, within

EXAMPLES_RUN = 120
FULL_CHECKS = 12
CASE_SECONDS = 90  # a full check here takes one to a few seconds; only a hang reaches this
MAX_ELEMENTS = "8000"


def _fast(data: dict) -> dict:
    """The part with a [mesh] table that keeps a full check short (a mutation may still change it)."""
    if isinstance(data, dict) and isinstance(data.get("mesh", {}), dict):
        data = dict(data)
        data["mesh"] = {**data.get("mesh", {}), "max_levels": 3, "tolerance": 0.05}
    return data


def test_check_command_on_generated_parts(tmp_path_factory, capsys):
    tally = {"full": 0, "refused": 0, "read only": 0, "exit 3": 0}

    @settings(FUZZ, max_examples=EXAMPLES_RUN)
    @given(st.one_of(core_parts().map(_fast), mutated_examples()))
    def case(data):
        folder = tmp_path_factory.mktemp("fuzz")
        part, out = folder / "part.toml", folder / "out.json"
        text = toml_text(data)
        part.write_text(text, encoding="utf-8")
        try:
            parse_part(text)
            valid = True
        except PartError:
            valid = False
        if valid and tally["full"] >= FULL_CHECKS:
            tally["read only"] += 1
            return
        tally["full" if valid else "refused"] += 1
        capsys.readouterr()
        with within(CASE_SECONDS):
            code = main(["check", str(part), "--json", str(out), "--quiet", "--max-elements", MAX_ELEMENTS])
        captured = capsys.readouterr()
        assert "Traceback" not in captured.err and "internal error" not in captured.err, captured.err
        err = captured.err.strip().splitlines()
        if code == 2:
            assert len(err) == 1 and err[0].startswith("stressraiser: "), err
            assert MESSAGE.match(err[0][len("stressraiser: "):]), err[0]
            assert not out.exists()
        elif code == 3:
            tally["exit 3"] += 1
            assert err and err[-1].startswith("stressraiser: "), err
            if out.exists():
                assert isinstance(json.loads(out.read_text()), dict)
        else:
            assert code == 0, (code, captured.err)
            record = json.loads(out.read_text())
            assert record["kt"]["converged"] is True

    case()
    # both kinds of outcome must have been reached, or the test says little
    assert tally["full"] >= FULL_CHECKS // 2 and tally["refused"] >= 30, tally
