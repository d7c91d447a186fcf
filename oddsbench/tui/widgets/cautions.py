"""The cautions of ``report/cautions.py``: one line under every view, the full text one key away (F9)."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from oddsbench.report.cautions import CAUTIONS, HORIZON_CAUTIONS

FULL_TEXT_KEY = "F9"


class CautionsLine(Static):
    """Every caution on one line, cut where the width ends; the key to the full text comes first, so
    it is never cut off. A click opens the full text too."""

    def __init__(self, **kwargs) -> None:
        line = Text(no_wrap=True, overflow="ellipsis", end="")
        line.append(f" {FULL_TEXT_KEY} ", style="bold reverse")
        line.append(" Cautions: ", style="bold")
        line.append(" · ".join(CAUTIONS))
        super().__init__(line, **kwargs)

    def on_click(self) -> None:
        self.app.action_cautions()


class CautionsScreen(ModalScreen[None]):
    """The cautions in full, one per line."""

    BINDINGS = [Binding("escape,enter,q,f9", "close", "Close")]

    def __init__(self) -> None:
        super().__init__(classes="dialog-screen")

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="cautions-full", classes="dialog"):
            yield Static(Text("Cautions", style="bold"), classes="dialog-question")
            yield Static("\n".join(f"• {line}" for line in CAUTIONS), classes="cautions-text", markup=False)
            yield Static(Text("Over many rounds (the Horizon view, F10)", style="bold"), classes="dialog-question")
            yield Static("\n".join(f"• {line}" for line in HORIZON_CAUTIONS), classes="cautions-text", markup=False)
            yield Static("Esc, Enter or q closes.", classes="dialog-detail")

    def on_mount(self) -> None:
        self.query_one("#cautions-full").focus()

    def action_close(self) -> None:
        self.dismiss(None)
