"""Where batch cases run: the local pool survives a worker that dies, and a Dask cluster gives the same
numbers as the local pool."""

from __future__ import annotations

import json

import pytest

from stressraiser.cli import batch
from stressraiser.cli.batch import STATUS_CRASHED, Execution, execute, run_case
from stressraiser.cli.main import main

from crash_runners import crash_on_request
from test_sweep import write_plate


def test_a_dying_worker_fails_only_its_own_case():
    jobs = [(f"case{n}", {"n": n, "crash": n in (1, 4)}) for n in range(6)]
    rows = dict(execute(jobs, Execution(workers=2), runner=crash_on_request))
    assert set(rows) == {key for key, _ in jobs}
    for n in range(6):
        row = rows[f"case{n}"]
        if n in (1, 4):
            assert row["status"] == STATUS_CRASHED and "worker process died" in row["error"]
        else:
            assert row["status"] == "ok" and row["kt_net"] == n


def test_bad_part_is_a_row_not_an_exception():
    row = run_case({"plate": {"length": 100.0}})
    assert row["status"] == "input" and "plate.width" in row["error"]


def test_dask_cluster_gives_the_same_numbers_as_the_local_pool(tmp_path):
    distributed = pytest.importorskip("dask.distributed")
    part = write_plate(tmp_path, 0.02)
    vary = ["--vary", "hole.1.diameter=20,40"]
    assert main(["sweep", str(part), *vary, "--out", str(tmp_path / "local"), "--workers", "2"]) == 0
    # processes=True: each Dask worker is its own process (gmsh is a global library); loopback only
    with distributed.LocalCluster(n_workers=1, threads_per_worker=1, processes=True, host="127.0.0.1",
                                  dashboard_address=None) as cluster:
        assert main(["sweep", str(part), *vary, "--out", str(tmp_path / "dask"),
                     "--scheduler", cluster.scheduler_address]) == 0
    local = json.loads((tmp_path / "local" / "sweep.json").read_text())["rows"]
    remote = json.loads((tmp_path / "dask" / "sweep.json").read_text())["rows"]
    for a, b in zip(local, remote, strict=True):
        a.pop("seconds"), b.pop("seconds")
        assert a == b  # deterministic: the same part gives the same mesh and the same numbers anywhere


def test_unreachable_scheduler_is_an_input_error(tmp_path, capsys, monkeypatch):
    pytest.importorskip("dask.distributed")
    monkeypatch.setattr(batch, "CONNECT_TIMEOUT", "1s")
    part = write_plate(tmp_path, 0.02)
    # port 9 on loopback (discard): nothing listens there
    code = main(["sweep", str(part), "--vary", "hole.1.diameter=20,40", "--out", str(tmp_path / "x"),
                 "--scheduler", "tcp://127.0.0.1:9"])
    assert code == 2
    assert "--scheduler: cannot reach a Dask scheduler at 'tcp://127.0.0.1:9'" in capsys.readouterr().err
