"""Meshing in a child process: the mesher can be stopped at any moment, and a crash inside it is an error
of the check, not the end of the program.

gmsh runs in compiled code that does not return to Python for as long as it meshes (minutes on a long,
thin plate), so a signal handler in the same process cannot stop it, and a fault inside it (an abort, a
segmentation fault, the kernel's out-of-memory killer) would end the whole program without a word.
`MeshProcess` therefore forks the process once per study and meshes every level in the child
(geometry/meshing.py `mesh_part`: gmsh initialised and finalised there for each level); the part and the
scale go to the child and the Mesh (or the exception) comes back through pipes. The parent waits for the
answer in slices of WAIT_SLICE seconds, so its signal handlers run at once: on Ctrl-C or SIGTERM it kills
the child and lets the interrupt go on. A child that ends without an answer becomes a MeshError naming
how it ended. The child ignores Ctrl-C (its parent decides), and dies with its parent however that ends
(geometry/process_lifetime.py).

One child serves the whole study because a fresh fork pays for copying the pages it touches: its first
mesh takes some tens of milliseconds longer than in the parent, later ones none (benchmarks/mesh_process.py
prints the cost per level on the bundled example).

    with MeshProcess() as mesher:
        mesh = mesher.mesh(spec, scale)
"""

from __future__ import annotations

import gc
import os
import pickle
import select
import signal
import struct
import traceback
from types import TracebackType

from . import meshing
from .errors import MeshError
from .mesh import Mesh
from .process_lifetime import end_with_parent
from .spec import PartSpec

WAIT_SLICE = 0.1  # s between returns to Python while the parent waits for the child's answer
_HEADER = struct.Struct(">Q")  # each message: its length in bytes, then the pickled message
_ANSWER_MESH, _ANSWER_ERROR = "mesh", "error"


class MeshProcess:
    """A child process that meshes parts on request (`mesh`), started at the first request and ended
    (killed: it holds nothing worth keeping between requests) when the block ends."""

    def __init__(self) -> None:
        self._pid: int | None = None
        self._requests = self._answers = -1

    def __enter__(self) -> MeshProcess:
        return self

    def __exit__(self, kind: type[BaseException] | None, exc: BaseException | None, tb: TracebackType | None) -> None:
        self._stop()

    def mesh(self, spec: PartSpec, scale: float = 1.0) -> Mesh:
        """The mesh of `spec` at `scale`, as geometry/meshing.py `mesh_part` makes it. Raises what mesh_part
        raises (MeshError, PartError, ...), or MeshError when the child ends without an answer; an
        interrupt while waiting ends the child and is raised on."""
        if not hasattr(os, "fork"):  # no fork on this system: mesh here
            return meshing.mesh_part(spec, scale)
        if self._pid is None:
            self._start()
        try:
            _write_message(self._requests, pickle.dumps((spec, scale), protocol=pickle.HIGHEST_PROTOCOL))
            answer = _read_message(self._answers, wait=True)
        except BrokenPipeError:  # the child has already ended
            answer = None
        except BaseException:
            self._stop()
            raise
        if answer is None:
            raise MeshError(f"the mesher stopped without a mesh: {self._stop()}")
        kind, value = pickle.loads(answer)
        if kind == _ANSWER_ERROR:
            raise value
        return value

    def _start(self) -> None:
        parent = os.getpid()
        request_read, self._requests = os.pipe()
        self._answers, answer_write = os.pipe()
        try:
            pid = os.fork()
        except OSError as exc:  # no memory or process slot for a child
            for fd in (request_read, answer_write):
                os.close(fd)
            self._close()
            raise MeshError(f"cannot start the mesher process ({exc.strerror or exc})") from None
        if pid == 0:  # the child: never returns
            os.close(self._requests)
            os.close(self._answers)
            _serve(parent, request_read, answer_write)
        os.close(request_read)
        os.close(answer_write)
        self._pid = pid

    def _stop(self) -> str:
        """End the child (if any) and close the pipes; how the child ended, in words."""
        self._close()
        if self._pid is None:
            return "it never started"
        pid, self._pid = self._pid, None
        try:
            os.kill(pid, signal.SIGKILL)
        except ProcessLookupError:
            pass
        _, status = os.waitpid(pid, 0)
        return ended(status)

    def _close(self) -> None:
        for fd in (self._requests, self._answers):
            if fd >= 0:
                os.close(fd)
        self._requests = self._answers = -1


