"""The sign-off block of the terminal summary: design check and fatigue screen, in the part file's units.

Numbers are converted from mm, N, MPa to the part file's unit system (`spec.units`) only here, at the
edge; the sentences come from compare.design.design_statements and compare.fatigue.screen_statements.
"""

from __future__ import annotations

from rich.console import Console

from ..compare.check import CheckResult
from ..compare.design import design_statements
from ..compare.fatigue import screen_statements
from ..compare.signoff import DesignSignOff, FatigueSignOff, material_basis
from ..geometry.units import format_quantity


def _verdict(passes: bool) -> str:
    return "[bold green]PASSES[/bold green]" if passes else "[bold red]FAILS[/bold red]"


def _factor(value: float | None) -> str:
    return "—" if value is None else f"{value:.3g}"


def print_signoff(result: CheckResult, console: Console) -> None:
    """Print the design check and the fatigue screen, when the part file asked for them."""
    if result.design is None and result.fatigue is None:
        return
    units = result.spec.units
    console.print(f"[bold]Sign-off[/bold] (in {units})")
    for line in material_basis(result.spec):
        _item(console, "", line, "dim")
    if result.design is not None:
        _print_design(result.design, units, console)
    if result.fatigue is not None:
        _print_fatigue(result.fatigue, units, console)


def _print_design(design: DesignSignOff, units: str, console: Console) -> None:
    c = design.check
    margin = c.net_margin if c.governing_check == "net-section" else c.peak_margin
    console.print(f"Design check: {_verdict(c.passes)} — {c.governing_check} check governs, margin {margin:+.3f}",
                  soft_wrap=False)
    for line in design_statements(c, units):
        _item(console, " • ", line)
    ultimate = ""
    if c.achieved_fos_net_ultimate is not None:
        ultimate = (f"; on ultimate {_factor(c.achieved_fos_net_ultimate)} (net section), "
                    f"{_factor(c.achieved_fos_peak_ultimate)} (peak)")
    _item(console, " • ", f"Factor of safety achieved on yield {_factor(c.achieved_fos_net_yield)} (net section), "
          f"{_factor(c.achieved_fos_peak_yield)} (peak){ultimate}; required "
          f"{c.fos_yield:g} on yield" + (f", {c.fos_ultimate:g} on ultimate." if c.fos_ultimate else "."))
    for line in design.basis:
        _item(console, "   ", line, "dim")


def _print_fatigue(fatigue: FatigueSignOff, units: str, console: Console) -> None:
    s, cycle = fatigue.screen, fatigue.cycle

    def force(value: float) -> str:
        return format_quantity(value, "force", units)

    def stress(value: float) -> str:
        return format_quantity(value, "stress", units)

    console.print(f"Fatigue screen: {_verdict(s.passes)} — n_f {s.n_f:.3g} against {s.required_factor:g} "
                  "required (a screen, not a life prediction)", soft_wrap=False)
    low, high = cycle.mean - cycle.alternating, cycle.mean + cycle.alternating
    _item(console, " • ", f"Load cycle {force(low)} to {force(high)}: "
          f"alternating {force(cycle.alternating)}, mean {force(cycle.mean)}; on the net section "
          f"sa = {stress(s.sa_nominal_mpa)}, sm = {stress(s.sm_nominal_mpa)} (nominal).")
    for line in screen_statements(s, units):
        _item(console, " • ", line)
    for line in fatigue.basis:
        _item(console, "   ", line, "dim")


def _item(console: Console, lead: str, text: str, style: str = "") -> None:
    """One statement wrapped at words to the console's width (80 columns when not a terminal), its
    continuation lines indented under its first word; the text is printed as it is (no markup)."""
    from rich.table import Table
    from rich.text import Text

    grid = Table.grid()
    if lead:
        grid.add_column(width=len(lead), no_wrap=True)
    grid.add_column()
    grid.add_row(*((lead,) if lead else ()), Text(text, style=style))
    console.print(grid)
