"""Many independent checks at once: a local pool of worker processes, or an existing Dask cluster.

Each case is a part-file dictionary checked from scratch by `run_case` in a worker: nothing is shared or
reused between cases, so every result is the one `stressraiser check` gives for that part alone, whatever
the order or the worker. gmsh is a global C library, so a worker process checks one case at a time (a lock
guards it even when a Dask worker runs several threads).

A case that fails (a part the reader refuses, a mesher or solver failure, a bug, a worker process that
died) comes back as a row with its status and the error text; the other cases go on.
"""

from __future__ import annotations

import argparse
import math
import multiprocessing
import os
import signal
import threading
import time
import uuid
from collections.abc import Callable, Iterator, Sequence
from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
from concurrent.futures.process import BrokenProcessPool
from dataclasses import dataclass
from typing import Any

from ..geometry.errors import PartError
from .errors import CommandLineError, SchedulerError

STATUS_OK = "ok"
STATUS_INPUT = "input"  # the part-file reader refused the case (bad geometry or value)
STATUS_NUMERICS = "numerics"  # the mesher or the solver failed
STATUS_INTERNAL = "internal"  # an unexpected error (a bug) or an error on the cluster
STATUS_CRASHED = "crashed"  # the worker process died while the case was on it
RETRY_ON_RESUME = frozenset({STATUS_INTERNAL, STATUS_CRASHED})  # deterministic failures are not retried
CONNECT_TIMEOUT = "10s"  # to reach a Dask scheduler

WORKER_PRELOAD = ("stressraiser.compare.check", "stressraiser.geometry.partfile", "stressraiser.cli.batch")
Runner = Callable[[dict], dict]
_ONE_CHECK_AT_A_TIME = threading.Lock()


@dataclass(frozen=True)
class Execution:
    """Where the cases run: a local pool of `workers` processes (None: one per usable core), or the Dask
    cluster whose scheduler is at `scheduler` (e.g. "tcp://scheduler.example:8786")."""

    workers: int | None = None
    scheduler: str | None = None


def run_case(part: dict) -> dict:
    """Check one part-file dictionary and return its row (plain JSON-ready data, mm / N / MPa).

    Never raises for a failed case: the row's `status` is one of ok / input / numerics / internal and
    `error` holds the one-line reason."""
    from ..compare.check import check_part
    from ..fem.solve import SolverError
    from ..geometry.meshing import MeshError
    from ..geometry.partfile import part_from_dict

    with _ONE_CHECK_AT_A_TIME:
        start = time.perf_counter()
        try:
            row = summary_row(check_part(part_from_dict(part)))
        except PartError as exc:
            row = failed_row(STATUS_INPUT, str(exc))
        except (MeshError, SolverError) as exc:
            row = failed_row(STATUS_NUMERICS, str(exc))
        except Exception as exc:  # a bug: reported in the row so that the other cases go on
            row = failed_row(STATUS_INTERNAL, f"{type(exc).__name__}: {exc}")
        row["seconds"] = time.perf_counter() - start
    return row


