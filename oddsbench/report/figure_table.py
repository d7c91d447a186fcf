"""Figures as a table of text for a screen: one row per figure, one cell per column (a strategy, a
plan, or the one round), each cell holding the exact value in full, its decimal, and the row's
meaning, so a front end can show short cells and the whole figure on demand.

``fit_table`` decides what a table of a given width shows (exact, decimal or both in each cell),
never shortening an exact value that fits; the workbench only passes its width.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import text, to_float
from oddsbench.report.meanings import meaning
from oddsbench.report.numbers_text import figure_decimal_text, fit_exact
from oddsbench.report.round_report import figure_items, hand_rows, irrational_cell, is_percent

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import RoundFigures

CELL_KINDS = ("both", "exact", "decimal")  # as ``--cells`` names them
PAD = 2  # a screen table's padding around each column
SCROLLBAR = 2  # room kept for a vertical scrollbar
MIN_EXACT = 10  # an exact part narrower than this shows nothing useful: decimals only then
MIN_LABEL = 14
HEADER = 10  # a column's name claims at most this width when the table is tight (the detail pane names it whole)


@dataclass(frozen=True)
class Shown:
    """One cell: the exact value in full (None where there is only a decimal or a word), the decimal
    with its percent form where it has one, and ``brief``, the decimal alone, for narrow columns."""

    exact: str | None
    decimal: str
    brief: str | None = None

    @property
    def short_decimal(self) -> str:
        return self.brief if self.brief is not None else self.decimal


@dataclass(frozen=True)
class FigureRow:
    """A figure under every column: ``key`` names it (``house_edge``, ``session.ruin_probability``)."""

    key: str
    label: str
    cells: tuple[Shown | None, ...]
    meaning: str


@dataclass(frozen=True)
class FigureTable:
    """Rows of figures under named columns (one column: a single round)."""

    columns: tuple[str, ...]
    rows: tuple[FigureRow, ...]

    def __bool__(self) -> bool:
        return bool(self.rows)


@dataclass(frozen=True)
class FittedTable:
    """What a table of a given width shows: headers, text rows, column widths, and the cells' kind."""

    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    widths: tuple[int, ...]
    kind: str

    @property
    def kind_text(self) -> str:
        return {"both": "exact | decimal", "exact": "exact", "decimal": "decimal"}[self.kind]


def shown(figure: Figure | None, percent: bool = False) -> Shown | None:
    """A figure as a cell's text (None where the figure does not apply)."""
    if figure is None:
        return None
    exact = None if figure.exact is None else text(figure.exact)
    decimal = figure_decimal_text(figure, percent)
    brief = figure_decimal_text(figure) if percent else None
    return Shown(exact, decimal, brief)


def word(value: str) -> Shown:
    """A cell that holds a word or a short text, not a figure."""
    return Shown(None, value)


def row(key: str, label: str, cells, meaning_key: str | None = None) -> FigureRow:
    return FigureRow(key, label, tuple(cells), meaning(meaning_key or key))


def round_table(figures: RoundFigures, column: str = "value") -> FigureTable:
    """One round's figures, end-state chances and result totals (win, loss, push), one column."""
    rows = [row(key, label, (_round_cell(key, f, figures),)) for key, label, f in figure_items(figures)]
    for index, (label, count, share) in enumerate(hand_rows(figures)):  # a single draw: its hands counted
        key = "hands" if index == 0 else "hands_ending"
        rows.append(row(key, label, (Shown(count, share),)))
    return FigureTable((column,), tuple(rows))


def _round_cell(key: str, figure: Figure, figures: RoundFigures) -> Shown | None:
    """A round figure's cell; a square root with no rational value says ``irrational``, not ``-``
    (which reads as a minus sign)."""
    cell = shown(figure, is_percent(key))
    why = irrational_cell(key, figures)
    return cell if cell is None or why is None else replace(cell, exact=why)


def net_law_table(figures: RoundFigures) -> FigureTable:
    """The round's net law, one row per net value: its chance and its contribution (chance x net);
    no rows where the core did not list it, the likeliest values only past a screen's rows
    (``return_table_report.screen_law``)."""
    from oddsbench.report.return_table_report import screen_law

    law = screen_law(figures)
    rows = [
        row(
            f"net_law[{text(value.net)}]",
            f"net {text(value.net)}",
            (shown(_exact(value.probability), percent=True), shown(_exact(value.contribution))),
            "net_law",
        )
        for value in law
    ]
    return FigureTable(("chance", "contribution"), tuple(rows))


