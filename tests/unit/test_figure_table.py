"""The screen tables' fitter (report/figure_table.py): short cells that fit the width, never a
shortened exact value where the whole one fits, decimals whole, headers cut only when needed."""

from __future__ import annotations

from oddsbench.report.figure_table import FigureRow, FigureTable, Shown, fit_table

LONG = "3367057324275168985874606277720046975426/7538832993067950134204445048083389623658"


def table(columns, *rows) -> FigureTable:
    return FigureTable(
        tuple(columns), tuple(FigureRow(f"k{i}", label, cells, "") for i, (label, cells) in enumerate(rows))
    )


def test_a_thirteen_digit_fraction_that_fits_is_shown_whole():
    one = table(("value",), ("house edge", (Shown("1234567/891011", "1.38558"),)))
    fitted = fit_table(one, 80)
    assert fitted.kind == "both" and fitted.rows[0][1] == "1234567/891011"


def test_a_long_exact_value_is_shortened_but_its_decimal_stays_whole():
    one = table(("value",), ("reach the goal", (Shown(LONG, "0.446628 (44.66 %)", "0.446628"),)))
    fitted = fit_table(one, 80)
    exact, decimal = fitted.rows[0][1:]
    assert exact != LONG and "digits" in exact and exact.startswith("336705")
    assert decimal.startswith("0.446628")
    assert all(len(cell) <= width for cell, width in zip(fitted.rows[0], fitted.widths, strict=True))


def test_plans_side_by_side_at_80_columns_keep_the_first_column_of_figures_whole():
    plans = table(
        ("timid", "bold", "flat:2"),
        ("reach the goal", (Shown(LONG, "0.00446628 (0.4466 %)", "0.00446628"), Shown("18/37", "0.486486"), None)),
        ("ruin", (Shown(LONG, "0.995534 (99.55 %)", "0.995534"), Shown("19/37", "0.513514"), Shown(LONG, "0.9"))),
    )
    fitted = fit_table(plans, 80)
    assert fitted.kind == "decimal"  # long exact values beside their decimals do not fit: decimals alone
    assert fitted.rows[0][1].startswith("0.00446628") and fitted.rows[1][1].startswith("0.995534")
    assert fitted.rows[0][3] == "-"  # a figure that does not apply
    assert sum(fitted.widths) + 2 * len(fitted.widths) <= 80


def test_each_kind_of_cell_on_request():
    one = table(("a", "b"), ("house edge", (Shown("1/37", "0.027027"), Shown("1/30", "0.0333333"))))
    assert fit_table(one, 80, "exact").rows[0][1:] == ("1/37", "1/30")
    assert fit_table(one, 80, "decimal").rows[0][1:] == ("0.027027", "0.0333333")
    assert fit_table(one, 80, "both").rows[0][1:] == ("1/37 | 0.027027", "1/30 | 0.0333333")


def test_headers_are_whole_where_the_width_allows():
    names = ("hold-at-10", "hold-at-15", "best (max-return)")
    wide = table(names, ("expected net", tuple(Shown(LONG, "8.14179") for _ in names)))
    assert fit_table(wide, 120).headers[1:] == names
    narrow = fit_table(wide, 40)
    assert any(header.endswith("…") for header in narrow.headers[1:])
    assert [row[1] for row in narrow.rows] == ["8.14179"]


def test_the_pass_lines_standard_deviation_is_said_irrational_not_a_dash():
    # Pass line: net variance 1 - (7/495)^2 = 244976/245025 (first principles from the house edge
    # 7/495, Ethier 2010), not a square: its root has no exact cell, and "-" would read as minus.
    from pathlib import Path

    from oddsbench.core import load_game, make_settings, round_figures
    from oddsbench.report.figure_table import round_table

    game = load_game(Path(__file__).resolve().parents[2] / "rulesets" / "pass-line.toml")
    figures = round_figures(game, make_settings()).columns[0].figures
    cells = {row.key: row.cells[0] for row in round_table(figures).rows}
    assert cells["net_variance"].exact == "244976/245025"
    assert cells["net_sd"].exact == "irrational" and cells["net_sd"].decimal == "0.9999"
    fitted = fit_table(round_table(figures), 80)
    assert not any(row[0] == "net sd per unit staked" and row[1].startswith("-") for row in fitted.rows)
