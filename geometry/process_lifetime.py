"""Child processes that end with the process they work for, however it ends (Ctrl-C, SIGTERM, SIGKILL, a
crash): a mesher or a batch worker left running holds its memory (hundreds of MB) and the terminal's
standard error, and a pipeline reading that stream waits on it.

Two mechanisms, used together:
- the kernel's parent-death signal (Linux prctl PR_SET_PDEATHSIG): SIGKILL to this process as soon as its
  parent ends; nothing in this process needs to run for it to work;
- a watch on a given process that need not be the parent (a pool worker's parent is the pool's fork
  server, not the command): a daemon thread waits on a pidfd of that process (Linux 5.3 and later) or
  polls it every WATCH_POLL seconds, and kills this process when it ends.
Elsewhere (no prctl) only the watch works.
"""

from __future__ import annotations

import ctypes
import os
import select
import signal
import threading
import time

PR_SET_PDEATHSIG = 1  # linux/prctl.h
WATCH_POLL = 0.5  # s between checks where no pidfd can be had


def end_with_parent(parent: int) -> None:
    """In a child process that `parent` (a pid) has just started: be killed when the parent ends, and
    end now if it has already ended (between the start and this call)."""
    _parent_death_signal(signal.SIGKILL)
    if os.getppid() != parent:
        os._exit(1)


def end_with(pid: int) -> None:
    """Be killed when the process `pid` ends (and when this process's parent ends), whichever comes first;
    `pid` must be alive when this is called (else this process ends at once)."""
    _parent_death_signal(signal.SIGKILL)
    try:
        handle = os.pidfd_open(pid)
    except ProcessLookupError:
        os.kill(os.getpid(), signal.SIGKILL)
        return
    except (AttributeError, OSError):  # no pidfd here: poll
        handle = None
    threading.Thread(target=_kill_self_after, args=(pid, handle), daemon=True, name="stressraiser-end-with").start()


def _kill_self_after(pid: int, handle: int | None) -> None:
    if handle is not None:
        select.select([handle], [], [])  # readable once the process has ended
    else:
        while _alive(pid):
            time.sleep(WATCH_POLL)
    os.kill(os.getpid(), signal.SIGKILL)


def _alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except (ProcessLookupError, PermissionError):  # gone (a process of another user's has its number now)
        return False
    return True


def _find_prctl():
    """The C library's prctl, looked up once on import: a child forked from a process with other threads
    must not call the dynamic loader, whose lock another thread may have held at the fork."""
    try:
        return ctypes.CDLL(None, use_errno=True).prctl
    except (OSError, AttributeError):  # not Linux
        return None


_PRCTL = _find_prctl()


def _parent_death_signal(signum: int) -> None:
    if _PRCTL is not None:
        _PRCTL(PR_SET_PDEATHSIG, int(signum), 0, 0, 0)
