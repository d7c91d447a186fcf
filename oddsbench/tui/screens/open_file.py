"""Pick a ruleset to open: the bundled ones, the rulesets in a folder, a path typed in, or a new one."""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, Label, OptionList, Static
from textual.widgets.option_list import Option

from oddsbench.model.file_read import FileRefused, read_text_capped
from oddsbench.model.load import MAX_FILE_BYTES
from oddsbench.tui.bundled import bundled_rulesets, folder_rulesets
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.fields import Field

NEW = "new:"
HINT = "Enter opens · Tab to the path box: type a file (or a folder to list) · Escape cancels"


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


def choices(folder: Path) -> list[Option | None]:
    """New, the bundled rulesets, then the rulesets in ``folder``."""
    options: list[Option | None] = [Option(Text("New ruleset from the template…", style="green"), id=NEW), None]
    options.append(Option(Text("Bundled rulesets", style="underline"), disabled=True))
    options += [Option(_describe(path), id=str(path)) for path in bundled_rulesets()]
    options.append(None)
    here = folder_rulesets(folder)
    options.append(Option(plain(f"In {folder}", "underline"), disabled=True))
    options += [Option(_describe(path), id=str(path)) for path in here]
    if not here:
        options.append(Option(Text("  no rulesets here", style="dim"), disabled=True))
    return options


class OpenScreen(ModalScreen[str | None]):
    """Returns a path to open, ``new:`` for a new ruleset, or None."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, folder: Path) -> None:
        super().__init__(classes="dialog-screen")
        self.folder = folder

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog", id="open-dialog"):
            yield Label("Open a ruleset", classes="dialog-question")
            yield OptionList(*choices(self.folder), id="open-list")
            with Horizontal(classes="ask-row"):
                yield Label("path", classes="ask-label")
                yield Field(
                    "path", "a ruleset file, or a folder", moves_on_enter=False, id="open-path", classes="ask-field"
                )
            yield Static(HINT, id="open-message", classes="dialog-detail", markup=False)

    def on_mount(self) -> None:
        self.query_one(OptionList).focus()

    @on(OptionList.OptionSelected)
    def _chosen(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(event.option.id)

    @on(Input.Submitted, "#open-path")
    def _typed(self, event: Input.Submitted) -> None:
        """A typed path: a file opens (a missing one is said, not created), a folder lists its rulesets."""
        event.stop()
        typed = event.value.strip()
        if not typed:
            return
        path = Path(typed).expanduser()
        if not path.is_absolute():
            path = self.folder / path
        if path.is_dir():
            self.folder = path
            options = self.query_one(OptionList)
            options.clear_options()
            options.add_options(choices(path))
            self._say(f"listed the rulesets in {path}", error=False)
            options.focus()
        elif path.is_file():
            self.dismiss(str(path))
        else:
            self._say(f"{path}: no such file or folder (Ctrl+N makes a new ruleset)", error=True)

    def _say(self, message: str, error: bool) -> None:
        shown = self.query_one("#open-message", Static)
        shown.update(plain(message))
        shown.set_class(error, "-error")

    def action_cancel(self) -> None:
        self.dismiss(None)
