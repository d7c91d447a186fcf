"""The work budget: how long one question may run and how much memory it may hold.

Size limits alone do not bound the work: a 5,000-state walk with one 60-digit probability passes
every size limit and runs for hours in its exact back-substitutions. So every expensive step
estimates its cost first and refuses (one line) or degrades (decimals only, with a note) when
it would not fit what is left, and while it runs a deadline and a memory guard stop it.

The budget of the question running now is a context variable: the command line sets it once
from ``--budget SECONDS`` and ``--memory MB`` (its clock starts before the file is read), the
core sets it from ``Settings`` for the workbench and the Python API, and every layer below reads
it (``check()`` in loops, ``left()`` before a step). A nested scope never loosens an outer one.
Exact arithmetic may use only the first ``EXACT_SHARE`` of the time, so the float engine always
has time left to give decimals. A question of several parts side by side (the plans of a
session) gives each part its own equal piece of that share, counted from the part's first exact
step (``exact_part``): whether one plan is exact never depends on what another plan used.
"""

from __future__ import annotations

import math
import os
import time
from collections.abc import Iterator
from contextlib import contextmanager
from contextvars import ContextVar
from dataclasses import dataclass, field, replace

from oddsbench.model.defaults import DEFAULT_BUDGET_SECONDS, DEFAULT_MEMORY_MB
from oddsbench.model.errors import OddsbenchError

TIME_OPTION = "--budget SECONDS"
MEMORY_OPTION = "--memory MB"
EXACT_SHARE = 0.4  # of the time budget, for exact arithmetic before it gives way to decimals
EXACT_RULE = (
    f"exact arithmetic may use {EXACT_SHARE:.0%} of it, then decimals only; plans side by side get "
    f"{EXACT_SHARE:.0%}/N each, counted from the plan's first exact step, whatever the others used"
)
MEMORY_GUARD = 0.9  # of the memory budget: the polled guard stops here, the hard limit is the budget
MEMORY_POLL_SECONDS = 0.05  # the resident size is read at most this often
MB = 1 << 20


class OverBudget(OddsbenchError):
    """A step would not fit, or did not fit, the time or memory budget; the message names the option."""


@dataclass(frozen=True)
class Budget:
    """``seconds`` of wall time from ``started`` and ``memory_mb`` of resident memory for one question."""

    seconds: float = DEFAULT_BUDGET_SECONDS
    memory_mb: int = DEFAULT_MEMORY_MB
    started: float = field(default_factory=time.monotonic)
    piece: ExactPiece | None = field(default=None, compare=False)  # one part's own exact time (``exact_part``)

    @property
    def deadline(self) -> float:
        return self.started + self.seconds

    @property
    def exact_deadline(self) -> float:
        if self.piece is not None:
            return min(self.piece.deadline(), self.deadline)
        return self.started + EXACT_SHARE * self.seconds

    @property
    def memory_bytes(self) -> int:
        return int(self.memory_mb) * MB

    def left(self) -> float:
        return self.deadline - time.monotonic()

    def exact_left(self) -> float:
        return self.exact_deadline - time.monotonic()

    def within(self, outer: Budget) -> Budget:
        """This budget, never looser than ``outer`` (the earlier deadline, the smaller memory)."""
        deadline = min(self.deadline, outer.deadline)
        memory = min(self.memory_mb, outer.memory_mb)
        started = min(self.started, outer.started)
        return Budget(deadline - started, memory, started, self.piece or outer.piece)

    def exact_piece(self, count: int) -> float:
        """Seconds of exact arithmetic each of ``count`` parts side by side may use (``exact_part``)."""
        return EXACT_SHARE * self.seconds / max(count, 1)


@dataclass
class ExactPiece:
    """One part's own seconds of exact arithmetic, whose clock starts when the part's exact work
    first asks how much time it has (the float engine's time before that is not counted)."""

    seconds: float
    began: float | None = None

    def deadline(self) -> float:
        if self.began is None:
            self.began = time.monotonic()
        return self.began + self.seconds


_CURRENT: ContextVar[Budget | None] = ContextVar("oddsbench_budget", default=None)
_last_memory_read = [0.0, 0]


def current() -> Budget | None:
    """The budget of the question running in this thread (None: unbounded)."""
    return _CURRENT.get()


@contextmanager
def scope(budget: Budget | None) -> Iterator[Budget | None]:
    """Run a block under ``budget`` (inside an outer budget, the tighter of the two)."""
    if budget is None:
        yield current()
        return
    outer = current()
    token = _CURRENT.set(budget.within(outer) if outer is not None else budget)
    try:
        yield _CURRENT.get()
    finally:
        _CURRENT.reset(token)


