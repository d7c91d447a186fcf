"""A labelled one-line input with its validation message beside it.

Enter in a form field moves to the next field at once, as a priority binding: the focus moves
before the next key is delivered, so keys typed right after Enter land in the next field.
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.widgets import Input, Label, Static

from oddsbench.model.errors import Problem
from oddsbench.model.visible import visible
from oddsbench.tui.plain import plain


class Field(Input):
    """An input that remembers which document field it edits; no blinking in tests and screenshots.

    ``moves_on_enter``: Enter goes to the next field (forms) instead of submitting (dialogs)."""

    BINDINGS = [Binding("enter", "next_field", "Next field", show=False, priority=True)]

    def __init__(self, field: str, placeholder: str = "", moves_on_enter: bool = True, **kwargs) -> None:
        # reached from the keyboard, a field's text is selected: typing replaces it, arrows keep it
        super().__init__(placeholder=placeholder, compact=True, select_on_focus=True, **kwargs)
        self.field = field
        self.moves_on_enter = moves_on_enter

    def on_mount(self) -> None:
        self.cursor_blink = getattr(self.app, "cursor_blinks", True)

    def show(self, value: str) -> None:
        """Put the document's value in. While the user types here the input leads and the document
        follows, so a refresh never overwrites newer keystrokes; undo and redo force the value."""
        if self.has_focus and not getattr(self.screen, "force_fields", False):
            return
        value = visible(value)  # a control character from the file is shown (and, if edited, kept) as its escape
        if self.value != value:
            self.value = value
            self.cursor_position = len(value)

    async def action_next_field(self) -> None:
        # this binding replaces Input's own Enter: a field that does not move submits, as Input would
        if not self.moves_on_enter:
            await self.action_submit()
            return
        self.screen.focus_next(Field)

    def enter(self) -> None:
        """Take the focus now, the text selected so that typing replaces it (Enter on a table row)."""
        self.screen.set_focus(self)
        self.action_select_all()


class FieldRow(Horizontal):
    """``label [input] message``: the message is the problem line of ``oddsbench check`` for this field."""

    def __init__(self, field: str, label: str, placeholder: str = "", **kwargs) -> None:
        super().__init__(classes="field-row", **kwargs)
        self.field = field
        self.label = label
        self.placeholder = placeholder

    def compose(self) -> ComposeResult:
        yield Label(self.label, classes="field-label")
        yield Field(self.field, self.placeholder, id=f"field-{self.field}")
        yield Static("", classes="field-message")

    @property
    def input(self) -> Field:
        return self.query_one(Field)

    def show_problems(self, problems: list[Problem]) -> None:
        show_problems(self, self.input, problems)


def show_problems(row, field: Field, problems: list[Problem], text: str | None = None) -> None:
    """The problem lines beside ``field`` (in ``row``'s message), coloured by severity; plain text."""
    message = row.query_one(".field-message", Static)
    message.update(plain(text if text is not None else "\n".join(str(problem) for problem in problems)))
    message.set_class(any(p.is_error for p in problems), "-error")
    message.set_class(bool(problems) and not any(p.is_error for p in problems), "-warning")
    field.set_class(any(p.is_error for p in problems), "-invalid")
