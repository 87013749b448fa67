"""Time and size of the review report (`stressraiser check PART --report DIR`) for one part.

Prints figures only; asserts nothing. The check itself runs once; the report is then written `--repeat`
times into a temporary folder. For each figure, drawn in this process one after the other: build (with
its layout and label placement), PNG and SVG times (wall and CPU, median) and file sizes (no SVG for the
mesh and the stress map); their sum is the report's drawing work. Then the whole report as the command
writes it (the figures shared between two processes where there are two cores, the fields beside them),
and its stages. CPU time is printed beside wall time because the machines this runs on are often shared;
the CPU time of the whole report is this process's only (not the child's). Usage:

    python benchmarks/report_write.py [examples/winch_strap.toml] [--repeat 3]
"""

from __future__ import annotations

import argparse
import statistics
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent


def _timed(fn):
    wall, cpu = time.perf_counter(), time.process_time()
    value = fn()
    return value, time.perf_counter() - wall, time.process_time() - cpu


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("part", nargs="?", default=str(HERE.parent / "examples" / "winch_strap.toml"))
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()

    from stressraiser.compare.check import check_part
    from stressraiser.geometry.partfile import load_part

    (_, import_wall, import_cpu) = _timed(lambda: __import__("stressraiser.cli.report"))
    from stressraiser.cli.report import figure_bytes, figure_jobs, write_report

    result, check_wall, check_cpu = _timed(lambda: check_part(load_part(args.part)))
    mesh = result.solution.mesh
    print(f"part {args.part}: finest mesh {mesh.n_nodes} nodes, {mesh.n_elements} triangles; "
          f"check {check_wall:.2f} s wall / {check_cpu:.2f} s CPU")
    print(f"import of the report modules (matplotlib, meshio): {import_wall:.2f} s wall / {import_cpu:.2f} s CPU")

    print(f"{'figure':<14}{'build s':>9}{'render s (PNG+SVG)':>20}{'CPU s':>8}{'PNG kB':>9}{'SVG kB':>9}")
    total = [0.0, 0.0]
    for job in figure_jobs(result):
        rows = []
        for _ in range(args.repeat):
            fig, bw, bc = _timed(lambda: job.build(result))
            if fig is None:
                break
            (png, svg), rw, rc = _timed(lambda: figure_bytes(fig, svg=job.vector))
            rows.append((bw, rw, bc + rc, len(png), len(svg or b"")))
        if rows:
            med = [statistics.median(col) for col in zip(*rows)]
            total = [total[0] + med[0] + med[1], total[1] + med[2]]
            svg_kb = f"{med[4] / 1e3:>9.0f}" if job.vector else f"{'-':>9}"
            print(f"{job.name:<14}{med[0]:>9.2f}{med[1]:>20.2f}{med[2]:>8.2f}{med[3] / 1e3:>9.0f}{svg_kb}")
    print(f"{'all figures':<14}{total[0]:>29.2f}{total[1]:>8.2f}   (one after the other, one process)")

    totals = []
    with tempfile.TemporaryDirectory() as tmp:
        for k in range(args.repeat):
            written, wall, cpu = _timed(lambda: write_report(result, Path(tmp) / f"r{k}", part_file=args.part))
            totals.append((wall, cpu, written.seconds))
        sizes = {p.relative_to(written.directory).as_posix(): p.stat().st_size for p in written.paths}
    wall = statistics.median(t[0] for t in totals)
    cpu = statistics.median(t[1] for t in totals)
    stages = {key: statistics.median(t[2][key] for t in totals) for key in totals[0][2]}
    print(f"whole report: {wall:.2f} s wall / {cpu:.2f} s CPU of this process (median of {args.repeat}); stages "
          + ", ".join(f"{k} {v:.2f} s" for k, v in stages.items()))
    print(f"files: {len(sizes)}, total {sum(sizes.values()) / 1e6:.2f} MB; report.html {sizes['report.html'] / 1e6:.2f} MB, "
          f"part.vtu {sizes['part.vtu'] / 1e3:.0f} kB, check.json {sizes['check.json'] / 1e3:.0f} kB")


if __name__ == "__main__":
    main()
