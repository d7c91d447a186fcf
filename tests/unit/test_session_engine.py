"""The session engine on fixed games: brute force, the optimiser, grids and round distributions.

The identities on random games (hypothesis) are in tests/property/test_session_properties.py."""

from __future__ import annotations

import itertools

import pytest
from conftest import NAMED_PLANS, RULESETS

from oddsbench.chain.round_distribution import RoundOutcome, make_distribution, parse_round_text
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ
from oddsbench.strategy.session import SessionSettings, analyse_session


def brute_force_within(nets, probs, bankroll, goal, bet, rounds):
    """Enumerate every path of ``rounds`` rounds of a flat bet (cut to the bankroll, ruin below 1)."""
    ruin = reach = QQ(0)
    after: dict[int, QQ] = {}
    for path in itertools.product(range(len(nets)), repeat=rounds):
        money, chance, stopped = bankroll, QQ(1), None
        for k in path:
            chance *= probs[k]  # rounds after a stop still split the chance: their branches add up
            if stopped:
                continue
            stake = min(bet, money)
            money += nets[k] * stake
            if money >= goal:
                stopped = "goal"
            elif money < 1:
                stopped = "ruin"
        if stopped == "goal":
            reach += chance
        elif stopped == "ruin":
            ruin += chance
        after[money] = after.get(money, QQ(0)) + chance
    return ruin, reach, after


@pytest.mark.parametrize("rounds", [1, 3, 6])
def test_ruin_within_n_rounds_matches_path_enumeration(rounds):
    nets, probs = [-1, 0, 2], [QQ(1, 2), QQ(1, 6), QQ(1, 3)]
    game = make_distribution("t", [RoundOutcome(QQ(n), p) for n, p in zip(nets, probs)])
    result = analyse_session(game, SessionSettings(QQ(3), QQ(9)), "flat:2", rounds=rounds)
    ruin, reach, after = brute_force_within(nets, probs, 3, 9, 2, rounds)
    assert result.figures["within_ruin_probability"].exact == ruin
    assert result.figures["within_goal_probability"].exact == reach
    assert {int(v.money): v.chance.exact for v in result.after_rounds} == {k: v for k, v in after.items() if v}


def test_time_cap_matches_path_enumeration():
    nets, probs = [-1, 0, 2], [QQ(1, 2), QQ(1, 6), QQ(1, 3)]
    game = make_distribution("t", [RoundOutcome(QQ(n), p) for n, p in zip(nets, probs)])
    result = analyse_session(game, SessionSettings(QQ(3), QQ(9), max_rounds=4), "flat:2")
    ruin, reach, after = brute_force_within(nets, probs, 3, 9, 2, 4)
    assert result.figures["ruin_probability"].exact == ruin
    assert result.figures["time_cap_probability"].exact == 1 - ruin - reach
    expected_final = sum((money * p for money, p in after.items()), QQ(0))
    assert result.figures["expected_final_bankroll"].exact == expected_final
    assert result.figures["expected_net"].exact == result.figures["edge_times_staked"].exact


@pytest.mark.parametrize("spec", ["1:18/37,-1:19/37", "35:1/37,-1:36/37", "1:7/18,2:1/36,3:1/36,-1:5/9"])
def test_optimiser_is_never_worse_than_a_named_plan(spec):
    # Issue 4: the optimiser's chance of the goal is at least every named plan's, from every bankroll.
    game = parse_round_text(spec)
    settings = SessionSettings(QQ(20), QQ(40))
    best = analyse_session(game, settings, "best")
    assert "exact arithmetic" in " ".join(best.notes)
    for plan in NAMED_PLANS:
        other = analyse_session(game, settings, plan)
        assert all(b >= o for b, o in zip(best.goal_series_exact, other.goal_series_exact)), plan


def test_optimiser_equals_bold_play_in_a_subfair_even_money_game():
    # Dubins and Savage (1965): bold play is optimal for subfair red-and-black.
    game = parse_round_text("1:18/37,-1:19/37")
    settings = SessionSettings(QQ(37), QQ(100))
    best = analyse_session(game, settings, "best")
    bold = analyse_session(game, settings, "bold")
    assert best.goal_series_exact == bold.goal_series_exact


def test_optimiser_beats_bold_play_where_bold_is_not_optimal():
    # A superfair even-money game: timid play is better than bold play (Feller, ch. XIV: for p > q
    # the ruin chance falls as the stake is made smaller); the optimiser must find at least that.
    game = parse_round_text("1:3/5,-1:2/5")
    settings = SessionSettings(QQ(10), QQ(20))
    best = analyse_session(game, settings, "best").figures["goal_probability"].exact
    bold = analyse_session(game, settings, "bold").figures["goal_probability"].exact
    timid = analyse_session(game, settings, "timid").figures["goal_probability"].exact
    assert timid > bold and best >= timid