def summary_row(result) -> dict[str, Any]:
    """The numbers of one CheckResult that a table of many cases shows (mm, N, MPa; kt_error relative).

    kt_net / kt_gross / kt_error / converged are the part's governing peak (what signs the part off).
    case_raiser / case_kt_net / case_kt_gross / case_kt_error / case_converged are those of the raiser the
    preferred handbook case describes (compare/case_kt.py: the middle hole of a row of holes), the Kt a
    handbook comparison uses; when the case describes the part's peak, or no case covers the part, they
    equal the governing values and case_raiser is the governing feature. A part with several load cases
    gives the governing case's numbers (load_case names it; compare.check.governing_case) and, under
    load_cases, each case's name, Kt, band, convergence, peak and where it is."""
    from ..compare.case_kt import case_kt
    from ..geometry.registry import raiser_label

    preferred = result.handbook[0] if result.handbook else None
    described = case_kt(result, preferred)
    row = {
        "status": STATUS_OK,
        "error": None,
        "peak": result.peak.stress,
        "peak_fe": result.peak.fe_stress,
        "peak_x": result.peak.location[0],
        "peak_y": result.peak.location[1],
        "feature": raiser_label(result.peak.feature),
        "average": result.net_section.average,
        "gross_average": result.gross_average,
        "kt_net": result.kt.net,
        "kt_gross": result.kt.gross,
        "kt_error": result.kt.error,
        "converged": bool(result.kt.converged),
        "equilibrium_error": result.net_section.equilibrium_error,
        "levels": len(result.study.levels),
        "elements": int(result.study.levels[-1].elements),
        "handbook_case": preferred.case.key if preferred else None,
        "handbook_kt_net": preferred.kt_net if preferred else None,
        "handbook_kt_gross": preferred.kt_gross if preferred else None,
        "handbook_in_range": bool(preferred.in_range) if preferred else None,
        "case_raiser": raiser_label(described.raiser),
        "case_kt_net": described.kt_net,
        "case_kt_gross": described.kt_gross,
        "case_kt_error": described.error,
        "case_converged": described.converged,
        "load_case": result.case,
    }
    row = {k: _plain(v) for k, v in row.items()}
    row["load_cases"] = [load_case_entry(r) for r in result.every_case]
    return row


def load_case_entry(result) -> dict[str, Any]:
    """One load case's numbers in a batch row (plain data, MPa)."""
    from ..geometry.registry import raiser_label

    entry = {"name": result.case, "kt_net": result.kt.net, "kt_gross": result.kt.gross, "kt_error": result.kt.error,
             "converged": bool(result.kt.converged), "peak": result.peak.stress,
             "feature": raiser_label(result.peak.feature)}
    return {k: _plain(v) for k, v in entry.items()}


def load_cases_text(entries: list[dict[str, Any]] | None) -> str:
    """A row's load cases on one line, for a table cell: "working: Kt 2.395 ±0.65%; proof: ..."."""
    def one(e: dict[str, Any]) -> str:
        kt = f"Kt {e['kt_net']:.3f}" if e.get("kt_net") is not None else "Kt —"
        band = f" ±{e['kt_error']:.2%}" if e.get("kt_error") is not None else ""
        return f"{e['name']}: {kt}{band}" + ("" if e.get("converged") else " NOT converged")
    return "; ".join(one(e) for e in entries or [])


def _plain(value: Any) -> Any:
    """A JSON-ready number: numpy scalars as Python floats, NaN or infinity (JSON has neither) as None."""
    if isinstance(value, (str, bool, int)) or value is None:
        return value
    value = float(value)
    return value if math.isfinite(value) else None


ROW_FIELDS = (  # every key of a row, in table order
    "status", "error", "peak", "peak_fe", "peak_x", "peak_y", "feature", "average", "gross_average", "kt_net",
    "kt_gross", "kt_error", "converged", "equilibrium_error", "levels", "elements", "handbook_case",
    "handbook_kt_net", "handbook_kt_gross", "handbook_in_range", "case_raiser", "case_kt_net", "case_kt_gross",
    "case_kt_error", "case_converged", "load_case", "load_cases", "seconds",
)


def failed_row(status: str, error: str) -> dict[str, Any]:
    """A row for a case that produced no result."""
    row: dict[str, Any] = dict.fromkeys(ROW_FIELDS)
    row.update(status=status, error=error, seconds=0.0)
    return row


