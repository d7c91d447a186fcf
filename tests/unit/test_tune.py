"""``tune``: a round figure as an exact function of one parameter, and the values giving a target.

Every check names its source; "first principles" means the figure is derived in the comment.
"""

from __future__ import annotations

import mpmath
import pytest
from conftest import RULESETS

from oddsbench.core import game_from_text, load_game, parse_amount, parse_target, tune
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ
from oddsbench.solve.rational_function import RationalFunction

WHEEL = RULESETS / "single-zero-wheel.toml"


def wheel_text(pockets_won: int) -> str:
    return (WHEEL.read_text()).replace("pockets_won = 18", f"pockets_won = {pockets_won}")


def test_even_money_wheel_edge_is_19_minus_18_payout_over_37_and_breaks_even_at_19_18():
    # 18 of 37 pockets pay `payout`, 19 lose 1: edge = (19 - 18 payout)/37 (first principles)
    result = tune(load_game(WHEEL), "payout")
    assert result.kind == "rational"
    assert result.formula == RationalFunction((19, -18), (37,))
    assert result.formula.text("payout") == "(19 - 18*payout)/37"
    assert [v.solution.exact for v in result.values] == [QQ(19, 18)]
    assert result.values[0].confirmed is True  # the file solved again at 19/18 gives edge 0 exactly
    assert result.bound.numerator == 1 and result.bound.denominator == 0  # payout enters one pay, linearly


def test_a_straight_up_bet_breaks_even_at_36():
    # 1 pocket of 37 pays `payout`, 36 lose 1: fair when payout = 36 (first principles)
    result = tune(game_from_text(wheel_text(1)), "payout")
    assert [v.solution.exact for v in result.values] == [QQ(36)]


def test_a_percent_target_is_exact():
    # edge 1.5 % = 3/200: 19 - 18 x = 37 * 3/200, x = (3800 - 111)/3600 = 3689/3600 (first principles)
    result = tune(load_game(WHEEL), "payout", parse_target("house_edge=1.5%"))
    assert result.target == QQ(3, 200)
    assert [v.solution.exact for v in result.values] == [QQ(3689, 3600)]


def test_field_twelve_payout_break_even():
    # field, 2 pays double, 12 pays x: edge = (20 - 14 - 2 - x)/36 = (4 - x)/36; 1/36 at x = 3
    # (the field's 2.78 % edge with 3 to 1 on twelve: Ethier 2010, from memory)
    result = tune(load_game(RULESETS / "field.toml"), "pay_twelve")
    assert result.figure_now.exact == QQ(1, 36)
    assert result.formula(QQ(3)) == QQ(1, 36)
    assert [v.solution.exact for v in result.values] == [QQ(4)]


def newton_keller(p):
    """Chance of winning a game to four points, win by two (Newton and Keller 2005):
    p^4 + 4 p^4 q + 10 p^4 q^2 + 20 p^3 q^3 p^2 / (1 - 2 p q)."""
    q = 1 - p
    return p**4 + 4 * p**4 * q + 10 * p**4 * q**2 + 20 * p**3 * q**3 * p**2 / (1 - 2 * p * q)


def test_deuce_game_win_chance_is_newton_and_keller_identically():
    from flint import fmpq_poly

    result = tune(load_game(RULESETS / "deuce-game.toml"), "p", parse_target("end:won=1/2"))
    assert result.kind == "rational"
    # The identity as polynomials: N_f D_e = N_e D_f, with Newton and Keller's formula over a common
    # denominator (1 - 2pq) = 1 - 2p + 2p^2.
    p = fmpq_poly([0, 1])
    q = 1 - p
    d_e = 1 - 2 * p * q
    n_e = (p**4 + 4 * p**4 * q + 10 * p**4 * q**2) * d_e + 20 * p**5 * q**3
    n_f, d_f = fmpq_poly(list(result.formula.numerator)), fmpq_poly(list(result.formula.denominator))
    assert n_f * d_e == n_e * d_f
    # p = 1/2 wins half the games by symmetry (first principles), and it is the only valid value
    valid = [v for v in result.values if v.valid]
    assert [v.solution.exact for v in valid] == [QQ(1, 2)]
    assert result.valid_range[0][0].at.exact == 0 and result.valid_range[0][1].at.exact == 1


def test_an_algebraic_value_has_certified_digits_that_newton_and_keller_confirm():
    result = tune(load_game(RULESETS / "deuce-game.toml"), "p", parse_target("end:won=3/4"))
    valid = [v for v in result.values if v.valid]
    assert len(valid) == 1 and valid[0].solution.exact is None
    solution = valid[0].solution
    mpmath.mp.dps = 50
    root = mpmath.findroot(lambda x: newton_keller(x) - mpmath.mpf(3) / 4, solution.approximate)
    digits = solution.decimal.text
    assert len(digits.replace("0.", "", 1)) == 30  # 30 digits, each proved: off by less than one in the last
    assert abs(mpmath.mpf(digits) - root) < mpmath.mpf(10) ** -30
    assert "real root of" in solution.text("p")