def shares_table(figures: RoundFigures) -> FigureTable:
    """Each paying step: its pay, the expected times a round takes it, and its share of the expected net."""
    from oddsbench.report.return_table_report import step_label

    shares = () if figures.return_table is None else figures.return_table.shares
    rows = [
        row(
            f"return_share[{step_label(s.source, s.action, s.target)}]",
            step_label(s.source, s.action, s.target),
            (shown(_exact(s.pay)), shown(_exact(s.taken)), shown(_exact(s.contribution))),
            "return_share",
        )
        for s in shares
    ]
    return FigureTable(("pay", "times taken", "share"), tuple(rows))


def _exact(value) -> Figure:
    return Figure(value, to_float(value))


def side_by_side(columns: list[tuple[str, RoundFigures]]) -> FigureTable:
    """Rounds side by side (named strategies, the best play): a figure missing from a round is ``-``,
    an end state it never reaches has chance exactly 0."""
    keyed = [{key: (label, f) for key, label, f in figure_items(figures)} for _, figures in columns]
    order: list[str] = []
    for items in keyed:
        order += [key for key in items if key not in order]
    rows = []
    for key in order:
        label = next(items[key][0] for items in keyed if key in items)
        cells = []
        for (_, figures), items in zip(columns, keyed):
            if key in items:
                cells.append(shown(items[key][1], is_percent(key)))
            elif key.startswith("end_probability["):  # not reachable under this play: chance exactly 0
                cells.append(Shown("0" if figures.exact else None, "0", "0"))
            else:
                cells.append(None)
        rows.append(row(key, label, cells))
    return FigureTable(tuple(name for name, _ in columns), tuple(rows))


def fit_table(table: FigureTable, width: int, kind: str = "both") -> FittedTable:
    """The table's text for ``width`` columns of screen: the label column, then the cells in ``kind``
    (both, exact, decimal). Exact values are shortened only when they do not fit; when even short
    exact values would not fit beside the decimals, the cells show decimals alone (``kind`` says so).
    Columns of words or decimals keep their width; columns holding exact values share what is left."""
    label_width = _label_width(table, width)
    room = max(0, width - SCROLLBAR - label_width - PAD)
    if len(table.columns) == 1 and kind == "both":
        fitted = _split_columns(table, room)
        if fitted is not None:
            return _with_labels(table, label_width, *fitted)
        kind = "decimal"
    count = len(table.columns)
    widths = [_natural_width(table, j, kind) for j in range(count)]
    if sum(w + PAD for w in widths) > room:  # headers give way, then decimals lose their percent form
        widths = [_natural_width(table, j, kind, brief=kind == "decimal", header=HEADER) for j in range(count)]
        flexible = [j for j in range(count) if kind != "decimal" and _has_exact(table, j)]
        if flexible and sum(w + PAD for w in widths) > room:
            fixed = sum(widths[j] + PAD for j in range(count) if j not in flexible)
            shares = _share(room - fixed, {j: widths[j] for j in flexible})
            widths = [shares.get(j, w) for j, w in enumerate(widths)]
    if kind == "both" and any(_squeezed(r.cells[j], widths[j]) for r in table.rows for j in range(count)):
        return fit_table(table, width, "decimal")
    over = sum(w + PAD for w in widths) - room
    if over > 0:  # the labels give way first, down to a readable width
        label_width = max(min(label_width, MIN_LABEL), label_width - over)
    spare = -over
    for j, name in enumerate(table.columns):  # headers cut to make room take back what is left
        grow = min(max(0, len(name) - widths[j]), max(0, spare))
        widths[j] += grow
        spare -= grow
    cells = [[_cell(_at(r, j), kind, widths[j]) for j in range(count)] for r in table.rows]
    headers = [_cut(name, w) for name, w in zip(table.columns, widths)]
    widths = [max([w] + [len(c[j]) for c in cells]) for j, w in enumerate(widths)]
    return _with_labels(table, label_width, headers, cells, widths, kind)


