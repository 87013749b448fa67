"""The terminal summary of a check: verdict first, then the numbers that support it."""

from __future__ import annotations

from rich.console import Console
from rich.table import Table

from ..compare.check import CheckResult


def verdict(result: CheckResult) -> str:
    """One line: Kt with its band and whether the peak converged."""
    kt = result.kt
    state = "converged" if kt.converged else "NOT converged"
    return (f"Kt(net) {kt.net:.3f} ± {kt.error:.2%}, Kt(gross) {kt.gross:.3f} — peak {result.peak.stress:.1f} MPa "
            f"at {result.peak.feature}, {state} in {len(result.study.levels)} mesh levels")


def print_summary(result: CheckResult, console: Console) -> None:
    """Print the full summary."""
    spec, ns, peak = result.spec, result.net_section, result.peak
    console.print(f"[bold]{spec.title}[/bold]")
    console.print(verdict(result))
    for warning in result.warnings:
        console.print(f"[bold yellow]warning:[/bold yellow] {warning}")

    table = Table(show_header=False, box=None, pad_edge=False)
    table.add_column(style="bold")
    table.add_column(justify="right")
    table.add_column()
    table.add_row("Net-section average", f"{ns.average:.1f} MPa",
                  f"force / net area; section x = {ns.x:g} mm, net width {ns.width:.2f} mm, area {ns.area:.1f} mm²")
    table.add_row("FE peak stress", f"{peak.stress:.1f} MPa",
                  f"max principal at ({peak.location[0]:.2f}, {peak.location[1]:.2f}) mm on {peak.feature}; "
                  f"finest mesh {peak.fe_stress:.1f} MPa")
    table.add_row("Average understates peak", f"{1 - ns.average / peak.stress:.1%}",
                  f"the peak is {result.kt.net:.2f} × the net-section average")
    table.add_row("Kt net / gross", f"{result.kt.net:.3f} / {result.kt.gross:.3f}",
                  f"band ± {result.kt.error:.2%}; gross nominal {result.gross_average:.1f} MPa")
    if result.handbook:
        m = result.handbook[0]
        diff = result.kt.net / m.kt_net - 1.0
        rng = "inside" if m.in_range else "OUTSIDE"
        params = ", ".join(f"{k} = {v:.3g}" for k, v in m.recognised.params.items())
        table.add_row("Handbook Kt net", f"{m.kt_net:.3f}", f"FE differs by {diff:+.2%}; {params} {rng} the chart range")
        table.add_row("", "", f"[dim]{m.case.source}[/dim]")
        for alt in result.handbook[1:]:
            table.add_row("Also published", f"{alt.kt_net:.3f}",
                          f"FE differs by {result.kt.net / alt.kt_net - 1.0:+.2%}; [dim]{alt.case.source}[/dim]")
    else:
        table.add_row("Handbook Kt", "—", "no handbook case covers this geometry")
    table.add_row("Equilibrium", f"{ns.equilibrium_error:+.3%}",
                  f"FE force on the net section {ns.fe_force:.1f} N vs applied {spec.load.axial:.1f} N")
    console.print(table)

    levels = Table(title="Mesh levels", title_justify="left", box=None)
    for column in ("level", "nodes", "elements", "peak MPa", "time s"):
        levels.add_column(column, justify="right")
    for i, lv in enumerate(result.study.levels, start=1):
        levels.add_row(str(i), str(lv.nodes), str(lv.elements), f"{lv.peak:.2f}", f"{sum(lv.seconds.values()):.2f}")
    est = result.study.estimate
    console.print(levels)
    order = f", observed order {est.order:.2f}" if est.order else ""
    console.print(f"estimate by {est.method}{order}; target error {spec.mesh.tolerance:.2%}")
    console.print("[bold]Cautions[/bold]")
    for caution in result.cautions:
        console.print(f" • {caution}")
