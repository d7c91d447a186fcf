"""Small modal dialogs: a question with lettered answers, a one-line name prompt, and a short form."""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Label, Static

from oddsbench.model.visible import visible
from oddsbench.tui.widgets.fields import Field

ROW_WIDTH = 56  # answers side by side up to this many columns; more are stacked, so all stay visible at 80x24


class Choose(ModalScreen[str]):
    """Ask a question; each answer has a key (its first letter). Escape gives ``cancel``."""

    BINDINGS = [Binding("escape", "answer('cancel')", "Cancel")]

    def __init__(self, question: str, answers: list[tuple[str, str]], detail: str = "") -> None:
        super().__init__(classes="dialog-screen")
        self.question = question
        self.detail = detail
        self.answers = answers  # (key, label)

    def compose(self) -> ComposeResult:
        width = sum(len(label) + len(key) + 7 for key, label in self.answers)
        with Vertical(classes="dialog"):
            yield Label(visible(self.question), classes="dialog-question", markup=False)
            if self.detail:
                yield Static(visible(self.detail, multiline=True), classes="dialog-detail", markup=False)
            buttons = Horizontal if width <= ROW_WIDTH else Vertical
            with buttons(classes="dialog-buttons" + ("" if width <= ROW_WIDTH else " -stacked")):
                for key, label in self.answers:
                    yield Button(f"{label} ({key})", id=f"answer-{key}", compact=True)

    def on_mount(self) -> None:
        self.query(Button).first().focus()

    def on_key(self, event) -> None:
        for key, _ in self.answers:
            if event.key == key:
                event.stop()
                self.dismiss(key)

    @on(Button.Pressed)
    def _pressed(self, event: Button.Pressed) -> None:
        self.dismiss((event.button.id or "answer-cancel").removeprefix("answer-"))

    def action_answer(self, answer: str) -> None:
        self.dismiss(answer)


class AskName(ModalScreen[str | None]):
    """Ask for a name or a path; Enter accepts, Escape cancels. ``check`` may refuse with a message."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, question: str, value: str = "", check=None) -> None:
        super().__init__(classes="dialog-screen")
        self.question = question
        self.value = value
        self.check = check

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label(visible(self.question), classes="dialog-question", markup=False)
            yield Field("name", moves_on_enter=False, id="ask-name")
            yield Static("Enter to accept, Escape to cancel", id="ask-message", classes="dialog-detail", markup=False)

    def on_mount(self) -> None:
        field = self.query_one(Field)
        field.value = visible(self.value)
        field.cursor_position = len(field.value)
        field.focus()

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        value = event.value.strip()
        problem = self.check(value) if self.check else (None if value else "a name is needed")
        if problem:
            message = self.query_one("#ask-message", Static)
            message.update(visible(problem))
            message.add_class("-error")
            return
        self.dismiss(value)

    def action_cancel(self) -> None:
        self.dismiss(None)


class AskFields(ModalScreen[dict[str, str] | None]):
    """A short form: labelled fields (Enter moves on; Enter in the last accepts), Escape cancels.

    ``check`` gets the values and may refuse with a message naming the field."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, question: str, fields: list[tuple[str, str, str]], check=None, detail: str = "") -> None:
        super().__init__(classes="dialog-screen")
        self.question = question
        self.fields = fields  # (key, label, value)
        self.check = check
        self.detail = detail

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label(self.question, classes="dialog-question")
            if self.detail:
                yield Static(self.detail, classes="dialog-detail", markup=False)
            for index, (key, label, _) in enumerate(self.fields):
                with Horizontal(classes="ask-row"):
                    yield Label(label, classes="ask-label")
                    last = index == len(self.fields) - 1
                    yield Field(key, moves_on_enter=not last, id=f"ask-{key}", classes="ask-field")
            yield Static("Enter moves on and accepts, Escape cancels", id="ask-message", classes="dialog-detail")

    def on_mount(self) -> None:
        for key, _, value in self.fields:
            field = self.query_one(f"#ask-{key}", Field)
            field.value = value
            field.cursor_position = len(value)
        self.query(Field).first().focus()

    def values(self) -> dict[str, str]:
        return {key: self.query_one(f"#ask-{key}", Field).value.strip() for key, _, _ in self.fields}

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        values = self.values()
        problem = self.check(values) if self.check else None
        if problem:
            message = self.query_one("#ask-message", Static)
            message.update(problem)
            message.add_class("-error")
            return
        self.dismiss(values)

    def action_cancel(self) -> None:
        self.dismiss(None)
