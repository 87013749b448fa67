"""The Kt curve of a sweep: FE Kt (net section) with its error band against the first varied key, one
series per combination of the other keys, and the handbook curve of every case that covers the part,
evaluated densely over the same range (the case's formula at the parameters the part is recognised with).

Where the handbook case describes a raiser other than the one where the part's peak is (the middle hole
of a row of holes), the FE points beside the curve are that raiser's Kt (case_kt_net, like with like) and
the part's governing Kt is drawn too, as hollow squares, labelled with where its peak is.

matplotlib is imported here only (it is slow to import) and drawn without pyplot (no global backend).
"""

from __future__ import annotations

import io
import math
from pathlib import Path
from typing import Any

CURVE_SAMPLES = 121  # handbook points per series
MAX_CURVE_SERIES = 12  # series beyond this get FE points only (keeps the plot readable and quick)
CASE_STYLES = ("--", ":", "-.", (0, (6, 2, 1, 2)), (0, (1, 3)))


def plot_sweep(png: Path, svg: Path, base: dict[str, Any], varies: list, rows: list[dict[str, Any]]) -> None:
    """Draw the sweep and write it as PNG and SVG (each written whole or not at all)."""
    from matplotlib import colormaps, rc_context
    from matplotlib.figure import Figure

    from .files import write_atomic
    from .sweep import case_raiser_differs

    xkey = varies[0].key.text
    units = base.get("units", "mm-N-MPa")
    series = _series(varies, rows)
    colours = colormaps["viridis"]
    fig = Figure(figsize=(7.5, 5.0), layout="constrained")
    ax = fig.add_subplot()
    styles: dict[str, Any] = {}
    failed = 0
    for n, (label, members) in enumerate(series.items()):
        colour = colours(0.15 + 0.7 * n / max(1, len(series) - 1)) if len(series) > 1 else colours(0.3)
        done = sorted((r for r in members if r["status"] == "ok"), key=lambda r: r["inputs"][xkey])
        failed += len(members) - len(done)
        if done:
            xs = [r["inputs"][xkey] for r in done]
            split = any(case_raiser_differs(r) for r in done)
            prefix = "case_" if split else ""
            kt = [_number(r.get(f"{prefix}kt_net")) for r in done]
            band = [k * _number(r.get(f"{prefix}kt_error")) for k, r in zip(kt, done)]
            suffix = f" ({label})" if label else ""
            if split:
                raisers = ", ".join(dict.fromkeys(str(r["case_raiser"]) for r in done))
                fe_label = f"FE, converged Kt net of {raisers}, the raiser the handbook case describes{suffix}"
                peaks_at = ", ".join(dict.fromkeys(str(r["feature"]) for r in done))
                ax.plot(xs, [r["kt_net"] for r in done], color=colour, ls=":", lw=1.0, marker="s", ms=6, mfc="none",
                        label=f"FE, the part's peak Kt net (governing, at {peaks_at}){suffix}")
            else:
                fe_label = f"FE, converged Kt net{suffix}"
            ax.errorbar(xs, kt, yerr=band, color=colour, marker="o", ms=5, lw=1.4, capsize=3, label=fe_label)
            loose = [(x, k) for x, k, r in zip(xs, kt, done) if not (r["converged"] and (r.get("case_converged")
                                                                                       if split else True))]
            if loose:
                ax.plot([x for x, _ in loose], [k for _, k in loose], ls="none", marker="o",
                        ms=10, mfc="none", mec="#b2182b", label="not converged" if n == 0 else None)
        if n < MAX_CURVE_SERIES:
            for case, (cx, cy) in _handbook_curves(base, varies, members).items():
                first = case not in styles
                styles.setdefault(case, CASE_STYLES[len(styles) % len(CASE_STYLES)])
                shade = colours(min(0.9, 0.55 + 0.3 * list(styles).index(case))) if len(series) == 1 else colour
                ax.plot(cx, cy, color=shade, ls=styles[case], lw=1.6,
                        label=f"handbook: {case}" if first else None)
    ax.set_xlabel(f"{xkey} (part-file units, {units})")
    ax.set_ylabel("Kt on the net section (peak / net-section average)")
    title = str(base.get("title", "untitled part"))
    ax.set_title(f"{title[:70]}\nKt against {xkey}", fontsize=10)
    ax.grid(True, alpha=0.3)
    if failed:
        ax.text(0.99, 0.01, f"{failed} failed case(s) not drawn; see the table", transform=ax.transAxes,
                ha="right", va="bottom", fontsize=8, color="#b2182b")
    ax.legend(fontsize=8, loc="best")
    for path, fmt in ((png, "png"), (svg, "svg")):
        buffer = io.BytesIO()
        with rc_context({"svg.fonttype": "none"}):  # SVG text stays text: searchable and editable
            fig.savefig(buffer, format=fmt, dpi=150)
        write_atomic(path, buffer.getvalue())


def _number(value: float | None) -> float:
    return float(value) if value is not None else math.nan


def _series(varies: list, rows: list[dict[str, Any]]) -> dict[str, list[dict[str, Any]]]:
    """Rows grouped by the values of every varied key but the first (label "" when only one key)."""
    others = [v.key.text for v in varies[1:]]
    groups: dict[str, list[dict[str, Any]]] = {}
    for row in rows:
        label = ", ".join(f"{k} = {row['inputs'][k]:g}" for k in others)
        groups.setdefault(label, []).append(row)
    return groups


def _handbook_curves(base: dict[str, Any], varies: list, members: list[dict[str, Any]]
                     ) -> dict[str, tuple[list[float], list[float]]]:
    """Handbook Kt net of every case that covers the part, over the series' range of the first key; a
    value outside the case's range or where the part is not recognised is left as a gap."""
    from ..compare.handbook import handbook_matches
    from ..geometry.errors import PartError
    from ..geometry.partfile import part_from_dict
    from .sweep import set_vary

    xkey = varies[0]
    xs = [r["inputs"][xkey.key.text] for r in members]
    lo, hi = min(xs), max(xs)
    if hi <= lo:
        return {}
    fixed = members[0]["inputs"]
    part = base
    for vary in varies[1:]:
        part = set_vary(part, vary.key, fixed[vary.key.text])
    samples = [lo + (hi - lo) * i / (CURVE_SAMPLES - 1) for i in range(CURVE_SAMPLES)]
    curves: dict[str, dict[float, float]] = {}
    for x in samples:
        try:
            spec = part_from_dict(set_vary(part, xkey.key, x))
        except PartError:
            continue
        for match in handbook_matches(spec):
            if match.in_range:
                curves.setdefault(match.case.key, {})[x] = match.kt_net
    out = {}
    for case, values in curves.items():
        ys = [values.get(x, math.nan) for x in samples]
        out[case] = (samples, ys)
    return out


