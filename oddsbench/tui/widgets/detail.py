"""The highlighted figure whole: its name, its decimal, what it means in plain words, and the exact
value in full (scrollable; Enter in a table shows it on a screen of its own)."""

from __future__ import annotations

import textwrap

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from oddsbench.report.figure_table import FigureRow, Shown
from oddsbench.report.numbers_text import fit_exact
from oddsbench.tui.plain import plain


def figure_text(row: FigureRow, column: str, cell: Shown | None, room: tuple[int, int] | None = None) -> Text:
    """The figure as the pane shows it: what it is, its decimal, its meaning, then its exact value.

    ``room`` (width, lines): the exact value in full where it fits in the lines left under the
    meaning, else shortened to one line (Enter shows it whole); None: always in full."""
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
    if cell is None or cell.exact is None:
        return text
    digits = sum(ch.isdigit() for ch in cell.exact)
    note = f"  ({digits:,} digits; Enter shows it on its own screen)" if digits > 40 and room is not None else ""
    text.append("\nexact ", style="dim")
    if room is None or _fits(room, row.meaning, len(EXACT_LABEL) + len(cell.exact) + len(note)):
        text.append(cell.exact, style="cyan")
        text.append(note, style="dim")
    else:
        width = room[0] - len(EXACT_LABEL) - len(ENTER_NOTE)
        text.append(fit_exact(cell.exact, max(1, width)), style="cyan")
        text.append(ENTER_NOTE, style="dim")
    return text


EXACT_LABEL = "exact "
ENTER_NOTE = "  Enter: whole"


def _fits(room: tuple[int, int], meaning: str, length: int) -> bool:
    """Whether ``length`` characters fit in the lines the pane has left under the heading and meaning."""
    width, lines = room
    if width <= 0 or lines <= 0:
        return True  # not laid out yet: the whole text, the pane scrolls
    used = 1 + sum(max(1, len(textwrap.wrap(part, width))) for part in meaning.split("\n"))
    return -(-length // width) <= lines - used


class DetailPane(VerticalScroll):
    """Shows what ``show`` gives it; scrolls when the exact value is long."""

    def compose(self) -> ComposeResult:
        yield Static(Text("Move the cursor to a figure to see it whole here.", style="dim"), id="detail-text")

    def show(self, row: FigureRow, column: str, cell: Shown | None) -> None:
        region = self.scrollable_content_region
        room = (region.width, region.height)
        self.query_one("#detail-text", Static).update(figure_text(row, column, cell, room))
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
            yield Static(figure_text(self.row, self.column, self.cell))
            yield Static("Esc, Enter or q closes; arrows and Page Up/Down scroll.", classes="dialog-detail")

    def on_mount(self) -> None:
        self.query_one("#figure-whole").focus()

    def action_close(self) -> None:
        self.dismiss(None)
