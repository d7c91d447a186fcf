"""Solving a ruleset with overridden [params]: dependent values follow, unknown names are refused."""

from pathlib import Path

import pytest

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import RulesetError
from oddsbench.model.load import load_ruleset, load_ruleset_text, read_ruleset_file
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round

WHEEL = Path(__file__).resolve().parents[2] / "rulesets" / "single-zero-wheel.toml"


def house_edge(ruleset):
    return solve_round(build_round_chain(ruleset)).figures["house_edge"].exact


DEPENDENT = """
[ruleset]
title = "dependent parameters"
start = "spin"
[params]
pockets = 37
win = "1/pockets"
[states.spin]
outcomes = [{ to = "hit", prob = "win", pay = 35 }, { to = "miss", pay = -1 }]
[states.hit]
[states.miss]
"""


def test_bundled_wheel_has_the_single_zero_edge():
    # 1/37 on a single-zero wheel: common practice, no source
    assert house_edge(load_ruleset(WHEEL)) == QQ(1, 37)


def test_overriding_pockets_re_evaluates_a_dependent_parameter():
    # 38 pockets paying 35 to 1: edge 2/38 = 1/19 (double-zero wheel; common practice, no source)
    ruleset = load_ruleset_text(DEPENDENT, "dependent.toml", {"pockets": QQ(38)})
    assert dict(ruleset.params)["win"] == QQ(1, 38)
    assert house_edge(ruleset) == QQ(1, 19)


def test_overrides_turn_the_even_money_bet_into_a_straight_up_bet():
    # one pocket of 37 paying 35 to 1: edge 1/37 (common practice, no source)
    ruleset = load_ruleset(WHEEL, {"pockets_won": QQ(1), "payout": QQ(35)})
    assert house_edge(ruleset) == QQ(1, 37)
    assert dict(ruleset.params) == {"pockets": QQ(37), "pockets_won": QQ(1), "payout": QQ(35)}


def test_an_unknown_parameter_is_one_clear_error():
    result = read_ruleset_file(WHEEL, {"colour": QQ(1)})
    assert result.ruleset is None
    (problem,) = result.errors
    assert "param 'colour'" in str(problem) and "no such parameter" in str(problem)
    with pytest.raises(RulesetError):
        load_ruleset(WHEEL, {"colour": QQ(1)})


def test_an_override_that_breaks_the_chances_is_reported_by_validation():
    result = read_ruleset_file(WHEEL, {"pockets": QQ(1, 2)})
    assert result.ruleset is None
    assert any("prob" in str(problem) for problem in result.errors)
