"""The tune equation's roots are found inside the work budget: estimated first (one line when they
would not fit), and past a small degree found in a child process the deadline and Esc can stop,
with the same proved answer as in this process."""

from __future__ import annotations

import time

import pytest

from oddsbench.model import budget
from oddsbench.model.budget import Budget, OverBudget
from oddsbench.model.numbers import QQ
from oddsbench.solve.rational_function import RationalFunction, solutions
from oddsbench.solve.ruin.roots import DETACH_DEGREE


def test_a_high_degree_equation_is_solved_detached_with_proved_digits():
    # x^60 = 2 has exactly one positive and one negative real root, +-2^(1/60) (standard algebra).
    degree = 60
    assert degree > DETACH_DEGREE
    f = RationalFunction(tuple([0] * degree + [1]), (1,))
    found = solutions(f, QQ(2))
    assert [s.exact for s in found] == [None, None]
    root = 2 ** (1 / degree)
    assert found[0].approximate == pytest.approx(-root, rel=1e-15)
    assert found[1].approximate == pytest.approx(root, rel=1e-15)
    assert found[1].decimal.text.startswith("1.011619")  # 2^(1/60) = 1.0116194403... (math.pow)


def test_a_rational_root_of_a_high_degree_equation_stays_exact():
    # (x - 3/2) x^50 = 0 beside target 0: x = 3/2 exactly, and x = 0.
    top = [0] * 50 + [-3, 2]
    found = solutions(RationalFunction(tuple(top), (1,)), QQ(0))
    assert [s.exact for s in found] == [QQ(0), QQ(3, 2)]


def test_root_finding_that_would_not_fit_the_time_left_is_refused_in_one_line():
    f = RationalFunction(tuple([0] * 300 + [1]), (1,))
    spent = Budget(1, 1_900, started=time.monotonic() - 0.999)
    with budget.scope(spent), pytest.raises(OverBudget) as refused:
        solutions(f, QQ(2))
    message = str(refused.value)
    assert "degree-300 equation f(x) = target" in message and "\n" not in message
