"""Pick a ruleset to open: the bundled ones, those in the current folder, or a new one."""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Label, OptionList, Static
from textual.widgets.option_list import Option

from oddsbench.model.file_read import FileRefused, read_text_capped
from oddsbench.model.load import MAX_FILE_BYTES
from oddsbench.tui.bundled import bundled_rulesets, folder_rulesets
from oddsbench.tui.plain import plain

NEW = "new:"


def _describe(path: Path) -> Text:
    """The file name and its title line, read cheaply (no full check while browsing)."""
    label = plain(path.name, "bold")
    try:
        for line in read_text_capped(path, MAX_FILE_BYTES).splitlines()[:40]:
            stripped = line.strip()
            if stripped.startswith("title") and "=" in stripped:
                label.append(plain("  " + stripped.split("=", 1)[1].strip().strip('"')[:80], "dim"))
                break
    except FileRefused as refused:
        label.append(plain(f"  ({refused})", "red"))
    return label


class OpenScreen(ModalScreen[str | None]):
    """Returns a path to open, ``new:`` for a new ruleset, or None."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, folder: Path) -> None:
        super().__init__(classes="dialog-screen")
        self.folder = folder

    def compose(self) -> ComposeResult:
        options: list[Option | None] = [Option(Text("New ruleset from the template…", style="green"), id=NEW), None]
        options.append(Option(Text("Bundled rulesets", style="underline"), disabled=True))
        options += [Option(_describe(path), id=str(path)) for path in bundled_rulesets()]
        options.append(None)
        here = folder_rulesets(self.folder)
        options.append(Option(Text(f"In {self.folder}", style="underline"), disabled=True))
        options += [Option(_describe(path), id=str(path)) for path in here]
        if not here:
            options.append(Option(Text("  no .toml files here", style="dim"), disabled=True))
        with Vertical(classes="dialog", id="open-dialog"):
            yield Label("Open a ruleset", classes="dialog-question")
            yield OptionList(*options, id="open-list")
            yield Static("Enter opens, Escape cancels", classes="dialog-detail")

    def on_mount(self) -> None:
        self.query_one(OptionList).focus()

    @on(OptionList.OptionSelected)
    def _chosen(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(event.option.id)

    def action_cancel(self) -> None:
        self.dismiss(None)
