"""The Source view: the file as text, for anything the forms do not cover. When the text is not TOML,
the line and column are said above it and the line is marked in the text."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widgets import Static, TextArea

from oddsbench.tui.plain import plain

SOURCE_HEADING = "The file as text: anything the forms do not cover. Edits here are undoable too."
SOURCE_HEADING_CONTROLS = (
    "The file as text. It holds control characters, shown here as escapes such as \\x1b: "
    "an edit here writes them as shown."
)
ERROR_LINE_STYLE = "on #5a2430"


class SourceText(TextArea):
    """A TextArea that marks one line (the first line that is not TOML)."""

    error_line: int | None = None  # 0-based

    def get_line(self, line_index: int) -> Text:
        line = super().get_line(line_index)
        if line_index == self.error_line:
            line.stylize(ERROR_LINE_STYLE)
        return line

    def mark(self, line: int | None) -> None:
        if line != self.error_line:
            self.error_line = line
            self._line_cache.clear()
            self.refresh()


class SourceView(Vertical):
    """The text and, when it does not read as TOML, where."""

    def compose(self) -> ComposeResult:
        yield Static(SOURCE_HEADING, classes="editor-heading", id="source-heading")
        yield Static("", id="source-problem")
        yield SourceText("", id="source-text", soft_wrap=False, show_line_numbers=True)

    def show_problem(self, message: str | None, line: int | None) -> None:
        """``message`` (None: the text reads as TOML) and its 1-based ``line`` to mark."""
        problem = self.query_one("#source-problem", Static)
        problem.update(plain(message or "", "bold red"))
        problem.display = bool(message)
        self.query_one(SourceText).mark(line - 1 if message and line else None)
