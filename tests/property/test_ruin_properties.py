"""Play with no goal on random walks (hypothesis): bounds and cut-bet engines against truncation."""

from __future__ import annotations

import math
import os

import mpmath
from conftest import expected_rounds_by_truncation, levels_problem, scaled
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from oddsbench.model.numbers import QQ
from oddsbench.solve.ruin import solve_no_goal_ruin

EXAMPLES = int(os.environ.get("ODDSBENCH_HEAVY_EXAMPLES", "20"))

LAWS = st.builds(
    lambda losses, wins: (losses, wins),
    st.lists(st.integers(1, 12), min_size=1, max_size=3),
    st.lists(st.integers(1, 12), min_size=1, max_size=3),
)
BETS = st.tuples(st.integers(1, 3), st.integers(1, 3)).map(sorted)


def law_of(losses, wins):
    """Losses on -1..-len(losses), wins on 1..len(wins), with the given weights."""
    weights = {-(i + 1): w for i, w in enumerate(losses)} | {i + 1: w for i, w in enumerate(wins)}
    total = sum(weights.values())
    return {jump: QQ(w, total) for jump, w in weights.items()}


def mean_of(law):
    return sum(QQ(j) * p for j, p in law.items())


# Lundberg's inequality psi(u) <= exp(-R u) (Asmussen and Albrecher, Ruin Probabilities, 2nd ed.,
# ch. I and ch. IV, from memory); for a walk whose only loss is one unit it holds with equality.
@settings(max_examples=EXAMPLES, deadline=None)
@given(LAWS, st.integers(1, 40))
def test_lundberg_bound_is_never_below_the_exact_value(weights, bankroll):
    law = law_of(*weights)
    assume(mean_of(law) > 0)  # the bound is about favourable walks
    ruin = solve_no_goal_ruin(law, bankroll, digits=20, check=False)
    mpmath.mp.dps = 40
    assert mpmath.mpf(ruin.ruin.text) <= mpmath.mpf(ruin.lundberg.text) * (1 + mpmath.mpf(10) ** -18)
    if ruin.is_skip_free:
        assert ruin.ruin.text == ruin.lundberg.text


@settings(max_examples=EXAMPLES, deadline=None)
@given(LAWS, BETS, st.integers(1, 12))
def test_cut_bet_walks_agree_with_exact_truncation(weights, bets, bankroll):
    from oddsbench.solve.ruin import ruin_before_goal_levels, solve_cut_bet_ruin

    losses, _ = weights
    law = law_of(*weights)
    small, full = bets
    tail = scaled(law, full)
    bottom = [scaled(law, small)] * (full * len(losses) - 1)
    ruin = solve_cut_bet_ruin(tail, bottom, bankroll, digits=15, check=False)
    problem = levels_problem(tail, bottom, bankroll)
    if ruin.verdict == "possible":
        rate = float(ruin.adjustment_coefficient.value) * ruin.step
        goal = bankroll + len(bottom) + 1 + ruin.step * (1 + math.ceil(7 * math.log(10) / rate))
        assume(goal <= 600)  # a truncation far enough for a gap below 1e-7 stays small
        lower = float(ruin_before_goal_levels(problem.law_at, bankroll, goal))
        assert lower - 1e-12 <= ruin.ruin.value <= lower + 2e-7  # gap below rho^distance <= 1e-7
    else:
        assert ruin.ruin_exact == 1


@settings(max_examples=max(EXAMPLES // 2, 5), deadline=None)
@given(LAWS, BETS, st.integers(1, 12))
def test_subfair_expected_rounds_agree_with_a_long_truncated_walk(weights, bets, bankroll):
    from oddsbench.solve.ruin import solve_cut_bet_ruin

    losses, _ = weights
    law = law_of(*weights)
    assume(mean_of(law) < QQ(-1, 20))  # favourable, fair, or so close to fair that 4,000 levels are not far enough
    small, full = bets
    tail = scaled(law, full)
    bottom = [scaled(law, small)] * (full * len(losses) - 1)
    ruin = solve_cut_bet_ruin(tail, bottom, bankroll, digits=15)
    truth = expected_rounds_by_truncation(levels_problem(tail, bottom, bankroll), bankroll)
    shown = ruin.rounds_to_ruin.decimal
    assert shown is not None and abs(shown.value - truth) < 1e-6 * max(1.0, truth)