def test_three_to_two_payout_uses_a_half_unit_grid():
    result = analyse_session(parse_round_text("3/2:1/2,-1:1/2"), SessionSettings(QQ(10), QQ(20)), "bold")
    assert result.step == QQ(1, 2)
    assert {v.money for v in result.final} == {QQ(0), QQ(1, 2), QQ(20), QQ(41, 2), QQ(21)}
    assert result.figures["expected_net"].exact == result.figures["edge_times_staked"].exact


def test_bets_never_exceed_what_the_bankroll_covers():
    # an extra stake of 1 per unit (a doubled bet) needs twice the bet in the bankroll
    game = parse_round_text("2:2/5:1,-2:1/2:1,0:1/10")
    result = analyse_session(game, SessionSettings(QQ(5), QQ(30)), "flat:10")
    assert result.figures["first_bet"].exact == 2
    assert all(v.money >= 0 for v in result.final)


def test_max_bet_limits_bold_play():
    game = parse_round_text("1:18/37,-1:19/37")
    result = analyse_session(game, SessionSettings(QQ(50), QQ(100), max_bet=QQ(10)), "bold")
    assert result.figures["first_bet"].exact == 10


def test_floor_stops_the_session_as_a_stop_loss():
    game = parse_round_text("1:1/2,-1:1/2")
    result = analyse_session(game, SessionSettings(QQ(5), QQ(10), floor=QQ(2)), "timid")
    # fair walk between 2 and 10 from 5: reach 10 with chance 3/8
    assert result.figures["goal_probability"].exact == QQ(3, 8)
    assert result.figures["floor_probability"].exact == QQ(5, 8)
    assert result.figures["ruin_probability"].exact == 0


def test_a_bankroll_below_the_minimum_bet_is_ruin_at_once():
    game = parse_round_text("1:1/2,-1:1/2")
    result = analyse_session(game, SessionSettings(QQ(1), QQ(10), min_bet=QQ(2)), "timid")
    assert result.figures["ruin_probability"].exact == 1
    assert result.figures["expected_rounds"].exact == 0


@pytest.mark.parametrize(
    ("spec", "message"),
    [
        ("1:1/2,-1:1/3", "sum to 5/6"),
        ("1:1/2", "sum"),
        ("0:1", "net result 0"),
        ("1:x", "unknown parameter"),
        ("1", "net:probability"),
    ],
)
def test_bad_inline_rounds_are_one_clear_error(spec, message):
    with pytest.raises(OddsbenchError, match=message):
        parse_round_text(spec)


def test_goal_must_be_above_the_bankroll():
    with pytest.raises(OddsbenchError, match="goal"):
        analyse_session(parse_round_text("1:1/2,-1:1/2"), SessionSettings(QQ(10), QQ(5)), "timid")


def test_pass_line_round_distribution_from_the_ruleset():
    from oddsbench.model.load import load_ruleset
    from oddsbench.solve.round_distribution import round_distribution_of

    distribution = round_distribution_of(load_ruleset(RULESETS / "pass-line.toml"))
    assert [(o.net, o.prob) for o in distribution.outcomes] == [(-1, QQ(251, 495)), (1, QQ(244, 495))]


def test_an_end_state_reached_with_different_totals_splits_the_distribution():
    from oddsbench.model.load import load_ruleset_text
    from oddsbench.solve.round_distribution import round_distribution_of

    text = """
[ruleset]
title = "two ways in"
start = "a"
stake = 1

[states.a]
outcomes = [
  { to = "b", prob = "1/2", pay = 1 },
  { to = "b", prob = "1/2", pay = -1 },
]

[states.b]
outcomes = [
  { to = "b", prob = "1/3" },
  { to = "done", prob = "2/3", pay = 1 },
]

[states.done]
result = "end"
"""
    distribution = round_distribution_of(load_ruleset_text(text, "two.toml"))
    assert [(o.net, o.prob) for o in distribution.outcomes] == [(0, QQ(1, 2)), (2, QQ(1, 2))]


def test_a_goal_chance_below_the_float_range_is_given_as_a_power_of_ten_not_a_plain_zero():
    # (19/18)^-20000 is about 1e-470: far below the smallest float. The classical ruin formula
    # (Feller vol. I ch. XIV sec. 2), P(goal) = (r^z - 1) / (r^a - 1) with r = q/p, in mpmath.
    import mpmath

    game = parse_round_text("1:18/37,-1:19/37")
    result = analyse_session(game, SessionSettings(QQ(20_000), QQ(40_000)), "timid")
    goal = result.figures["goal_probability"]
    assert goal.decimal == 0.0 and goal.log10 is not None
    with mpmath.workdps(40):
        r = mpmath.mpf(19) / 18
        truth = mpmath.log10((r**20_000 - 1) / (r**40_000 - 1))
    assert abs(goal.log10 - float(truth)) < 1e-9
