"""Cancelling a long solve: the caller's ``should_stop`` is polled, and the solve raises."""

from __future__ import annotations

from collections.abc import Callable

StopCheck = Callable[[], bool] | None


class SolveCancelled(Exception):
    """Raised inside a solve when its cancel check says stop."""


def stop_if_asked(should_stop: StopCheck) -> None:
    """Raise ``SolveCancelled`` when the caller's check says stop (no check: never)."""
    if should_stop is not None and should_stop():
        raise SolveCancelled
