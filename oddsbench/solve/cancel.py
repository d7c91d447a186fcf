"""Cancelling a long solve: the caller's ``should_stop`` is polled, and the solve raises.

Each poll also checks the work budget (``model/budget.py``): past the deadline or above the memory
guard it raises ``OverBudget`` (one line for the user) instead.
"""

from __future__ import annotations

from collections.abc import Callable

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
