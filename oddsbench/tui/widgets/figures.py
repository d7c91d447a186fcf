"""Figures as the report layer writes them: quantity | exact | decimal, and a one-line summary."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import DataTable, Static

from oddsbench.tui.analysis import RoundResult
from oddsbench.tui.plain import plain


class FiguresTable(DataTable):
    """The round's figures and end-state chances; kept (and marked stale) while the text is invalid."""

    def __init__(self, **kwargs) -> None:
        super().__init__(cursor_type="row", zebra_stripes=False, **kwargs)

    def on_mount(self) -> None:
        self.add_column("quantity", key="quantity")
        self.add_column("exact", key="exact")
        self.add_column("decimal", key="decimal")

    def show(self, result: RoundResult) -> None:
        row = self.cursor_row
        self.clear()
        for quantity, exact, decimal in result.rows:
            self.add_row(plain(quantity), Text(exact, justify="right"), Text(decimal, justify="right"))
        if self.row_count:
            self.move_cursor(row=min(row, self.row_count - 1))


class SummaryLine(Static):
    """The headline figures in one line, for the editing view where the table does not fit."""

    def show(self, result: RoundResult, stale: bool) -> None:
        text = Text()
        for quantity, exact, decimal in result.summary:
            if text:
                text.append("  │  ", style="dim")
            text.append(f"{quantity} ", style="bold")
            text.append(exact, style="cyan")
            text.append(" = ", style="dim")
            text.append(decimal)
        if stale:
            text.append("  (last good figures)", style="yellow")
        self.update(text)
