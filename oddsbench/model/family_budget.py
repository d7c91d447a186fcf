"""The work budget of a family expansion: expression steps counted against the time left, and the
``--max-states`` cap seen while members are made (not after).

Split from ``model/families.py``: a family with a filter can try millions of index values and keep
none, so the cost is counted in expression steps, not members.
"""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager
from contextvars import ContextVar

from oddsbench.model import budget as budgets
from oddsbench.model.family_index import FamilyError

# The work of an expansion, in expression steps (one node of an expression evaluated); a member
# or an outcome table also costs its own bookkeeping. Measured: about 1.7 microseconds a step.
STEPS_PER_SECOND = 400_000
READING_SHARE = 0.5  # of the time left in the work budget, for expanding families
TABLE_STEPS = 30  # a table also costs its reading: the loader parses each rendered value again
CHECK_EVERY_STEPS = 100_000


STATE_LIMIT: ContextVar[int | None] = ContextVar("family_state_limit", default=None)


@contextmanager
def state_limit(limit: int | None) -> Iterator[None]:
    """Refuse families past ``limit`` states while they expand (``--max-states``), not after."""
    token = STATE_LIMIT.set(limit)
    try:
        yield
    finally:
        STATE_LIMIT.reset(token)


class ExpansionSteps:
    """The expression steps an expansion may still take: a share of the time left in the work budget
    (``model/budget.py``; the default budget when none is in force)."""

    def __init__(self) -> None:
        left = budgets.time_left()
        if left == float("inf"):
            left = budgets.Budget().seconds
        self.seconds = max(left, 0.0) * READING_SHARE
        self.limit = int(self.seconds * STEPS_PER_SECOND)
        self.left = self.limit
        self.next_check = CHECK_EVERY_STEPS

    def spend(self, steps: int) -> None:
        self.left -= steps
        if self.left < 0:
            raise FamilyError(self.over(f"families evaluate more than {self.limit:,} expression steps"))
        self.next_check -= steps
        if self.next_check < 0:
            self.next_check = CHECK_EVERY_STEPS
            budgets.check("expanding families")

    def over(self, what: str) -> str:
        return (
            f"{what}, more than reading may take in {budgets.seconds_text(self.seconds)} "
            f"(raise it with {budgets.TIME_OPTION})"
        )
