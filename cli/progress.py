"""Progress on stderr while a check meshes and solves its levels (and writes its report).

Shown only on a terminal and only for runs longer than `delay` seconds: quick runs and redirected
output stay clean. The display is transient (erased when done), so the summary on stdout reads the same
with or without it.
"""

from __future__ import annotations

import threading

from rich.console import Console
from rich.progress import Progress, SpinnerColumn, TextColumn, TimeElapsedColumn

from ..fem.convergence import Level
from ..geometry.units import DEFAULT_SYSTEM
from .display_units import quantity_text

SHOW_AFTER = 1.0  # seconds before the display appears


class LevelProgress:
    """A context manager and `converge` callback: `with LevelProgress(err) as report: check_part(spec, report)`.

    Each call with a finished Level updates the line ("level 3 done: 4,350 triangles, peak 492.1 MPa", the peak
    in the unit system `units`); `stage(text)` names the current step after the levels (e.g. writing the report)."""

    def __init__(self, console: Console, enabled: bool = True, delay: float = SHOW_AFTER,
                 units: str = DEFAULT_SYSTEM):
        self._progress = Progress(SpinnerColumn(), TextColumn("{task.description}"), TimeElapsedColumn(),
                                  console=console, transient=True, disable=not (enabled and console.is_terminal))
        self._task = self._progress.add_task("meshing and solving level 1", total=None)
        self._delay = delay
        self._lock = threading.Lock()
        self._timer: threading.Timer | None = None
        self._shown = False
        self._done = False
        self.levels = 0
        self.units = units

    def __enter__(self) -> LevelProgress:
        self._timer = threading.Timer(self._delay, self._show)
        self._timer.daemon = True
        self._timer.start()
        return self

    def _show(self) -> None:
        with self._lock:
            if not self._done and not self._shown:
                self._progress.start()
                self._shown = True

    def __call__(self, level: Level) -> None:
        self.levels += 1
        self._progress.update(self._task, description=(
            f"level {self.levels} done: {level.elements:,} triangles, peak "
            f"{quantity_text(level.peak, 'stress', self.units)}; "
            "refining or finishing"))

    def stage(self, text: str) -> None:
        """Describe the step under way after the levels."""
        self._progress.update(self._task, description=text)

    def __exit__(self, *exc) -> None:
        if self._timer is not None:
            self._timer.cancel()
        with self._lock:
            self._done = True
            if self._shown:
                self._progress.stop()
