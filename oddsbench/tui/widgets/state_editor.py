"""One state: its outcomes in a table, the highlighted outcome's fields below, messages beside them."""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import DataTable, Input, Static

from oddsbench.model.document import OUTCOME_FIELDS, OutcomeList, RulesetDocument
from oddsbench.model.errors import Problem
from oddsbench.model.places import place_of
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.draw_editor import DrawEditor
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow

FIELD_HINTS = {
    "to": "next state",
    "prob": "8/36, or empty",
    "pay": "net win: 1, -1",
    "stake": "extra at risk",
    "note": "a few words",
}


class OutcomeTable(DataTable):
    """The outcomes of one list. Keys here add, delete and move outcomes."""

    BINDINGS = [
        Binding("a,insert", "add_outcome", "Add outcome"),
        Binding("d,delete", "delete_outcome", "Delete outcome"),
        Binding("ctrl+up", "move(-1)", "Move up", show=False),
        Binding("ctrl+down", "move(1)", "Move down", show=False),
        Binding("left_square_bracket", "choice(-1)", "Previous choice", show=False),
        Binding("right_square_bracket", "choice(1)", "Next choice", show=False),
    ]

    def action_add_outcome(self) -> None:
        self.parent_editor.add_outcome()

    def action_delete_outcome(self) -> None:
        self.parent_editor.delete_outcome()

    def action_move(self, offset: int) -> None:
        self.parent_editor.move_outcome(offset)

    def action_choice(self, offset: int) -> None:
        self.parent_editor.switch_choice(offset)

    @property
    def parent_editor(self) -> StateEditor:
        return self.query_ancestor(StateEditor)


