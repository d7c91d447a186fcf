"""The work budget (``model/budget.py``) and the estimates that use it: what a step will cost is
known before it runs, and a step that would not fit is refused in one line naming the option that
raises the budget, or given in decimals with a note.

Time is never asserted here: budgets are made already spent (``started`` in the past) or tiny
next to an estimate that is hopeless by orders of magnitude.
"""

from __future__ import annotations

import time
from types import SimpleNamespace

import pytest
from conftest import RULESETS
from hostile import attack_files as files

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model import budget
from oddsbench.model.budget import Budget, OverBudget
from oddsbench.model.load import load_ruleset, load_ruleset_text, read_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.solve.by_step import end_chances_by_step
from oddsbench.solve.linear import ExactTooLarge, factor_exact, identity_minus
from oddsbench.solve.linear.costs import ExactClock
from oddsbench.solve.round import solve_round
from oddsbench.solve.ruin.roots import characteristic_polynomial, root_seconds
from oddsbench.strategy import compare


def spent(seconds: float = 50, memory_mb: int = 1_900) -> Budget:
    """A budget whose time ran out ``seconds`` ago... or rather one that began that long ago."""
    return Budget(seconds, memory_mb, started=time.monotonic() - seconds)


def test_a_nested_budget_is_never_looser_than_the_one_around_it():
    outer = Budget(10, 500)
    with budget.scope(outer), budget.scope(Budget(100, 4_000)) as inner:
        assert inner.deadline <= outer.deadline + 1e-9
        assert inner.memory_mb == 500


def test_past_the_deadline_a_poll_stops_with_one_line_naming_the_option():
    with (
        budget.scope(spent()),
        pytest.raises(OverBudget, match=r"over the time budget of 50 s \(raise it with --budget"),
    ):
        budget.check("the sweep")


def test_above_the_memory_guard_a_poll_stops_naming_the_memory_option(monkeypatch):
    monkeypatch.setattr(budget, "memory_in_use", lambda: 10 * budget.MB * 1024)
    monkeypatch.setattr(budget, "_last_memory_read", [0.0, 0])
    with budget.scope(Budget(50, 100)), pytest.raises(OverBudget, match=r"memory budget of 100 MB.*--memory MB"):
        budget.check()


def test_a_step_that_would_not_fit_is_refused_before_it_starts():
    with budget.scope(Budget(50)), pytest.raises(OverBudget, match="would take about 2 hours"):
        budget.require("stepping 10^9 rounds", seconds=7_200)


def test_without_a_budget_nothing_is_refused():
    assert budget.current() is None
    budget.check()
    budget.require("anything", seconds=1e12, memory=1e15)


def test_the_exact_solves_of_a_walk_with_a_60_digit_probability_are_estimated_from_its_factors():
    # 300 states: the factors hold numbers of about 120,000 bits; each solve works on numbers as
    # large for every row, which the estimate measures on the factors' own largest pivot.
    chain = build_round_chain(load_ruleset_text(files.walk(300), "walk.toml"))
    lu = factor_exact(identity_minus(chain.q_rows()))
    assert lu.solve_seconds() > 0
    with budget.scope(Budget(1e-3 / 0.4 + lu.solve_seconds())):  # exact arithmetic's share: far too little
        with pytest.raises(ExactTooLarge, match="6 exact solves of 299 states would take"):
            lu.expect_solves(6)


def test_a_round_whose_exact_solves_would_not_fit_gets_decimals_and_a_note():
    # 1,000 states: the round's three solves in whole numbers take several seconds (300 states now fit)
    chain = build_round_chain(load_ruleset_text(files.walk(1_000), "walk.toml"))
    with budget.scope(Budget(2)):
        figures = solve_round(chain)
    assert figures.figures["expected_steps"].exact is None
    assert figures.figures["expected_steps"].decimal > 0
    assert any("exact arithmetic stopped" in note and "--budget" in note for note in figures.notes)


