"""A fatigue cycle between two load cases ([fatigue] min_case and max_case), a cycle that scales one named
case ([fatigue] case), every refusal of those keys, and the model caution naming the state used.

Independent values:
- Linear elasticity (an analytic property of the model): a load case that is another times f has every
  stress and every resultant f times the other's, so the cycle between the two cases is the cycle between
  f and 1 x the other's load, which the part with that load alone screens through its fractions. Runs
  compared on the same three mesh levels (a tolerance out of reach stops each at mesh.max_levels).
- Hand calculations: the net-section nominal N / A_net and the combined N / A + M s / I of a section from
  its ligaments (common practice, docs/references.md [Practice]; beam theory, [Timoshenko-Goodier]); the
  modified Goodman factor n = 1 / (sa / Se + sm / Su), the steel estimate Se' = 0.5 Su and
  Kf = 1 + q (Kt - 1) ([Shigley], from memory); Peterson's q = 1 / (1 + a / r), a = 0.0254 (2068 / Su)^1.8 mm
  ([Peterson-q], from memory).
- A case's own converged peak on a raiser (Richardson over its levels, fem.convergence) for the other
  case's notch stress, within the two bands.
"""

from __future__ import annotations

import copy
import json

import jsonschema
import numpy as np
import pytest

from stressraiser.cli.main import main
from stressraiser.cli.record import check_record
from stressraiser.cli.schema import check_schema
from stressraiser.compare.check import check_part
from stressraiser.fem.convergence import richardson
from stressraiser.geometry.kinds.base import RaiserId
from stressraiser.geometry.partfile import load_part, parse_part, part_from_dict

from conftest import EXAMPLES, STRAP, assert_refused, toml_text

ROUND_OFF = 1e-9
W, T, D = 80.0, 10.0, 22.0  # the strap's width, thickness and hole diameter (mm)
SU = 510.0  # MPa, the ultimate strength given below
STEEL = {"E": 210000.0, "nu": 0.3, "yield": 355.0, "ultimate": SU, "family": "steel"}
LEVELS = {"tolerance": 1e-4, "max_levels": 3}  # the same three levels in every run


def _part(load, fatigue, mesh=LEVELS) -> dict:
    """The strap of conftest.STRAP in steel under `load` (a table, or a list of named cases) and `fatigue`."""
    part = copy.deepcopy(STRAP)
    part.update(title="strap with a fatigue cycle", material=dict(STEEL), load=copy.deepcopy(load),
                fatigue=dict(fatigue), mesh=dict(mesh))
    return part


def _scaled(load: dict, factor: float) -> dict:
    """The load times `factor`: every force and moment, a pin's force."""
    out = {}
    for key, value in load.items():
        out[key] = {**value, "force": factor * value["force"]} if key == "pin" else factor * value
    return out


SCREEN_NUMBERS = ("kt_net", "kf", "q", "sa_nominal_mpa", "sm_nominal_mpa", "sa_mpa", "sm_mpa", "n_f",
                  "elastic_peak_mpa")


def _same_screen(got, want) -> None:
    """Two fatigue screens agree to round-off: both notch states and every number derived from them."""
    for a, b in ((got.cycle.low, want.cycle.low), (got.cycle.high, want.cycle.high)):
        assert a.nominal_mpa == pytest.approx(b.nominal_mpa, rel=ROUND_OFF)
        assert a.peak_mpa == pytest.approx(b.peak_mpa, rel=ROUND_OFF)
    for name in SCREEN_NUMBERS:
        assert getattr(got, name) == pytest.approx(getattr(want, name), rel=ROUND_OFF, abs=1e-12), name
    assert (got.passes, got.first_cycle_yield, got.reversed_yield) == (want.passes, want.first_cycle_yield,
                                                                       want.reversed_yield)


