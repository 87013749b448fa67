"""Terminal rows and blocks for loads: which nominal each Kt uses, the stress peaks, and section cuts."""

from __future__ import annotations

from rich.console import Console
from rich.markup import escape
from rich.table import Table

from ..compare.check import CheckResult

Row = tuple[str, str, str]


def nominal_rows(result: CheckResult) -> list[Row]:
    """Each nominal stress of the load, its formula and the Kt it gives; the first two give Kt net/gross."""
    n = result.nominal
    if n is None:
        return []
    rows = [("Kt net / gross use", "", f"{n.net.label} / {n.gross.label}")]
    for nom in n.all:
        kt = f"Kt {nom.kt:.3f}" if nom.kt is not None else "Kt —"
        rows.append((f"  {nom.label}", f"{nom.stress:.1f} MPa", f"{kt}; {escape(nom.formula)}"))
    if result.spec.load.pin is not None:
        rows.append(("", "", "bearing stress P / (d t): the pin's force over its projected contact area"))
    return rows


def stress_rows(result: CheckResult) -> list[Row]:
    """von Mises and Tresca peaks, and the compressive peak when it is larger in magnitude."""
    s = result.stresses
    if s is None:
        return []
    rows = [("von Mises / Tresca", f"{s.von_mises.value:.1f} / {s.tresca.value:.1f} MPa",
             f"finest mesh, at ({s.von_mises.location[0]:.2f}, {s.von_mises.location[1]:.2f}) / "
             f"({s.tresca.location[0]:.2f}, {s.tresca.location[1]:.2f}) mm")]
    if s.compressive_governs:
        rows.append(("Compressive peak", f"{s.min_principal.value:.1f} MPa",
                     f"min principal at ({s.min_principal.location[0]:.2f}, {s.min_principal.location[1]:.2f}) mm "
                     f"exceeds the tensile {s.max_principal.value:.1f} MPa"))
    return rows


def print_sections(result: CheckResult, console: Console) -> None:
    """One row per requested cut: FE resultants, averages, peak, and the statics check."""
    if not result.sections:
        return
    table = Table(title="Sections (method of sections: FE resultants vs statics)", title_justify="left",
                  box=None, pad_edge=False)
    for column in ("cut", "N kN", "V kN", "M kN·m", "avg σ MPa", "avg τ MPa", "peak σ MPa", "statics err"):
        table.add_column(column, justify="left" if column == "cut" else "right")
    for r in result.sections:
        worst = r.worst_error
        table.add_row(escape(r.label), f"{r.fe_normal_force / 1e3:.3f}", f"{r.fe_shear_force / 1e3:.3f}",
                      f"{r.fe_moment / 1e6:.4f}", f"{r.average_normal:.2f}", f"{r.average_shear:.2f}",
                      f"{r.peak_normal:.1f}", "—" if worst is None else f"{worst:.3%}")
    console.print(table)
    console.print("M about the centroid of the cut's material, positive when it stretches the side to the left of "
                  "the cut's normal; errors relative to the cut's largest force scale (README)", soft_wrap=False)