def ended(status: int) -> str:
    """How a child process with wait status `status` ended, in words for a MeshError."""
    if os.WIFSIGNALED(status):
        number = os.WTERMSIG(status)
        try:
            name = signal.Signals(number).name
        except ValueError:
            name = f"signal {number}"
        cause = {signal.SIGKILL: "killed: out of memory is the usual cause; lower mesh.max_elements",
                 signal.SIGABRT: "gmsh aborted on an internal error", signal.SIGSEGV: "a crash inside gmsh",
                 signal.SIGTERM: "stopped by another program"}.get(number, "ended by a signal")
        return f"its process ended by {name} ({cause})"
    return f"its process exited with code {os.waitstatus_to_exitcode(status)} without an answer"


def _serve(parent: int, requests: int, answers: int) -> None:
    """The child: mesh each request and answer (kind, value) until the requests end, then end the process
    without running any of the parent's exit handlers or flushing its buffers."""
    code = 0
    try:
        end_with_parent(parent)
        gc.freeze()  # the parent's objects stay out of this process's collections: their pages stay shared
        signal.set_wakeup_fd(-1)  # the parent's signal watcher reads that pipe, not this process's signals
        signal.signal(signal.SIGINT, signal.SIG_IGN)  # Ctrl-C reaches the whole process group: the parent decides
        signal.signal(signal.SIGTERM, signal.SIG_DFL)
        while (request := _read_message(requests, wait=False)) is not None:
            spec, scale = pickle.loads(request)
            try:
                answer = (_ANSWER_MESH, meshing.mesh_part(spec, scale))
            except BaseException as exc:  # sent back whole: the parent raises it as if meshing there
                answer = (_ANSWER_ERROR, _portable(exc))
            _write_message(answers, pickle.dumps(answer, protocol=pickle.HIGHEST_PROTOCOL))
    except BaseException:
        code = 70  # could not even answer: the parent reports the exit code
    finally:
        os._exit(code)


def _portable(exc: BaseException) -> BaseException:
    """`exc` with the child's traceback as a note (shown with STRESSRAISER_DEBUG=1), or, when it cannot
    cross the pipe, a RuntimeError that carries its type and message."""
    exc.add_note("in the meshing process:\n" + "".join(traceback.format_exception(exc)))
    try:
        pickle.loads(pickle.dumps(exc))
        return exc
    except Exception:
        return RuntimeError(f"{type(exc).__name__}: {exc}")


def _write_message(fd: int, data: bytes) -> None:
    view = memoryview(_HEADER.pack(len(data)) + data)
    while view:
        view = view[os.write(fd, view):]


def _read_message(fd: int, wait: bool) -> bytes | None:
    """One message from `fd`, or None at the end of the stream. With `wait`, the read returns to Python
    every WAIT_SLICE seconds (so that signal handlers run) until data arrives."""
    header = _read_exactly(fd, _HEADER.size, wait)
    if header is None:
        return None
    return _read_exactly(fd, _HEADER.unpack(header)[0], wait)


def _read_exactly(fd: int, size: int, wait: bool) -> bytes | None:
    parts, left = [], size
    while left:
        if wait and not select.select([fd], [], [], WAIT_SLICE)[0]:
            continue
        data = os.read(fd, min(left, 1 << 20))
        if not data:
            return None
        parts.append(data)
        left -= len(data)
    return b"".join(parts)
