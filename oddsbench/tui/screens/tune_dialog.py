"""The target action on a parameter: type a target, see the formula and the values that give it,
apply one (one undoable edit). The answer comes from the core in a thread worker
(``tui/tuning.py``); this screen only lays it out."""

from __future__ import annotations

from textual import on, work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Input, Label, OptionList, Static
from textual.widgets.option_list import Option
from textual.worker import get_current_worker

from oddsbench.tui.plain import plain
from oddsbench.tui.tuning import DEFAULT_TARGET, TuneView
from oddsbench.tui.widgets.cautions import CautionsLine
from oddsbench.tui.widgets.fields import Field

HINT = "Enter finds the values · Tab to the list, Enter applies one (Ctrl+Z undoes) · Escape closes"


class TuneDialog(ModalScreen[str | None]):
    """Tune parameter ``name`` of the ruleset ``text`` to a target; dismisses with the value to apply."""

    CSS_PATH = "../styles/tune.tcss"
    BINDINGS = [Binding("escape", "close", "Close")]

    def __init__(self, text: str, source: str, name: str, now: str, strategy: str | None) -> None:
        super().__init__(classes="dialog-screen")
        self.ruleset_text = text
        self.ruleset_source = source
        self.param = name
        self.now = now
        self.strategy = strategy
        self.values: list[str] = []

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog", id="tune-dialog"):
            yield Label(plain(f"Target for parameter {self.param!r} (now {self.now})", multiline=False))
            yield Static(
                "FIGURE=VALUE: house_edge=1.5%, return_to_player=97%, hit_frequency=1/3, end:STATE=1/2 ...",
                classes="dialog-detail",
                markup=False,
            )
            yield Field("target", DEFAULT_TARGET, moves_on_enter=False, id="tune-target")
            yield Static(HINT, id="tune-message", classes="dialog-detail", markup=False)
            with VerticalScroll(id="tune-answer-box"):
                yield Static("", id="tune-answer", markup=False)
            yield OptionList(id="tune-choices")
            yield CautionsLine(classes="cautions-text")

    def on_mount(self) -> None:
        field = self.query_one("#tune-target", Field)
        field.value = DEFAULT_TARGET
        field.cursor_position = len(field.value)
        field.focus()
        self.query_one("#tune-choices", OptionList).display = False

    @on(Input.Submitted, "#tune-target")
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self._say("finding the values ...")
        self._find(event.value)

    @work(thread=True, exclusive=True)
    def _find(self, target: str) -> None:
        from oddsbench.core.work import Cancelled
        from oddsbench.tui.tuning import tune_view

        worker = get_current_worker()
        try:
            answer = tune_view(
                self.ruleset_text, self.ruleset_source, self.param, target, self.strategy, lambda: worker.is_cancelled
            )
        except Cancelled:
            return
        if not worker.is_cancelled:
            self.app.call_from_thread(self._show, answer)

    def _show(self, answer: TuneView | str) -> None:
        choices = self.query_one("#tune-choices", OptionList)
        choices.clear_options()
        if isinstance(answer, str):
            self._say(answer, error=True)
            self.query_one("#tune-answer", Static).update("")
            choices.display = False
            self.values = []
            return
        self.query_one("#tune-answer", Static).update(plain(answer.text))
        self.values = [value for _, value in answer.choices]
        choices.add_options([Option(plain(f"apply {label}", multiline=False)) for label, _ in answer.choices])
        choices.display = bool(answer.choices)
        self._say(HINT if answer.choices else "no value to apply: " + HINT)

    def _say(self, message: str, error: bool = False) -> None:
        line = self.query_one("#tune-message", Static)
        line.update(plain(message))
        line.set_class(error, "-error")

    @on(OptionList.OptionSelected, "#tune-choices")
    def _chosen(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.workers.cancel_all()
        self.dismiss(self.values[event.option_index])

    def action_close(self) -> None:
        self.workers.cancel_all()
        self.dismiss(None)