def usable_cores() -> int:
    """Cores this process may run on (the affinity mask where the system has one)."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not on Linux
        return max(1, os.cpu_count() or 1)


def execute(jobs: Sequence[tuple[str, dict]], execution: Execution, runner: Runner = run_case
            ) -> Iterator[tuple[str, dict]]:
    """Run every (key, part) job and yield (key, row) as each one finishes, in finishing order."""
    if not jobs:
        return iter(())
    if execution.scheduler:
        return _on_cluster(jobs, execution.scheduler, runner)
    return _on_local_pool(jobs, execution.workers or usable_cores(), runner)


def run_batch(jobs: Sequence[tuple[str, dict]], execution: Execution, on_done: Callable[[str, dict], None],
              label: str, runner: Runner = run_case, show_progress: bool = True) -> dict[str, dict]:
    """Run the jobs with a progress bar on stderr (cases done, failed, remaining; shown on a terminal).
    `on_done(key, row)` is called in this process as each case finishes. Returns every row by key."""
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from .terminal import err_console

    rows: dict[str, dict] = {}
    failed = 0
    columns = (TextColumn("{task.description}"), BarColumn(),
               TextColumn("{task.fields[done]} done, {task.fields[failed]} failed, {task.fields[left]} remaining"),
               TimeElapsedColumn())
    console = err_console()
    # live on a terminal only (as cli/progress.py): redirected output stays clean, and the command's
    # summary on stdout gives the same counts
    progress = Progress(*columns, console=console, disable=not (show_progress and console.is_terminal))
    with progress:
        task = progress.add_task(label, total=len(jobs), done=0, failed=0, left=len(jobs))
        for key, row in execute(jobs, execution, runner):
            rows[key] = row
            failed += row["status"] != STATUS_OK
            on_done(key, row)
            progress.update(task, advance=1, done=len(rows), failed=failed, left=len(jobs) - len(rows))
    return rows


def add_execution_options(parser: argparse.ArgumentParser) -> None:
    """The options that choose where cases run (shared by the batch commands)."""
    parser.add_argument("--workers", type=_worker_count, metavar="N",
                        help=f"local worker processes (default: one per usable core, here {usable_cores()})")
    parser.add_argument("--scheduler", metavar="ADDRESS",
                        help="run the cases on an existing Dask cluster whose scheduler is at ADDRESS "
                             "(needs the [cluster] extra, and stressraiser installed on its workers)")


def execution_from_args(args: argparse.Namespace) -> Execution:
    if args.scheduler and args.workers:
        raise CommandLineError("--workers: applies to the local pool only; the cluster's workers run the cases "
                        "when --scheduler is given")
    return Execution(workers=args.workers, scheduler=args.scheduler)


def _worker_count(text: str) -> int:
    if not text.isdigit() or not 1 <= int(text) <= 4096:
        raise argparse.ArgumentTypeError(f"must be a whole number from 1 to 4096; got {text!r}")
    return int(text)


# --- local pool ---------------------------------------------------------------------------------------

def _pool_context() -> multiprocessing.context.BaseContext:
    """Fresh interpreters for the workers (forkserver where the system has it, else spawn): never a fork
    of this process, whose gmsh or thread state must not leak into a worker."""
    if "forkserver" not in multiprocessing.get_all_start_methods():
        return multiprocessing.get_context("spawn")
    context = multiprocessing.get_context("forkserver")
    # the server imports the solver's libraries once; each worker forked from it starts with them loaded
    context.set_forkserver_preload(list(WORKER_PRELOAD))
    return context


def _on_local_pool(jobs: Sequence[tuple[str, dict]], workers: int, runner: Runner) -> Iterator[tuple[str, dict]]:
    """Yield rows from a pool of worker processes.

    A worker that dies (a crash inside the mesher, say) breaks the pool. Each worker reports the key of a
    case as it starts it, so the cases on a dead pool's workers are known: if one was running, it is the
    culprit and is reported as crashed; if several were, each is run again alone (one worker) to find out;
    the cases not yet started go on in a new pool."""
    pending = dict(jobs)
    suspects: set[str] = set()
    while pending:
        alone = [key for key in pending if key in suspects]
        keys = alone or list(pending)
        running = yield from _one_pool(keys, pending, 1 if alone else min(workers, len(keys)), runner)
        if running is None:
            continue
        if len(running) == 1 or (alone and running):
            blamed = running.pop()
            del pending[blamed]
            suspects.discard(blamed)
            yield blamed, failed_row(STATUS_CRASHED, "the worker process died while checking this case (a crash "
                                                     "in the mesher or solver, or out of memory)")
        elif running:
            suspects |= running
        else:  # no case had started: the workers themselves could not start
            for key in keys:
                if key in pending:
                    del pending[key]
                    yield key, failed_row(STATUS_CRASHED, "the worker processes died before starting any case")


def _one_pool(keys: list[str], pending: dict[str, dict], size: int, runner: Runner):
    """Run `keys` on a fresh pool of `size` workers, yielding rows and removing finished keys from
    `pending`. Returns None when every case finished, else (the pool broke) the keys that had started but
    not finished."""
    context = _pool_context()
    starts = context.SimpleQueue()
    pool = ProcessPoolExecutor(max_workers=size, mp_context=context, initializer=_worker_setup,
                               initargs=(starts, os.getpid()))
    clean = False
    try:
        futures = {pool.submit(_tracked, runner, key, pending[key]): key for key in keys}
        waiting = set(futures)
        while waiting:
            finished, waiting = wait(waiting, return_when=FIRST_COMPLETED)
            for future in finished:
                key = futures[future]
                try:
                    row = future.result()
                except BrokenProcessPool:
                    started = set()
                    while not starts.empty():
                        started.add(starts.get())
                    return {k for k in started if k in pending}
                except Exception as exc:  # e.g. the job could not be sent to the worker
                    row = failed_row(STATUS_INTERNAL, f"{type(exc).__name__}: {exc}")
                del pending[key]
                yield key, row
        clean = True
        return None
    finally:
        if not clean:  # interrupted, broken, or the consumer stopped early: do not wait for running cases
            for process in list((getattr(pool, "_processes", None) or {}).values()):
                process.terminate()
        pool.shutdown(wait=clean, cancel_futures=True)
        starts.close()


_STARTS = None  # in a worker: where it reports the key of each case it starts


def _worker_setup(starts, command: int) -> None:
    """In each worker: keep the queue for start reports, ignore Ctrl-C (the terminal sends it to the whole
    process group; the parent stops the workers), and end with the command's process `command` however it
    ends, even by SIGKILL (geometry/process_lifetime.py): a worker left behind holds its memory and the
    terminal's standard error. The pool's fork server ends by itself once no worker is left."""
    from ..geometry.process_lifetime import end_with

    global _STARTS
    _STARTS = starts
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    end_with(command)


def _tracked(runner: Runner, key: str, part: dict) -> dict:
    """Report the case's key as started (written before the case runs), then run it."""
    if _STARTS is not None:
        _STARTS.put(key)
    return runner(part)