@contextmanager
def exact_part(count: int) -> Iterator[Budget | None]:
    """Run one of ``count`` parts side by side (the plans of a session) with exact arithmetic's own
    piece of the time: ``EXACT_SHARE`` x seconds / ``count``, counted from the part's first exact
    step, whatever the other parts used (the deadline and the memory guard of the whole stay as
    they are). This is the one rule every front end gets: the command line, the workbench and the
    reports all ask for sessions through the core, which runs each plan in its own part."""
    outer = current()
    if outer is None:
        yield None
        return
    token = _CURRENT.set(replace(outer, piece=ExactPiece(outer.exact_piece(count))))
    try:
        yield _CURRENT.get()
    finally:
        _CURRENT.reset(token)


def memory_in_use() -> int:
    """Resident memory of this process in bytes (0 where the system does not say)."""
    try:
        with open("/proc/self/statm", "rb") as statm:
            return int(statm.read().split()[1]) * os.sysconf("SC_PAGE_SIZE")
    except (OSError, ValueError, IndexError):
        try:
            import resource

            return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024
        except (ImportError, OSError):
            return 0


def _memory_now() -> int:
    """``memory_in_use``, read at most every ``MEMORY_POLL_SECONDS`` (loops may call this often)."""
    now = time.monotonic()
    if now - _last_memory_read[0] >= MEMORY_POLL_SECONDS:
        _last_memory_read[0] = now
        _last_memory_read[1] = memory_in_use()
    return _last_memory_read[1]


def seconds_text(seconds: float) -> str:
    if not math.isfinite(seconds):
        return "without end"
    if seconds < 0.1:
        return f"{seconds * 1000:.0f} ms"
    if seconds < 10:
        return f"{seconds:.1f} s"
    if seconds < 7200:
        return f"{seconds:,.0f} s"
    return f"{seconds / 3600:,.0f} hours"


def over_time(what: str, budget: Budget) -> OverBudget:
    return OverBudget(f"{what}: over the time budget of {seconds_text(budget.seconds)} (raise it with {TIME_OPTION})")


def over_memory(what: str, budget: Budget, used: int | None = None) -> OverBudget:
    held = f" ({used / MB:,.0f} MB held)" if used else ""
    return OverBudget(
        f"{what}: over the memory budget of {budget.memory_mb:,} MB{held} (raise it with {MEMORY_OPTION})"
    )


def check(what: str = "stopped") -> None:
    """Raise ``OverBudget`` past the deadline or above the memory guard (cheap: call it in loops)."""
    budget = _CURRENT.get()
    if budget is None:
        return
    if time.monotonic() > budget.deadline:
        raise over_time(what, budget)
    used = _memory_now()
    if used > MEMORY_GUARD * budget.memory_bytes:
        raise over_memory(what, budget, used)


def time_left() -> float:
    """Seconds left in the current budget (infinite when unbounded)."""
    budget = _CURRENT.get()
    return math.inf if budget is None else budget.left()


def exact_time_left() -> float:
    """Seconds exact arithmetic may still use (infinite when unbounded)."""
    budget = _CURRENT.get()
    return math.inf if budget is None else budget.exact_left()


def memory_left() -> float:
    """Bytes that may still be taken before the memory guard (infinite when unbounded)."""
    budget = _CURRENT.get()
    if budget is None:
        return math.inf
    return MEMORY_GUARD * budget.memory_bytes - memory_in_use()


def require(what: str, seconds: float = 0.0, memory: float = 0.0) -> None:
    """Refuse a step before it starts when its estimate does not fit what is left (one line)."""
    budget = _CURRENT.get()
    if budget is None:
        return
    left = budget.left()
    if seconds > 0 and left <= 0:
        raise over_time(what, budget)
    if seconds > left:
        raise OverBudget(
            f"{what} would take about {seconds_text(seconds)}, more than the {seconds_text(max(left, 0))} left "
            f"of the time budget of {seconds_text(budget.seconds)} (raise it with {TIME_OPTION})"
        )
    room = memory_left()
    if memory > room:
        raise OverBudget(
            f"{what} would need about {memory / MB:,.0f} MB, more than the {max(room, 0) / MB:,.0f} MB left of the "
            f"memory budget of {budget.memory_mb:,} MB (raise it with {MEMORY_OPTION})"
        )


def limit_process_memory(memory_mb: int) -> None:
    """The hard memory limit of this process (the data segment): an allocation past it fails with
    MemoryError instead of the machine swapping. For the command line only; never the workbench."""
    try:
        import resource
    except ImportError:  # not POSIX: the polled guard still holds
        return
    limit = int(memory_mb) * MB
    _soft, hard = resource.getrlimit(resource.RLIMIT_DATA)
    if hard != resource.RLIM_INFINITY:
        limit = min(limit, hard)
    try:
        resource.setrlimit(resource.RLIMIT_DATA, (limit, hard))
    except (ValueError, OSError):
        pass
