"""A labelled one-line input with its validation message beside it."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.widgets import Input, Label, Static

from oddsbench.model.errors import Problem
from oddsbench.model.visible import visible
from oddsbench.tui.plain import plain


class Field(Input):
    """An input that remembers which document field it edits; no blinking in tests and screenshots."""

    def __init__(self, field: str, placeholder: str = "", **kwargs) -> None:
        super().__init__(placeholder=placeholder, compact=True, select_on_focus=False, **kwargs)
        self.field = field

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
        message = self.query_one(".field-message", Static)
        message.update(plain("\n".join(str(problem) for problem in problems)))
        message.set_class(any(p.is_error for p in problems), "-error")
        message.set_class(bool(problems) and not any(p.is_error for p in problems), "-warning")
        self.input.set_class(any(p.is_error for p in problems), "-invalid")
