"""Ctrl-C (SIGINT) and SIGTERM stop any command within two seconds, cleanly.

While a command runs (`stopping_on_signals`), the first SIGINT raises KeyboardInterrupt and the first
SIGTERM raises Terminated (a KeyboardInterrupt) in the main thread: the code under way unwinds through its
clean-ups (a meshing child process is killed, a pool's workers are stopped, a half-written output file or
report folder is removed) and the command line prints one line and exits with 130 or 143 (128 + the
signal's number, the shell's convention). Later signals are not raised again, so that a second Ctrl-C
cannot cut a clean-up short.

Python runs a signal handler only between bytecodes of the main thread, so a long call into a compiled
library (a sparse factorisation of a big mesh) would hold the stop until it returns. A watcher thread
therefore learns of each signal at once (through the interpreter's wake-up file descriptor, written by
the C-level handler) and, if the command has not finished GRACE seconds later, ends the process itself
with the same line and exit code: nothing is half-written at such a moment (outputs are written after the
computation), and child processes die with their parent (geometry/process_lifetime.py).
"""

from __future__ import annotations

import os
import signal
import threading
from collections.abc import Iterator
from contextlib import contextmanager

GRACE = 1.0  # s the main thread has to stop by itself before the watcher ends the process
EXIT_CODES = {signal.SIGINT: 130, signal.SIGTERM: 143}  # 128 + the signal number
_STOP_WATCHING = b"\0"  # not a signal number: written to wake the watcher when the command ends


class Terminated(KeyboardInterrupt):
    """SIGTERM arrived: unwind as for Ctrl-C, exit with 143."""


def exit_code(exc: KeyboardInterrupt) -> int:
    """The exit code of a command stopped by `exc`."""
    return EXIT_CODES[signal.SIGTERM if isinstance(exc, Terminated) else signal.SIGINT]


@contextmanager
def stopping_on_signals(message: str = "stressraiser: interrupted") -> Iterator[None]:
    """Inside the block, SIGINT and SIGTERM stop the command as described above; `message` is the line the
    watcher writes to standard error when it has to end the process itself. Outside the main thread (a
    command run from a worker thread) signals cannot be handled there, and the block changes nothing."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    read_end, write_end = os.pipe()
    os.set_blocking(write_end, False)
    raised = threading.Event()
    finished = threading.Event()
    lock = threading.Lock()

    def on_signal(signum: int, frame: object) -> None:
        if raised.is_set():  # already unwinding: let the clean-ups finish (the watcher keeps the deadline)
            return
        raised.set()
        raise Terminated() if signum == signal.SIGTERM else KeyboardInterrupt()

    watcher = threading.Thread(target=_watch, args=(read_end, finished, lock, message), daemon=True,
                               name="stressraiser-signal-watcher")
    previous_fd = signal.set_wakeup_fd(write_end, warn_on_full_buffer=False)
    previous = {sig: signal.signal(sig, on_signal) for sig in EXIT_CODES}
    watcher.start()
    try:
        yield
    finally:
        with lock:
            finished.set()
        for sig, handler in previous.items():
            signal.signal(sig, handler)
        signal.set_wakeup_fd(previous_fd)
        try:
            os.write(write_end, _STOP_WATCHING)
        except OSError:
            pass
        watcher.join(timeout=GRACE)
        os.close(write_end)
        if not watcher.is_alive():
            os.close(read_end)


def _watch(read_end: int, finished: threading.Event, lock: threading.Lock, message: str) -> None:
    """Wait for signal numbers on the wake-up pipe; GRACE seconds after SIGINT or SIGTERM, if the command
    has not finished, write `message` and end the process with the signal's exit code."""
    while True:
        try:
            data = os.read(read_end, 64)
        except OSError:
            return
        if not data or finished.is_set():
            return
        caught = [s for s in data if s in EXIT_CODES]
        if not caught:
            continue
        if finished.wait(GRACE):
            return
        with lock:
            if finished.is_set():
                return
            try:
                os.write(2, (message + "\n").encode("utf-8", "replace"))
            finally:
                os._exit(EXIT_CODES[signal.Signals(caught[0])])
