"""Every key of the workbench, read from the bindings themselves so the list cannot go stale."""

from __future__ import annotations

from rich.console import Group
from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from oddsbench.report.cautions import CAUTIONS

KEY_NAMES = {
    "left_square_bracket": "[",
    "right_square_bracket": "]",
    "less_than_sign": "<",
    "greater_than_sign": ">",
    "minus": "-",
    "plus": "+",
    "equals_sign": "=",
    "space": "Space",
    "question_mark": "?",
    "escape": "Esc",
    "delete": "Del",
    "insert": "Ins",
    "enter": "Enter",
    "tab": "Tab",
    "shift+tab": "Shift+Tab",
}


def key_text(keys: str) -> str:
    shown = []
    for key in keys.split(","):
        key = KEY_NAMES.get(key, key)
        if key.startswith("ctrl+"):
            rest = key[5:]
            key = "Ctrl+" + (rest.upper() if len(rest) == 1 else rest.capitalize())
        elif len(key) > 1 and key[0] == "f" and key[1:].isdigit():
            key = key.upper()
        shown.append(key)
    return " / ".join(shown)


def bindings_text(areas: list[tuple[str, list]]) -> Group:
    """Each area's keys in two columns: a long description wraps in its own column, under itself."""
    parts = []
    for area, bindings in areas:
        parts.append(Text(area, style="bold underline"))
        keys = Table.grid(padding=(0, 2), pad_edge=True)
        keys.add_column(min_width=20, style="bold cyan", no_wrap=True)
        keys.add_column(ratio=1)
        for binding in bindings:
            if isinstance(binding, Binding) and binding.description:
                keys.add_row(key_text(binding.key), Text(binding.description))
        parts += [keys, Text("")]
    return Group(*parts)


class HelpScreen(ModalScreen[None]):
    """Keys by area, then how editing works, then the cautions."""

    BINDINGS = [Binding("escape,f1,q", "dismiss_help", "Close help")]

    def __init__(self, areas: list[tuple[str, list]]) -> None:
        super().__init__(classes="dialog-screen")
        self.areas = areas

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help", classes="dialog"):
            yield Static(Text("Keys of the workbench", style="bold"), classes="dialog-question")
            yield Static(bindings_text(self.areas))
            yield Static(
                "Editing: move with the arrow keys and Tab; every change is checked as you type, with the "
                "messages of `oddsbench check` beside the field, and the figures are solved again in the "
                "background. While a field is wrong, the figures shown are the last good ones. Values are "
                "exact: write 8/36 or 1 - p, not 0.2222. An empty prob shares what is left of 1.",
                classes="dialog-detail",
                markup=False,
            )
            yield Static("\n".join(f"• {line}" for line in CAUTIONS), classes="cautions-text", markup=False)
            yield Static("Esc, F1 or q closes this screen; arrows scroll.", classes="dialog-detail")

    def on_mount(self) -> None:
        self.query_one("#help").focus()

    def action_dismiss_help(self) -> None:
        self.dismiss(None)
