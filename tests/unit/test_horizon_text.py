"""The horizon as text for a screen: the one grammar of numbers of rounds (CLI and workbench), the
log axis's round ticks, and the table with one column per N whose figures are the core's own."""

from __future__ import annotations

import pytest

from oddsbench.core.game import inline_round
from oddsbench.core.horizons import horizon, parse_rounds
from oddsbench.model.errors import OddsbenchError
from oddsbench.report.chart_ticks import log_positions, log_ticks, percent_ticks
from oddsbench.report.figure_table import fit_table
from oddsbench.report.horizon_report import horizon_items, horizon_table
from oddsbench.report.meanings import HORIZON, meaning


@pytest.mark.parametrize(
    ("typed", "rounds"),
    [
        ("1,10,100", (1, 10, 100)),
        (" 100, 10 , 1 ", (1, 10, 100)),  # in increasing order: tables and charts run along N
        ("10, 10, 1_000", (10, 1000)),
        ("5,", (5,)),
    ],
)
def test_rounds_read_in_increasing_order_without_repeats(typed, rounds):
    assert parse_rounds(typed) == rounds


@pytest.mark.parametrize(
    ("typed", "message"),
    [
        ("", "expected whole numbers of rounds"),
        ("10, ten", "got 'ten'"),
        ("10, -1", "got '-1'"),
        ("1,000", "commas separate the numbers of rounds: write 1000 or 1_000"),
        ("0", "at least 1, got 0"),
        ("1e3", "got '1e3'"),
        ("１０", "got '１０'"),  # full-width digits are not ASCII digits
        ("9" * 13, "expected whole numbers"),
    ],
)
def test_a_list_that_does_not_read_is_one_line_naming_the_item(typed, message):
    with pytest.raises(OddsbenchError, match=message.replace("(", r"\(")) as raised:
        parse_rounds(typed)
    assert "\n" not in str(raised.value)


def test_log_ticks_are_powers_of_ten_at_their_logarithms():
    assert log_ticks(1, 10_000) == [(0.0, "1"), (1.0, "10"), (2.0, "100"), (3.0, "1k"), (4.0, "10k")]
    assert log_ticks(10, 10) == [(1.0, "10"), (2.0, "100")]  # at least two ticks
    assert log_ticks(3, 70) == [(0.0, "1"), (1.0, "10"), (2.0, "100")]  # covers both ends
    wide = log_ticks(1, 10**9)
    assert len(wide) <= 7 and wide[0] == (0.0, "1") and wide[-1][0] >= 9  # every other decade
    assert log_positions([1, 100, 10_000]) == [0.0, 2.0, 4.0]


def test_percent_ticks_are_round_percents():
    assert percent_ticks(0.2, 1.8) == [(0.0, "0 %"), (0.5, "50 %"), (1.0, "100 %"), (1.5, "150 %"), (2.0, "200 %")]
    assert [label for _, label in percent_ticks(0.9566, 0.9894)] == ["95 %", "96 %", "97 %", "98 %", "99 %"]


def test_the_table_has_a_column_per_n_holding_the_cores_figures():
    # An even-money bet on the 37-pocket wheel (first principles: win 18/37, lose 19/37).
    results = horizon(inline_round("1:18/37,-1:19/37"), (1, 10))
    table = horizon_table(results)
    assert table.columns == ("N = 1", "N = 10")
    rows = {row.label: row for row in table.rows}
    assert rows["ahead (total > 0)"].cells[0].exact == "18/37"
    assert rows["ahead (total > 0)"].cells[1].exact == "1655010535112064/4808584372417849"  # binomial
    assert rows["mean total"].cells[1].exact == "-10/37"  # N times one round's mean, exactly
    assert rows["law"].cells[1].decimal == "exact"
    assert rows["90 % range of the return to player"].cells[1].exact == "2/5 .. 7/5"
    # every row of the table is an item of the text, in the same order, with a meaning of its own
    assert [row.label for row in table.rows[1:]] == [item.label for item in horizon_items(results.horizons[0])]
    for row in table.rows:
        assert row.meaning == meaning(row.key.split("[")[0]) and row.meaning in HORIZON.values()


def test_five_columns_fit_80_screen_columns_in_decimals():
    results = horizon(inline_round("1:18/37,-1:19/37"), (1, 10, 100, 1000, 10_000))
    fitted = fit_table(horizon_table(results), 76)
    assert sum(fitted.widths) + 2 * len(fitted.widths) <= 76
    assert fitted.rows[1][1].strip() == "0.486486"  # the first column of figures whole
