"""How a parameter enters a ruleset: its degree in chances, pays and stakes, or why not polynomially.

The degree bound of ``tune`` rests on these degrees; a wrong low degree would make the
reconstruction fail its confirmation, so they are specified here directly.
"""

from __future__ import annotations

import tomllib

import pytest

from oddsbench.model.param_degree import param_degrees


def degrees_of(prob: str, pay: str = "1", params: str = "x = 1", extra: str = "") -> object:
    text = f"""
[ruleset]
title = "t"
start = "s"
stake = 1
[params]
{params}
[states.s]
{extra}
outcomes = [{{ to = "a", prob = "{prob}", pay = "{pay}" }}, {{ to = "b", pay = -1 }}]
[states.a]
[states.b]
"""
    return param_degrees(tomllib.loads(text), "x")


def test_degrees_add_up_through_products_powers_and_helpers():
    found = degrees_of("x^2 * (1 - x) / 4", pay="3*x + 1")
    assert (found.prob, found.pay, found.stake) == (3, 1, 0) and found.polynomial and not found.unused
    helper = degrees_of("y / 2", params='x = 1\ny = "x^2"')
    assert helper.prob == 2


@pytest.mark.parametrize(
    ("prob", "how", "piecewise"),
    [
        ("floor(x) / 4", "floor()", True),
        ("(x > 1) / 2", "'>'", True),
        ("if x > 1 then 1/2 else 1/4", "an 'if' test", True),
        ("1 / (x + 1)", "a division", False),
        ("(1/2)^x", "an exponent", False),
    ],
)
def test_steps_and_divisions_are_not_polynomial(prob, how, piecewise):
    found = degrees_of(prob)
    assert not found.polynomial and how in found.not_polynomial[0] and found.piecewise is piecewise


def test_a_parameter_no_chance_pay_or_stake_reads_is_unused():
    found = degrees_of("1/2", params="x = 1")
    assert found.unused
