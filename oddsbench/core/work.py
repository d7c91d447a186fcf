"""Cancellation, progress and the work budget: one small object every front end hands to the core.

The workbench's thread worker passes ``Work(should_stop=lambda: worker.is_cancelled)``; the
command line passes a progress callback for its bar (or nothing). Engines poll ``should_stop``
and raise ``Cancelled``; the core reports ``progress(done, total)`` after each unit of work
(a plan, a strategy, a sweep point).

``budget`` bounds one question in time and memory (``model/budget.py``): each core entry point
runs under it (``running``), or under the budget already in force (the command line's, whose clock
started before the file was read), or else under the defaults. Every poll of a cancel check also
checks the budget, so a stop by the user and a stop by the deadline travel the same road, native
calls included (``solve/detached.py``).
"""

from __future__ import annotations

import functools
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass

from oddsbench.model import budget as budgets
from oddsbench.model.budget import Budget, OverBudget
from oddsbench.solve.cancel import SolveCancelled as Cancelled
from oddsbench.solve.cancel import cancellable

__all__ = ["Budget", "Cancelled", "NO_WORK", "OverBudget", "Work", "budgeted"]


def _never() -> bool:
    return False


def _ignore(done: int, total: int) -> None:
    return None


@dataclass(frozen=True)
class Work:
    """``should_stop()`` asks whether to give up (the engines raise ``Cancelled``); ``progress(done, total)``
    hears how far a question with several parts has come; ``budget`` (None: the one in force, else the
    defaults) bounds its time and memory."""

    should_stop: Callable[[], bool] = _never
    progress: Callable[[int, int], None] = _ignore
    budget: Budget | None = None

    def __post_init__(self) -> None:
        # the engines poll ``should_stop``: the budget's deadline and memory guard ride on every poll
        object.__setattr__(self, "should_stop", _with_budget(self.should_stop))

    def check(self) -> None:
        """Raise ``Cancelled`` when a stop was asked for, ``OverBudget`` past the budget (between units of work)."""
        budgets.check()
        if self.should_stop():
            raise Cancelled

    def done(self, done: int, total: int) -> None:
        self.progress(done, total)

    @contextmanager
    def running(self) -> Iterator[None]:
        """Run a question under this work's budget (see the module text)."""
        chosen = self.budget
        if chosen is None and budgets.current() is None:
            chosen = Budget()
        with budgets.scope(chosen), cancellable(self.should_stop):
            yield


def _with_budget(asked: Callable[[], bool]) -> Callable[[], bool]:
    if getattr(asked, "checks_budget", False):
        return asked

    def should_stop() -> bool:
        budgets.check()
        return asked()

    should_stop.checks_budget = True  # type: ignore[attr-defined]
    return should_stop


NO_WORK = Work()


def budgeted(question: Callable) -> Callable:
    """A core entry point that runs under its ``work`` argument's budget (keyword or last positional)."""

    @functools.wraps(question)
    def run(*args, **kwargs):
        work = kwargs.get("work")
        if work is None:
            work = next((value for value in reversed(args) if isinstance(value, Work)), NO_WORK)
        with work.running():
            return question(*args, **kwargs)

    return run