def _share(room: int, wants: dict[int, int]) -> dict[int, int]:
    """Share ``room`` among columns: the narrow ones get what they need, the rest split what is left."""
    given: dict[int, int] = {}
    pending = sorted(wants, key=wants.get)
    while pending:
        fair = room // len(pending) - PAD
        if wants[pending[0]] > fair:
            given.update({j: max(1, fair) for j in pending})
            break
        column = pending.pop(0)
        given[column] = wants[column]
        room -= wants[column] + PAD
    return given


def _at(table_row: FigureRow, column: int) -> Shown | None:
    return table_row.cells[column] if column < len(table_row.cells) else None


def _has_exact(table: FigureTable, column: int) -> bool:
    return any((c := _at(r, column)) is not None and c.exact is not None for r in table.rows)


def _split_columns(table: FigureTable, room: int):
    """One round in two columns, exact and decimal, when the exact one keeps at least ``MIN_EXACT``."""
    cells = [r.cells[0] if r.cells else None for r in table.rows]
    decimal_width = max([len("decimal")] + [len(c.decimal) for c in cells if c is not None])
    brief = False
    if room - decimal_width - PAD - PAD < MIN_EXACT:
        brief = True
        decimal_width = max([len("decimal")] + [len(c.short_decimal) for c in cells if c is not None])
    exact_room = room - decimal_width - PAD - PAD
    if exact_room < MIN_EXACT:
        return None
    exact_width = min(exact_room, max([len("exact")] + [len(c.exact or "-") for c in cells if c is not None]))
    rows = []
    for c in cells:
        if c is None:
            rows.append(["-", "-"])
            continue
        decimal = c.short_decimal if brief else c.decimal
        rows.append([fit_exact(c.exact, exact_width) if c.exact is not None else "-", decimal])
    widths = [max([len("exact")] + [len(r[0]) for r in rows]), decimal_width]
    return ["exact", "decimal"], rows, widths, "both"


def _with_labels(table: FigureTable, label_width: int, headers, cells, widths, kind: str) -> FittedTable:
    rows = tuple((_cut(r.label, label_width), *c) for r, c in zip(table.rows, cells))
    return FittedTable(("quantity", *headers), rows, (label_width, *widths), kind)


def _label_width(table: FigureTable, width: int) -> int:
    longest = max([len("quantity")] + [len(r.label) for r in table.rows])
    return min(longest, max(MIN_LABEL, width * 2 // 5))


def _natural_width(table: FigureTable, column: int, kind: str, brief: bool = False, header: int = 10**6) -> int:
    """The width a column needs to show every cell whole (``brief``: decimals without their percent
    form; ``header``: the most the column's name may claim)."""
    cells = [_at(r, column) for r in table.rows]
    name = min(len(table.columns[column]), header)
    if brief:
        return max([name] + [len(c.short_decimal) if c else 1 for c in cells])
    return max([name] + [len(_cell(c, kind, 10**6)) for c in cells])


def _cell(cell: Shown | None, kind: str, width: int) -> str:
    """One cell in ``kind`` within ``width`` (a decimal keeps its percent form only where it fits)."""
    if cell is None:
        return "-"
    decimal = cell.decimal if len(cell.decimal) <= width else cell.short_decimal
    if kind == "decimal" or cell.exact is None:
        return decimal
    if kind == "exact":
        return fit_exact(cell.exact, width)
    decimal = cell.short_decimal if len(cell.exact) + 3 + len(cell.decimal) > width else cell.decimal
    if cell.exact == decimal:
        return decimal
    return f"{fit_exact(cell.exact, max(1, width - 3 - len(decimal)))} | {decimal}"


def _squeezed(cell: Shown | None, width: int) -> bool:
    """Whether ``both`` leaves this cell's exact part too narrow to read: under ``MIN_EXACT``
    characters, or fewer than four of its leading digits left."""
    if cell is None or cell.exact is None or cell.exact == cell.short_decimal:
        return False
    budget = width - 3 - len(cell.short_decimal)
    if len(cell.exact) <= budget:
        return False
    return budget < MIN_EXACT or not fit_exact(cell.exact, budget).lstrip("-")[:4].isdigit()


def _cut(label: str, width: int) -> str:
    return label if len(label) <= width else label[: max(0, width - 1)] + "…"
