"""What meshing in a child process costs (geometry/mesh_process.py): the mesh levels of a part's study
meshed in this process (geometry/meshing.py `mesh_part`) and in a MeshProcess (one child per study, as
fem/convergence.py uses it), interleaved in the same run, best of n per level, with the CPU time of the
whole study (less disturbed by other jobs on a shared machine); and a bare fork, exit and wait of this
process. Prints figures only. Usage:

    python benchmarks/mesh_process.py [PART] [--repeat 7] [--levels 4]
"""

from __future__ import annotations

import argparse
import math
import os
import time
from pathlib import Path

from measure import machine

HERE = Path(__file__).resolve().parent


def bare_fork() -> float:
    """Seconds for a fork of this process whose child exits at once, and the wait for it."""
    start = time.perf_counter()
    pid = os.fork()
    if pid == 0:
        os._exit(0)
    os.waitpid(pid, 0)
    return time.perf_counter() - start


def cpu_seconds() -> float:
    """CPU seconds of this process and of its children that have ended."""
    t = os.times()
    return t.user + t.system + t.children_user + t.children_system


def main() -> None:
    from stressraiser.fem.convergence import FIRST_SCALE, LEVEL_RATIO
    from stressraiser.geometry.mesh_process import MeshProcess
    from stressraiser.geometry.meshing import mesh_part
    from stressraiser.geometry.partfile import load_part

    parser = argparse.ArgumentParser()
    parser.add_argument("part", nargs="?", default=str(HERE.parent / "examples" / "winch_strap.toml"))
    parser.add_argument("--repeat", type=int, default=7)
    parser.add_argument("--levels", type=int, default=4)
    args = parser.parse_args()
    spec = load_part(args.part)
    scales = [FIRST_SCALE / LEVEL_RATIO ** k for k in range(args.levels)]
    print(f"machine: {machine()}")
    print(f"part: {Path(args.part).name}, {args.levels} levels (scales {', '.join(f'{s:.3f}' for s in scales)}), "
          f"best of {args.repeat}")
    here = [math.inf] * len(scales)
    child = [math.inf] * len(scales)
    elements = [0] * len(scales)
    study_here = study_child = cpu_here = cpu_child = math.inf
    for _ in range(args.repeat):
        start, cpu = time.perf_counter(), cpu_seconds()
        for k, scale in enumerate(scales):
            clock = time.perf_counter()
            elements[k] = mesh_part(spec, scale).n_elements
            here[k] = min(here[k], time.perf_counter() - clock)
        study_here, cpu_here = min(study_here, time.perf_counter() - start), min(cpu_here, cpu_seconds() - cpu)
        start, cpu = time.perf_counter(), cpu_seconds()
        with MeshProcess() as mesher:
            for k, scale in enumerate(scales):
                clock = time.perf_counter()
                mesher.mesh(spec, scale)
                child[k] = min(child[k], time.perf_counter() - clock)
        study_child, cpu_child = min(study_child, time.perf_counter() - start), min(cpu_child, cpu_seconds() - cpu)
    print(f"{'level':>5} {'elements':>9} {'in process ms':>14} {'in child ms':>12} {'cost ms':>8}")
    for k in range(len(scales)):
        print(f"{k + 1:>5} {elements[k]:>9} {1e3 * here[k]:>14.1f} {1e3 * child[k]:>12.1f} "
              f"{1e3 * (child[k] - here[k]):>+8.1f}")
    print(f"every level: in process {1e3 * study_here:.1f} ms, in a child {1e3 * study_child:.1f} ms "
          f"(the child's start and end included): {1e3 * (study_child - study_here):+.1f} ms per study, "
          f"{1e3 * (study_child - study_here) / len(scales):+.1f} ms per level")
    print(f"CPU time of every level (this process and its ended children): in process {1e3 * cpu_here:.1f} ms, "
          f"in a child {1e3 * cpu_child:.1f} ms: {1e3 * (cpu_child - cpu_here):+.1f} ms per study")
    forks = sorted(bare_fork() for _ in range(args.repeat))
    print(f"a bare fork, exit and wait of this process: best {1e3 * forks[0]:.1f} ms, median "
          f"{1e3 * forks[len(forks) // 2]:.1f} ms")


if __name__ == "__main__":
    main()
