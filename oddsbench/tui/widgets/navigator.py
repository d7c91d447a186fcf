"""The list on the left: the round's setup, its parameters, session and deck, then every state, family
and strategy of the file. Keys here add (asking which kind), rename, delete and change a state's kind."""

from __future__ import annotations

from rich.text import Text
from textual.binding import Binding
from textual.message import Message
from textual.widgets import OptionList
from textual.widgets.option_list import Option

from oddsbench.model.document import RulesetDocument
from oddsbench.tui.plain import plain

SETUP = "setup:"
PARAMS = "params:"
SESSION = "session:"
DECK = "deck:"
STATE = "state:"
FAMILY = "family:"
STRATEGY = "strategy:"
NAMED = (STATE, FAMILY, STRATEGY)


def section(title: str) -> Option:
    return Option(Text(title, style="dim italic"), disabled=True)


class Navigator(OptionList):
    """Pick what to edit."""

    BINDINGS = [
        Binding("enter", "open_entry", "Edit", show=False, priority=True),
        Binding("a", "command('add')", "Add…"),
        Binding("e", "command('add-end')", "Add end state", show=False),
        Binding("r", "command('rename')", "Rename"),
        Binding("d,delete", "command('delete')", "Delete"),
        Binding("k", "command('kind')", "Kind", show=False),
    ]

    class Picked(Message):
        """The user moved to an entry (``setup:``, ``params:``, ``session:``, ``state:NAME``,
        ``family:NAME`` or ``strategy:NAME``)."""

        def __init__(self, entry: str) -> None:
            super().__init__()
            self.entry = entry

    class Command(Message):
        """Add, rename, delete or change the kind of the highlighted entry: the screen asks and edits."""

        def __init__(self, command: str, entry: str | None) -> None:
            super().__init__()
            self.command = command
            self.entry = entry

        @property
        def state(self) -> str | None:
            return self.entry[len(STATE) :] if self.entry and self.entry.startswith(STATE) else None

    def show(self, document: RulesetDocument, select: str | None = None, failing: set[str] | None = None) -> None:
        failing = failing or set()
        current = select or self.current_entry
        options: list[Option | None] = [
            Option(Text("Round setup", style="bold"), id=SETUP),
            Option(Text(f"Parameters ({len(document.params())})", style="bold"), id=PARAMS),
            Option(Text("Session", style="bold"), id=SESSION),
            Option(Text("Deck", style="bold"), id=DECK),
            section("states"),
        ]
        for name in document.state_names():
            kind = document.state_kind(name)
            label = plain(name)
            if kind == "end":
                label.append(plain(f" ({document.state_result(name) or 'end'})", "dim"))
            elif kind == "choices":
                label.append(" (decision)", style="dim")
            if name in failing:
                label.append(" ✗", style="red")
            options.append(Option(label, id=STATE + name))
        families = document.family_names()
        if families:
            options.append(section("families"))
        for name in families:
            label = plain(name, multiline=False)
            label.append_text(plain(f" {document.family_fields(name)['state']}", "dim", multiline=False))
            if FAMILY + name in failing:
                label.append(" ✗", style="red")
            options.append(Option(label, id=FAMILY + name))
        strategies = document.strategy_names()
        if strategies or document.decision_owners():
            options.append(section("strategies"))
        for name in strategies:
            label = plain(name, multiline=False)
            if STRATEGY + name in failing:
                label.append(" ✗", style="red")
            options.append(Option(label, id=STRATEGY + name))
        signature = tuple((o.id, o.prompt.plain) if o else None for o in options)
        if signature == getattr(self, "_signature", None) and select is None:
            return
        self._signature = signature
        self.clear_options()
        self.add_options(options)
        ids = [option.id for option in options if option is not None]
        self.highlighted = ids.index(current) if current in ids else 0

    @property
    def current_entry(self) -> str | None:
        option = self.highlighted_option
        return option.id if option is not None else None

    @property
    def current_state(self) -> str | None:
        entry = self.current_entry
        return entry[len(STATE) :] if entry and entry.startswith(STATE) else None

    def on_option_list_option_highlighted(self, event: OptionList.OptionHighlighted) -> None:
        event.stop()
        if event.option.id:
            self.post_message(self.Picked(event.option.id))

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()

    def action_open_entry(self) -> None:
        """Enter: into the entry's editor at once (a priority key, so keys typed next follow the focus)."""
        entry = self.current_entry
        enter = getattr(self.screen, "enter_editor", None)
        if entry and enter is not None:
            enter(entry)

    def action_command(self, command: str) -> None:
        entry = self.current_entry
        if command in ("rename", "delete", "kind") and not (entry and entry.startswith(NAMED)):
            return
        self.post_message(self.Command(command, entry))
