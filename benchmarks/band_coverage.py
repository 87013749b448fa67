"""Does the error band contain the answer? The check's converged peak and band against a much finer
quadratic study of the same raiser, on one part of every raiser family, in tension and in-plane bending,
and pin-loaded lugs (cosine pressure and a rigid pin with clearance).

Prints figures only; asserts nothing. For each case: the check as a user runs it (linear triangles, the
part's mesh.tolerance, default 1 %) — the governing raiser, its converged peak, band, how it was
estimated (Roache's factor of safety, observed order), levels and finest DOFs; then the reference: the
same raiser's peak on quadratic triangles (mesh.order = 2) refined by sqrt(2) per level from scale 1 until
the finest level has at least REFERENCE_GROWTH times the DOFs of the check's finest level and at least
REFERENCE_LEVELS levels; its finest value, its last change, and whether the check's band contains it.

The reference studies are cached (in the temp folder, keyed by the part description) so that a change to
the estimator can be re-measured without re-solving them; --fresh ignores the cache.

Then the observed orders of the governing raiser's peak over the check's linear levels and the reference's
quadratic levels: the measurement behind fem.convergence.FORMAL_ORDER.

Usage:
    python benchmarks/band_coverage.py [--fresh] [--only NAME ...] [--order-tolerance 0.1]
"""

from __future__ import annotations

import argparse
import hashlib
import json
import math
import os
import platform
import tempfile
import time
from pathlib import Path

REFERENCE_GROWTH = 6.0  # the reference's finest level has at least this many times the check's finest DOFs
REFERENCE_LEVELS = 6  # and at least this many quadratic levels
REFERENCE_MAX_NODES = 450_000  # and stops before a level would exceed this many nodes
CACHE = Path(tempfile.gettempdir()) / "stressraiser-band-coverage"

STEEL = {"E": 210000.0, "nu": 0.3}


def _plate(title, length, width, load, **raisers):
    return {"title": title, "plate": {"length": length, "width": width, "thickness": 10.0},
            "material": dict(STEEL), "load": load, **raisers}


def cases() -> dict[str, dict]:
    """The parts (part-file dictionaries, mm, N, MPa): invented proportions inside the families' ranges."""
    from stressraiser.compare.handbook import BUILDERS

    return {
        "central hole, tension": BUILDERS["central-hole-tension"]({"d/W": 0.3}),
        "offset hole, tension": _plate("offset hole", 320.0, 80.0, {"axial": 80000.0},
                                       hole=[{"center": [0.0, 22.0], "diameter": 16.0}]),
        "hole, bending": _plate("hole off the neutral axis", 400.0, 100.0, {"bending": 1.5e7},
                                hole=[{"center": [0.0, 25.0], "diameter": 20.0}]),
        "ellipse at 30°, tension": BUILDERS["elliptical-hole-wide-plate"]({"a/b": 2.0, "load angle": 30.0,
                                                                          "hole span/W": 0.04}),
        "slot, tension": _plate("obround slot", 400.0, 100.0, {"axial": 100000.0},
                                slot=[{"center": [0.0, 0.0], "length": 40.0, "width": 12.0, "angle": 90.0}]),
        "U notches, tension": BUILDERS["opposite-u-notches"]({"h/r": 2.0, "2h/D": 0.3}),
        "U notches, bending": BUILDERS["opposite-u-notches-bending"]({"h/r": 2.0, "2h/D": 0.3}),
        "V notches, tension": _plate("V notches", 360.0, 60.0, {"axial": 60000.0},
                                     notch=[{"x": 0.0, "side": "both", "shape": "V", "depth": 8.0, "radius": 2.0,
                                             "angle": 60.0}]),
        "semicircular notches, tension": BUILDERS["opposite-semicircular-notches"]({"2r/D": 0.3}),
        "edge U notch, tension": BUILDERS["edge-u-notch-semi-infinite"]({"h/r": 3.0, "h/W": 0.015}),
        "shoulder D/d 2, r/d 0.1, tension": BUILDERS["stepped-bar-fillets"]({"h/r": 5.0, "2h/D": 0.5}),
        "shoulder, bending": BUILDERS["stepped-bar-fillets-bending"]({"h/r": 2.0, "2h/D": 0.3}),
        "row of 7 holes, tension": BUILDERS["row-of-holes"]({"d/l": 0.4, "holes": 7.0}),
        "square lug, cosine pin": _plate("square-ended lug", 200.0, 60.0,
                                         {"pin": {"hole": 1, "force": 30000.0, "contact": "cosine"}},
                                         hole=[{"center": [40.0, 0.0], "diameter": 24.0}]),
        "round lug, rigid pin, 1 mm clearance": {
            **_plate("round-ended lug", 200.0, 60.0,
                     {"pin": {"hole": 1, "force": 30000.0, "contact": "rigid", "clearance": 1.0}},
                     hole=[{"center": [70.0, 0.0], "diameter": 24.0}]),
            "lug": {"hole": 1}},
    }


