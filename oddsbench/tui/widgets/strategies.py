"""The strategies view: every named strategy side by side, then the best play and its certificate."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.widgets import DataTable, Static

from oddsbench.tui.analysis import RoundFailure, StrategiesResult
from oddsbench.tui.plain import plain


class StrategiesPanel(VerticalScroll):
    """Shows a ``StrategiesResult`` (report text) or why there is nothing to compare."""

    def compose(self) -> ComposeResult:
        yield Static("", id="strategies-heading", classes="figures-heading")
        yield DataTable(cursor_type="row", id="strategies-table")
        yield Static("", id="best-text")

    def show(self, result: StrategiesResult | RoundFailure | None, stale: bool = False, busy: bool = False) -> None:
        heading = self.query_one("#strategies-heading", Static)
        table = self.query_one("#strategies-table", DataTable)
        best = self.query_one("#best-text", Static)
        if result is None:
            heading.update(Text("solving every strategy…" if busy else "no figures yet", style="magenta"))
            return
        if isinstance(result, RoundFailure):
            heading.update(Text(result.message, style="yellow"))
            table.display = False
            best.update("")
            return
        title = Text(result.heading, style="bold")
        if stale:
            title.append("  (last good figures)", style="yellow")
        if busy:
            title.append("  solving…", style="magenta")
        heading.update(title)
        table.display = bool(result.headers)
        table.clear(columns=True)
        if result.headers:
            table.add_columns(*[plain(header) for header in result.headers])
            for row in result.rows:
                table.add_row(plain(row[0]), *[Text(cell, justify="right") for cell in row[1:]])
        best.update(Text(f"Best play (goal {result.goal}, g changes it)\n", style="bold") + plain(result.best))
