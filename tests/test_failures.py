"""Mesher and solver failures: each class ends with a specific one-line message and exit code 3 (distinct
from bad input, exit code 2), and no output file.

Failures are constructed through the command line where a part file can cause them (a non-converging
study, a part too large for the element limit, the --max-elements option); the others, which a validated
part file cannot reach, by replacing a piece of gmsh's or the solver's behaviour in this process: gmsh's
own API (a failing call, corrupted node coordinates), the supports, or the memory budget. Cases that could
abort the process if a guard were missing run in a child process.
"""

from __future__ import annotations

import json
import subprocess
import sys
import textwrap
from dataclasses import replace

import gmsh
import numpy as np
import pytest

from stressraiser.cli.main import main
from stressraiser.geometry.errors import MeshError
from stressraiser.geometry.mesh_guard import checked_expression
from stressraiser.geometry.kinds.hole import Hole

from conftest import EXAMPLES, REPO, strap, toml_text

STRAP = EXAMPLES / "winch_strap.toml"
NUMERICS = 3


def run_check(tmp_path, capsys, *options, part=STRAP):
    """Run `check` in this process; return (exit code, last stderr line, path of the --json file)."""
    out = tmp_path / "out.json"
    code = main(["check", str(part), "--json", str(out), "--quiet", *options])
    err = capsys.readouterr().err.strip().splitlines()
    return code, (err[-1] if err else ""), out


def part_file(tmp_path, mesh: dict, length: float = 300.0) -> str:
    """The strap with the [mesh] table `mesh` and plate.length `length`, as a part file."""
    path = tmp_path / "part.toml"
    part = strap(title="failure test", mesh=mesh)
    part["plate"]["length"] = length
    path.write_text(toml_text(part))
    return str(path)


# --- gmsh failures -----------------------------------------------------------------------------------


def test_gmsh_error_while_meshing(tmp_path, capsys, monkeypatch):
    def fail(dim=3):
        raise Exception("Invalid boundary mesh (overlapping facets) on surface 1")  # gmsh's exception type

    monkeypatch.setattr(gmsh.model.mesh, "generate", fail)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert line.startswith("stressraiser: gmsh could not mesh the part") and "overlapping facets" in line
    assert not out.exists()


def test_gmsh_error_while_building_the_geometry(tmp_path, capsys, monkeypatch):
    def fail():
        raise Exception("OpenCASCADE exception: BRep_API: command not done")

    monkeypatch.setattr(gmsh.model.occ, "synchronize", fail)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "gmsh could not mesh the part" in line and "BRep_API" in line
    assert not out.exists()


CHILD = textwrap.dedent("""\
    import sys
    from dataclasses import replace
    import stressraiser.geometry.partfile as partfile
    import stressraiser.geometry.meshing as meshing
    from stressraiser.cli.main import main
    from stressraiser.geometry.kinds.hole import Hole
    load = partfile.load_part
    case = sys.argv[1]
    if case == "expression":
        meshing.distance_expression = lambda raiser: "x - -1"  # a form gmsh's parser aborts on
    else:
        partfile.load_part = lambda path: replace(load(path), raisers=(Hole((float("nan"), 0.0), 22.0),))
    sys.exit(main(["check", sys.argv[2], "--quiet"]))
    """)


@pytest.mark.parametrize("case, words", [
    ("expression", "gmsh would abort"),
    ("nan", "non-finite number"),
])
def test_input_gmsh_would_abort_on_is_refused_first(case, words):
    # gmsh aborts the whole process ("terminate called ...") on a malformed size expression; a NaN
    # coordinate has undefined behaviour in OpenCASCADE. Run in a child: without the guards the child dies
    # by a signal instead of exiting with 3.
    run = subprocess.run([sys.executable, "-c", CHILD, case, str(STRAP)], capture_output=True, text=True,
                         timeout=120, cwd=REPO)
    assert run.returncode == NUMERICS, run.stderr
    assert words in run.stderr and "Traceback" not in run.stderr and "terminate called" not in run.stderr