@pytest.mark.parametrize("load, factor", [
    ({"axial": 60000.0}, 0.3),
    ({"bending": 1.2e6}, 0.4),
    ({"pin": {"hole": 1, "force": 20000.0, "direction": 0.0}}, 0.25),
], ids=["axial", "bending", "pin"])
def test_a_case_scaled_by_a_factor_gives_the_fraction_cycle(load, factor):
    cases = [{"name": "full", **load}, {"name": "part", **_scaled(load, factor)}]
    between = check_part(part_from_dict(_part(cases, {"min_case": "part", "max_case": "full"})))
    fractions = check_part(part_from_dict(_part(load, {"min_fraction": factor, "max_fraction": 1.0})))
    assert [lv.elements for lv in between.study.levels] == [lv.elements for lv in fractions.study.levels]
    f = between.fatigue
    assert (f.min_case, f.max_case, f.notch_case, f.min_fraction, f.max_fraction) == ("part", "full", "full", None, None)
    assert f.ratio == pytest.approx(factor, rel=ROUND_OFF) and f.others == ()  # both cases peak at one node
    assert (f.feature, f.location) == (fractions.fatigue.feature, fractions.fatigue.location)  # the same notch
    _same_screen(f.screen, fractions.fatigue.screen)
    assert all(r.fatigue is None for r in between.cases)  # the cycle is the part's, not a case's


def test_tension_and_compression_of_one_load_give_the_fully_reversed_cycle():
    force = 150000.0  # the hole's edge yields on the first cycle, in tension and in compression
    curve = {"cyclic_strength": 776.0, "cyclic_exponent": 0.15}
    cases = [{"name": "pull", "axial": force}, {"name": "push", "axial": -force}]
    between = check_part(part_from_dict(_part(cases, {"min_case": "push", "max_case": "pull", **curve})))
    reversed_ = check_part(part_from_dict(_part({"axial": force}, {"min_fraction": -1.0, "max_fraction": 1.0,
                                                                   **curve})))
    s = between.fatigue.screen
    _same_screen(s, reversed_.fatigue.screen)
    # hand calculation (docs/references.md [Practice]): S = F / ((W - d) t) at both extremes with opposite
    # signs, no mean stress
    nominal = force / ((W - D) * T)
    assert s.cycle.high.nominal_mpa == pytest.approx(nominal, rel=ROUND_OFF)
    assert s.cycle.low.nominal_mpa == pytest.approx(-nominal, rel=ROUND_OFF)
    assert s.cycle.low.peak_mpa == pytest.approx(-s.cycle.high.peak_mpa, rel=ROUND_OFF)
    assert abs(s.sm_mpa) <= ROUND_OFF * s.sa_mpa and s.sa_mpa == pytest.approx(s.kf * nominal, rel=ROUND_OFF)
    assert any("compresses the part along its axis: buckling is not checked" in line
               for line in between.fatigue.basis)
    # first-cycle yield and Neuber's rule from the two states (docs/references.md [Neuber], [Masing]): the first
    # extreme's sigma eps E is its elastic stress squared, the reversal's d_sigma d_eps E the elastic range
    # squared, and a fully reversed loop has no mean stress
    local, E = s.local, STEEL["E"]
    assert s.first_cycle_yield and local is not None and local.first == "high"
    assert local.high_stress_mpa * local.high_strain * E == pytest.approx(s.cycle.high.peak_mpa ** 2, rel=1e-9)
    elastic_range = s.cycle.high.peak_mpa - s.cycle.low.peak_mpa
    assert local.stress_range_mpa * local.strain_range * E == pytest.approx(elastic_range ** 2, rel=1e-9)
    assert abs(local.mean_stress_mpa) <= 1e-9 * local.stress_range_mpa
    other = reversed_.fatigue.screen.local
    assert (local.high_stress_mpa, local.low_stress_mpa) == (pytest.approx(other.high_stress_mpa, rel=ROUND_OFF),
                                                             pytest.approx(other.low_stress_mpa, rel=ROUND_OFF))


def test_goodman_factor_by_hand_from_the_two_cases_converged_peaks():
    pull, push = 60000.0, -24000.0
    cases = [{"name": "pull", "axial": pull}, {"name": "push", "axial": push}]
    result = check_part(part_from_dict(_part(cases, {"min_case": "push", "max_case": "pull"})))
    high, low = (result.case_named(name).peak.stress for name in ("pull", "push"))  # each case's converged peak
    area = (W - D) * T  # net section through the hole (hand calculation)
    s_high, s_low = pull / area, push / area
    kt_high, kt_low = high / s_high, low / s_low
    a = 0.0254 * (2068.0 / SU) ** 1.8  # Peterson's steel a (docs/references.md [Peterson-q], from memory)
    q = 1.0 / (1.0 + a / (D / 2.0))  # at the hole's radius
    n_high, n_low = s_high * (1.0 + q * (kt_high - 1.0)), s_low * (1.0 + q * (kt_low - 1.0))  # Kf x nominal
    sa, sm = 0.5 * abs(n_high - n_low), 0.5 * (n_high + n_low)
    se = 0.5 * SU  # Se' = 0.5 Su, steel (docs/references.md [Shigley], from memory)
    factor = 1.0 / (sa / se + sm / SU)  # modified Goodman, tensile mean ([Shigley], from memory)
    s = result.fatigue.screen
    assert sm > 0.0 and s.q == pytest.approx(q, rel=ROUND_OFF)
    assert s.kf == pytest.approx(1.0 + q * (kt_high - 1.0), rel=1e-8)
    assert (s.sa_mpa, s.sm_mpa) == (pytest.approx(sa, rel=1e-8), pytest.approx(sm, rel=1e-8))
    assert s.n_f == pytest.approx(factor, rel=1e-8)


