"""Small modal dialogs: a question with lettered answers, and a one-line name prompt."""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Label, Static

from oddsbench.model.visible import visible
from oddsbench.tui.widgets.fields import Field


class Choose(ModalScreen[str]):
    """Ask a question; each answer has a key (its first letter). Escape gives ``cancel``."""

    BINDINGS = [Binding("escape", "answer('cancel')", "Cancel")]

    def __init__(self, question: str, answers: list[tuple[str, str]], detail: str = "") -> None:
        super().__init__(classes="dialog-screen")
        self.question = question
        self.detail = detail
        self.answers = answers  # (key, label)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label(visible(self.question), classes="dialog-question", markup=False)
            if self.detail:
                yield Static(visible(self.detail, multiline=True), classes="dialog-detail", markup=False)
            with Horizontal(classes="dialog-buttons"):
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
            yield Field("name", id="ask-name")
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
