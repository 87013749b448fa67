"""Dotted part-file keys for sweeps and suites, and the --vary value syntax: what they address, and the
one-line refusals of keys and values that do not fit."""

from __future__ import annotations

import pytest

from stressraiser.cli.main import main
from stressraiser.cli.sweep import parse_values
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.partkeys import check_key_known, flatten_keys, resolve_key, set_value

from test_sweep import write_plate

BASE = {
    "title": "two holes",
    "plate": {"length": 300.0, "width": 80.0, "thickness": "10 mm"},
    "hole": [{"center": [-40.0, 0.0], "diameter": 16.0}, {"center": [40.0, 5.0], "diameter": 12.0}],
    "material": {"E": 210000.0, "nu": 0.3},
    "load": {"axial": 100000.0},
}


@pytest.mark.parametrize("text, expected", [
    ("plate.width", 80.0), ("plate.thickness", "10 mm"), ("hole.2.diameter", 12.0), ("hole.2.center.y", 5.0),
    ("hole.1.center.x", -40.0), ("load.axial", 100000.0),
])
def test_keys_address_values(text, expected):
    key = resolve_key(BASE, text)
    assert key.present
    changed = set_value(BASE, key, 99.0)
    node = changed
    for step in key.steps:
        node = node[step]
    assert node == 99.0
    # the original dictionary is left alone
    node = BASE
    for step in key.steps:
        node = node[step]
    assert node == expected


def test_missing_value_in_a_known_table_is_created():
    key = resolve_key(BASE, "mesh.tolerance")
    assert not key.present
    part = set_value(BASE, key, 0.02)
    assert part["mesh"] == {"tolerance": 0.02} and "mesh" not in BASE
    assert part_from_dict(part).mesh.tolerance == 0.02
    check_key_known(BASE, key, 0.02, part_from_dict)  # the reader knows mesh.tolerance


@pytest.mark.parametrize("text, words", [
    ("hole.1.size.1", "hole.1 has no 'size' (it has: center, diameter)"),
    ("hole.3.diameter", "hole is an array of tables with 2 entries; address one as hole.1 ... hole.2"),
    ("hole.diameter", "hole is an array of tables with 2 entries"),
    ("hole.1", "is a table; address one of its values (hole.1.center, hole.1.diameter)"),
    ("hole.1.center", "is an array; address one entry, e.g. hole.1.center.x or hole.1.center.y"),
    ("hole.1.center.z", "hole.1.center is an array of values (x, y) with 2 entries"),
    ("title", "holds the text 'two holes', not a number"),
    ("plate..width", "a key is table and key names joined by dots"),
    ("plate.width.x", "plate.width is a single value"),
])
def test_bad_keys_are_refused_in_one_line(text, words):
    with pytest.raises(PartError) as info:
        resolve_key(BASE, text)
    message = str(info.value)
    assert words in message and "\n" not in message and message.startswith(text)


@pytest.mark.parametrize("text", ["mesh.tolerence", "plate.widht"])
def test_key_unknown_to_the_reader_is_refused(text):
    # a value the file does not hold may be added where a table can hold it, if the reader knows the key
    key = resolve_key(BASE, text)
    assert not key.present
    with pytest.raises(PartError, match=f"{text}: the part-file reader does not know this key .*unknown key"):
        check_key_known(BASE, key, 0.02, part_from_dict)


def test_flatten_keys_gives_back_dotted_text():
    # TOML reads `set = { hole.1.diameter = 14 }` as nested tables
    assert flatten_keys({"hole": {"1": {"diameter": 14}}, "plate.width": 70}) == {
        "hole.1.diameter": 14, "plate.width": 70}


@pytest.mark.parametrize("text, values", [
    ("10:60:6", (10, 20, 30, 40, 50, 60)),
    ("0.1:0.3:3", (0.1, 0.2, 0.3)),
    ("10:11:3", (10.0, 10.5, 11.0)),
    ("60,80,100", (60, 80, 100)),
    ("-5, 2.5", (-5, 2.5)),
])
def test_values(text, values):
    got = parse_values(text)
    assert got == values
    assert [type(v) for v in got] == [type(v) for v in values]


@pytest.mark.parametrize("text", ["10:60", "10:60:1", "10:60:2.5", "a,b", "1,1", "1,nan", ":::"])
def test_bad_values_are_refused(text):
    with pytest.raises(PartError):
        parse_values(text)


@pytest.mark.parametrize("vary, words", [
    ("plate.widht=60,80", "--vary plate.widht: the part-file reader does not know this key (plate.widht: "
                          "unknown key; allowed here: condition, length, thickness, width)"),
    ("hole.2.diameter=10:20:3", "--vary hole.2.diameter: hole is an array of tables with 1 entry; "
                                "address one as hole.1"),
    ("hole.1.diameter", "--vary hole.1.diameter: write KEY=START:STOP:COUNT"),
    ("hole.1.diameter=10:20", "--vary 10:20: a range is START:STOP:COUNT"),
    ("mesh.tolerence=0.01,0.02", "does not know this key"),
])
def test_sweep_refuses_bad_vary_with_exit_2(tmp_path, capsys, vary, words):
    part = write_plate(tmp_path, 0.02)  # one hole; [mesh] holds only tolerance
    code = main(["sweep", str(part), "--vary", vary, "--out", str(tmp_path / "s")])
    err = capsys.readouterr().err.strip()
    assert code == 2
    assert len(err.splitlines()) == 1 and words in err
    assert not (tmp_path / "s").exists()  # nothing written
