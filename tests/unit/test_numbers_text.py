"""How figures are written: exact text, decimals, values beyond the float range."""

from __future__ import annotations

from oddsbench.model.numbers import QQ
from oddsbench.report.numbers_text import decimal_text, exact_text


def test_negative_zero_from_the_float_engine_reads_as_zero():
    assert decimal_text(-0.0) == "0"
    assert decimal_text(-0.0, percent=True) == "0 (0 %)"


def test_a_value_below_the_float_range_is_written_from_the_exact_value():
    tiny = QQ(1, 10**400)
    assert decimal_text(0.0, tiny) == "1.00000e-400"


def test_long_exact_values_are_cut_in_the_middle_with_their_digit_count():
    assert exact_text(QQ(2**200, 3)) == "16069...376 (61 digits)/3"
