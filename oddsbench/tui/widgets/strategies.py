"""The strategies view: every named strategy beside the best play, the best play's certificate, and
the strategy played held against the best play (where it loses, and how much)."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.widgets import Static

from oddsbench.tui.analysis import RoundFailure, StrategiesResult
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.figure_grid import FigureGrid
from oddsbench.tui.widgets.stale import marked_heading


class StrategiesPanel(VerticalScroll):
    """Shows a ``StrategiesResult`` (report text) or why there is nothing to compare."""

    def compose(self) -> ComposeResult:
        yield Static("", id="strategies-heading", classes="figures-heading")
        yield FigureGrid(id="strategies-table", classes="figure-grid")
        yield Static("", id="best-heading", classes="section-heading")
        yield Static("", id="best-text")
        yield Static("", id="check-heading", classes="section-heading")
        yield FigureGrid(id="check-table", classes="figure-grid")

    def show(
        self,
        result: StrategiesResult | RoundFailure | None,
        stale: bool = False,
        busy: bool = False,
        strategy: str | None = None,
        kind: str | None = None,
    ) -> None:
        heading = self.query_one("#strategies-heading", Static)
        table = self.query_one("#strategies-table", FigureGrid)
        parts = [self.query_one(f"#{name}") for name in ("best-heading", "best-text", "check-heading", "check-table")]
        if result is None:
            heading.update(Text("solving every strategy…" if busy else "no figures yet", style="magenta"))
            return
        if isinstance(result, RoundFailure):
            heading.update(plain(result.message, "yellow"))
            for widget in (table, *parts):
                widget.display = False
            return
        heading.update(marked_heading(result.heading, stale, busy))
        table.display = bool(result.table)
        table.show(result.table, kind)
        for widget in parts:
            widget.display = True
        best = Text(f"Best play for {result.goal}", style="bold")
        best.append("   g: next goal", style="dim")
        self.query_one("#best-heading", Static).update(best)
        self.query_one("#best-text", Static).update(plain(result.best))
        verdict = result.check_of(strategy)
        check_heading = self.query_one("#check-heading", Static)
        check_table = self.query_one("#check-table", FigureGrid)
        if verdict is None:
            check_heading.display = check_table.display = False
            return
        title = plain(f"Strategy {verdict.strategy!r} against the best play", "bold")
        title.append("   s: next strategy", style="dim")
        title.append(plain(f"\n{verdict.summary}"))
        for note in verdict.notes:
            title.append(plain(f"\nnote: {note}", "#e0a060"))
        check_heading.update(title)
        check_table.display = bool(verdict.table)
        check_table.show(verdict.table, kind)
