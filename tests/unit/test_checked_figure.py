"""The one rule for a decimal beside its exact value (solve/checked.py)."""

from __future__ import annotations

from oddsbench.model.numbers import QQ
from oddsbench.solve.checked import Tolerance, checked_figure

STRICT = Tolerance(relative=1e-9, absolute=1e-12)
QUIET = Tolerance(relative=1e-9, absolute=1e-12, small_notes=False)


def test_a_decimal_within_the_tolerance_shows_the_exact_value_without_a_note():
    notes: list[str] = []
    figure = checked_figure("house_edge", QQ(1, 37), 1 / 37 * (1 + 1e-12), notes, STRICT)
    assert figure.exact == QQ(1, 37) and figure.decimal == 1 / 37 and notes == []


def test_a_decimal_off_the_exact_value_is_a_warning_and_the_exact_value_is_shown():
    notes: list[str] = []
    figure = checked_figure("net_variance", QQ(7, 4) / 10**40, 6.74e-06, notes, STRICT)
    assert figure.exact == QQ(7, 4) / 10**40
    assert notes == [
        "numerical warning: net_variance: float engine gives 6.74e-06, exact value is 1.75e-40; "
        "the exact value is shown"
    ]


def test_an_exact_value_below_the_float_range_stands_and_is_named_unless_the_engine_names_it_itself():
    notes: list[str] = []
    tiny = QQ(1, 10**400)
    assert checked_figure("end_probability[goal]", tiny, 0.0, notes, STRICT).exact == tiny
    assert "about 1e-400, below the floating-point range" in notes[0]
    quiet: list[str] = []
    assert checked_figure("final bankroll 7", tiny, 0.0, quiet, QUIET).exact == tiny and quiet == []


def test_a_lone_decimal_names_what_it_cannot_vouch_for():
    notes: list[str] = []
    assert checked_figure("expected_net", None, float("inf"), notes, STRICT).exact is None
    checked_figure("end_probability[won]", None, 1e-310, notes, STRICT)
    checked_figure("end_probability[won]", None, -1e-17, notes, STRICT)
    assert "no exact value to fall back on" in notes[0]
    assert "(underflow); raise --exact-limit" in notes[1]
    assert "negative chance" in notes[2]


def test_a_lone_decimal_keeps_its_vouched_digits_and_a_log10_below_the_float_range():
    notes: list[str] = []
    assert checked_figure("expected_steps", None, 1e12, notes, STRICT, digits=4).digits == 4
    below = checked_figure("goal_probability", None, 0.0, notes, QUIET, log10=-2348.1096)
    assert below.decimal == 0.0 and below.log10 == -2348.1096 and notes == []
