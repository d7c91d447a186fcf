"""The return table of one round: the law of the net result, hit, push and loss chances, the standard
deviation per unit staked and each paying step's share of the expected net."""

from __future__ import annotations

import math

import pytest
from conftest import RULESETS, solve_file, solve_text

from oddsbench.model.numbers import QQ
from oddsbench.solve import return_table as engine


def law_of(figures) -> dict:
    return {value.net: value.probability for value in figures.return_table.law}


def test_pass_line_hit_push_and_loss_chances():
    # Ethier, "The Doctrine of Chances" (2010), ch. 15: the pass line wins 244/495, never pushes.
    figures = solve_file("pass-line.toml").figures
    assert figures["hit_frequency"].exact == QQ(244, 495)
    assert figures["push_probability"].exact == 0
    assert figures["loss_probability"].exact == QQ(251, 495)


def test_field_hit_frequency_is_four_ninths():
    # First principles: the field wins on 2, 3, 4, 9, 10, 11, 12: 1+2+3+4+3+2+1 = 16 of 36 rolls.
    assert solve_file("field.toml").figures["hit_frequency"].exact == QQ(4, 9)


def test_field_net_law_lists_each_payout_with_its_contribution():
    # 2 pays double (1/36), 12 pays triple (1/36), the other winners even money (14/36).
    figures = solve_file("field.toml")
    assert law_of(figures) == {QQ(-1): QQ(5, 9), QQ(1): QQ(7, 18), QQ(2): QQ(1, 36), QQ(3): QQ(1, 36)}
    contributions = [value.contribution for value in figures.return_table.law]
    assert contributions == [QQ(-5, 9), QQ(7, 18), QQ(1, 18), QQ(1, 12)]
    assert sum(contributions, QQ(0)) == figures.figures["expected_net"].exact == QQ(-1, 36)


# A round that pays at two steps: a first flip pays 1 and offers a second flip at double the stake
# (pay 2 or -2); a first loss ends it at -1. The end state 'done' is reached with nets 3, -1 and -1:
# the chance of an end state is not the law of the net (hand-worked).
TWO_STEPS = """
[ruleset]
title = "Two flips"
start = "first"

[states.first]
outcomes = [{ to = "second", prob = "1/2", pay = 1 }, { to = "done", prob = "1/2", pay = -1 }]

[states.second]
outcomes = [{ to = "done", prob = "1/3", pay = 2 }, { to = "done", prob = "2/3", pay = -2, note = "loses" }]

[states.done]
"""


def test_the_net_law_is_the_law_of_the_sum_of_every_steps_pay():
    figures = solve_text(TWO_STEPS)
    # nets: -1 (1/2), 1 - 2 = -1 (1/2 * 2/3 = 1/3), 1 + 2 = 3 (1/6)
    assert law_of(figures) == {QQ(-1): QQ(5, 6), QQ(3): QQ(1, 6)}
    assert figures.figures["hit_frequency"].exact == QQ(1, 6)
    assert figures.figures["loss_probability"].exact == QQ(5, 6)
    # E[net] = -5/6 + 3/6 = -1/3; E[net^2] = 5/6 + 9/6 = 7/3; variance 7/3 - 1/9 = 20/9
    assert figures.figures["expected_net"].exact == QQ(-1, 3)
    assert figures.figures["net_variance"].exact == QQ(20, 9)


def test_each_paying_step_carries_its_share_of_the_expected_net():
    figures = solve_text(TWO_STEPS)
    shares = {(s.source, s.target, s.pay): (s.taken, s.contribution) for s in figures.return_table.shares}
    assert shares == {
        ("first", "second", QQ(1)): (QQ(1, 2), QQ(1, 2)),
        ("first", "done", QQ(-1)): (QQ(1, 2), QQ(-1, 2)),
        ("second", "done", QQ(2)): (QQ(1, 6), QQ(1, 3)),
        ("second", "done", QQ(-2)): (QQ(1, 3), QQ(-2, 3)),
    }
    assert sum((s.contribution for s in figures.return_table.shares), QQ(0)) == QQ(-1, 3)