def test_a_parameter_the_round_does_not_use_is_constant():
    text = WHEEL.read_text().replace("payout = 1", "payout = 1\nunused = 5")
    result = tune(game_from_text(text), "unused", parse_target("house_edge=1/37"))
    assert result.kind == "constant" and result.every_value
    result = tune(game_from_text(text), "unused")
    assert result.kind == "constant" and not result.every_value and not result.values


def test_a_division_by_the_parameter_is_not_polynomial_and_is_bisected():
    # 18 of `pockets` pockets pay 1: edge = (pockets - 36)/pockets, 0 at 36 pockets (first principles)
    result = tune(load_game(WHEEL), "pockets", tolerance=QQ(1, 10**12))
    assert result.kind == "not-polynomial" and any("division" in reason for reason in result.reasons)
    assert any(b.low <= 36 <= b.high for b in result.brackets)


PIECEWISE = """
[ruleset]
title = "Rounded payout (invented demo)"
start = "spin"
[params]
payout = "3/2"
[states.spin]
outcomes = [
  { to = "won", prob = "1/2", pay = "floor(payout * 4) / 4" },
  { to = "lost", prob = "1/2", pay = -1 },
]
[states.won]
[states.lost]
"""


def test_a_floor_makes_the_figure_piecewise_and_bisection_brackets_the_jump():
    # net = (floor(4x)/4 - 1)/2; break-even needs floor(4x)/4 = 1: every x in [1, 5/4) (first principles)
    result = tune(game_from_text(PIECEWISE), "payout", tolerance=QQ(1, 10**6))
    assert result.kind == "piecewise" and any("floor" in reason for reason in result.reasons)
    assert result.brackets
    hit = result.brackets[0]
    assert QQ(1) <= hit.low <= QQ(5, 4) and hit.high - hit.low <= QQ(1, 10**6)


def test_amounts_parse_exactly_and_never_as_code():
    assert parse_amount("1.5%", "x") == QQ(3, 200)
    assert parse_amount("1e-9", "x") == QQ(1, 10**9)
    assert parse_amount("19/18", "x") == QQ(19, 18)
    with pytest.raises(OddsbenchError):
        parse_amount("__import__('os')", "x")
    with pytest.raises(OddsbenchError):
        parse_target("house_edge")


STREAK = """
[ruleset]
title = "Streak (invented demo)"
start = "step-0"
[params]
rungs = 5
[families.step]
state = "step-{k}"
index = { k = [0, "rungs - 1"] }
outcomes = [
  { to = "step-{k + 1}", prob = "9/10", when = "k + 1 < rungs" },
  { to = "won", prob = "9/10", when = "k + 1 == rungs", pay = 10 },
  { to = "lost", prob = "1/10", pay = -1 },
]
[states.won]
[states.lost]
"""


def test_a_count_is_bisected_over_whole_values():
    # survive n steps at 9/10 to win 10: edge = 1 - 11 (9/10)^n, 0 between n = 22 and 23, since
    # (9/10)^22 > 1/11 > (9/10)^23 (first principles)
    result = tune(game_from_text(STREAK), "rungs")
    assert result.kind == "piecewise"
    assert [(b.low, b.high) for b in result.brackets] == [(QQ(22), QQ(23))]
    assert result.brackets[0].figure_low.exact == 1 - 11 * QQ(9, 10) ** 22
    assert any("whole numbers" in note for note in result.notes)


def test_the_search_over_whole_values_says_it_is_exact_not_to_a_tolerance():
    # Issue 13 round 3: the text said "to 1e-9" for a count, whose brackets are neighbouring whole
    # values found exactly; a payout through floor() is bisected to the tolerance (first principles:
    # floor(payout) in the wheel's pay is piecewise, and payout takes any value).
    from oddsbench.report.tune_report import tune_json, tune_text

    counted = tune(game_from_text(STREAK), "rungs")
    assert counted.whole
    shown = " ".join(tune_text(counted).split())
    assert "over whole values of rungs" in shown and "no tolerance applies" in shown
    assert "to 1/1000000000" not in shown
    assert tune_json(counted)["whole_values"] is True
    floored = tune(game_from_text(WHEEL.read_text().replace('pay = "payout"', 'pay = "floor(payout)"')), "payout")
    assert floored.kind == "piecewise" and not floored.whole
    assert "Exact bisection to 1/1000000000" in " ".join(tune_text(floored).split())
    assert tune_json(floored)["whole_values"] is False