def test_the_forecast_follows_how_the_time_grew_with_the_rows():
    # T(16) / T(8) = 8: rows cost like i^2, the whole like i^3: 1,000 rows take (1000/16)^3 x 8 s.
    clock = ExactClock(None, 1_000, "factorisation")
    assert clock.forecast(8, 1.0) == pytest.approx(1.0 * (1_000 / 8) ** 1)  # no history yet: linear
    assert clock.forecast(16, 8.0) == pytest.approx(8.0 * (1_000 / 16) ** 3)


def test_an_elimination_that_falls_behind_its_forecast_gives_way_to_decimals(monkeypatch):
    clock = ExactClock(None, 10_000, "factorisation")
    monkeypatch.setattr(clock, "began", time.monotonic() - 2.0)  # 2 s spent on the first 100 rows
    with budget.scope(Budget(20)), pytest.raises(ExactTooLarge, match="would take about"):
        clock.poll(100)


def test_end_chances_of_a_star_need_no_transient_by_end_matrix():
    # Each branch ends in its own state with chance 1/2 x 1/branches; half of all rounds go back.
    branches = 2_000
    chain = build_round_chain(load_ruleset_text(files.star(branches), "star.toml"))
    figures = solve_round(chain)
    assert figures.end_probability["e-17"].exact == QQ(1, 2 * branches)
    assert figures.end_probability["back"].exact == QQ(1, 2)
    assert sum(f.exact for f in figures.end_probability.values()) == 1


def test_chances_by_step_stop_stepping_once_nothing_is_left_to_move():
    chain = build_round_chain(load_ruleset(RULESETS / "pass-line.toml"))
    notes: list[str] = []
    with budget.scope(Budget(50)):
        exact, decimal = end_chances_by_step(chain, 10**9, True, notes, None)  # 10^9 steps, done in a few thousand
    assert exact == [None, None]
    assert sum(decimal) == pytest.approx(1.0, abs=1e-12)
    assert decimal[0] == pytest.approx(244 / 495, rel=1e-12)  # the pass line's win chance (Wizard of Odds, from memory)
    assert any("exact products stopped" in note for note in notes)


def test_root_finding_is_estimated_from_the_degree():
    law = ((-1, QQ(1, 2)), (5000, QQ(1, 2)))
    polynomial = characteristic_polynomial(law)
    assert len(polynomial) - 1 == 5001
    assert root_seconds(polynomial) > 1_000
    assert root_seconds(characteristic_polynomial(((-1, QQ(19, 37)), (1, QQ(18, 37))))) < 0.01


def test_families_too_costly_to_expand_are_refused_before_expanding():
    with budget.scope(Budget(50)):
        result = read_ruleset_text(files.combinations(), "f.toml")
    (problem,) = result.errors
    assert "1,999,396 index combinations" in str(problem) and "--budget SECONDS" in str(problem)


def test_a_state_limit_stops_a_family_as_it_expands():
    from oddsbench.model.family_budget import state_limit

    with state_limit(10):
        result = read_ruleset_text(files.many_lets(), "f.toml")
    (problem,) = result.errors
    assert "more than 10 states" in str(problem) and "--max-states" in str(problem)


def test_side_by_side_columns_that_would_not_fit_are_refused_at_the_pace_of_the_first(monkeypatch):
    from oddsbench.core import Work, load_game, make_settings, round_figures

    ticks = iter(range(0, 10**6, 5))  # every column seems to take 5 s
    monkeypatch.setattr(compare, "time", SimpleNamespace(monotonic=lambda: float(next(ticks))))
    game = load_game(RULESETS / "pass-line.toml")
    settings = make_settings(starts="point-*")
    with pytest.raises(OverBudget, match=r"solving 5 more start states side by side \(5.0 s each\)"):
        round_figures(game, settings, Work(budget=Budget(20)))
