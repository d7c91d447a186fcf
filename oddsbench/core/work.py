"""Cancellation and progress: one small object every front end hands to the core.

The workbench's thread worker passes ``Work(should_stop=lambda: worker.is_cancelled)``; the
command line passes a progress callback for its bar (or nothing). Engines poll ``should_stop``
and raise ``Cancelled``; the core reports ``progress(done, total)`` after each unit of work
(a plan, a strategy, a sweep point).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.solve.cancel import SolveCancelled as Cancelled

__all__ = ["Cancelled", "Work", "NO_WORK"]


def _never() -> bool:
    return False


def _ignore(done: int, total: int) -> None:
    return None


@dataclass(frozen=True)
class Work:
    """``should_stop()`` asks whether to give up (the engines raise ``Cancelled``); ``progress(done, total)``
    hears how far a question with several parts has come."""

    should_stop: Callable[[], bool] = _never
    progress: Callable[[int, int], None] = _ignore

    def check(self) -> None:
        """Raise ``Cancelled`` when a stop was asked for (between units of work)."""
        if self.should_stop():
            raise Cancelled

    def done(self, done: int, total: int) -> None:
        self.progress(done, total)


NO_WORK = Work()
