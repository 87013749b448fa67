"""Every bundled example runs through the command line and writes a complete JSON record."""

from __future__ import annotations

import json
import tomllib

import jsonschema
import pytest

from stressraiser.cli.main import main
from stressraiser.cli.schema import check_schema

from conftest import EXAMPLES

REQUIRED = [
    ("peak", "stress"), ("peak", "location"), ("net_section", "area"), ("net_section", "average"),
    ("net_section", "equilibrium_error"), ("kt", "net"), ("kt", "gross"), ("kt", "error"), ("kt", "converged"),
    ("mesh", "levels"),
]


@pytest.mark.parametrize("example", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_example_runs_and_records(example, tmp_path, capsys):
    out = tmp_path / "result.json"
    assert main(["check", str(example), "--json", str(out)]) == 0
    record = json.loads(out.read_text())
    for table, key in REQUIRED:
        assert key in record[table]
    assert "handbook" in record and "cautions" in record and record["cautions"]
    assert record["kt"]["converged"] is True
    assert abs(record["net_section"]["equilibrium_error"]) < 0.005
    assert all({"nodes", "elements", "peak"} <= set(level) for level in record["mesh"]["levels"])
    jsonschema.Draft202012Validator(check_schema()).validate(record)  # the documented schema, cli/check.schema.json
    printed = capsys.readouterr().out
    assert "Kt(net)" in printed and "Cautions" in printed
    tables = tomllib.loads(example.read_text())
    if "design" in tables:  # every example with a [design] table signs off, whatever its load
        assert record["design"]["checks"] and record["design"]["load_kind"] == record["part"]["load"]["kind"]
        assert "Design check:" in printed
    if "fatigue" in tables:
        assert record["fatigue"]["notch"] and "Fatigue screen:" in printed


def test_examples_sign_off_every_kind_of_load():
    # the [design] check is no longer refused for a load kind: the examples carry it for each kind they have
    from stressraiser.geometry.partfile import load_part

    specs = [load_part(p) for p in EXAMPLES.glob("*.toml")]
    assert {s.load.kind for s in specs if s.design is not None} == {s.load.kind for s in specs}


def test_quiet_prints_verdict_only(capsys):
    assert main(["check", str(EXAMPLES / "winch_strap.toml"), "--quiet"]) == 0
    lines = capsys.readouterr().out.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("Kt(net)")


def test_same_part_same_numbers(tmp_path):
    # Determinism: two runs of the same part file give identical JSON numbers.
    a, b = tmp_path / "a.json", tmp_path / "b.json"
    main(["check", str(EXAMPLES / "winch_strap.toml"), "--json", str(a), "--quiet"])
    main(["check", str(EXAMPLES / "winch_strap.toml"), "--json", str(b), "--quiet"])
    ra, rb = json.loads(a.read_text()), json.loads(b.read_text())
    ra.pop("version"), rb.pop("version")
    assert ra == rb


CUT_PARTS = sorted((EXAMPLES / "cut_parts").glob("*.toml"))


@pytest.mark.parametrize("example", CUT_PARTS, ids=lambda p: p.stem)
def test_cut_file_example_runs_on_the_drawing_its_script_writes(example, tmp_path, capsys):
    # The repository holds the scripts, not the drawings: each part file of examples/cut_parts names the
    # DXF its script in examples/ writes (NAME.dxf by NAME_dxf.py); the script writes it beside a copy of
    # the part file, as a user would, and the check runs to a converged, complete record that names the drawing.
    import shutil
    import subprocess
    import sys

    part = tmp_path / example.name
    shutil.copy(example, part)
    drawing = tomllib.loads(example.read_text())["outline"]["file"]
    script = EXAMPLES / f"{drawing.rsplit('.', 1)[0]}_dxf.py"  # the drawing's own script, whichever part file
    done = subprocess.run([sys.executable, str(script), str(tmp_path / drawing)], capture_output=True, text=True,
                          timeout=120)
    assert done.returncode == 0, done.stderr
    out = tmp_path / "result.json"
    assert main(["check", str(part), "--json", str(out), "--quiet"]) == 0
    record = json.loads(out.read_text())
    jsonschema.Draft202012Validator(check_schema()).validate(record)
    assert record["kt"]["converged"] is True and abs(record["net_section"]["equilibrium_error"]) < 0.005
    outline = record["part"]["outline"]
    assert outline["source"] == "file" and outline["file"] == drawing and outline["holes"] >= 1
    assert record["sharp_corners"] == []  # both drawings round every inside corner
    assert not record["handbook"]  # no handbook case describes a drawn outline
