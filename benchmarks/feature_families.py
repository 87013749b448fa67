"""Time and mesh levels to convergence for one example of each raiser family, with the level peaks and
how steadily they converge.

Prints figures only; asserts nothing. For each example: the number of levels, the finest mesh, the wall
time of the whole check, Kt with its band and how it was estimated, the handbook value where a case
covers the part, the peak of every level and the ratio of successive level-to-level differences (about
2 for second-order convergence under the sqrt(2) refinement; steady ratios are what Richardson needs).

Usage:
    python benchmarks/feature_families.py [--tolerance 0.01] [--layers 8 --ratio 1.15] [EXAMPLE.toml ...]
"""

from __future__ import annotations

import argparse
import os
import platform
import sys
import time
from dataclasses import replace
from pathlib import Path

HERE = Path(__file__).resolve().parent
FAMILIES = {  # family -> bundled example
    "holes": "trailer_hitch_bracket.toml",
    "ellipse": "greenhouse_vent_arm.toml",
    "slot": "conveyor_take_up_link.toml",
    "notches": "fence_tensioner_strap.toml",
    "step": "shelf_bracket_tenon.toml",
    "lug": "sailboat_chainplate_lug.toml",
}


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("parts", nargs="*", help="part files (default: one bundled example per family)")
    parser.add_argument("--tolerance", type=float, help="override mesh.tolerance")
    parser.add_argument("--layers", type=int, help="structured layers at raiser edges (default: the mesher's)")
    parser.add_argument("--ratio", type=float, help="thickness ratio of successive layers")
    args = parser.parse_args()

    from stressraiser.compare.check import check_part
    from stressraiser.geometry import meshing
    from stressraiser.geometry.partfile import load_part

    if args.layers or args.ratio:
        sizing = meshing.Sizing()
        sizing = replace(sizing, layers=args.layers or sizing.layers, layer_ratio=args.ratio or sizing.layer_ratio)
        meshing.mesh_part.__defaults__ = (1.0, sizing)  # the study calls mesh_part(spec, scale)
    print(f"machine: {platform.machine()} {os.cpu_count()} cores, Python {platform.python_version()}; "
          f"bands: {meshing.mesh_part.__defaults__[1].layers} layers x {meshing.mesh_part.__defaults__[1].layer_ratio}")
    parts = [(Path(p).stem, Path(p)) for p in args.parts] or [(f, HERE.parent / "examples" / e) for f, e in FAMILIES.items()]
    print(f"{'family':<10} {'levels':>6} {'elements':>9} {'time s':>7} {'Kt net':>7} {'band':>7} {'method':<11} "
          f"{'handbook':>8} {'FE-hb':>7}  level peaks (MPa) | difference ratios")
    for family, path in parts:
        spec = load_part(path)
        if args.tolerance:
            spec = replace(spec, mesh=replace(spec.mesh, tolerance=args.tolerance))
        start = time.perf_counter()
        result = check_part(spec)
        seconds = time.perf_counter() - start
        peaks = [lv.peak for lv in result.study.levels]
        diffs = [b - a for a, b in zip(peaks, peaks[1:])]
        ratios = [a / b if b else float("inf") for a, b in zip(diffs, diffs[1:])]
        hb = result.handbook[0] if result.handbook else None
        hb_text = f"{hb.kt_net:8.3f} {result.kt.net / hb.kt_net - 1:+7.2%}" if hb else f"{'—':>8} {'':>7}"
        print(f"{family:<10} {len(peaks):>6} {result.study.levels[-1].elements:>9} {seconds:>7.2f} {result.kt.net:>7.3f} "
              f"{result.kt.error:>7.2%} {result.study.estimate.method:<11} {hb_text}  "
              + " ".join(f"{p:.2f}" for p in peaks) + " | " + " ".join(f"{r:.2f}" for r in ratios))
        sys.stdout.flush()


if __name__ == "__main__":
    main()