def test_a_step_taken_again_and_again_counts_every_time():
    # s -> t pays 1, t -> s pays -1 (each with chance 1/2, else the round ends). Expected visits:
    # v_s = 1 + v_t / 2, v_t = v_s / 2, so v_s = 4/3, v_t = 2/3; the net is 1 when the round ends
    # from t (chance v_t / 2 = 1/3) and 0 from s (hand-worked).
    text = """
[ruleset]
title = "Back and forth"
start = "s"
[states.s]
outcomes = [{ to = "t", prob = "1/2", pay = 1 }, { to = "end", prob = "1/2" }]
[states.t]
outcomes = [{ to = "s", prob = "1/2", pay = -1 }, { to = "end", prob = "1/2" }]
[states.end]
"""
    figures = solve_text(text)
    shares = {(s.source, s.target): (s.taken, s.contribution) for s in figures.return_table.shares}
    assert shares == {("s", "t"): (QQ(2, 3), QQ(2, 3)), ("t", "s"): (QQ(1, 3), QQ(-1, 3))}
    assert law_of(figures) == {QQ(0): QQ(2, 3), QQ(1): QQ(1, 3)}
    assert figures.figures["expected_net"].exact == QQ(1, 3)


def test_a_loop_that_keeps_paying_has_no_listed_law_but_keeps_its_figures():
    # Each loop pays 1 (chance 1/2), the end pays -2: the net k - 2 has no bound.
    text = """
[ruleset]
title = "Loop"
start = "s"
[states.s]
outcomes = [{ to = "s", prob = "1/2", pay = 1 }, { to = "end", prob = "1/2", pay = -2 }]
[states.end]
"""
    figures = solve_text(text)
    assert figures.return_table is None and "hit_frequency" not in figures.figures
    assert figures.figures["expected_net"].exact == -1  # E[k] = 1 loop on average
    assert any("return table not listed" in note for note in figures.notes)


def test_net_sd_is_the_root_of_the_variance_per_unit_staked():
    figures = solve_file("pass-line.toml").figures
    sd = figures["net_sd"]
    assert sd.exact is None  # 244976/245025 is not the square of a rational
    assert sd.decimal == pytest.approx(math.sqrt(244976 / 245025), rel=1e-15)


def test_net_sd_is_exact_where_the_root_is_rational():
    # A fair coin at even money: variance 1, standard deviation 1; staked 2 per round halves it.
    coin = """
[ruleset]
title = "Coin"
start = "flip"
stake = 2
[states.flip]
outcomes = [{ to = "end", prob = "1/2", pay = 2 }, { to = "end", prob = "1/2", pay = -2 }]
[states.end]
"""
    figures = solve_text(coin).figures
    assert figures["net_variance"].exact == 4
    assert figures["net_sd"].exact == 1 and figures["net_sd"].decimal == 1.0


def test_a_game_of_points_has_chances_but_no_sd_per_unit_staked():
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset
    from oddsbench.solve.round import solve_round
    from oddsbench.strategy.compare import policy_of

    ruleset = load_ruleset(RULESETS / "pig-turn.toml")
    figures = solve_round(build_round_chain(ruleset, policy_of(ruleset, "hold-at-20"))).figures
    assert "net_sd" not in figures and "house_edge" not in figures
    # Pig: a turn held at 20 or more scores 0 (pigged) or at least 20 points; never a loss of points.
    assert figures["loss_probability"].exact == 0
    assert figures["hit_frequency"].exact + figures["push_probability"].exact == 1


def test_decimals_only_keeps_the_figures_and_says_why_the_table_is_missing():
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset
    from oddsbench.solve.round import solve_round

    figures = solve_round(build_round_chain(load_ruleset(RULESETS / "field.toml")), exact_limit=0)
    assert figures.return_table is None and "hit_frequency" not in figures.figures
    assert figures.figures["net_sd"].decimal == pytest.approx(math.sqrt(1691 / 1296))
    assert any("return table" in note and "not listed" in note for note in figures.notes)


def test_a_net_law_too_large_to_list_keeps_the_chances(monkeypatch):
    monkeypatch.setattr(engine, "NET_LAW_LIMIT", 3)
    figures = solve_file("field.toml")
    assert figures.return_table.law is None and figures.return_table.values == 4
    assert figures.figures["hit_frequency"].exact == QQ(4, 9)
    assert any("net law not listed" in note and "4 values" in note for note in figures.notes)


def test_a_product_chain_over_the_exact_limit_is_not_listed():
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset
    from oddsbench.solve.round import solve_round

    chain = build_round_chain(load_ruleset(RULESETS / "pass-line.toml"))
    assert isinstance(engine.return_table(chain, exact_limit=3), str)
    figures = solve_round(chain, exact_limit=chain.transient_count)  # the round fits; its product chain fits too
    assert figures.return_table is not None


def test_a_chance_below_the_float_range_is_a_power_of_ten_in_json_never_0():
    from oddsbench.report.return_table_report import value_json

    tiny = value_json(QQ(1, 10**400))
    assert tiny == {"exact": "1/" + "1" + "0" * 400, "decimal": None, "log10": pytest.approx(-400)}
    assert value_json(QQ(7, 495)) == {"exact": "7/495", "decimal": 7 / 495, "log10": None}
