"""The method of sections: FE resultants on any straight cut against the statics of the applied loads,
the command-line cuts, and the JSON they produce."""

from __future__ import annotations

import json

import jsonschema
import pytest

from stressraiser.cli.main import main
from stressraiser.cli.schema import check_schema
from stressraiser.compare.check import check_part
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import parse_section_option, part_from_dict

from conftest import strap

CUTS = [{"x": -100.0}, {"x": 0.0}, {"through": [[-20.0, -40.0], [30.0, 40.0]]},
        {"through": [[60.0, 40.0], [120.0, -40.0]]}, {"y": 10.0}]


def _part(load, holes, support=None, tolerance=0.01):
    data = strap(hole=[{"center": list(c), "diameter": d} for c, d in holes], load=load, section=CUTS,
                 mesh={"tolerance": tolerance})
    if support:
        data["support"] = support
    return part_from_dict(data)


@pytest.mark.parametrize("load, holes, support", [
    # axial + bending + shear on the loaded end, clamped held end, two holes
    ({"axial": 20000.0, "bending": 4.0e5, "shear": 3000.0}, [((0.0, 0.0), 22.0), ((80.0, 18.0), 12.0)],
     {"held": "clamped"}),
    # a pin pulling at 30 degrees, held end in x with the transverse reaction by statics
    ({"pin": {"hole": 2, "force": 30000.0, "direction": 30.0}}, [((0.0, 0.0), 22.0), ((100.0, 0.0), 20.0)], None),
], ids=["end-loads", "oblique-pin"])
def test_five_cuts_satisfy_statics(load, holes, support):
    result = check_part(_part(load, holes, support, tolerance=0.005))
    assert len(result.sections) == 5
    for cut in result.sections:
        # The free body on one side of any cut is in equilibrium: the FE N, V and M on the cut equal the
        # resultant of the loads on that side (method of sections; common practice, docs/references.md [Practice]). Errors are relative to the cut's largest force scale (compare.method_of_sections).
        assert cut.worst_error is not None and cut.worst_error < 0.005, (cut.label, cut.normal_error,
                                                                         cut.shear_error, cut.moment_error)
    across = result.sections[0]
    if "pin" not in load:  # statics by hand for the end loads at x = -100: N = P, V = V, M = M - V (150 + 100)
        assert across.statics.normal_force == pytest.approx(20000.0, rel=1e-6)
        assert across.statics.shear_force == pytest.approx(3000.0, rel=1e-6)
        assert across.statics.moment == pytest.approx(4.0e5 - 3000.0 * 250.0, rel=1e-6)
    # the longitudinal cut crosses the held end: its statics use the FE support reactions
    assert "reactions" in result.sections[4].statics.basis


def test_quarter_model_reports_the_full_part():
    spec = part_from_dict({"plate": {"length": 600.0, "width": 100.0, "thickness": 10.0},
                           "hole": [{"center": [0.0, 0.0], "diameter": 30.0}],
                           "material": {"E": 210000.0, "nu": 0.3}, "load": {"axial": 100000.0},
                           "support": {"symmetry": ["x", "y"]}, "section": [{"x": 0.0}, {"x": 150.0}]})
    result = check_part(spec)
    # Howland's table, d/W = 0.3: Ktg = 3.36 (R. C. J. Howland, Phil. Trans. R. Soc. A 229, 1930;
    # docs/references.md [Howland], [Peterson]), 1 % as for the full model
    assert result.kt.gross == pytest.approx(3.36, rel=0.01)
    # forces are those of the full part (statics: the whole 100 kN crosses every cut)
    for cut in result.sections:
        assert cut.fe_normal_force == pytest.approx(100000.0, rel=0.005)
        assert cut.area == pytest.approx((70.0 if cut.label == "x = 0" else 100.0) * 10.0, rel=1e-6)


def test_section_option_forms():
    across = parse_section_option("x=40")
    assert across.point == (40.0, 0.0) and across.normal == (1.0, 0.0)
    along = parse_section_option("y = -5")
    assert along.point == (0.0, -5.0) and along.normal == (0.0, 1.0)
    line = parse_section_option("0,-40:0,40")
    assert line.normal == pytest.approx((1.0, 0.0))
    assert parse_section_option("x=1in").point[0] == pytest.approx(25.4)  # 1 in = 25.4 mm exactly (NIST SP 811)
    for bad in ("z=4", "x=", "1,2", "0,0:0,0", "x=nan", "a,b:c,d"):
        with pytest.raises(PartError) as err:
            parse_section_option(bad)
        assert err.value.args[0].startswith("--section")


def test_command_line_cut_writes_its_distribution(tmp_path, capsys):
    part = tmp_path / "bar.toml"
    part.write_text('title = "bar"\n[plate]\nlength = 200.0\nwidth = 40.0\nthickness = 5.0\n'
                    '[[hole]]\ncenter = [0.0, 0.0]\ndiameter = 10.0\n'
                    '[material]\nE = 210000.0\nnu = 0.3\n[load]\nbending = "0.2 kN*m"\n')
    out = tmp_path / "r.json"
    assert main(["check", str(part), "--section", "x=50", "--section=-10,-20:10,20", "--json", str(out)]) == 0
    record = json.loads(out.read_text())
    jsonschema.Draft202012Validator(check_schema()).validate(record)  # the documented schema
    assert [s["label"] for s in record["sections"]] == ["x = 50", "through (-10, -20) and (10, 20)"]
    first = record["sections"][0]
    assert first["statics"]["moment"] == pytest.approx(2.0e5, rel=1e-6)
    assert first["fe"]["moment"] == pytest.approx(2.0e5, rel=0.005)
    assert len(first["distribution"]["position"]) == len(first["distribution"]["normal_stress"]) > 10
    assert record["kt"]["basis"]["net"]["key"] == "bending-net"
    assert record["part"]["load"]["kind"] == "bending"
    assert {"max_principal", "min_principal", "von_mises", "tresca"} <= set(record["stresses"])
    printed = capsys.readouterr().out
    assert "Sections" in printed and "x = 50" in printed
    assert main(["check", str(part), "--section", "x=500"]) == 2  # misses the part: a one-line error
    assert "misses the part" in capsys.readouterr().err