# --- Dask cluster -------------------------------------------------------------------------------------

def _on_cluster(jobs: Sequence[tuple[str, dict]], address: str, runner: Runner) -> Iterator[tuple[str, dict]]:
    """Yield rows from the Dask cluster at `address`; each job is one task with a key of its own."""
    try:
        from dask.distributed import Client, as_completed
    except ImportError:
        raise SchedulerError("--scheduler: Dask is not installed; install the cluster extra "
                        "(pip install 'stressraiser[cluster]')") from None
    try:
        client = Client(address, timeout=CONNECT_TIMEOUT, set_as_default=False)
    except Exception as exc:  # unreachable, refused, or not an address
        raise SchedulerError(f"--scheduler: cannot reach a Dask scheduler at {address!r} ({type(exc).__name__}: {exc})") from None
    run_id = uuid.uuid4().hex[:12]
    try:
        keys = [key for key, _ in jobs]
        futures = client.map(runner, [part for _, part in jobs], key=[f"stressraiser-{run_id}-{k}" for k in keys])
        owner = {future.key: key for future, key in zip(futures, keys)}
        for future in as_completed(futures, loop=client.loop):
            key = owner[future.key]
            try:
                row = future.result()
            except Exception as exc:  # the task failed on the cluster: lost workers, missing package, ...
                row = failed_row(STATUS_CRASHED if type(exc).__name__ == "KilledWorker" else STATUS_INTERNAL,
                                 f"on the cluster: {type(exc).__name__}: {exc}")
            future.release()
            yield key, row
    finally:
        client.close()
