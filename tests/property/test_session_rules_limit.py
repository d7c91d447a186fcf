"""Bounded sessions and play with no goal follow one copy of the session rules, so the no-goal ruin
chance is the limit of the bounded ruin chance as the goal grows (random small rounds, hypothesis).

P(ruin before the goal G) rises with G to the no-goal ruin chance psi, and psi - P(ruin before G)
is at most the chance of ever falling from G back below the levels with full bets, which the
Lundberg bound keeps under exp(-R x distance) (Asmussen and Albrecher, Ruin Probabilities, ch. I,
from memory).
"""

from __future__ import annotations

import math

from hypothesis import assume, given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_distribution import RoundOutcome, make_distribution, parse_round_text
from oddsbench.model.numbers import QQ
from oddsbench.strategy.no_goal_play import solve_no_goal
from oddsbench.strategy.plans import parse_plan
from oddsbench.strategy.session import SessionSettings, analyse_session


@st.composite
def favourable_rounds(draw):
    """Wins of 1..3 and losses of 1..2 units with small integer weights, expected result at least 1/10."""
    losses = draw(st.lists(st.integers(1, 6), min_size=1, max_size=2))
    wins = draw(st.lists(st.integers(1, 6), min_size=1, max_size=3))
    total = sum(losses) + sum(wins)
    outcomes = [RoundOutcome(QQ(-(i + 1)), QQ(w, total)) for i, w in enumerate(losses)]
    outcomes += [RoundOutcome(QQ(i + 1), QQ(w, total)) for i, w in enumerate(wins)]
    distribution = make_distribution("random round", outcomes)
    assume(distribution.expected_net >= QQ(1, 10))
    return distribution


def bounded_ruin(distribution, bankroll: int, goal: int, bet: int, min_bet: int, exact_limit: int = 0) -> float:
    settings = SessionSettings(bankroll=QQ(bankroll), goal=QQ(goal), min_bet=QQ(min_bet))
    figures = analyse_session(distribution, settings, f"flat:{bet}", exact_limit=exact_limit)
    return figures.figures["ruin_probability"]


@settings(max_examples=25, deadline=None)
@given(favourable_rounds(), st.integers(1, 3), st.integers(2, 12))  # bankroll covers a loss of 2
def test_no_goal_ruin_is_the_limit_of_bounded_ruin_as_the_goal_grows(distribution, bet, bankroll):
    no_goal = solve_no_goal(distribution, parse_plan(f"flat:{bet}"), QQ(bankroll), min_bet=QQ(1), check=False)
    psi = no_goal.ruin.ruin.value
    rate = float(no_goal.ruin.adjustment_coefficient.value)  # R per grid unit of the full bet
    near = bankroll + 2 * bet
    far = bankroll + 2 * bet + math.ceil(12 * math.log(10) / rate) + 2 * bet
    assume(far <= 3_000)
    small = bounded_ruin(distribution, bankroll, near, bet, 1, exact_limit=3_000)
    large = bounded_ruin(distribution, bankroll, far, bet, 1)
    assert small.exact is not None
    assert small.decimal <= large.decimal + 1e-12 <= psi + 2e-12
    assert psi - large.decimal < 1e-9


def test_subfair_bounded_ruin_rises_to_certain_ruin():
    # Feller vol. I ch. XIV sec. 2: ruin before the goal from 10 is 1 - (r^10 - 1) / (r^G - 1), r = 19/18
    round_ = parse_round_text("1:18/37,-1:19/37")
    assert solve_no_goal(round_, parse_plan("flat:1"), QQ(10)).ruin.ruin_exact == 1
    r = QQ(19, 18)
    for goal in (20, 100, 400):
        ruin = bounded_ruin(round_, 10, goal, 1, 1, exact_limit=3_000)
        assert ruin.exact == 1 - (r**10 - 1) / (r**goal - 1)
    assert 1 - ruin.decimal < 1e-9