@pytest.fixture(scope="module")
def hatch():
    """The bundled hatch stay link: its slam compresses the drain hole (hole 2), its opening pull peaks at
    the lightening hole (hole 1)."""
    return check_part(load_part(EXAMPLES / "hatch_stay_link.toml"))


def test_a_compressive_min_case_peaking_on_another_raiser_governs(hatch):
    f, slam, opening = hatch.fatigue, hatch.case_named("slam"), hatch.case_named("opening")
    assert slam.peak.feature == RaiserId("hole", 2) and slam.peak.stress < 0.0
    assert opening.peak.feature == RaiserId("hole", 1)
    # both peaks are screened; the slam's, the worse, governs and the opening's is reported beside it
    assert (f.notch_case, f.feature, f.location) == ("slam", RaiserId("hole", 2), slam.peak.location)
    (other,) = f.others
    assert (other.case, other.feature, other.location) == ("opening", RaiserId("hole", 1), opening.peak.location)
    assert other.n_f > f.screen.n_f
    low, high = f.screen.cycle.low, f.screen.cycle.high
    assert low.peak_mpa == slam.peak.stress  # the notch case's state is its own converged peak
    # first-cycle yield and the screen follow from the compressive extreme as from a tensile one
    assert f.screen.elastic_peak_mpa == pytest.approx(abs(low.peak_mpa), rel=ROUND_OFF)
    # nominals on hole 2's cut at x = 55 mm, ligaments y = -30..15.5 and 22.5..30 mm, t = 8 mm, by hand
    # (docs/references.md [Practice], [Timoshenko-Goodier])
    spans = np.array([[-30.0, 15.5], [22.5, 30.0]])
    lengths, middles = spans[:, 1] - spans[:, 0], spans.mean(axis=1)
    area = 8.0 * lengths.sum()
    centroid = float((lengths * middles).sum() / lengths.sum())
    inertia = 8.0 * float((lengths**3 / 12.0 + lengths * (middles - centroid) ** 2).sum())
    assert high.nominal_mpa == pytest.approx(26000.0 / area, rel=ROUND_OFF)  # the opening pull, N / A_net
    # the slam: N = -9 kN along the axis, M = -0.3 kN m at the end; about the net centroid M - N y_c (statics);
    # the larger extreme fibre of N / A + M s / I, with the sign of the notch stress (compressive)
    n, m = -9000.0, -0.3e6 - (-9000.0) * centroid
    fibres = [n / area + m * (y - centroid) / inertia for y in (-30.0, 30.0)]
    assert low.nominal_mpa == pytest.approx(-max(abs(v) for v in fibres), rel=1e-6)
    # the opening's notch stress at hole 2 against its own converged peak on hole 2's edge (Richardson over its
    # levels), within the two bands
    own = richardson([lv.raisers[RaiserId("hole", 2)][0] for lv in opening.study.levels])
    assert high.peak_mpa == pytest.approx(own.value, rel=own.error + slam.kt.error + 0.002)


def test_the_record_holds_the_cycle_between_cases(hatch):
    record = json.loads(json.dumps(check_record(hatch)))
    jsonschema.Draft202012Validator(check_schema()).validate(record)
    f = record["fatigue"]
    assert f["cycle"]["between_cases"] is True
    assert (f["cycle"]["min_case"], f["cycle"]["max_case"], f["cycle"]["min_fraction"]) == ("slam", "opening", None)
    assert f["notch"]["case"] == "slam" and f["notch"]["location"] == list(hatch.case_named("slam").peak.location)
    assert f["other_notches"][0]["case"] == "opening" and f["other_notches"][0]["feature"] == "hole 1"
    assert [c["fatigue"] for c in record["cases"]] == [None, None]


