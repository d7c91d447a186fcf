"""The highlighted figure whole: its name, its decimal, what it means in plain words, and the exact
value in full (scrollable; Enter in a table shows it on a screen of its own)."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from oddsbench.report.figure_table import FigureRow, Shown
from oddsbench.tui.plain import plain


def figure_text(row: FigureRow, column: str, cell: Shown | None, whole: bool = False) -> Text:
    """The figure as the pane shows it: what it is, its decimal, its meaning, then its exact value."""
    text = Text(overflow="fold")
    text.append(plain(row.label.strip(), "bold", multiline=False))
    if column and column not in ("value",):
        text.append(plain(f"  · {column}", "bold #9fd8cf", multiline=False))
    if cell is None:
        text.append("  does not apply here", style="dim")
    else:
        text.append("  ")
        text.append(cell.decimal, style="bold")
    text.append("\n")
    text.append(plain(row.meaning, "#c8d3e0"))
    if cell is not None and cell.exact is not None:
        text.append("\nexact ", style="dim")
        text.append(cell.exact, style="cyan")
        digits = sum(ch.isdigit() for ch in cell.exact)
        if digits > 40 and not whole:
            text.append(f"  ({digits:,} digits; Enter shows it on its own screen)", style="dim")
    return text


class DetailPane(VerticalScroll):
    """Shows what ``show`` gives it; scrolls when the exact value is long."""

    def compose(self) -> ComposeResult:
        yield Static(Text("Move the cursor to a figure to see it whole here.", style="dim"), id="detail-text")

    def show(self, row: FigureRow, column: str, cell: Shown | None) -> None:
        self.query_one("#detail-text", Static).update(figure_text(row, column, cell))
        self.scroll_home(animate=False)

    def clear_figure(self, message: str = "Move the cursor to a figure to see it whole here.") -> None:
        self.query_one("#detail-text", Static).update(Text(message, style="dim"))


class FigureScreen(ModalScreen[None]):
    """One figure on a screen of its own, the exact value in full; Esc, Enter or q closes it."""

    BINDINGS = [Binding("escape,enter,q", "close", "Close")]

    def __init__(self, row: FigureRow, column: str, cell: Shown | None) -> None:
        super().__init__(classes="dialog-screen")
        self.row = row
        self.column = column
        self.cell = cell

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="figure-whole", classes="dialog"):
            yield Static(figure_text(self.row, self.column, self.cell, whole=True))
            yield Static("Esc, Enter or q closes; arrows and Page Up/Down scroll.", classes="dialog-detail")

    def on_mount(self) -> None:
        self.query_one("#figure-whole").focus()

    def action_close(self) -> None:
        self.dismiss(None)
