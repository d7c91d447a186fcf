"""The tune equation's roots are found inside the work budget: estimated first (one line when they
would not fit), and past a small degree found in a child process the deadline and Esc can stop,
with the same proved answer as in this process."""

from __future__ import annotations

import math
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


def chebyshev(n: int) -> list[int]:
    """T_n's integer coefficients, lowest power first (T_0 = 1, T_1 = x, T_(k+1) = 2x T_k - T_(k-1))."""
    before, now = [1], [0, 1]
    for _ in range(n - 1):
        following = [0] + [2 * c for c in now]
        for i, c in enumerate(before):
            following[i] -= c
        before, now = now, following
    return now


def test_the_roots_of_a_factor_are_found_once_per_precision_however_many_of_them_are_asked_for(monkeypatch):
    # T_45(x) = 1/7 has 45 real roots in (-1, 1): x = cos((+-acos(1/7) + 2 pi k) / 45), since
    # T_n(cos t) = cos(n t) (standard trigonometry; Abramowitz and Stegun 22.3.15).
    # Each root is certified and each validity sign taken on the same degree-45 factor: the roots are
    # found at a handful of precisions, not once per root (192 child processes for degree 60 before).
    from oddsbench.solve import rational_function
    from oddsbench.solve.ruin import roots

    calls = []
    real = roots.detached_roots
    monkeypatch.setattr(roots, "detached_roots", lambda *args: calls.append(args[3]) or real(*args))
    rational_function._roots_at.cache_clear()
    f = RationalFunction(tuple(chebyshev(45)), (1,))
    found = solutions(f, QQ(1, 7))
    assert len(found) == 45 and all(s.exact is None for s in found)
    assert [s.text("x").split(" real")[0] for s in found[19:24]] == [
        f"the {n}" for n in ("20th", "21st", "22nd", "23rd", "24th")
    ]
    a = math.acos(1 / 7)
    closed_form = sorted(
        {round(math.cos((sign * a + 2 * math.pi * k) / 45), 12) for k in range(45) for sign in (1, -1)}
    )
    assert [s.approximate for s in found] == pytest.approx(closed_form, abs=1e-11)
    signs = [rational_function.sign_at((QQ(0), QQ(1)), s) for s in found]  # the sign of x at each root
    assert signs == [1 if x > 0 else -1 for x in closed_form]
    root_calls = [what for what in calls if what.startswith("finding the roots")]
    assert 1 <= len(root_calls) <= 4, root_calls


def test_ordinals_read_as_english():
    from oddsbench.solve.rational_function import ordinal

    assert [ordinal(n) for n in (1, 2, 3, 4, 11, 12, 13, 21, 22, 23, 101, 111, 112)] == [
        "1st", "2nd", "3rd", "4th", "11th", "12th", "13th", "21st", "22nd", "23rd", "101st", "111th", "112th",
    ]  # fmt: skip
