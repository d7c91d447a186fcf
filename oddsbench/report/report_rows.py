"""Report content as plain rows shared by the renderers: one place decides labels and order."""

from __future__ import annotations

from typing import TYPE_CHECKING

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import text, to_float
from oddsbench.report.document import ReportDocument
from oddsbench.report.numbers_text import exact_text, figure_decimal_text
from oddsbench.report.round_report import figure_items, is_percent

if TYPE_CHECKING:
    from oddsbench.core.results import RoundColumn


def strategy_label(section: RoundColumn) -> str:
    return section.strategy if section.strategy is not None else "as written"


def round_figure_items(section: RoundColumn) -> list[tuple[str, str, Figure]]:
    """(key, label, figure) for every figure of one round section, end and result chances too."""
    return figure_items(section.figures)


def shown(key: str, figure: Figure, width: int | None) -> tuple[str, str]:
    return exact_text(figure.exact, width), figure_decimal_text(figure, is_percent(key))


def comparison_rows(document: ReportDocument) -> tuple[list[str], list[list[str]]]:
    """quantity | decimal under each strategy, for the strategies-compared table."""
    headers = ["quantity"] + [strategy_label(s) for s in document.rounds]
    keyed = [dict((key, (label, f)) for key, label, f in round_figure_items(s)) for s in document.rounds]
    order = [key for key, _, _ in round_figure_items(document.rounds[0])]
    for other in keyed[1:]:
        order += [key for key in other if key not in order]
    rows = []
    for key in order:
        label = next(k[key][0] for k in keyed if key in k)
        rows.append([label] + [shown(key, k[key][1], None)[1] if key in k else "-" for k in keyed])
    return headers, rows


def param_items(document: ReportDocument) -> list[tuple[str, str, float]]:
    return [(name, text(value), to_float(value)) for name, value in document.ruleset.params]
