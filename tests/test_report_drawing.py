"""How the report's figures are drawn does not change what they show: in one process or shared with a forked
child, with a child that dies, with text layouts measured once or every time, the files are the same bytes.
The expected values are the report's own figures drawn the plain way (one process, no cache): the speed-ups
must be invisible in the output.
"""

from __future__ import annotations

import os
from dataclasses import replace

import pytest
from matplotlib.text import Text

import stressraiser.cli.report as report
from stressraiser.cli.text_cache import cached_text_layouts
from stressraiser.compare.check import check_part
from stressraiser.geometry.partfile import load_part

from conftest import EXAMPLES


@pytest.fixture(scope="module")
def strap():
    spec = load_part(EXAMPLES / "winch_strap.toml")
    return check_part(replace(spec, mesh=replace(spec.mesh, tolerance=0.05, max_levels=3)))


@pytest.fixture(scope="module")
def plain(strap):
    """The figures drawn one after the other in this process, every text laid out every time it is asked."""
    return [report._render(strap, job) for job in report.figure_jobs(strap)]


def _files(figures) -> dict[str, tuple]:
    return {fig.name: fig.files for fig in figures if fig is not None}


def test_a_forked_child_draws_the_same_figures(strap, plain, monkeypatch) -> None:
    if not report._can_fork():
        pytest.skip("this platform cannot fork a process")
    monkeypatch.setattr(report, "_cores", lambda: 2)
    mine, theirs = report._share(report.figure_jobs(strap))
    assert mine and theirs  # both processes draw
    figures, beside = report.render_figures(strap, beside=lambda: os.getpid())
    assert beside == os.getpid()  # the other work runs in this process
    assert [f.name for f in figures] == [f.name for f in plain if f is not None]  # in reading order
    assert _files(figures) == _files(plain)


def test_a_child_that_dies_leaves_its_figures_to_this_process(strap, plain, monkeypatch) -> None:
    if not report._can_fork():
        pytest.skip("this platform cannot fork a process")
    monkeypatch.setattr(report, "_cores", lambda: 2)
    monkeypatch.setattr(report, "_draw_in_child", lambda send, result, jobs, parent: os._exit(9))  # dies, sends nothing
    figures, _ = report.render_figures(strap)
    assert _files(figures) == _files(plain)


def test_the_figures_are_shared_by_their_cost() -> None:
    # invented costs; the costliest first, each to the less loaded process, this one starting with 0.6 units
    # (BESIDE_COST, the fields file): b 2.4 -> child (0.6 > 0); c 1.6 -> here (0.6 <= 2.4); e 1.3 -> here
    # (2.2 <= 2.4); a 1.0 -> child (3.5 > 2.4); d 0.8 -> child (3.5 > 3.4): 3.5 units here, 4.2 in the child
    # (worked by hand)
    assert report.BESIDE_COST == 0.6
    jobs = [report.FigureJob(name, "", "", lambda r: None, cost=cost)
            for name, cost in (("a", 1.0), ("b", 2.4), ("c", 1.6), ("d", 0.8), ("e", 1.3))]
    mine, theirs = report._share(jobs)
    assert [j.name for j in mine] == ["c", "e"] and [j.name for j in theirs] == ["b", "a", "d"]


def test_text_layouts_measured_once_are_the_same(strap, plain) -> None:
    with cached_text_layouts():
        cached = [report._render(strap, job) for job in report.figure_jobs(strap)]
    assert _files(cached) == _files(plain)
    assert Text._get_layout.__name__ == "_get_layout"  # matplotlib's own again after the block
