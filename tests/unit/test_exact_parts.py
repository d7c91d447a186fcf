"""Plans side by side each get their own piece of exact arithmetic's time (``model/budget.py``,
``exact_part``): a plan is shown exactly or not whatever the plans before it used.

Time is never asserted: the clock is a fake one the tests move, or budgets are made with most of
their time already spent (``started`` in the past), so today's shared share would be gone.
"""

from __future__ import annotations

import time

import pytest
from conftest import RULESETS

import oddsbench
from oddsbench.model import budget
from oddsbench.model.budget import EXACT_SHARE, Budget


class FakeClock:
    """``time.monotonic`` that moves only when told."""

    def __init__(self) -> None:
        self.now = 1_000.0

    def monotonic(self) -> float:
        return self.now


@pytest.fixture
def clock(monkeypatch):
    fake = FakeClock()
    monkeypatch.setattr(budget.time, "monotonic", fake.monotonic)
    return fake


def test_a_part_that_used_all_its_exact_time_leaves_the_next_part_its_whole_piece(clock):
    whole = Budget(30, started=clock.now)
    piece = EXACT_SHARE * 30 / 3
    with budget.scope(whole):
        with budget.exact_part(3):
            assert budget.exact_time_left() == pytest.approx(piece)
            clock.now += 25  # the first plan ran its exact work far past its piece
            assert budget.exact_time_left() < 0
        with budget.exact_part(3):
            assert budget.exact_time_left() == pytest.approx(piece)


def test_a_parts_exact_clock_starts_at_its_first_exact_step_not_when_the_part_begins(clock):
    with budget.scope(Budget(30, started=clock.now)), budget.exact_part(2) as part:
        clock.now += 2  # the float engine runs first
        assert part.exact_left() == pytest.approx(EXACT_SHARE * 30 / 2)
        clock.now += 1
        assert part.exact_left() == pytest.approx(EXACT_SHARE * 30 / 2 - 1)


def test_a_part_never_has_exact_time_past_the_deadline_of_the_whole(clock):
    with budget.scope(Budget(10, started=clock.now - 9)), budget.exact_part(1):
        assert budget.exact_time_left() == pytest.approx(1)


def test_without_a_budget_a_part_is_unbounded():
    with budget.exact_part(3) as part:
        assert part is None and budget.exact_time_left() == float("inf")


def test_every_plan_on_the_wheel_is_exact_though_the_sessions_shared_share_was_spent_before_they_began():
    # 13 of 30 s gone before the plans (as reading a file under load might take): the whole's
    # exact share of 12 s is spent, yet each plan has 4 s of its own, and bold (one round, a
    # few hundredths of a second of exact work) is exact however long timid ran.
    # Bold from 100 to 200 on the single-zero wheel: one even-money bet, goal chance 18/37
    # (standard combinatorics: 18 winning pockets of 37).
    game = oddsbench.load(RULESETS / "single-zero-wheel.toml")
    with budget.scope(Budget(30, started=time.monotonic() - 13)):
        results = oddsbench.sessions(game, plans=("timid", "bold", "flat:2"))
    bold = results.of("bold")
    assert str(bold.bounded.figures["goal_probability"].exact) == "18/37"
    assert all(not plan.notes for plan in results.plans), [plan.notes for plan in results.plans]
