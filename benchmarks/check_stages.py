"""Wall time of the whole `stressraiser check` process on the bundled examples, and of each stage.

First the start-up of the command-line process (see `startup`). For each part: the whole console process
(interpreter start, imports, meshing, solving, output), best of n, then the per-level stage times measured in-process (mesh, assemble, solve, recover) with the solver
each level used, and Kt against the preferred handbook case. `--order 2` checks a copy of each part file
with quadratic triangles. `--report` also times the whole process with `--report DIR` (the review report
written into a temporary folder), beside the same command without it, run for run. Prints figures only;
asserts nothing about time. Usage:

    python benchmarks/check_stages.py [PART ...] [--repeat 3] [--order 1|2] [--report]
"""

from __future__ import annotations

import argparse
import json
import os
import re
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from measure import machine

HERE = Path(__file__).resolve().parent
EXAMPLES = HERE.parent / "examples"


def with_order(text: str, order: int) -> str:
    """The part-file text with [mesh] order set (the table is added when the file has none)."""
    if order == 1:
        return text
    if re.search(r"^\[mesh\]\s*$", text, flags=re.M):
        return re.sub(r"^\[mesh\]\s*$", f"[mesh]\norder = {order}", text, count=1, flags=re.M)
    return text + f"\n[mesh]\norder = {order}\n"


def whole_process(part: Path, repeat: int, report: bool = False) -> tuple[list[float], dict]:
    """Time the console command end to end, as an installed copy runs: with the package's compiled
    bytecode cached (pip compiles it at install; PYTHONDONTWRITEBYTECODE, if set here, would make every
    run recompile the sources, about 0.15 s), after one untimed run that writes the cache. With `report`,
    the command also writes the review report (`--report`) into a temporary folder."""
    times, record = [], {}
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "r.json"
        command = [sys.executable, "-m", "stressraiser", "check", str(part), "--json", str(out), "--quiet"]
        command += ["--report", str(Path(tmp) / "review")] if report else []
        subprocess.run(command, check=False, capture_output=True, env=env)
        for _ in range(repeat):
            start = time.perf_counter()
            subprocess.run(command, check=False, capture_output=True, env=env)
            times.append(time.perf_counter() - start)
        if out.exists():
            record = json.loads(out.read_text())
    return times, record


LIBRARIES = "import rich.console, stressraiser.fem.solve, stressraiser.geometry.meshing"


def startup(repeat: int) -> None:
    """Start-up of the command-line process: `stressraiser --version` as the console script runs it
    (cli.main.entry loads the libraries with the cyclic garbage collector paused, then freezes them), and,
    in the same run, the same libraries loaded with the collector running and with it paused: what the
    pause saves."""
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    commands = {
        "stressraiser --version (entry point)": [sys.executable, "-m", "stressraiser", "--version"],
        "the libraries, collector running": [sys.executable, "-c", LIBRARIES],
        "the libraries, collector paused": [sys.executable, "-c", f"import gc; gc.disable(); {LIBRARIES}; "
                                            "gc.freeze(); gc.enable()"],
    }
    best = dict.fromkeys(commands, float("inf"))
    for counted in [False] + [True] * repeat:  # the first round writes the bytecode caches
        for name, command in commands.items():
            start = time.perf_counter()
            subprocess.run(command, check=False, capture_output=True, env=env)
            if counted:
                best[name] = min(best[name], time.perf_counter() - start)
    print(f"start-up, best of {repeat}: " + "; ".join(f"{name} {t:.3f} s" for name, t in best.items()))


def with_report(part: Path, repeat: int) -> None:
    """The whole process with and without --report, alternating run for run (a shared machine's load then
    falls on both alike), best and all runs of each."""
    plain, reported = [], []
    for _ in range(repeat):
        plain += whole_process(part, 1)[0]
        reported += whole_process(part, 1, report=True)[0]
    for name, times in (("check", plain), ("check --report", reported)):
        print(f"{name:>15}: min {min(times):.2f} s over {len(times)} runs (all: "
              + ", ".join(f"{t:.2f}" for t in times) + ")")
    print(f"the report adds {min(reported) - min(plain):.2f} s (best against best)")


def stages(part: Path) -> list[dict]:
    """Per-level stage times measured in-process."""
    from stressraiser.compare.check import check_part
    from stressraiser.geometry.partfile import load_part

    result = check_part(load_part(part))
    return [dict(nodes=lv.nodes, elements=lv.elements, dofs=2 * lv.nodes, peak=lv.peak, solver=lv.solver, **lv.seconds)
            for lv in result.study.levels]


def report(part: Path, repeat: int) -> None:
    times, record = whole_process(part, repeat)
    print(f"\npart: {part.name}")
    if not record:
        print("  the check failed (no JSON record)")
        return
    print(f"whole check process: min {min(times):.2f} s over {len(times)} runs (all: "
          + ", ".join(f"{t:.2f}" for t in times) + ")")
    rows = stages(part)
    print(f"{'level':>5} {'DOFs':>8} {'elements':>9} {'mesh s':>7} {'assemble s':>10} {'solve s':>8} {'recover s':>9} "
          f"{'solver':>8} {'peak MPa':>9}")
    for i, r in enumerate(rows, 1):
        print(f"{i:>5} {r['dofs']:>8} {r['elements']:>9} {r['mesh']:>7.3f} {r['assemble']:>10.3f} {r['solve']:>8.3f} "
              f"{r['recover']:>9.3f} {r['solver']:>8} {r['peak']:>9.2f}")
    totals = {k: sum(r.get(k, 0.0) for r in rows) for k in ("mesh", "assemble", "solve", "recover")}
    print("stage totals: " + ", ".join(f"{k} {v:.3f} s" for k, v in totals.items()))
    kt = record["kt"]
    print(f"Kt net {kt['net']:.4f} ± {kt['error']:.2%} (converged: {kt['converged']}), levels {len(rows)}")
    hb = record.get("handbook")
    if hb and hb.get("kt_net"):
        print(f"handbook {hb['case']}: Kt net {hb['kt_net']:.4f}; FE differs by {kt['net'] / hb['kt_net'] - 1:+.3%}")


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("parts", nargs="*", help="part files (default: every bundled example)")
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--order", type=int, choices=(1, 2), default=1)
    parser.add_argument("--report", action="store_true", help="time the command with and without --report")
    args = parser.parse_args()
    parts = [Path(p) for p in args.parts] or sorted(EXAMPLES.glob("*.toml"))
    print(f"machine: {machine()}")
    if args.report:
        for part in parts:
            print(f"\npart: {part.name}")
            with_report(part, args.repeat)
        return
    print(f"element order {args.order}")
    startup(args.repeat)
    with tempfile.TemporaryDirectory() as tmp:
        for part in parts:
            if args.order != 1:
                copy = Path(tmp) / part.name
                copy.write_text(with_order(part.read_text(encoding="utf-8"), args.order), encoding="utf-8")
                part = copy
            report(part, args.repeat)


if __name__ == "__main__":
    main()