def reference(part: dict, name: str, compressive: bool, check_nodes: int, fresh: bool) -> dict:
    """The quadratic study of `part`: every level's nodes and the candidate `name`'s peak (cached)."""
    from stressraiser.fem.analysis import solve_part
    from stressraiser.fem.convergence import LEVEL_RATIO
    from stressraiser.fem.raiser_peaks import raiser_peaks
    from stressraiser.geometry.meshing import mesh_part
    from stressraiser.geometry.partfile import part_from_dict

    data = {**part, "mesh": {"order": 2, "max_elements": 4_000_000}}
    key = hashlib.sha256(json.dumps([data, str(name), compressive], sort_keys=True).encode()).hexdigest()[:16]
    path = CACHE / f"{key}.json"
    if path.exists() and not fresh:
        cached = json.loads(path.read_text())
        if cached["levels"][-1]["nodes"] >= REFERENCE_GROWTH * check_nodes:
            return cached
    spec = part_from_dict(data)
    levels, scale, contact, start = [], 1.0, None, time.perf_counter()
    while True:
        mesh = mesh_part(spec, scale)
        if mesh.n_nodes > REFERENCE_MAX_NODES:
            break
        solution = solve_part(spec, mesh, contact)
        contact = solution.contact.arc if solution.contact is not None else None
        levels.append({"scale": scale, "nodes": mesh.n_nodes,
                       "peak": raiser_peaks(solution, compressive)[name][0]})
        if len(levels) >= REFERENCE_LEVELS and mesh.n_nodes >= REFERENCE_GROWTH * check_nodes:
            break
        scale /= LEVEL_RATIO
    out = {"levels": levels, "seconds": time.perf_counter() - start}
    CACHE.mkdir(parents=True, exist_ok=True)
    path.write_text(json.dumps(out))
    return out


def observed_orders(values: list[float], ratio: float) -> list[float]:
    """The observed order of every three successive values whose two changes keep their sign and shrink."""
    out = []
    for f1, f2, f3 in zip(values, values[1:], values[2:]):
        e21, e32 = f2 - f1, f3 - f2
        if e21 * e32 > 0 and abs(e32) < abs(e21):
            out.append(math.log(e21 / e32) / math.log(ratio))
    return out


def _orders_text(orders: list[float]) -> str:
    if not orders:
        return "–"
    ordered = sorted(orders)
    return f"{ordered[len(ordered) // 2]:.2f} ({ordered[0]:.2f}-{ordered[-1]:.2f}, {len(orders)})"


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--fresh", action="store_true", help="re-solve the reference studies")
    parser.add_argument("--only", nargs="*", help="names of the cases to run (default: all)")
    parser.add_argument("--order-tolerance", type=float,
                        help="how far the observed order may depart from the formal one for Fs 1.25 (default: the "
                             "check's)")
    args = parser.parse_args()

    from stressraiser.compare.check import check_part
    from stressraiser.fem import convergence
    from stressraiser.fem.convergence import FORMAL_ORDER, LEVEL_RATIO
    from stressraiser.geometry.partfile import part_from_dict

    if args.order_tolerance is not None:  # a what-if on the estimator alone: the check reads it at each estimate
        convergence.ORDER_TOLERANCE = args.order_tolerance
    print(f"machine: {platform.machine()} {os.cpu_count()} cores, Python {platform.python_version()}, "
          f"load average {os.getloadavg()[0]:.1f}; formal orders {FORMAL_ORDER}, order tolerance "
          f"{convergence.ORDER_TOLERANCE:.0%}")
    print(f"reference: quadratic triangles from scale 1 by sqrt(2) per level, at least {REFERENCE_LEVELS} levels "
          f"and {REFERENCE_GROWTH:g}x the check's finest nodes (at most {REFERENCE_MAX_NODES:,} nodes)")
    print("| case | raiser | check peak MPa | band | estimate | levels (finest nodes) | check s | reference MPa "
          "(nodes; last change) | check - reference | inside |")
    print("| --- | --- | ---: | ---: | --- | ---: | ---: | ---: | ---: | :---: |")
    inside_count = total = 0
    orders = []
    for label, part in cases().items():
        if args.only and label not in args.only:
            continue
        spec = part_from_dict(part)
        start = time.perf_counter()
        result = check_part(spec)
        check_seconds = time.perf_counter() - start
        study, est = result.study, result.study.estimate
        finest_nodes = study.levels[-1].nodes
        ref = reference(part, study.governing, study.compressive, finest_nodes, args.fresh)
        last, before = ref["levels"][-1], ref["levels"][-2]
        value = last["peak"]
        difference = est.value / value - 1.0
        inside = abs(est.value - value) <= est.error * abs(est.value)
        inside_count += inside
        total += 1
        order = f", p {est.order:.2f}" if est.order is not None else ""
        how = f"{est.method}, Fs {est.safety:g}{order}"
        print(f"| {label} | {study.governing} | {est.value:.2f} | ±{est.error:.2%} | {how} | "
              f"{len(study.levels)} ({finest_nodes:,}) | {check_seconds:.1f} | {value:.2f} ({last['nodes']:,}; "
              f"{last['peak'] - before['peak']:+.3f}) | {difference:+.3%} | {'yes' if inside else 'NO'} |",
              flush=True)
        linear = observed_orders([lv.raisers[study.governing][0] for lv in study.levels], LEVEL_RATIO)
        quadratic = observed_orders([lv["peak"] for lv in ref["levels"]], LEVEL_RATIO)
        orders.append((label, linear, quadratic, len(ref["levels"])))
    print(f"{inside_count} of {total} bands contain the reference")
    print()
    print("Observed orders of the governing raiser's peak over every monotone triple of levels: median (range, "
          "how many triples)")
    print("| case | linear (the check's levels) | quadratic (the reference's levels) |")
    print("| --- | ---: | ---: |")
    for label, linear, quadratic, n in orders:
        print(f"| {label} | {_orders_text(linear)} | {_orders_text(quadratic)} of {n - 2} |")
    every = [p for _, lin, _, _ in orders for p in lin], [p for _, _, quad, _ in orders for p in quad]
    print(f"all cases: linear {_orders_text(every[0])}; quadratic {_orders_text(every[1])}")


if __name__ == "__main__":
    main()