class StateEditor(Vertical):
    """Edit a state's outcomes (or, for an end state, its result)."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.state: str | None = None
        self.lists: list[OutcomeList] = []
        self.list_index = 0
        self.rows: list[dict[str, str]] = []
        self.result = ""
        self.problems: tuple[Problem, ...] = ()
        self.end_targets: list[str] = []
        self.document: RulesetDocument | None = None

    def compose(self) -> ComposeResult:
        yield Static("", id="state-heading", classes="editor-heading")
        yield Static("", id="state-message", classes="field-message")
        yield DrawEditor(id="draw-editor")
        yield OutcomeTable(cursor_type="row", id="outcomes")
        with Vertical(id="outcome-form"):
            for field in OUTCOME_FIELDS:
                yield FieldRow(field, field, FIELD_HINTS[field])
        with Vertical(id="end-form"):
            yield FieldRow("result", "result", "win, loss, push... (a word for reports)")

    def on_mount(self) -> None:
        table = self.query_one(OutcomeTable)
        table.add_column("#", key="index")
        for field in OUTCOME_FIELDS:
            table.add_column(field, key=field)

    @property
    def where(self) -> OutcomeList | None:
        return self.lists[self.list_index] if self.lists else None

    @property
    def row(self) -> int:
        return self.query_one(OutcomeTable).cursor_row

    def show(self, document: RulesetDocument, state: str, problems: tuple[Problem, ...]) -> None:
        """Reload from the document (after any edit, undo or redo), keeping the cursor where it was."""
        if state != self.state:
            self.list_index = 0
            self.query_one(OutcomeTable).move_cursor(row=0)
        self.state = state
        self.document = document
        self.problems = problems
        kind = document.state_kind(state)
        self.lists = document.outcome_lists(state)
        self.list_index = min(self.list_index, max(len(self.lists) - 1, 0))
        self.end_targets = [name for name in document.state_names() if document.state_kind(name) == "end"]
        where = self.where
        self.rows = document.outcomes(where) if where else []
        self.result = document.state_result(state)
        heading = Text(f"State {state!r}", style="bold")
        if kind == "choices" and where is not None:
            actions = ", ".join(item.action or "" for item in self.lists)
            heading.append(
                f"  decision: choice {where.action!r} ({self.list_index + 1} of {len(self.lists)}: {actions})"
            )
            heading.append("  [ ] switch", style="dim")
        elif kind == "end":
            heading.append("  ends the round", style="dim")
        else:
            heading.append(f"  {len(self.rows)} outcomes", style="dim")
        self.query_one("#state-heading", Static).update(heading)
        self.set_class(kind == "end", "-end")
        self.query_one(DrawEditor).show(document, state, problems)
        self._fill_table()
        self._load_form()
        self._show_state_problems()

    def _fill_table(self) -> None:
        table = self.query_one(OutcomeTable)
        row = table.cursor_row
        table.clear()
        failing = {p.outcome for p in self._mine() if p.outcome is not None}
        for index, outcome in enumerate(self.rows):
            mark = Text(str(index + 1), style="red bold" if index in failing else "")
            table.add_row(mark, *[plain(outcome[field]) for field in OUTCOME_FIELDS])
        if table.row_count:
            table.move_cursor(row=min(max(row, 0), table.row_count - 1))

    def _mine(self):
        places = []
        for problem in self.problems:
            place = place_of(problem)
            if place.section == "states" and place.state == self.state:
                where = self.where
                if where is not None and place.action != where.action and place.action is not None:
                    continue
                places.append(place)
        return places

    def _problems_at(self, outcome: int | None, field: str | None) -> list[Problem]:
        found = []
        for problem in self.problems:
            place = place_of(problem)
            if place.section != "states" or place.state != self.state:
                continue
            where = self.where
            if where is not None and place.action != where.action:
                continue
            if place.outcome == outcome and (field is None or place.field == field):
                found.append(problem)
        return found

    def _load_form(self) -> None:
        row = self.row
        outcome = self.rows[row] if 0 <= row < len(self.rows) else None
        for field_row in self.query("#outcome-form FieldRow").results(FieldRow):
            field_row.input.disabled = outcome is None
            field_row.input.show(outcome[field_row.field] if outcome else "")
            problems = self._problems_at(row, field_row.field) if outcome else []
            if outcome is not None and field_row.field == "to":
                # an outcome's problems that name no field (a missing 'to', a bad table) go beside 'to'
                problems = self._problems_at(row, "to") + [
                    p for p in self._problems_at(row, None) if place_of(p).field is None
                ]
            field_row.show_problems(problems)
        result_row = self.query_one("#end-form FieldRow", FieldRow)
        result_row.input.show(self.result)
        result_row.show_problems([p for p in self._problems_at(None, "result")])

    def _show_state_problems(self) -> None:
        general = [p for p in self._problems_at(None, None) if place_of(p).field not in ("result", "draw")]
        message = self.query_one("#state-message", Static)
        message.update(plain("\n".join(str(p) for p in general)))
        message.set_class(any(p.is_error for p in general), "-error")
        message.display = bool(general)

    @on(DataTable.RowHighlighted, "#outcomes")
    def _row_moved(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._load_form()

    @on(DataTable.RowSelected, "#outcomes")
    def _row_chosen(self, event: DataTable.RowSelected) -> None:
        event.stop()
        self.query_one("#field-prob", Field).focus()

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        if not isinstance(event.input, Field) or self.state is None:
            return
        field, value, state = event.input.field, event.input.value, self.state
        if field == "result":
            if value == self.result:
                return
            self.result = value
            self.post_message(
                EditRequested(lambda doc: doc.set_state_result(state, value), f"result of {state}", f"{state}:result")
            )
            return
        where, row = self.where, self.row
        if where is None or not 0 <= row < len(self.rows) or self.rows[row][field] == value:
            return
        self.rows[row][field] = value
        self.query_one(OutcomeTable).update_cell_at((row, OUTCOME_FIELDS.index(field) + 1), value)
        self.post_message(
            EditRequested(
                lambda doc: doc.set_outcome(where, row, field, value),
                f"{field} of outcome {row + 1} in {state}",
                field=f"{state}:{where.action}:{row}:{field}",
            )
        )

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.screen.focus_next()

    def add_outcome(self) -> None:
        where, row = self.where, self.row
        if where is None:
            return
        after = row if self.rows else None
        target = self.end_targets[0] if self.end_targets else ""
        self.post_message(
            EditRequested(lambda doc: doc.add_outcome(where, after, to=target), f"new outcome in {where.state}")
        )
        self.call_after_refresh(self._cursor_to, (row + 1) if self.rows else 0)

    def _cursor_to(self, row: int) -> None:
        table = self.query_one(OutcomeTable)
        if table.row_count:
            table.move_cursor(row=min(row, table.row_count - 1))

    def delete_outcome(self) -> None:
        where, row = self.where, self.row
        if where is None or not 0 <= row < len(self.rows):
            return
        self.post_message(
            EditRequested(lambda doc: doc.delete_outcome(where, row), f"delete outcome {row + 1} in {where.state}")
        )

    def move_outcome(self, offset: int) -> None:
        where, row = self.where, self.row
        if where is None or not 0 <= row + offset < len(self.rows):
            return
        self.post_message(
            EditRequested(lambda doc: doc.move_outcome(where, row, offset), f"move outcome {row + 1} in {where.state}")
        )
        self.call_after_refresh(self._cursor_to, row + offset)

    def switch_choice(self, offset: int) -> None:
        if len(self.lists) > 1:
            self.list_index = (self.list_index + offset) % len(self.lists)
            self.query_one(OutcomeTable).move_cursor(row=0)
            if self.state is not None:
                self.show(self.document, self.state, self.problems)
