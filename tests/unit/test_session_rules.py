"""The session rules (chain/session_rules.py): one copy for bounded sessions and play with no goal."""

from __future__ import annotations

import numpy as np
import pytest

from oddsbench.chain.bankroll import make_grid
from oddsbench.chain.round_distribution import parse_round_text
from oddsbench.chain.session_rules import (
    cover_of,
    default_unit,
    grid_scale,
    rational_gcd,
    table_rules,
)
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ
from oddsbench.strategy.no_goal_play import no_goal_walk, solve_no_goal
from oddsbench.strategy.plans import parse_plan
from oddsbench.strategy.session import SessionSettings, analyse_session

EVEN_MONEY = parse_round_text("1:18/37,-1:19/37")


@pytest.mark.parametrize(
    ("min_bet", "amounts", "unit"),
    [
        (None, (), QQ(1)),  # nothing set: the unit is 1
        (QQ(2), (), QQ(1)),  # a whole minimum keeps the unit 1
        (QQ(1, 2), (), QQ(1, 2)),  # a minimum that is not whole is the unit
        (None, (QQ(3),), QQ(1)),  # a whole flat bet changes nothing
        (QQ(1, 2), (QQ(3, 2),), QQ(1, 2)),  # an amount that is a multiple of the unit changes nothing
        (None, (QQ(1, 2),), QQ(1, 2)),  # flat:1/2 with no unit set: the unit follows the plan's bet
        (None, (QQ(3, 2),), QQ(1, 2)),  # the rational gcd of 1 and 3/2
        (QQ(1, 2), (QQ(1, 3),), QQ(1, 6)),
        (QQ(2), (QQ(3, 4),), QQ(1, 4)),
    ],
)
def test_default_unit(min_bet, amounts, unit):
    assert default_unit(min_bet, amounts) == unit


def test_rational_gcd_divides_every_value_a_whole_number_of_times():
    assert rational_gcd([QQ(3, 4), QQ(5, 6)]) == QQ(1, 12)
    assert rational_gcd([QQ(2), QQ(4)]) == QQ(2)


def test_grid_and_cover_come_from_the_round():
    blackjack_like = parse_round_text("3/2:1/4,1:1/4,-1:1/4,-2:1/8,2:1/8")
    assert grid_scale(o.net for o in blackjack_like.outcomes) == 2 == blackjack_like.net_denominator
    assert cover_of([(QQ(1), QQ(1)), (QQ(-2), QQ(0))]) == 2  # a doubled loss takes two stakes
    assert cover_of([(QQ(1), QQ(3)), (QQ(-1), QQ(0))]) == 4  # an extra stake of 3 is tied up


def test_cut_bets_raise_to_the_minimum_cut_to_the_maximum_and_to_the_cover():
    rules = table_rules(QQ(1), 1, QQ(1), min_bet=QQ(2), max_bet=QQ(5))
    assert rules.low == 2  # the ruin level: the smallest bankroll covering the minimum bet
    assert [rules.placed(4, value) for value in (2, 3, 4, 9)] == [2, 3, 4, 4]
    assert rules.placed(9, 100) == 5 and rules.placed(1, 100) == 2
    assert rules.placed(np.array([9, 1]), np.array([3, 100])).tolist() == [3, 2]


def test_bad_table_amounts_are_refused_in_one_line():
    with pytest.raises(OddsbenchError, match="session max_bet 1 is below min_bet 2"):
        table_rules(QQ(1), 1, QQ(1), min_bet=QQ(2), max_bet=QQ(1))
    with pytest.raises(OddsbenchError, match="session min_bet 1/3 must be a whole, positive number of betting units"):
        table_rules(QQ(1, 2), 1, QQ(1), min_bet=QQ(1, 3))
    with pytest.raises(OddsbenchError, match="session floor must be at least 0, got -1"):
        table_rules(QQ(1), 1, QQ(1), floor=QQ(-1))


def test_bounded_sessions_and_no_goal_place_the_same_cut_bets():
    # a 2-unit flat bet on a 3-to-2 payout round with a table minimum of 1: one copy of the cut-bet rule
    round_ = parse_round_text("3/2:1/2,-1:1/2")
    grid = make_grid(round_, QQ(9), QQ(40), min_bet=QQ(1))
    walk = no_goal_walk([(o.net, o.prob) for o in round_.outcomes], QQ(2), QQ(9), round_.cover, min_bet=QQ(1))
    assert walk.low == grid.low and walk.grid == grid.step
    values = np.arange(grid.low, grid.low + len(walk.bottom) + 3)
    bounded = grid.placed(np.full(len(values), 2), values).tolist()
    assert [bet / walk.unit for bet, _ in walk.bottom] == bounded[: len(walk.bottom)]
    assert bounded[len(walk.bottom) :] == [2, 2, 2]


def test_a_half_unit_flat_bet_with_no_unit_set_is_played_in_half_units():
    # Feller vol. I ch. XIV sec. 2: P(goal from k of N) = (1 - r^k) / (1 - r^N), r = q/p; here k = 10, N = 20
    plan = parse_plan("flat:1/2")
    grid = make_grid(EVEN_MONEY, QQ(5), QQ(10), amounts=(plan.amount,))
    assert grid.unit == QQ(1, 2)
    settings = SessionSettings(bankroll=QQ(5), goal=QQ(10), unit=default_unit(None, (plan.amount,)))
    figures = analyse_session(EVEN_MONEY, settings, plan)
    r = QQ(19, 18)
    assert figures.figures["goal_probability"].exact == (1 - r**10) / (1 - r**20)
    no_goal = solve_no_goal(EVEN_MONEY, plan, QQ(5))
    assert no_goal.walk.unit == QQ(1, 2) and no_goal.ruin.ruin_exact == 1
    assert no_goal.ruin.rounds_to_ruin.exact == 370  # Wald: 10 half units / (1/37) lost per round


def test_no_goal_refuses_plans_whose_bet_grows_with_the_bankroll():
    with pytest.raises(OddsbenchError, match="with no goal the bet must stay bounded"):
        solve_no_goal(EVEN_MONEY, parse_plan("bold"), QQ(5))


def test_the_rules_load_without_numpy_so_reading_a_ruleset_stays_quick():
    import subprocess
    import sys

    code = "import sys, oddsbench.chain.round_distribution; print('numpy' in sys.modules)"
    shown = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert shown.strip() == "False"
