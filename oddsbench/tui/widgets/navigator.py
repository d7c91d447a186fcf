"""The list on the left: the round's setup, its parameters, session and deck, then every state of the file."""

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


class Navigator(OptionList):
    """Pick what to edit. Keys here add, rename and delete states."""

    BINDINGS = [
        Binding("a", "add_state", "Add state"),
        Binding("e", "add_end_state", "Add end state"),
        Binding("r", "rename_state", "Rename"),
        Binding("d,delete", "delete_state", "Delete"),
    ]

    class Picked(Message):
        """The user moved to an entry (``setup:``, ``params:`` or ``state:NAME``)."""

        def __init__(self, entry: str) -> None:
            super().__init__()
            self.entry = entry

    class StateCommand(Message):
        """Add, rename or delete a state: the screen asks for a name and makes the edit."""

        def __init__(self, command: str, state: str | None) -> None:
            super().__init__()
            self.command = command
            self.state = state

    def show(self, document: RulesetDocument, select: str | None = None, failing: set[str] | None = None) -> None:
        failing = failing or set()
        current = select or self.current_entry
        options: list[Option | None] = [
            Option(Text("Round setup", style="bold"), id=SETUP),
            Option(Text(f"Parameters ({len(document.params())})", style="bold"), id=PARAMS),
            Option(Text("Session", style="bold"), id=SESSION),
            Option(Text("Deck", style="bold"), id=DECK),
            None,
        ]
        for name in document.state_names():
            kind = document.state_kind(name)
            label = plain(name)
            if kind == "end":
                result = document.state_result(name)
                label.append(plain(f" ({result or 'end'})", "dim"))
            elif kind == "choices":
                label.append(" (decision)", style="dim")
            if name in failing:
                label.append(" ✗", style="red")
            options.append(Option(label, id=STATE + name))
        signature = tuple((o.id, o.prompt.plain) if o else None for o in options) + (document.family_count(),)
        if signature == getattr(self, "_signature", None) and select is None:
            return
        self._signature = signature
        generated = document.family_count()
        if generated:
            options.append(None)
            options.append(
                Option(
                    Text(
                        f"+ states from {generated} famil{'y' if generated == 1 else 'ies'}: F6 Source",
                        style="dim italic",
                    ),
                    disabled=True,
                )
            )
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
        self.screen.focus_next()

    def action_add_state(self) -> None:
        self.post_message(self.StateCommand("add", None))

    def action_add_end_state(self) -> None:
        self.post_message(self.StateCommand("add-end", None))

    def action_rename_state(self) -> None:
        if self.current_state is not None:
            self.post_message(self.StateCommand("rename", self.current_state))

    def action_delete_state(self) -> None:
        if self.current_state is not None:
            self.post_message(self.StateCommand("delete", self.current_state))
