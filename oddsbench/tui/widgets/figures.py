"""The headline figures of the round on one line, for the editing view where the table does not fit."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from oddsbench.tui.analysis import RoundResult
from oddsbench.tui.plain import plain


class SummaryLine(Static):
    """The round's headline figures (the report layer's ``summary_items``), cut where the width ends."""

    def show(self, result: RoundResult, stale: bool) -> None:
        text = Text(no_wrap=True, overflow="ellipsis", end="")
        if stale:
            text.append("last good figures ", style="bold black on yellow")
        for index, (quantity, exact, decimal) in enumerate(result.summary):
            if index:
                text.append(" │ ", style="dim")
            text.append(plain(f"{quantity} ", "bold", multiline=False))
            if exact:
                text.append(exact, style="cyan")
                text.append(" = ", style="dim")
            text.append(plain(decimal, multiline=False))
        self.update(text)
