"""Cancelling a long solve: the caller's ``should_stop`` is polled, and the solve raises.

Each poll also checks the work budget (``model/budget.py``): past the deadline or above the memory
guard it raises ``OverBudget`` (one line for the user) instead. A caller's check is also kept as
the cancel check of everything inside a block (``cancellable``), so solves deep inside one call,
and waits on detached native calls (``solve/detached.py``), see it without being handed it.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from contextlib import contextmanager
from contextvars import ContextVar

from oddsbench.model import budget

StopCheck = Callable[[], bool] | None


class SolveCancelled(Exception):
    """Raised inside a solve when its cancel check says stop."""


def stop_if_asked(should_stop: StopCheck) -> None:
    """Raise ``SolveCancelled`` when the caller's check says stop (no check: never); ``OverBudget``
    past the budget."""
    budget.check()
    if should_stop is not None and should_stop():
        raise SolveCancelled


_SHOULD_STOP: ContextVar[StopCheck] = ContextVar("oddsbench_should_stop", default=None)


@contextmanager
def cancellable(should_stop: StopCheck) -> Iterator[None]:
    """Make ``should_stop`` the cancel check of every solve inside this block."""
    token = _SHOULD_STOP.set(should_stop) if should_stop is not None else None
    try:
        yield
    finally:
        if token is not None:
            _SHOULD_STOP.reset(token)


def current_stop() -> StopCheck:
    """The cancel check of the block running now (None outside one)."""
    return _SHOULD_STOP.get()