def test_expression_guard_matches_gmsh_parser():
    # Forms checked against gmsh 4's MathEval parser in a child process (2024): these mesh ...
    for ok in ["-x + 1", "(-1.5) + x", "x * (-1)", "1e+16 * x + 1", "1E-30 + x", "Max(0, -x)", "Min(x, y)",
               "x - (-1)", "Fabs(x)^2", "Max(0, Max(-(x), -(y)))", "2.5e3", ".5", "5.", "-(-x)", "+x",
               "Sqrt((x - (1.0))^2 + (y - (-2.0))^2)", "Exp (x)", "x ^ 2"]:
        assert checked_expression(ok) == ok
    # ... and these abort the process
    for bad in ["1 + nan * x", "x - -1", "1 + (", "0.1 + inf*x", "1 + -x", "1 - - 1", "x^-1", "Atan2(y, x)",
                "(x)(y)", "x y", "x * -1", "Pow(x, 2)", "Hypot(x, y)", ""]:
        with pytest.raises(MeshError, match="gmsh would abort"):
            checked_expression(bad)


# --- malformed meshes ---------------------------------------------------------------------------------


def _corrupt_nodes(monkeypatch, change):
    """Make gmsh.model.mesh.getNodes return coordinates passed through `change(coords, tags)`."""
    real = gmsh.model.mesh.getNodes

    def fake(*args, **kwargs):
        tags, coords, params = real(*args, **kwargs)
        xyz = np.array(coords, dtype=float).reshape(-1, 3)
        change(xyz, np.asarray(tags))
        return tags, xyz.ravel(), params

    monkeypatch.setattr(gmsh.model.mesh, "getNodes", fake)


def test_degenerate_triangles(tmp_path, capsys, monkeypatch):
    def flatten(xyz, tags):
        xyz[:, 1] *= 1e-6  # every triangle collapses onto the x axis

    _corrupt_nodes(monkeypatch, flatten)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "degenerate triangle" in line and "shape quality" in line
    assert not out.exists()


def test_inverted_triangles(tmp_path, capsys, monkeypatch):
    def fold(xyz, tags):
        # the highest tag is a node inside a surface; pull it through the plate so its triangles turn over
        k = int(np.argmax(tags))
        xyz[k, 0] += 1000.0

    _corrupt_nodes(monkeypatch, fold)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "inverted or overlapping triangles" in line
    assert not out.exists()


def test_part_split_in_two(tmp_path, capsys, monkeypatch):
    # Three overlapping holes across the whole width cut the strap in two. The reader refuses this part
    # (holes crossing each other and the sides), so the spec is built behind its back.
    import stressraiser.geometry.partfile as partfile

    load = partfile.load_part
    holes = (Hole((0.0, -30.0), 30.0), Hole((0.0, 0.0), 30.0), Hole((0.0, 30.0), 30.0))
    monkeypatch.setattr(partfile, "load_part", lambda path: replace(load(path), raisers=holes))
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "piece" in line
    assert not out.exists()


# --- solver failures ----------------------------------------------------------------------------------


def test_missing_support_is_a_singular_stiffness(tmp_path, capsys, monkeypatch):
    import stressraiser.fem.analysis as analysis
    from stressraiser.fem.supports import Supports

    none = Supports(np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64), np.zeros((0, 2)),
                    np.zeros((0, 2), dtype=np.int32), np.zeros(0, dtype=np.int64))
    monkeypatch.setattr(analysis, "support_set", lambda spec, mesh: none)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "rigid-body" in line
    assert not out.exists()


def test_underflowing_stiffness(tmp_path, capsys, monkeypatch):
    # A modulus of 1e-320 (subnormal; the reader refuses anything below 1e-6 MPa) makes the stiffness
    # underflow: the solver must refuse rather than report a number.
    import stressraiser.geometry.partfile as partfile

    load = partfile.load_part
    monkeypatch.setattr(partfile, "load_part",
                        lambda path: replace(load(path), material=replace(load(path).material, E=1e-320)))
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert line.startswith("stressraiser: ") and "internal error" not in line
    assert not out.exists()


