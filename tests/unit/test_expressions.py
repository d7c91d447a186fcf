"""The ruleset expression language: exact values and bounded refusals."""

from __future__ import annotations

import pytest

from oddsbench.model.expr import ExpressionError, evaluate_text
from oddsbench.model.numbers import QQ


@pytest.mark.parametrize(
    ("text", "value"),
    [
        ("8/36", QQ(2, 9)),
        ("0.45", QQ(9, 20)),
        (".5", QQ(1, 2)),
        ("2^-3", QQ(1, 8)),
        ("-2^2", QQ(-4)),
        ("2^3^2", QQ(512)),
        ("(1 - p)^2", QQ(361, 1369)),
        ("1 - 2 - 3", QQ(-4)),
        ("12 / 4 / 3", QQ(1)),
        ("min(1, 2/3, 5)", QQ(2, 3)),
        ("max(-1, -2)", QQ(-1)),
        ("abs(-3/4)", QQ(3, 4)),
        ("floor(-1/2)", QQ(-1)),
        ("ceil(-1/2)", QQ(0)),
        ("7 // 2", QQ(3)),
        ("7 % 3", QQ(1)),
        ("if p > 1/2 then 1 else 0", QQ(0)),
        ("3 >= 3 and not 2 == 3", QQ(1)),
        ("1 < 0 or 2 != 2", QQ(0)),
    ],
)
def test_expression_values_are_exact(text, value):
    assert evaluate_text(text, {"p": QQ(18, 37)}) == value


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("10^10^10", "exponent 10000000000 is beyond the limit of 4096"),
        ("2^(1/2)", "exponent must be a whole number"),
        ("1/0", "division by zero"),
        ("0^-1", "division by zero"),
        ("__import__('os')", "names starting with '__' are not allowed"),
        ("a.b", "unexpected character '.'"),
        ("lambda", "unknown parameter 'lambda'"),
        ("open(1)", "unknown function 'open'"),
        ("1 < 2 < 3", "chained comparisons"),
        ("9" * 61, "number literal longer than 60 digits"),
        ("(" * 100 + "1" + ")" * 100, "nested deeper than"),
        ("1 +", "unexpected end of text"),
        ("", "empty expression"),
        ("999999^4000", "number too large"),
    ],
)
def test_bad_expressions_are_refused_with_a_reason(text, message):
    with pytest.raises(ExpressionError, match=None) as refused:
        evaluate_text(text)
    assert message in str(refused.value)