def test_a_wider_range_where_neither_case_peaks_is_named_as_not_screened(tmp_path, capsys):
    # both cases peak at the big hole on the axis; the small hole near the top edge, which the bending of the
    # min case compresses and the pull stretches, sees a wider range but neither case's peak
    part = _part([{"name": "pull", "axial": 60000.0}, {"name": "pull and bend", "axial": 60000.0, "bending": -2.0e6},
                  {"name": "bend", "bending": -2.0e6}],
                 {"min_case": "pull and bend", "max_case": "pull"}, {"tolerance": 0.02})
    part["hole"] = [{"center": [-60.0, 0.0], "diameter": 30.0}, {"center": [60.0, 25.0], "diameter": 6.0}]
    path, out = tmp_path / "part.toml", tmp_path / "out.json"
    path.write_text(toml_text(part), encoding="utf-8")
    assert main(["check", str(path), "--json", str(out)]) == 0
    printed = capsys.readouterr().out
    record = json.loads(out.read_text())
    jsonschema.Draft202012Validator(check_schema()).validate(record)
    f = record["fatigue"]
    notches = [f["notch"]["location"]] + [o["location"] for o in f["other_notches"]]  # the points screened
    assert f["feature"] == "hole 1" and all(o["feature"] == "hole 1" for o in f["other_notches"])
    wider = f["wider_range"]
    assert wider["feature"] == "hole 2" and wider["ratio"] > 2.0
    assert "a wider range elsewhere is NOT SCREENED" in printed and "NOT SCREENED: on hole 2 at (60.00, 28.00) mm" in printed
    # superposition (linear elasticity): the two cases differ by the bending alone, so the range at a free edge
    # is the bending case's edge stress there; the ratio is the bending case's at hole 2's point over the widest
    # of the screened notches'
    result = check_part(part_from_dict(part))
    bend = result.case_named("bend").solution
    nodes = bend.mesh.nodes

    def edge_stress(point):
        node = int(np.argmin(np.linalg.norm(nodes - np.asarray(point), axis=1)))
        p = bend.principal[node]
        return p[0] if abs(p[0]) >= abs(p[1]) else p[1]

    ratio = abs(edge_stress(wider["location"])) / max(abs(edge_stress(p)) for p in notches)
    assert wider["ratio"] == pytest.approx(ratio, rel=1e-6)


def test_the_goodman_figure_stays_flat_for_a_compressive_mean(hatch):
    from stressraiser.cli.plots import fatigue_figure

    s = hatch.fatigue.screen
    assert s.sm_mpa < 0.0
    line = fatigue_figure(s).axes[0].lines[0]
    x, y = line.get_data()
    # a compressive mean is not credited ([Shigley], from memory; common practice): the drawn line is Se there,
    # and the working point scaled by its factor n_f = Se / sa lies on it
    assert x[0] < s.sm_mpa and np.interp(s.sm_mpa, x, y) == pytest.approx(s.se_mpa, rel=1e-12)
    assert s.sa_mpa * s.n_f == pytest.approx(s.se_mpa, rel=1e-12)


def test_a_named_case_scaled_by_fractions_is_that_case_alone():
    light, heavy = {"name": "light", "axial": 40000.0}, {"name": "heavy", "axial": 90000.0}
    part = _part([light, heavy], {"case": "light", "min_fraction": 0.1, "max_fraction": 1.0})
    part["design"] = {"yield_factor": 1.5}
    result = check_part(part_from_dict(part))
    assert result.case == "heavy"  # the smaller design margin governs the part
    alone = check_part(part_from_dict(_part({"axial": 40000.0}, {"min_fraction": 0.1, "max_fraction": 1.0})))
    f = result.fatigue
    assert (f.min_case, f.max_case, f.between_cases) == ("light", "light", False)
    assert f is result.case_named("light").fatigue and result.case_named("heavy").fatigue is None
    _same_screen(f.screen, alone.fatigue.screen)
    assert f.forces == pytest.approx((4000.0, 40000.0), rel=ROUND_OFF)  # 0.1 and 1 x 40 kN


