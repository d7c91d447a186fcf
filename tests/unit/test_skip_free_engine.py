"""The skip-free walk engine (solve/linear/skip_free.py) and the sessions it solves.

Truth: the classical ruin formula of Feller vol. I ch. XIV sec. 2, P(goal from z) = (r^z - 1) /
(r^a - 1) with r = q/p, evaluated in mpmath; elsewhere the exact engine (rational elimination).
"""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest

from oddsbench.chain.round_distribution import parse_round_text
from oddsbench.model.figure import FLOAT_TINY
from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve.linear import SkipFreeFactors, SkipFreeWalk, factor_exact, factor_float
from oddsbench.strategy.session import SessionSettings, analyse_session

WHEEL = "1:18/37,-1:19/37"


def feller_goal_log10(start: int, goal: int, p: mpmath.mpf, q: mpmath.mpf) -> float:
    with mpmath.workdps(40):
        r = q / p
        return float(mpmath.log10((r**start - 1) / (r**goal - 1)))


def leading(log10: float) -> tuple[str, int]:
    """(5 significant digits, exponent) of 10**log10."""
    exponent = math.floor(log10)
    return f"{10 ** (log10 - exponent):.4f}", exponent


@pytest.fixture(scope="module")
def million_session():
    wheel = parse_round_text(WHEEL)
    return analyse_session(wheel, SessionSettings(QQ(500_000), QQ(1_000_000)), "timid")


@pytest.mark.parametrize(
    "bankroll, shown",
    [(100_000, "1.0321e-21133"), (500_000, "2.8319e-11741"), (900_000, "7.7699e-2349")],  # issue 15's values
)
def test_the_goal_series_far_below_the_float_range_has_its_leading_digits_and_exponent(
    million_session, bankroll, shown
):
    truth = feller_goal_log10(bankroll, 1_000_000, mpmath.mpf(18) / 37, mpmath.mpf(19) / 37)
    figure = million_session.series_figure(bankroll)
    assert figure.decimal == 0.0 and figure.log10 is not None  # never float debris, never a silent 0
    assert leading(figure.log10) == leading(truth)
    digits, exponent = leading(truth)
    assert f"{digits}e{exponent}" == shown


def test_the_session_text_shows_the_series_as_powers_of_ten_not_underflow_debris(capsys):
    from oddsbench.cli.main import main

    args = ["session", "--round", WHEEL, "--bankroll", "500000", "--goal", "1000000", "--plan", "timid"]
    assert main(args) == 0
    out = capsys.readouterr().out
    for shown in ("7.76989e-2349", "2.83188e-11741", "1.03213e-21133"):
        assert shown in out
    assert "e-317" not in out and "e-318" not in out  # the old linear plateau of float debris


def test_a_fair_timid_session_reaches_the_goal_with_chance_one_half_to_the_last_digits():
    # issue 16: bankroll 10^6, goal 2 x 10^6, fair even money: exactly 1/2 (it printed 0.500001)
    from oddsbench.report.numbers_text import figure_decimal_text

    fair = parse_round_text("1:1/2,-1:1/2")
    result = analyse_session(fair, SessionSettings(QQ(1_000_000), QQ(2_000_000)), "timid")
    for name in ("goal_probability", "ruin_probability"):
        assert result.figures[name].decimal == pytest.approx(0.5, rel=1e-15)
        assert figure_decimal_text(result.figures[name]) == "0.5"
    # Feller ch. XIV (3.4): expected duration z (a - z) for a fair walk, here 10^12
    assert result.figures["expected_rounds"].decimal == pytest.approx(1e12, rel=1e-9)


def walk_exact(jumps, probs, size):
    """Exact goal chances and expected rounds of a homogeneous walk on levels 0 .. size - 1."""
    rows = []
    for k in range(size):
        row = {k: QQ(1)}
        for jump, prob in zip(jumps, probs):
            if 0 <= k + jump < size:
                row[k + jump] = row.get(k + jump, QQ(0)) - prob
        rows.append(row)
    lu = factor_exact(rows)
    goal = lu.solve([sum((p for j, p in zip(jumps, probs) if k + j >= size), QQ(0)) for k in range(size)])
    rounds = lu.solve([QQ(1)] * size)
    return goal, rounds


def check_walk(jumps, probs, size):
    walk = SkipFreeWalk(np.array(jumps), np.array([to_float(p) for p in probs]), size)
    factors = factor_float(walk)
    assert isinstance(factors, SkipFreeFactors)
    decimal, log10 = factors.top_chance()
    rounds = factors.solve(np.ones(size))
    goal_exact, rounds_exact = walk_exact(jumps, probs, size)
    from oddsbench.model.numbers import log10_abs

    for k in range(size):
        truth = to_float(goal_exact[k])
        if truth >= FLOAT_TINY:
            assert decimal[k] == pytest.approx(truth, rel=1e-12, abs=0), k
        else:
            assert decimal[k] == 0.0
            assert abs(log10[k] - log10_abs(goal_exact[k])) <= 1e-10 * max(1.0, abs(log10[k])), k
        assert rounds[k] == pytest.approx(to_float(rounds_exact[k]), rel=1e-9), k


@pytest.mark.parametrize(
    "jumps, probs, size",
    [
        ([-1, 1], [QQ(19, 37), QQ(18, 37)], 60),  # the wheel, subfair
        ([-1, 1], [QQ(1, 2), QQ(1, 2)], 40),  # fair
        ([-1, 1], [QQ(18, 37), QQ(19, 37)], 60),  # superfair: moments by the band LU
        ([-1, 0, 35], [QQ(35, 38), QQ(2, 38), QQ(1, 38)], 120),  # a 35-to-1 bet with a push
        ([-1, 1, 1000], [QQ(1) - QQ(1, 10) - QQ(1, 10**6), QQ(1, 10), QQ(1, 10**6)], 50),
        ([-1, 3], [QQ(1) - QQ(1, 10**9), QQ(1, 10**9)], 130),  # goal chances down to about 1e-390
    ],
)
def test_the_skip_free_engine_agrees_with_the_exact_engine(jumps, probs, size):
    check_walk(jumps, probs, size)
