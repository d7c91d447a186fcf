"""A cancel asked while the exact elimination solves (after it has factored) stops it at the next row.

The factors of a walk whose probability has a long denominator are small, but its solutions are
not: a 1,000-state walk with a 60-digit probability factors in half a second and then spends 40 s
in each solve, on numbers that grow row by row, and 64 rows of its transposed solve took 5 s. So
the solves ask whether to stop by the clock (``costs.POLL_SECONDS``), not by a count of rows.
Here the interval is set to 0, which makes every row dearer than it: each row must ask, and the
row that sees the stop is the last one done. Promptness in seconds is a benchmark
(``tests/benchmarks/bench_cancellation.py``), never a wall-clock assert.

Reference for the walk: the gambler's-ruin formula, W. Feller, An Introduction to Probability
Theory and Its Applications, vol. 1, 3rd ed., ch. XIV, sec. 2 (from memory): with r = q/p, the
chance of reaching N before 0 from z is (r^z - 1)/(r^N - 1).
"""

from __future__ import annotations

import pytest

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.numbers import QQ
from oddsbench.model.ruleset import Ruleset
from oddsbench.solve.cancel import SolveCancelled, cancellable
from oddsbench.solve.linear import ExactSparseLU, costs, factor_exact, identity_minus
from oddsbench.solve.linear.integer_lu import IntegerLU
from oddsbench.solve.round import solve_round
from tests.unit.test_numerics_limits import walk

UP = QQ(10**59 + 12_345, 2 * 10**59 + 7)  # an invented chance with a 60-digit denominator
STATES = 60


def long_walk(goal: int = STATES + 1) -> Ruleset:
    """A +1/-1 walk on bankrolls 0..goal from the middle (goal - 1 transient states)."""
    return walk(goal, goal // 2, UP)


class CountedRows(list):
    """Rows of the factors that count how often a solve reads them: each row of a solve's pass
    reads its pivot (``solve``'s second pass, ``solve_transposed``'s first) or its multipliers
    (the other pass) once."""

    def __init__(self, values) -> None:
        super().__init__(values)
        self.reached = 0

    def __getitem__(self, index):
        self.reached += 1
        return super().__getitem__(index)


class StopAtAsk:
    """A cancel check that says stop at its ``at``-th ask and counts every ask."""

    def __init__(self, at: int) -> None:
        self.at, self.asks = at, 0

    def __call__(self) -> bool:
        self.asks += 1
        return self.asks >= self.at


@pytest.fixture
def every_row_asks(monkeypatch):
    monkeypatch.setattr(costs, "POLL_SECONDS", 0.0)


def factors() -> ExactSparseLU:
    lu = factor_exact(identity_minus(build_round_chain(long_walk()).q_rows()))
    lu.solve_seconds()  # the solves' cost estimate reads the factors once, before any row is counted
    lu.pivots, lu.lower = CountedRows(lu.pivots), CountedRows(lu.lower)
    return lu


def rows_done(lu: ExactSparseLU) -> int:
    done = lu.pivots.reached + lu.lower.reached
    lu.pivots.reached = lu.lower.reached = 0
    return done


@pytest.mark.parametrize("which", ["solve", "solve_transposed"])
def test_a_cancel_during_an_exact_solve_stops_at_the_row_that_asks_and_returns_nothing(every_row_asks, which):
    lu = factors()
    assert lu.size == STATES
    rhs = [QQ(1)] * STATES if which == "solve" else [QQ(int(i == STATES // 2)) for i in range(STATES)]
    full = getattr(lu, which)(rhs)
    assert rows_done(lu) == 2 * STATES  # a whole solve: two passes over every row
    stop = StopAtAsk(at=STATES + 10)  # asked in the second half of the solve's 2 x 60 rows
    lu.should_stop = stop
    result = None
    with pytest.raises(SolveCancelled):
        result = getattr(lu, which)(rhs)
    assert result is None  # no partial vector comes back
    assert stop.asks == STATES + 10  # every row asked, and the stop was the last question
    assert rows_done(lu) == STATES + 9  # every row before the one that saw the stop, and not that one
    # the factors are untouched: the next solve gives the whole answer again
    lu.should_stop = None
    assert getattr(lu, which)(rhs) == full


def test_the_workbench_cancel_reaches_a_solve_through_the_cancel_block(every_row_asks):
    """The workbench hands its cancel to the whole solve as a block (``cancellable``); the solve's
    rows see it without being handed it, so a solve started before Esc still stops."""
    lu = factors()
    lu.should_stop = None
    stop = StopAtAsk(at=3)
    with cancellable(stop), pytest.raises(SolveCancelled):
        lu.solve([QQ(1)] * STATES)
    assert stop.asks == 3


def test_solve_round_gives_no_figures_when_cancelled_in_its_exact_solves(every_row_asks, monkeypatch):
    """A cancel in the exact moments' solves is a cancel, not a reason for decimals only: nothing is returned."""
    chain = build_round_chain(long_walk())
    solving = []
    real_solve = IntegerLU.solve_transposed_scaled  # the round's first solve: expected visits

    def noted_solve(self, rhs):
        solving.append(True)
        return real_solve(self, rhs)

    monkeypatch.setattr(IntegerLU, "solve_transposed_scaled", noted_solve)
    figures = solve_round(chain)  # uncancelled, the exact walk matches Feller's formula
    r = (1 - UP) / UP
    goal = STATES + 1
    start = goal // 2
    assert figures.end_probability[f"b{goal}"].exact == (r**start - 1) / (r**goal - 1)
    solving.clear()
    asked_in_solve = []

    def stop_once_solving() -> bool:
        if solving:
            asked_in_solve.append(True)
        return len(asked_in_solve) >= 2

    result = None
    with pytest.raises(SolveCancelled):
        result = solve_round(chain, should_stop=stop_once_solving)
    assert result is None
    assert len(solving) == 1 and len(asked_in_solve) == 2  # stopped in the first solve, at its second row