def test_a_named_pin_case_takes_its_cycle_in_forces():
    cases = [{"name": "pull", "axial": 60000.0}, {"name": "hoist", "pin": {"hole": 1, "force": 20000.0}}]
    spec = parse_part(toml_text(_part(cases, {"case": "hoist", "min_force": 5000.0, "max_force": 20000.0})))
    # divided by the hoist's pin force (hand calculation): 0.25 to 1
    assert (spec.fatigue.case, spec.fatigue.min_fraction, spec.fatigue.max_fraction) == ("hoist", 0.25, 1.0)


TWO = [{"name": "parked", "axial": 30000.0}, {"name": "hoist", "axial": 120000.0}]
REFUSED = [
    ("no such case", TWO, {"min_case": "parkd", "max_case": "hoist"},
     ["fatigue.min_case", "'parkd' names no load case", "'parked', 'hoist'"]),
    ("max case missing", TWO, {"min_case": "parked"}, ["fatigue.max_case", "missing", "together"]),
    ("one case twice", TWO, {"min_case": "hoist", "max_case": "hoist"},
     ["fatigue.max_case", "two different", "fatigue.case"]),
    ("a part with one load", {"axial": 120000.0}, {"min_case": "load", "max_case": "load"},
     ["fatigue.min_case", "two of them", "min_fraction"]),
    ("cases and fractions", TWO, {"min_case": "parked", "max_case": "hoist", "min_fraction": 0.0, "max_fraction": 1.0},
     ["fatigue.max_case", "one way only"]),
    ("case with two cases", TWO, {"case": "hoist", "min_case": "parked", "max_case": "hoist"},
     ["fatigue.case", "takes no case"]),
    ("fractions of which case", TWO, {"min_fraction": 0.0, "max_fraction": 1.0},
     ["fatigue.max_fraction", "several load cases", "fatigue.case", "'parked', 'hoist'", "min_case"]),
    ("forces of which case", TWO, {"min_force": 0.0, "max_force": 1.0}, ["fatigue.max_force", "several load cases"]),
    ("case names nothing", TWO, {"case": "lift", "min_fraction": 0.0, "max_fraction": 1.0},
     ["fatigue.case", "'lift' names no load case"]),
    ("case not a name", TWO, {"min_case": 1, "max_case": "hoist"}, ["fatigue.min_case", "1 names no load case"]),
    ("forces of a bending case", [{"name": "a", "axial": 1.0}, {"name": "b", "bending": 2.0}],
     {"case": "b", "min_force": 0.0, "max_force": 1.0}, ["fatigue.max_force", "load case 'b' is bending"]),
    ("a compressive case scaled", [{"name": "a", "axial": 1.0}, {"name": "b", "axial": -2.0}],
     {"case": "b", "min_fraction": 0.0, "max_fraction": 1.0}, ["load 2.axial", "tensile", "buckling"]),
]


@pytest.mark.parametrize("what, load, fatigue, words", REFUSED, ids=[r[0] for r in REFUSED])
def test_a_cycle_that_names_its_cases_wrongly_is_refused(tmp_path, capsys, what, load, fatigue, words):
    assert_refused(tmp_path, capsys, toml_text(_part(load, fatigue)), words)


def test_a_compressive_case_in_a_cycle_between_cases_is_read():
    cases = [{"name": "pull", "axial": 1.0}, {"name": "push", "axial": -1.0}]
    spec = parse_part(toml_text(_part(cases, {"min_case": "push", "max_case": "pull"})))
    assert (spec.fatigue.cycle_form, spec.fatigue.min_case, spec.fatigue.max_case) == ("cases", "push", "pull")


@pytest.mark.parametrize("condition", ["plane-stress", "plane-strain"])
def test_the_model_caution_names_the_state_used(tmp_path, condition):
    part = _part({"axial": 120000.0}, {"min_fraction": 0.0, "max_fraction": 1.0}, {"tolerance": 0.05})
    part["plate"]["condition"] = condition
    path, out = tmp_path / "part.toml", tmp_path / "out.json"
    path.write_text(toml_text(part), encoding="utf-8")
    assert main(["check", str(path), "--json", str(out), "--quiet"]) == 0
    first = json.loads(out.read_text())["cautions"][0]
    other = "plane-strain" if condition == "plane-stress" else "plane-stress"
    assert f"two-dimensional {condition} model" in first and other not in first
