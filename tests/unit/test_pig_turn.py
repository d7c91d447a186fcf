"""Pig, one turn: hold-at-n scores against an independent recursion; the best play and its certificate."""

from __future__ import annotations

from functools import cache

import pytest
from conftest import RULESETS

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round
from oddsbench.strategy.best_policy import best_policy, check_strategy

GOAL = 100


@pytest.fixture(scope="module")
def pig():
    return load_ruleset(RULESETS / "pig-turn.toml")


def recursion_score(n: int) -> QQ:
    """Expected score of one turn holding at n, by direct backward recursion (independent of the chain solver)."""

    @cache
    def score(total: int) -> QQ:
        if total >= GOAL:
            return QQ(total)
        if total >= n:
            return QQ(total)
        # a 1 scores nothing; faces 2..6 add to the total
        return sum((score(total + face) for face in range(2, 7)), QQ(0)) / 6

    return score(0)


def hold_at(ruleset, n: int) -> dict[str, str]:
    return {
        state.name: ("hold" if int(state.name[5:]) >= n else "roll") for state in ruleset.states if state.is_decision
    }


def chain_score(ruleset, n: int) -> QQ:
    return solve_round(build_round_chain(ruleset, hold_at(ruleset, n))).figures["expected_net"].exact


@pytest.fixture(scope="module")
def scores(pig):
    return {n: chain_score(pig, n) for n in range(1, 41)}


def test_hold_at_n_scores_match_a_direct_recursion_for_n_1_to_40(scores):
    assert all(scores[n] == recursion_score(n) for n in range(1, 41))


def test_hold_at_20_and_21_tie_exactly_at_the_maximum(scores):
    # Neller and Presser, "Optimal Play of the Dice Game Pig", UMAP Journal 25 (2004) (from memory):
    # holding at 20 maximises the expected score of a single turn, about 8.14 points.
    best = max(scores.values())
    assert scores[20] == scores[21] == best
    assert all(scores[n] < best for n in scores if n not in (20, 21))
    assert round(float(best), 2) == 8.14


def test_hold_at_20_score_is_the_exact_fraction(scores):
    assert scores[20] == QQ(492303203, 60466176)


def test_best_finds_a_play_worth_exactly_the_maximum(pig, scores):
    best = best_policy(pig, "max-return")
    assert best.value.exact == scores[20]
    assert best.certified and best.certificate.exact and best.certificate.holds


def test_best_rolls_below_20_and_holds_from_20_reporting_the_tie(pig):
    best = best_policy(pig, "max-return")
    policy = dict(best.policy)
    assert all(policy[f"turn-{t}"] == "roll" for t in range(0, 20) if t != 1)
    assert all(policy[f"turn-{t}"] == "hold" for t in range(20, 100))
    # At 20, rolling gains (5/6)(20 + 4) - 20 = 0: exactly tied, and hold is listed first in the file.
    assert [(tie.state, tie.chosen, tie.equally_good) for tie in best.certificate.ties] == [
        ("turn-20", "hold", ("roll",))
    ]


def test_hold_at_20_is_certified_optimal(pig):
    assert check_strategy(pig, "hold-at-20").optimal


def test_hold_at_25_is_improvable_by_holding_at_24_with_gain_2_of_3(pig):
    # Hand-worked: under hold-at-25, V(24) = (26 + 27 + 28 + 29 + 30)/6 = 70/3; holding gives 24.
    check = check_strategy(pig, "hold-at-25")
    assert not check.optimal
    at_24 = next(i for i in check.improvements if i.state == "turn-24")
    assert (at_24.action, at_24.better, at_24.gain.exact) == ("roll", "hold", QQ(2, 3))


def test_max_win_rolls_everywhere_for_the_chance_to_reach_100_in_one_turn(pig):
    best = best_policy(pig, "max-win")
    assert set(dict(best.policy).values()) == {"roll"}
    assert best.value.exact == solve_round(build_round_chain(pig, hold_at(pig, 1000))).result_probability["win"].exact
