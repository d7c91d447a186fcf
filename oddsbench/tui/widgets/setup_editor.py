"""The round's setup ([ruleset]: title, about, start, stake) and its parameters ([params])."""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.message import Message
from textual.widgets import DataTable, Input, Static

from oddsbench.model.document import RulesetDocument
from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.model.places import place_of
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow, show_problems

HEAD_LABELS = (("title", "title"), ("about", "about"), ("start", "start"), ("stake", "stake"))


class SetupEditor(Vertical):
    """Edit the round's head fields; messages appear beside the field they concern."""

    def compose(self) -> ComposeResult:
        yield Static("Round setup", classes="editor-heading")
        for field, label in HEAD_LABELS:
            yield FieldRow(field, label)
        yield Static("", id="setup-message", classes="field-message")

    def show(self, document: RulesetDocument, problems: tuple[Problem, ...]) -> None:
        head = self._head = document.head()
        for row in self.query(FieldRow):
            row.input.show(head.get(row.field, ""))
            row.show_problems(
                [p for p in problems if place_of(p).section == "ruleset" and place_of(p).field == row.field]
            )
        general = [p for p in problems if place_of(p).section == "ruleset" and place_of(p).field is None]
        self.query_one("#setup-message", Static).update(plain("\n".join(str(p) for p in general)))

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        field = event.input.field if isinstance(event.input, Field) else None
        if field is None:
            return
        value = event.input.value
        if getattr(self, "_head", {}).get(field) == value:
            return
        self.post_message(
            EditRequested(lambda doc: doc.set_head(field, value), f"[ruleset] {field}", field=f"head:{field}")
        )


class ParamsEditor(Vertical):
    """A table of parameters (name | value) and the value of the highlighted one."""

    BINDINGS = [
        Binding("a", "add_param", "Add parameter"),
        Binding("d,delete", "delete_param", "Delete parameter"),
        Binding("t", "target_param", "Target a figure (tune this parameter)"),
    ]

    class ParamCommand(Message):
        def __init__(self, command: str, name: str | None) -> None:
            super().__init__()
            self.command = command
            self.name = name

    def compose(self) -> ComposeResult:
        yield Static("Parameters: names usable in any expression", classes="editor-heading")
        table = DataTable(cursor_type="row", id="params-table")
        yield table
        yield FieldRow("param-value", "value")
        yield Static("", id="params-message", classes="field-message")

    def on_mount(self) -> None:
        table = self.query_one("#params-table", DataTable)
        table.add_column("name", key="name")
        table.add_column("value", key="value")

    def show(self, document: RulesetDocument, problems: tuple[Problem, ...]) -> None:
        table = self.query_one("#params-table", DataTable)
        row = table.cursor_row
        table.clear()
        self._params = document.params()
        for name, value in self._params:
            table.add_row(plain(name), plain(value), key=name)
        if table.row_count:
            table.move_cursor(row=min(row, table.row_count - 1))
        self._problems = problems
        self._load_value()

    @property
    def current(self) -> str | None:
        table = self.query_one("#params-table", DataTable)
        params = getattr(self, "_params", [])
        if not params or not 0 <= table.cursor_row < len(params):
            return None
        return params[table.cursor_row][0]

    def _load_value(self) -> None:
        row = self.query_one(FieldRow)
        name = self.current
        row.input.disabled = name is None
        row.input.show(dict(getattr(self, "_params", [])).get(name, "") if name else "")
        problems = getattr(self, "_problems", ())
        mine = [p for p in problems if place_of(p).section == "params" and place_of(p).name == name]
        row.show_problems(mine)
        others = [p for p in problems if place_of(p).section == "params" and place_of(p).name != name]
        self.query_one("#params-message", Static).update(plain("\n".join(str(p) for p in others)))

    @on(DataTable.RowHighlighted, "#params-table")
    def _highlighted(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._load_value()

    @on(DataTable.RowSelected, "#params-table")
    def _selected(self, event: DataTable.RowSelected) -> None:
        event.stop()
        self.query_one(FieldRow).input.focus()

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        name = self.current
        if name is None:
            return
        value = event.input.value
        if dict(self._params).get(name) == value:
            return
        self.post_message(EditRequested(lambda doc: doc.set_param(name, value), f"param {name}", field=f"param:{name}"))

    def action_add_param(self) -> None:
        self.post_message(self.ParamCommand("add", None))

    def action_delete_param(self) -> None:
        if self.current is not None:
            self.post_message(self.ParamCommand("delete", self.current))

    def action_target_param(self) -> None:
        if self.current is not None:
            self.post_message(self.ParamCommand("tune", self.current))


SESSION_HINTS = {
    "bankroll": "money at the start",
    "goal": 'amount to stop at, or "none"',
    "floor": "stop-loss (optional)",
    "min_bet": "table minimum",
    "max_bet": "table maximum",
    "unit": "betting unit",
    "max_rounds": "time cap (needs a goal)",
}


class SessionEditor(Vertical):
    """The file's ``[session]`` table: bankroll, goal (an amount, or ``none`` to play until ruin) and
    limits, shared by every plan. A problem sits beside its setting, in the form's words."""

    def compose(self) -> ComposeResult:
        from oddsbench.model.defaults import SESSION_SETTING_NAMES as SETTING_NAMES

        yield Static(
            "Session: the bankroll and limits every plan in Sessions (F5) plays with", classes="editor-heading"
        )
        for name in SETTING_NAMES:
            yield FieldRow(name, name.replace("_", " "), SESSION_HINTS.get(name, ""))
        yield Static("", id="session-message", classes="field-message")

    def show(self, document: RulesetDocument, problem: OddsbenchError | None) -> None:
        values = self._values = dict(document.session())
        setting = getattr(problem, "setting", None)
        for row in self.query(FieldRow):
            row.input.show(values.get(row.field, ""))
            mine = problem is not None and setting == row.field
            show_problems(row, row.input, [], getattr(problem, "reason", "") if mine else "")
            row.query_one(".field-message", Static).set_class(mine, "-error")
            row.input.set_class(mine, "-invalid")
        general = str(problem) if problem is not None and setting is None else ""
        message = self.query_one("#session-message", Static)
        message.update(plain(general))
        message.set_class(bool(general), "-error")

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        field = event.input.field if isinstance(event.input, Field) else None
        if field is None:
            return
        value = event.input.value
        if getattr(self, "_values", {}).get(field, "") == value:
            return
        self._values[field] = value
        self.post_message(
            EditRequested(lambda doc: doc.set_session(field, value), f"[session] {field}", field=f"session:{field}")
        )
