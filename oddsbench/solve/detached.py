"""Long native calls in a child process that the caller can abandon.

SuperLU's factorisation and flint's root finding do not return to Python until they are done:
Ctrl-C, a cancelled workbench worker and the work budget's deadline would all wait for them. So
a call expected to be long runs in a forked child, and the caller waits in short slices, polling
its cancel check and the budget (``model/budget.py``); on any stop the child is killed at once.
The child dies with its parent (``PR_SET_PDEATHSIG`` on Linux), ignores Ctrl-C (the parent
decides), writes nothing to the terminal (SuperLU prints its allocation failures), and may hold
no more memory than the budget allows (``RLIMIT_DATA``): an allocation past it ends the child,
not the program, and the caller gets one line naming ``--memory``.

``run_detached(function, args, what)`` runs one call; ``Detached(make, args, what)`` keeps the
object ``make(*args)`` built in the child and answers ``call(name, *args)`` on it, which is how
a SuperLU factorisation stays where it was made and serves every solve.
"""

from __future__ import annotations

import functools
import os
import signal
import sys
import time
import weakref
from collections.abc import Callable
from typing import Any

from oddsbench.model import budget
from oddsbench.model.budget import Budget
from oddsbench.model.errors import OddsbenchError
from oddsbench.solve.cancel import SolveCancelled, StopCheck, current_stop

POLL_SECONDS = 0.05
_READY, _OK, _ERROR, _MEMORY = "ready", "ok", "error", "memory"
_in_child = [False]  # inside a detached child, nested long calls simply run (the parent watches them all)


def can_detach() -> bool:
    """Whether a long call can run detached here: a POSIX system, and not already in a detached child."""
    return hasattr(os, "fork") and sys.platform != "win32" and not _in_child[0]


def die_with_parent() -> None:
    """Ask the system to kill this process when its parent ends (Linux; elsewhere nothing)."""
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        libc.prctl(1, signal.SIGKILL)  # PR_SET_PDEATHSIG
    except (OSError, AttributeError):
        pass


def _child(connection, make: Callable, args: tuple, serve: bool, memory_bytes: int | None) -> None:
    _in_child[0] = True
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    die_with_parent()
    quiet = os.open(os.devnull, os.O_WRONLY)
    os.dup2(quiet, 1)
    os.dup2(quiet, 2)
    if memory_bytes is not None:
        try:
            import resource

            _soft, hard = resource.getrlimit(resource.RLIMIT_DATA)
            resource.setrlimit(resource.RLIMIT_DATA, (memory_bytes, hard))
        except (ImportError, ValueError, OSError):
            pass

    def answer(compute: Callable[[], Any], kind: str = _OK) -> None:
        try:
            connection.send((kind, compute()))
        except MemoryError:
            connection.send((_MEMORY, None))
        except BaseException as error:  # noqa: BLE001 - every failure goes back to the caller
            try:
                connection.send((_ERROR, error))
            except Exception:  # an exception that does not pickle: its text
                connection.send((_ERROR, RuntimeError(f"{type(error).__name__}: {error}")))

    held: list[Any] = []

    def build():
        held.append(make(*args))
        return _summary(held[0]) if serve else held[0]

    answer(build, _READY if serve else _OK)
    while serve and held:
        try:
            request = connection.recv()
        except EOFError:
            break
        if request is None:
            break
        name, call_args = request
        answer(functools.partial(getattr(held[0], name), *call_args))
    connection.close()
    os._exit(0)


def _summary(held: Any) -> dict[str, Any]:
    """The plain attributes of the object built in the child, copied to the parent's stand-in."""
    names = ("size", "method", "order", "stored", "lower", "upper", "tridiagonal")
    return {name: getattr(held, name) for name in names if isinstance(getattr(held, name, None), (int, str, bool))}


def _memory_for_child(current: Budget | None) -> int | None:
    return None if current is None else current.memory_bytes


class Detached:
    """A child process holding ``make(*args)`` (see the module text); ``close()`` ends it."""

    def __init__(self, make: Callable, args: tuple, what: str, should_stop: StopCheck = None) -> None:
        self.what = what
        self.should_stop = should_stop
        self.seconds: float | None = None
        self._finaliser = None
        self.attributes = self._start(make, args, serve=True)

    def _start(self, make: Callable, args: tuple, serve: bool) -> Any:
        import multiprocessing

        context = multiprocessing.get_context("fork")
        self._connection, child_end = context.Pipe()
        self._process = context.Process(
            target=_child, args=(child_end, make, args, serve, _memory_for_child(budget.current())), daemon=True
        )
        self._process.start()
        child_end.close()
        self._finaliser = weakref.finalize(self, _end, self._process, self._connection)
        try:
            return self._receive()
        except BaseException:
            self.close()
            raise

    def call(self, name: str, *args: Any) -> Any:
        """``name(*args)`` on the object in the child, waited for as the module text says."""
        try:
            self._connection.send((name, args))
            return self._receive()
        except BaseException:
            self.close()
            raise

    def _receive(self) -> Any:
        connection, process = self._connection, self._process
        began = time.monotonic()
        while not connection.poll(POLL_SECONDS):
            budget.check(self.what)
            if self.seconds is not None and time.monotonic() - began > self.seconds:
                raise OddsbenchError(f"{self.what}: no answer within {self.seconds:g} s")
            asked = self.should_stop or current_stop()
            if asked is not None and asked():
                raise SolveCancelled
            if not process.is_alive() and not connection.poll(0):
                raise _ended(self.what, process.exitcode)
        try:
            kind, value = connection.recv()
        except EOFError:
            process.join(1)
            raise _ended(self.what, process.exitcode) from None
        if kind == _MEMORY:
            raise budget.over_memory(self.what, budget.current() or Budget())
        if kind == _ERROR:
            raise value
        return value

    def close(self) -> None:
        if self._finaliser is not None:
            self._finaliser()


def _end(process, connection) -> None:
    """Stop the child now (it holds nothing worth waiting for) and reap it."""
    try:
        connection.close()
    except OSError:
        pass
    if process.is_alive():
        process.kill()
    process.join()


def _ended(what: str, exitcode: int | None) -> OddsbenchError:
    current = budget.current() or Budget()
    if exitcode is not None and exitcode < 0:
        try:
            signal_name = signal.Signals(-exitcode).name
        except ValueError:
            signal_name = f"signal {-exitcode}"
        return budget.over_memory(f"{what} ended by {signal_name}, most likely for want of memory", current)
    return OddsbenchError(f"{what} ended without an answer (exit status {exitcode})")


def run_detached(
    function: Callable, args: tuple, what: str, should_stop: StopCheck = None, seconds: float | None = None
) -> Any:
    """``function(*args)`` in a child process the caller can abandon (in place where there is no fork);
    ``seconds`` bounds the wait (one line when it runs out) besides the work budget's deadline."""
    if not can_detach():
        return function(*args)
    runner = Detached.__new__(Detached)
    runner.what = what
    runner.should_stop = should_stop
    runner.seconds = seconds
    runner._finaliser = None
    try:
        return runner._start(function, args, serve=False)
    finally:
        runner.close()
