"""One hand-written state: its outcomes (every action's, for a decision) and the highlighted outcome's
fields, or, for an end state, its result; messages beside the fields they concern."""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Input, Static

from oddsbench.model.document import OutcomeList, RulesetDocument
from oddsbench.model.errors import Problem
from oddsbench.model.places import Place, place_of
from oddsbench.model.visible import visible
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.draw_editor import DrawEditor
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import FieldRow
from oddsbench.tui.widgets.outcomes import OutcomeCommand, OutcomesPanel, OutcomeTable

__all__ = ["EndForm", "OutcomeTable", "StateEditor", "heading", "matches", "outcome_summary"]


def heading(kind: str, name: str, detail: str) -> Text:
    """``State 'x' · 3 outcomes``: the separator keeps the words apart in every renderer."""
    text = plain(f"{kind} {name!r}", "bold", multiline=False)
    text.append_text(plain(f" · {detail}", "dim", multiline=False))
    return text


def outcome_summary(document: RulesetDocument, owner: str, family: bool) -> str:
    lists = document.outcome_lists(owner, family)
    if any(where.action is not None for where in lists):
        return f"a decision: {', '.join(where.action or '' for where in lists)}"
    count = len(document.outcomes(lists[0])) if lists else 0
    return f"{count} outcome{'s' if count != 1 else ''}"


def matches(place: Place, where: OutcomeList | None, index: int | None, field: str | None) -> bool:
    """Whether a problem's place is this outcome's field (``*``: any field; None: naming no field)."""
    if where is not None and place.action != where.action:
        return False
    if place.outcome != index:
        return False
    return field == "*" or place.field == field


class EndForm(Vertical):
    """An end state's result."""

    def compose(self) -> ComposeResult:
        yield FieldRow("result", "result", "win, loss, push... (a word for reports)")


class StateEditor(Vertical):
    """Edit a state's outcomes (or, for an end state, its result). ``k`` changes its kind."""

    BINDINGS = [Binding("k", "kind", "Kind of state", show=False)]

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.state: str | None = None
        self.result = ""
        self.problems: tuple[Problem, ...] = ()

    def compose(self) -> ComposeResult:
        yield Static("", id="state-heading", classes="editor-heading")
        yield Static("", id="state-message", classes="field-message")
        yield DrawEditor(id="draw-editor")
        yield OutcomesPanel(table_id="outcomes", id="state-outcomes")
        yield EndForm(id="end-form")

    def show(self, document: RulesetDocument, state: str, problems: tuple[Problem, ...]) -> None:
        """Reload from the document (after any edit, undo or redo), keeping the cursor where it was."""
        self.state = state
        self.problems = problems
        kind = document.state_kind(state)
        self.result = document.state_result(state)
        self.set_class(kind == "end", "-end")
        detail = "ends the round" if kind == "end" else outcome_summary(document, state, False)
        self.query_one("#state-heading", Static).update(heading("State", state, detail))
        self.query_one(DrawEditor).show(document, state, problems)
        mine = [(p, place) for p in problems if (place := place_of(p)).section == "states" and place.state == state]

        def problems_at(where: OutcomeList | None, index: int | None, field: str | None) -> list[Problem]:
            return [p for p, place in mine if matches(place, where, index, field)]

        if kind != "end":
            self.query_one(OutcomesPanel).show(document, state, problems_at)
        result_row = self.query_one("#end-form FieldRow", FieldRow)
        result_row.input.show(self.result)
        result_row.show_problems([p for p, place in mine if place.field == "result" and place.outcome is None])
        general = [p for p, place in mine if place.outcome is None and place.field not in ("result", "draw")]
        message = self.query_one("#state-message", Static)
        message.update(plain("\n".join(str(p) for p in general)))
        message.set_class(any(p.is_error for p in general), "-error")
        message.display = bool(general)

    def action_kind(self) -> None:
        if self.state is not None:
            self.post_message(OutcomeCommand("kind", self.state, False, None))

    @on(Input.Changed, "#end-form Input")
    def _result_changed(self, event: Input.Changed) -> None:
        event.stop()
        value, state = event.input.value, self.state
        if state is None or value == visible(self.result):
            return
        self.result = value
        self.post_message(
            EditRequested(lambda doc: doc.set_state_result(state, value), f"result of {state}", f"{state}:result")
        )