def test_non_finite_stresses(tmp_path, capsys, monkeypatch):
    # A stress recovery that returns NaN at one node must stop the check, not become the reported peak.
    import stressraiser.fem.analysis as analysis

    real = analysis.recover_nodal

    def recover_with_nan(*args, **kwargs):
        nodal = real(*args, **kwargs)
        nodal[len(nodal) // 2, 0] = np.nan
        return nodal

    monkeypatch.setattr(analysis, "recover_nodal", recover_with_nan)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "non-finite stresses" in line
    assert not out.exists()


def test_non_converging_refinement_prints_results_and_exits_3(tmp_path, capsys):
    # A tolerance of 0.01 % is out of reach in three levels: the results are still printed and recorded
    # with a loud warning, and the exit code says they are not for sign-off.
    part = part_file(tmp_path, {"tolerance": 0.0001, "max_levels": 3})
    out = tmp_path / "out.json"
    code = main(["check", part, "--json", str(out)])
    captured = capsys.readouterr()
    assert code == NUMERICS
    assert "NOT converged" in captured.out and "warning:" in captured.out
    assert captured.err.strip().splitlines()[-1].startswith("stressraiser: the peak did not converge")
    record = json.loads(out.read_text())
    assert record["kt"]["converged"] is False
    assert any("did not converge" in w for w in record["warnings"])


def test_out_of_memory(tmp_path, capsys, monkeypatch):
    # Memory running out despite the estimate is a failure of the numerics (exit 3), not a bug (exit 4).
    import stressraiser.fem.analysis as analysis

    def exhausted(*args, **kwargs):
        raise MemoryError

    monkeypatch.setattr(analysis, "stiffness_matrix", exhausted)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert line.startswith("stressraiser: out of memory") and "max_elements" in line
    assert not out.exists()


# --- budgets ---------------------------------------------------------------------------------------------


def test_memory_budget_refuses_before_solving(tmp_path, capsys, monkeypatch):
    import stressraiser.fem.budget as budget

    monkeypatch.setattr(budget, "memory_budget", lambda: 1e6)  # 1 MB
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "of memory" in line and "GB" in line and "budget is 0.001 GB" in line
    assert not out.exists()


def test_memory_budget_checked_at_the_solve(tmp_path, capsys, monkeypatch):
    # Past the estimate made before meshing, the solver itself refuses a system that would not fit.
    import stressraiser.fem.budget as budget
    import stressraiser.fem.convergence as convergence

    monkeypatch.setattr(convergence, "check_first_level", lambda spec, scale: None)
    monkeypatch.setattr(budget, "memory_budget", lambda: 1e6)
    code, line, out = run_check(tmp_path, capsys)
    assert code == NUMERICS
    assert "solve of" in line and "unknowns would need about" in line
    assert not out.exists()


def test_max_elements_refuses_the_coarsest_mesh(tmp_path, capsys):
    code, line, out = run_check(tmp_path, capsys, "--max-elements", "1000")
    assert code == NUMERICS
    assert "coarsest mesh" in line and "1,000" in line and "--max-elements" in line
    assert not out.exists()


def test_max_elements_stops_refining(tmp_path, capsys):
    # The strap's coarsest level has under 3000 elements and the next one more: one level is solved,
    # then refinement stops with the reason recorded.
    code, line, out = run_check(tmp_path, capsys, "--max-elements", "3000")
    assert code == NUMERICS
    assert "did not converge" in line and "max_elements = 3000" in line
    record = json.loads(out.read_text())
    assert record["kt"]["converged"] is False
    assert all(level["elements"] <= 3000 for level in record["mesh"]["levels"])


def test_a_huge_part_is_refused_before_meshing(tmp_path, capsys):
    # A 1 km plate 80 mm wide (12,500 widths) needs about 43,000 elements even with its far zones graded
    # (geometry/far_field.py); above a limit of 20,000 it is refused from the estimate, in well under a
    # second, instead of gmsh running for minutes.
    part = part_file(tmp_path, {"max_levels": 3}, length=1000000.0)
    code, line, out = run_check(tmp_path, capsys, "--max-elements", "20000", part=part)
    assert code == NUMERICS
    assert "coarsest mesh of this part would have about" in line
    assert not out.exists()


@pytest.mark.parametrize("value", ["0", "999", "abc", "2.5", "30000000"])
def test_max_elements_option_out_of_range_is_bad_input(tmp_path, capsys, value):
    code, line, out = run_check(tmp_path, capsys, "--max-elements", value)
    assert code == 2
    assert "--max-elements" in line and "1000 to 20000000" in line

